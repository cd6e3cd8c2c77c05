import type { Route } from "./+types/api.parts";
import { requireApiPermission } from "~/lib/auth/api.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import { searchParts as countParts } from "~/lib/catalog/parts.server";
import { searchParts } from "~/lib/packages/store.server";
import { queryInt } from "~/lib/http/ids";
import { readQuery } from "~/lib/http/text";

export const API_PARTS_PAGE = 60;
export const API_PARTS_MAX_OFFSET = 100_000;

// GET /api/parts?q=&category=&offset=&limit= — active parts for the parts shelf, in pages.
// The answer: { parts, total, offset, limit, next } where `next` is the address of the
// following page (null on the last). Prices only for roles that may see them.
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireApiPermission(request, "parts:read");
  const p = readQuery(request, { json: true });
  const q = (p.get("q") ?? "").slice(0, 100);
  const category = (p.get("category") ?? "").slice(0, 60);
  const offset =
    p.get("offset") === "0"
      ? 0
      : (queryInt(p, "offset", { max: API_PARTS_MAX_OFFSET, json: true }) ?? 0);
  const limit = queryInt(p, "limit", { max: API_PARTS_PAGE, json: true }) ?? API_PARTS_PAGE;
  const db = getDb();
  const [parts, counted] = await Promise.all([
    searchParts(db, {
      q,
      category: category || undefined,
      prices: can(user.role, "prices:read"),
      limit,
      offset,
    }),
    countParts(db, { q, category: category || undefined, perPage: 1 }),
  ]);
  const total = counted.total;
  let next: string | null = null;
  if (offset + parts.length < total) {
    const n = new URLSearchParams(p);
    n.set("offset", String(offset + parts.length));
    n.set("limit", String(limit));
    next = `/api/parts?${n}`;
  }
  return Response.json(
    { parts, total, offset, limit, next },
    { headers: { "Cache-Control": "private, no-store" } },
  );
}
