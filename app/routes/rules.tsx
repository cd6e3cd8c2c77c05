import { Link } from "react-router";
import type { Route } from "./+types/rules";
import { When } from "~/components/ui/when";
import { KindBadge } from "~/components/fit-rules/kind-badge";
import { WithReference } from "~/components/fit-rules/with-reference";
import { Caution } from "~/components/ui/alert";
import { buttonClass } from "~/components/ui/button";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { listRules } from "~/lib/fit-rules/rules.server";
import { can } from "~/lib/auth/permissions";

const iso = (d: unknown) => new Date(d as string).toISOString();
const KIND_ORDER: Record<string, number> = { conflict: 0, upgrade: 1, caution: 2 };

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "rules:read");
  const rules = await listRules(getDb());
  return {
    canEdit: can(user.role, "rules:edit"),
    // as the page says: conflicts first, then upgrades, then cautions; active before
    // inactive, then by name
    rules: [...rules]
      .sort(
        (a, b) =>
          KIND_ORDER[a.kind] - KIND_ORDER[b.kind] ||
          Number(b.active) - Number(a.active) ||
          a.name.localeCompare(b.name),
      )
      .map((r) => ({
        id: r.id,
        name: r.name,
        kind: r.kind,
        condition: r.condition,
        active: r.active,
        version: r.version,
        updated_at: iso(r.updated_at),
        updated_by_name: r.updated_by_name,
      })),
  };
}

export default function Rules({ loaderData }: Route.ComponentProps) {
  const { rules, canEdit } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <PageHeader
        title="Fit rules"
        lead="The shop's rules, checked against every package on the bench. Conflicts first, then upgrades, then cautions."
        actions={
          canEdit ? (
            <Link to="/rules/new" className={buttonClass()}>
              New rule
            </Link>
          ) : null
        }
      />
      <Caution className="mt-3">
        Rules help the staff remember the shop's practice; they do not replace the parts maker's
        instructions, local regulations or a qualified technician's check of brakes, axles and
        suspension.
      </Caution>
      <WithReference>
        <section aria-labelledby="list-h">
          <h2 id="list-h" className="sr-only">
            Rules
          </h2>
          {rules.length === 0 ? (
            <p className="rounded border border-steel-200 bg-white p-4 text-steel-700">
              No rules yet.{canEdit ? " Write the first one with “New rule”." : ""}
            </p>
          ) : (
            <table className="w-full rounded border border-steel-200 bg-white text-sm">
              <thead className="bg-steel-100 text-left text-graphite">
                <tr>
                  <th className="px-3 py-2">Kind</th>
                  <th className="px-3 py-2">Rule</th>
                  <th className="hidden px-3 py-2 sm:table-cell">Version</th>
                  <th className="hidden px-3 py-2 sm:table-cell">Changed</th>
                </tr>
              </thead>
              <tbody>
                {rules.map((r) => (
                  <tr
                    key={r.id}
                    className={`border-t border-steel-100 align-top ${r.active ? "" : "text-steel-700"}`}
                  >
                    <td className="px-3 py-2">
                      <KindBadge kind={r.kind} />
                    </td>
                    <td className="px-3 py-2">
                      <Link to={`/rules/${r.id}`} className="font-semibold text-ink underline">
                        {r.name}
                      </Link>
                      {r.active ? null : (
                        <span className="ml-2 text-xs font-semibold uppercase text-steel-700">
                          off
                        </span>
                      )}
                      <code className="mt-0.5 block break-all font-mono text-xs text-steel-700">
                        {r.condition}
                      </code>
                      {/* on a phone, version and change sit under the rule */}
                      <span className="mt-0.5 block text-xs text-steel-700 sm:hidden">
                        version {r.version} · changed <When at={r.updated_at} />
                        {r.updated_by_name ? ` by ${r.updated_by_name}` : ""}
                      </span>
                    </td>
                    <td className="num hidden px-3 py-2 sm:table-cell">v{r.version}</td>
                    <td className="hidden px-3 py-2 text-steel-700 sm:table-cell">
                      <When at={r.updated_at} />
                      {r.updated_by_name ? (
                        <span className="block">{r.updated_by_name}</span>
                      ) : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </section>
      </WithReference>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Fit rules · Torquewright" }];
}
