import { readForm } from "~/lib/http/body";
import type { Route } from "./+types/parts.new";
import { PartForm } from "~/components/catalog/part-form";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { categoryOptions } from "~/lib/catalog/parts.server";
import { getDb } from "~/lib/db.server";
import { handlePartSave } from "~/lib/catalog/part-actions.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "parts:edit");
  return { categories: await categoryOptions(getDb()) };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "parts:edit");
  return handlePartSave(await readForm(request), user, null);
}

const EMPTY = {
  part_number: "",
  category: "",
  maker: "",
  name: "",
  price: "",
  labour_hours: "0",
  tags: "",
  stock: false,
  notes: "",
  attributes: {},
};

export default function NewPart({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-3xl px-4 py-8">
      <PageHeader
        back={{ to: "/parts", label: "Parts catalog" }}
        title="New part"
        lead="Measurements come from the maker's spec sheet; the fit rules and the bench read them."
      />
      <div className="mt-6">
        <PartForm defaults={EMPTY} categories={loaderData.categories} editing={false} />
      </div>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "New part · Torquewright" }];
}
