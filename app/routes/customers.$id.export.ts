import { readQuery } from "~/lib/http/text";
import { data } from "react-router";
import type { Route } from "./+types/customers.$id.export";
import { requirePermission } from "~/lib/auth/auth.server";
import { exportCsv, exportCustomer } from "~/lib/customers/customers.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";

// Everything the shop keeps about one customer, as JSON or CSV (the owner's, on request).
export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "customers:export");
  const id = requireIdParam(params);
  const x = await exportCustomer(getDb(), id);
  if (!x) throw data("Not found", { status: 404 });
  const csv = readQuery(request).get("format") === "csv";
  const headers = {
    "Content-Type": csv ? "text/csv; charset=utf-8" : "application/json; charset=utf-8",
    "Content-Disposition": `attachment; filename="customer-${id}.${csv ? "csv" : "json"}"`,
    "Cache-Control": "no-store",
  };
  return new Response(csv ? exportCsv(x) : JSON.stringify(x, null, 2), { status: 200, headers });
}
