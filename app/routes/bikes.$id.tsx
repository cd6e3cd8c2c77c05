import { readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/bikes.$id";
import { InstalledPartForm, PartFormSchema } from "~/components/customers/installed-part-form";
import { StatusBadge } from "~/components/packages/status-badge";
import { when } from "~/components/requests/request-status";
import { Notice } from "~/components/ui/alert";
import { buttonClass, SubmitButton } from "~/components/ui/button";
import { SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { PageHeader, Section } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import {
  addBikePart,
  categoryExists,
  getBike,
  removeBikePart,
  updateBike,
  updateBikePart,
} from "~/lib/customers/bikes.server";
import { BikeSchema } from "~/lib/customers/forms";
import { getDb } from "~/lib/db.server";
import { listFamilies } from "~/lib/engine-families/families.server";
import { parseId, requireIdParam } from "~/lib/http/ids";

const UpdateSchema = BikeSchema.extend({ intent: z.literal("update") });

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "customers:read");
  const id = requireIdParam(params);
  const db = getDb();
  const [bike, families, parts, categories] = await Promise.all([
    getBike(db, id),
    listFamilies(db),
    db
      .selectFrom("parts")
      .select(["id", "part_number", "name", "category"])
      .where("archived_at", "is", null)
      .orderBy("category")
      .orderBy("name")
      .execute(),
    db.selectFrom("part_categories").select(["slug", "label"]).orderBy("sort").execute(),
  ]);
  if (!bike) throw data("Not found", { status: 404 });
  return {
    bike,
    families: families.map((f) => ({ value: String(f.id), label: f.name })),
    parts: parts.map((p) => ({
      id: p.id,
      label: `${p.part_number} ${p.name}`,
      category: p.category,
    })),
    categories: categories.map((c) => ({ value: c.slug, label: c.label })),
    canEdit: can(user.role, "customers:edit"),
    canStartPackage: can(user.role, "packages:create"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const form = await readForm(request);
  const user = await requirePermission(request, "customers:edit");
  const id = requireIdParam(params);
  const db = getDb();
  const bike = await db.selectFrom("bikes").select("id").where("id", "=", id).executeTakeFirst();
  if (!bike) throw data("Not found", { status: 404 });
  const intent = String(form.get("intent") ?? "");
  const rowId = parseId(form.get("partRowId"));
  const key = intent === "edit-part" ? `edit-part-${rowId}` : intent;
  if (intent === "update") {
    const s = parseWithZod(form, { schema: UpdateSchema });
    if (s.status !== "success") return data({ key, result: s.reply() }, { status: 400 });
    await updateBike(db, id, s.value);
    return { key, result: s.reply(), saved: "Bike saved." };
  }
  if (intent === "add-part" || intent === "edit-part") {
    const s = parseWithZod(form, { schema: PartFormSchema });
    if (s.status !== "success") return data({ key, result: s.reply() }, { status: 400 });
    if (s.value.partId === undefined && !(await categoryExists(db, s.value.category!)))
      return data(
        { key, result: s.reply({ fieldErrors: { category: ["Pick a category from the list"] } }) },
        { status: 400 },
      );
    const ok =
      intent === "add-part"
        ? (await addBikePart(db, id, s.value, user.id)) !== null
        : rowId !== null && (await updateBikePart(db, id, rowId, s.value));
    if (!ok)
      return data(
        {
          key,
          result: s.reply({
            fieldErrors: { partId: ["That part is not in the catalog, or the row is gone"] },
          }),
        },
        { status: 400 },
      );
    return {
      key,
      result: s.reply({ resetForm: intent === "add-part" }),
      saved: intent === "add-part" ? "Part added." : "Part saved.",
    };
  }
  if (intent === "remove-part") {
    if (rowId === null || !(await removeBikePart(db, id, rowId, user.id)))
      return data({ key, result: null, saved: undefined }, { status: 404 });
    return { key, result: null, saved: "Part removed; it stays in the bike's history." };
  }
  return data(
    { key: null, result: null, message: "That action was not understood." },
    { status: 400 },
  );
}

export default function BikePage({ loaderData, actionData }: Route.ComponentProps) {
  const { bike, families, parts, categories, canEdit, canStartPackage } = loaderData;
  const busy = useNavigation().state !== "idle";
  const resultFor = (key: string) =>
    actionData && actionData.key === key ? (actionData.result ?? undefined) : undefined;
  const [form, fields] = useForm({
    id: "bike",
    lastResult: resultFor("update"),
    defaultValue: {
      year: String(bike.year),
      model: bike.model,
      vin: bike.vin ?? "",
      engineFamilyId: bike.engineFamilyId ? String(bike.engineFamilyId) : "",
      mileage: bike.mileage !== null ? String(bike.mileage) : "",
      notes: bike.notes,
    },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: UpdateSchema }),
    shouldRevalidate: "onBlur",
  });
  const saved = actionData && "saved" in actionData ? actionData.saved : undefined;
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <PageHeader
        back={{ to: `/customers/${bike.customerId}`, label: bike.customer }}
        eyebrow={`Bike #${bike.id}`}
        title={`${bike.year} ${bike.model}`}
        lead={`${bike.family ?? "Engine family not set"}${bike.vin ? ` · VIN ${bike.vin}` : ""}`}
        actions={
          canStartPackage ? (
            <Link to={`/packages/new?bike=${bike.id}`} className={buttonClass("secondary")}>
              Start a package
            </Link>
          ) : undefined
        }
      />
      {saved ? <Notice className="mt-4">{saved}</Notice> : null}
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div className="space-y-6">
          <Section id="installed" title="Installed parts">
            {bike.parts.length === 0 ? (
              <p className="text-steel-700">
                Nothing recorded: the bike is as it left the factory, or not yet known.
              </p>
            ) : (
              <ul className="divide-y divide-steel-100 rounded border border-steel-200 bg-white">
                {bike.parts.map((p) => (
                  <li key={p.id} className="px-4 py-3" data-testid="installed-part">
                    <div className="flex flex-wrap items-baseline justify-between gap-2">
                      <div>
                        <p className="font-semibold text-ink">{p.label}</p>
                        <p className="text-sm text-steel-700">
                          {p.categoryLabel}
                          {p.partId ? "" : " · free text"}
                          {p.fittedOn ? ` · fitted ${p.fittedOn}` : ""}
                          {p.fittedMileage !== null
                            ? ` at ${p.fittedMileage.toLocaleString("en-US")} mi`
                            : ""}
                          {p.partId && p.description !== p.partName ? ` · “${p.description}”` : ""}
                        </p>
                        {p.notes ? <p className="text-sm">{p.notes}</p> : null}
                      </div>
                      {canEdit ? (
                        <Form method="post">
                          <input type="hidden" name="intent" value="remove-part" />
                          <input type="hidden" name="partRowId" value={p.id} />
                          <button
                            type="submit"
                            className="text-sm font-medium text-red-text underline"
                            aria-label={`Remove ${p.label}`}
                          >
                            Remove
                          </button>
                        </Form>
                      ) : null}
                    </div>
                    {canEdit ? (
                      <details
                        className="mt-2"
                        open={Boolean(resultFor(`edit-part-${p.id}`)?.error)}
                      >
                        <summary className="cursor-pointer text-sm font-medium text-teal-text">
                          Edit
                        </summary>
                        <div className="mt-2">
                          <InstalledPartForm
                            id={`edit-part-${p.id}`}
                            intent="edit-part"
                            partRowId={p.id}
                            defaults={{
                              partId: p.partId ? String(p.partId) : "",
                              category: p.partId ? "" : p.category,
                              description: p.description,
                              fittedOn: p.fittedOn ?? "",
                              fittedMileage:
                                p.fittedMileage !== null ? String(p.fittedMileage) : "",
                              notes: p.notes,
                            }}
                            parts={parts}
                            categories={categories}
                            lastResult={resultFor(`edit-part-${p.id}`)}
                            busy={busy}
                            submitLabel="Save the part"
                          />
                        </div>
                      </details>
                    ) : null}
                  </li>
                ))}
              </ul>
            )}
            {canEdit ? (
              <div className="mt-3 rounded border border-steel-200 bg-white p-4">
                <h3 className="mb-2 font-semibold text-ink">Add an installed part</h3>
                <InstalledPartForm
                  id="add-part"
                  intent="add-part"
                  parts={parts}
                  categories={categories}
                  lastResult={resultFor("add-part")}
                  busy={busy}
                  submitLabel="Add the part"
                />
              </div>
            ) : null}
          </Section>
          <Section id="packages" title="Packages">
            <ul className="divide-y divide-steel-100 rounded border border-steel-200 bg-white">
              {bike.packages.map((p) => (
                <li key={p.id} className="flex flex-wrap items-center gap-2 px-4 py-3">
                  <Link to={`/packages/${p.id}`} className="font-semibold text-teal-text underline">
                    {p.name}
                  </Link>
                  <StatusBadge status={p.status} />
                  <span className="text-sm text-steel-700">{p.builder ?? "no builder"}</span>
                  <Link
                    to={`/packages/${p.id}/keep-check`}
                    className="text-sm text-teal-text underline"
                  >
                    Keep-check{p.keepChecked ? " (done)" : ""}
                  </Link>
                </li>
              ))}
              {bike.packages.length === 0 ? (
                <li className="px-4 py-3 text-steel-700">No package yet.</li>
              ) : null}
            </ul>
          </Section>
        </div>
        <aside className="space-y-6">
          {canEdit ? (
            <Section id="record" title="Bike record">
              <Form
                method="post"
                {...getFormProps(form)}
                className="space-y-3 rounded border border-steel-200 bg-white p-4"
              >
                <input type="hidden" name="intent" value="update" />
                <TextField label="Model year" field={fields.year} type="number" step="1" />
                <TextField label="Model" field={fields.model} />
                <TextField label="VIN" field={fields.vin} mono />
                <SelectField
                  label="Engine family"
                  field={fields.engineFamilyId}
                  options={families}
                  placeholder="Not known yet"
                />
                <TextField label="Mileage (mi)" field={fields.mileage} type="number" step="1" />
                <TextAreaField label="Notes" field={fields.notes} rows={2} />
                <SubmitButton busy={busy}>Save the bike</SubmitButton>
              </Form>
            </Section>
          ) : null}
          <Section id="history" title="History">
            <ol className="space-y-1 text-sm">
              {bike.history.map((h, i) => (
                <li key={i}>
                  <span className="num">{when(h.at).slice(0, 10)}</span> · {h.what}
                </li>
              ))}
            </ol>
          </Section>
        </aside>
      </div>
    </main>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `${d?.bike ? `${d.bike.year} ${d.bike.model}` : "Bike"} · Torquewright` }];
}
