import { readForm } from "~/lib/http/body";
import { data, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/engine-families.new";
import { FamilyForm } from "~/components/engine-families/family-form";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { partOptions, saveFamilyForm } from "~/lib/engine-families/form-actions.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "families:edit");
  return { parts: await partOptions(getDb()) };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const user = await requirePermission(request, "families:edit");
  const out = await saveFamilyForm(getDb(), form, user.id);
  if (!out.ok) return data({ result: out.result }, { status: 400 });
  return redirect(`/engine-families/${out.id}`);
}

export default function NewFamily({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  return (
    <main className="mx-auto max-w-5xl px-4 py-6">
      <PageHeader
        back={{ to: "/engine-families", label: "Engine families" }}
        title="New engine family"
      />
      <div className="mt-4">
        <FamilyForm
          parts={loaderData.parts}
          lastResult={actionData?.result}
          busy={busy}
          submitLabel="Add the family"
        />
      </div>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "New engine family · Torquewright" }];
}
