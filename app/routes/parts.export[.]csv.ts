import { readQuery } from "~/lib/http/text";
import type { Route } from "./+types/parts.export[.]csv";
import { requirePermission } from "~/lib/auth/auth.server";
import { partsToCsv } from "~/lib/catalog/csv.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";

// GET /parts/export.csv — the catalog (archived parts too with ?archived=1); prices only for roles that see them.
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "parts:read");
  const archived = readQuery(request).get("archived") === "1";
  let q = getDb().selectFrom("parts").selectAll().orderBy("part_number");
  if (!archived) q = q.where("archived_at", "is", null);
  const csv = partsToCsv(await q.execute(), can(user.role, "prices:read"));
  return new Response(`\uFEFF${csv}\r\n`, {
    status: 200,
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": 'attachment; filename="parts-catalog.csv"',
      "Cache-Control": "private, no-store",
    },
  });
}
