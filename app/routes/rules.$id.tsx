import { data } from "react-router";
import type { Route } from "./+types/rules.$id";
import { RuleHistory } from "~/components/rules/history";
import { KindBadge } from "~/components/rules/kind-badge";
import { ReferencePanel } from "~/components/rules/reference-panel";
import { RuleForm } from "~/components/rules/rule-form";
import { requirePermission } from "~/lib/auth.server";
import { getDb } from "~/lib/db.server";
import { getRule, getRuleHistory } from "~/lib/fit-rules.server";
import { can } from "~/lib/permissions";

const iso = (d: unknown) => new Date(d as string).toISOString();
import { handleRuleAction, ruleFormOptions } from "~/lib/rule-actions.server";

async function findRule(id: string | undefined) {
  const rule = await getRule(getDb(), Number(id));
  if (!rule) throw data("No fit rule with this number.", { status: 404 });
  return rule;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "rules:read");
  const rule = await findRule(params.id);
  const history = await getRuleHistory(getDb(), rule.id);
  const canEdit = can(user.role, "rules:edit");
  return {
    canEdit,
    saved: new URL(request.url).searchParams.get("saved"),
    rule: { ...rule, updated_at: iso(rule.updated_at), created_at: iso(rule.created_at) },
    history: history.map((h) => ({ ...h, changed_at: iso(h.changed_at) })),
    options: canEdit ? await ruleFormOptions() : null,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requirePermission(request, "rules:edit");
  const rule = await findRule(params.id);
  return handleRuleAction(request, user, { id: rule.id });
}

export default function RulePage({ loaderData }: Route.ComponentProps) {
  const { rule, history, canEdit, options, saved } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <p className="text-sm">
        <a href="/rules" className="text-teal-text underline">
          Fit rules
        </a>
      </p>
      <h1 className="mt-1 flex flex-wrap items-center gap-3 text-3xl font-semibold text-ink">
        {rule.name} <KindBadge kind={rule.kind} />
        {rule.active ? null : <span className="text-base font-semibold uppercase text-steel-700">off</span>}
      </h1>
      <p className="mt-1 text-steel-700">
        Version <span className="num">{rule.version}</span>
        {rule.updated_by_name ? ` · last changed by ${rule.updated_by_name}` : ""}
      </p>
      {saved ? (
        <p role="status" className="mt-3 rounded border border-green bg-white px-3 py-2 text-sm font-medium text-green-text">
          Saved as version {saved}.
        </p>
      ) : null}
      <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_26rem]">
        <div className="space-y-8">
          {canEdit && options ? (
            <section aria-labelledby="edit-h">
              <h2 id="edit-h" className="mb-2 text-lg font-semibold text-ink">
                Change this rule
              </h2>
              <RuleForm
                key={rule.version}
                editing
                categories={options.categories}
                parts={options.parts}
                defaults={{
                  name: rule.name,
                  kind: rule.kind,
                  condition: rule.condition,
                  message: rule.message,
                  upgrade_category: rule.upgrade_category ?? "",
                  suggested_part_id: rule.suggested_part_id ? String(rule.suggested_part_id) : "",
                  active: rule.active,
                  version: rule.version,
                }}
              />
            </section>
          ) : (
            <section className="rounded border border-steel-200 bg-white p-4 text-sm">
              <p className="font-semibold text-graphite">Condition</p>
              <code className="mt-1 block break-all font-mono text-ink">{rule.condition}</code>
              <p className="mt-3 font-semibold text-graphite">Message</p>
              <p className="text-ink">{rule.message}</p>
            </section>
          )}
          <section aria-labelledby="history-h">
            <h2 id="history-h" className="mb-2 text-lg font-semibold text-ink">
              History
            </h2>
            <RuleHistory versions={history} />
          </section>
        </div>
        <aside>
          <ReferencePanel />
        </aside>
      </div>
    </main>
  );
}

export function meta({ data }: Route.MetaArgs) {
  return [{ title: `${data?.rule.name ?? "Fit rule"} · Torquewright` }];
}
