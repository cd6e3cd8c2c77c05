import { sql } from "kysely";
import type { Route } from "./+types/healthz";
import { getDb } from "~/lib/db.server";

// For load balancers and monitors: one query against the database.
export async function loader(_: Route.LoaderArgs) {
  try {
    await sql`select 1`.execute(getDb());
    return Response.json({ ok: true }, { headers: { "Cache-Control": "no-store" } });
  } catch (e) {
    const reason = e instanceof Error ? e.message : String(e);
    return Response.json(
      { ok: false, reason: `database unreachable: ${reason}` },
      { status: 503, headers: { "Cache-Control": "no-store" } },
    );
  }
}
