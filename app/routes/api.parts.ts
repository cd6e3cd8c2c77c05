import type { Route } from "./+types/api.parts";
import { requireApiPermission } from "~/lib/auth/api.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import { searchParts } from "~/lib/packages/store.server";

// GET /api/parts?q=&category= — active parts for the parts shelf; prices only for roles that may see them.
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireApiPermission(request, "parts:read");
  const url = new URL(request.url);
  const q = (url.searchParams.get("q") ?? "").slice(0, 100);
  const category = (url.searchParams.get("category") ?? "").slice(0, 60);
  const parts = await searchParts(getDb(), {
    q,
    category: category || undefined,
    prices: can(user.role, "prices:read"),
  });
  return Response.json({ parts }, { headers: { "Cache-Control": "private, no-store" } });
}
