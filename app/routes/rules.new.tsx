import type { Route } from "./+types/rules.new";
import { PairForm } from "~/components/rules/pair-form";
import { ReferencePanel } from "~/components/rules/reference-panel";
import { RuleForm } from "~/components/rules/rule-form";
import { requirePermission } from "~/lib/auth.server";
import { handleRuleAction, ruleFormOptions } from "~/lib/rule-actions.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "rules:edit");
  return ruleFormOptions();
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "rules:edit");
  return handleRuleAction(request, user, null);
}

const EMPTY = { name: "", kind: "caution", condition: "", message: "", upgrade_category: "", suggested_part_id: "", active: true };

export default function NewRule({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <p className="text-sm">
        <a href="/rules" className="text-teal-text underline">
          Fit rules
        </a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-ink">New fit rule</h1>
      <p className="mt-1 text-steel-700">Preview shows which saved packages the rule would flag before anything is saved.</p>
      <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_26rem]">
        <div className="space-y-8">
          <RuleForm defaults={EMPTY} categories={loaderData.categories} parts={loaderData.parts} editing={false} />
          <PairForm />
        </div>
        <aside>
          <ReferencePanel />
        </aside>
      </div>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "New fit rule · Torquewright" }];
}
