import { readQuery } from "~/lib/http/text";
import { parseId } from "~/lib/http/ids";
import { data } from "react-router";
import type { Route } from "./+types/rules.$id";
import { RuleHistory } from "~/components/fit-rules/history";
import { KindBadge } from "~/components/fit-rules/kind-badge";
import { WithReference } from "~/components/fit-rules/with-reference";
import { RuleForm } from "~/components/fit-rules/rule-form";
import { Notice } from "~/components/ui/alert";
import { PageHeader, Section } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { getRule, getRuleHistory } from "~/lib/fit-rules/rules.server";
import { can } from "~/lib/auth/permissions";

import { handleRuleAction, ruleFormOptions } from "~/lib/fit-rules/actions.server";

const iso = (d: unknown) => new Date(d as string).toISOString();

async function findRule(id: string | undefined) {
  const rid = parseId(id);
  const rule = rid === null ? null : await getRule(getDb(), rid);
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
    saved: readQuery(request).get("saved"),
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
      <PageHeader
        back={{ to: "/rules", label: "Fit rules" }}
        title={
          <>
            {rule.name} <KindBadge kind={rule.kind} />
            {rule.active ? null : (
              <span className="text-base font-semibold uppercase text-steel-700">off</span>
            )}
          </>
        }
        lead={
          <>
            Version <span className="num">{rule.version}</span>
            {rule.updated_by_name ? ` · last changed by ${rule.updated_by_name}` : ""}
          </>
        }
      />
      {saved ? <Notice className="mt-3">Saved as version {saved}.</Notice> : null}
      <WithReference>
        <div className="space-y-8">
          {canEdit && options ? (
            <Section id="edit-h" title="Change this rule">
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
            </Section>
          ) : (
            <section className="rounded border border-steel-200 bg-white p-4 text-sm">
              <p className="font-semibold text-graphite">Condition</p>
              <code className="mt-1 block break-all font-mono text-ink">{rule.condition}</code>
              <p className="mt-3 font-semibold text-graphite">Message</p>
              <p className="text-ink">{rule.message}</p>
            </section>
          )}
          <Section id="history-h" title="History">
            <RuleHistory versions={history} />
          </Section>
        </div>
      </WithReference>
    </main>
  );
}

export function meta({ data }: Route.MetaArgs) {
  return [{ title: `${data?.rule.name ?? "Fit rule"} · Torquewright` }];
}
