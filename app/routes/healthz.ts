import { sql } from "kysely";
import type { Route } from "./+types/healthz";
import { dbErrorReason, getDb } from "~/lib/db.server";

// For load balancers and monitors: one query against the database. While the database
// is away the answer is 503 with the driver's reason; the next check after it is back
// answers ok again (the pool opens new connections by itself).
export async function loader(_: Route.LoaderArgs) {
  try {
    await sql`select 1`.execute(getDb());
    return Response.json({ ok: true }, { headers: { "Cache-Control": "no-store" } });
  } catch (e) {
    return Response.json(
      { ok: false, reason: `database unreachable: ${dbErrorReason(e)}` },
      { status: 503, headers: { "Cache-Control": "no-store", "Retry-After": "5" } },
    );
  }
}
