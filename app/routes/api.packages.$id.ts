import { parseId } from "~/lib/http/ids";
import type { Route } from "./+types/api.packages.$id";
import { requireApiPermission } from "~/lib/auth/api.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import { getBenchState, getPackageHeader } from "~/lib/packages/store.server";

// GET /api/packages/:id — the package with its current revision's figures and findings.
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireApiPermission(request, "packages:read");
  const db = getDb();
  // a JSON route answers JSON, also for a number that cannot be a package's
  const id = parseId(params.id);
  const header = id === null ? undefined : await getPackageHeader(db, id);
  const state =
    header && id !== null
      ? await getBenchState(db, id, can(user.role, "prices:read"), { triggeredBy: true })
      : null;
  if (!header || !state)
    return Response.json({ error: "No package with this number." }, { status: 404 });
  const { computation, findings, spec, parts, revision, savedAt, savedBy } = state;
  return Response.json(
    {
      package: header,
      revision: { number: revision, savedAt, savedBy },
      spec,
      parts,
      results: computation.results,
      cautions: computation.cautions,
      missing: computation.missing,
      inputErrors: computation.inputErrors,
      findings,
    },
    { headers: { "Cache-Control": "private, no-store" } },
  );
}
