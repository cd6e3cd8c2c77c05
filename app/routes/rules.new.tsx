import type { Route } from "./+types/rules.new";
import { PairForm } from "~/components/fit-rules/pair-form";
import { WithReference } from "~/components/fit-rules/with-reference";
import { RuleForm } from "~/components/fit-rules/rule-form";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { handleRuleAction, ruleFormOptions } from "~/lib/fit-rules/actions.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "rules:edit");
  return ruleFormOptions();
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "rules:edit");
  return handleRuleAction(request, user, null);
}

const EMPTY = {
  name: "",
  kind: "caution",
  condition: "",
  message: "",
  upgrade_category: "",
  suggested_part_id: "",
  active: true,
};

export default function NewRule({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <PageHeader
        back={{ to: "/rules", label: "Fit rules" }}
        title="New fit rule"
        lead="Preview shows which saved packages the rule would flag before anything is saved."
      />
      <WithReference>
        <div className="space-y-8">
          <RuleForm
            defaults={EMPTY}
            categories={loaderData.categories}
            parts={loaderData.parts}
            editing={false}
          />
          <PairForm />
        </div>
      </WithReference>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "New fit rule · Torquewright" }];
}
