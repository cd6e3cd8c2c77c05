import { Link } from "react-router";
import type { Route } from "./+types/engine-families";
import { buttonClass } from "~/components/ui/button";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { getDb } from "~/lib/db.server";
import { listFamilies } from "~/lib/engine-families/families.server";
import { familyYears } from "~/lib/engine-families/family";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "families:read");
  const families = await listFamilies(getDb(), { includeArchived: true });
  return { families, canEdit: can(user.role, "families:edit") };
}

export default function EngineFamilies({ loaderData }: Route.ComponentProps) {
  const { families, canEdit } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <PageHeader
        title="Engine families"
        lead="The engines the shop works on, as delivered. A bike's new package starts from its family's stock parts."
        actions={
          canEdit ? (
            <Link to="/engine-families/new" className={buttonClass("primary")}>
              New engine family
            </Link>
          ) : undefined
        }
      />
      <div className="mt-4 overflow-x-auto rounded border border-steel-200 bg-white">
        <table className="w-full min-w-[40rem] text-left text-sm">
          <thead className="bg-steel-50 text-steel-700">
            <tr>
              <th className="px-3 py-2">Family</th>
              <th className="px-3 py-2">Years</th>
              <th className="px-3 py-2 text-right">Bore × stroke</th>
              <th className="px-3 py-2 text-right">Displacement</th>
              <th className="px-3 py-2 text-right">Rev limit</th>
            </tr>
          </thead>
          <tbody>
            {families.map((f) => (
              <tr key={f.id} className="border-t border-steel-100">
                <td className="px-3 py-2">
                  <Link
                    to={`/engine-families/${f.id}`}
                    className="font-semibold text-teal-text underline"
                  >
                    {f.name}
                  </Link>
                  {f.archived ? <span className="ml-2 text-steel-700">(archived)</span> : null}
                </td>
                <td className="px-3 py-2">{familyYears(f)}</td>
                <td className="num px-3 py-2 text-right">
                  {f.boreMm} × {f.strokeMm} mm
                </td>
                <td className="num px-3 py-2 text-right">
                  {f.displacementCc} cc ({(f.displacementCc / 16.387064).toFixed(0)} ci)
                </td>
                <td className="num px-3 py-2 text-right">
                  {f.revLimitRpm !== null ? `${f.revLimitRpm} rpm` : "—"}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Engine families · Torquewright" }];
}
