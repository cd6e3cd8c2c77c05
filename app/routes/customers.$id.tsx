import { readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/customers.$id";
import { StatusBadge } from "~/components/packages/status-badge";
import { RequestStatusBadge } from "~/components/requests/request-status";
import { Caution, FormAlert, formErrorsOf, Notice } from "~/components/ui/alert";
import { buttonClass, SubmitButton } from "~/components/ui/button";
import { SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { PageHeader, Section } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { addBike } from "~/lib/customers/bikes.server";
import { eraseCustomer, getCustomer, updateCustomer } from "~/lib/customers/customers.server";
import { BikeSchema, CustomerSchema } from "~/lib/customers/forms";
import { getDb } from "~/lib/db.server";
import { listFamilies } from "~/lib/engine-families/families.server";
import { requireIdParam } from "~/lib/http/ids";

const UpdateSchema = CustomerSchema.extend({ intent: z.literal("update") });
const AddBikeSchema = BikeSchema.extend({ intent: z.literal("add-bike") });
const EraseSchema = z.object({
  intent: z.literal("erase"),
  confirm: z.string({ error: "Type the customer's name to confirm" }).trim(),
});

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "customers:read");
  const id = requireIdParam(params);
  const db = getDb();
  const [customer, families] = await Promise.all([getCustomer(db, id), listFamilies(db)]);
  if (!customer) throw data("Not found", { status: 404 });
  return {
    customer,
    families: families.map((f) => ({ value: String(f.id), label: f.name })),
    canEdit: can(user.role, "customers:edit") && !customer.erased,
    canExport: can(user.role, "customers:export"),
    canErase: can(user.role, "customers:erase") && !customer.erased,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const form = await readForm(request);
  const intent = form.get("intent");
  const user = await requirePermission(
    request,
    intent === "erase" ? "customers:erase" : "customers:edit",
  );
  const id = requireIdParam(params);
  const db = getDb();
  const customer = await getCustomer(db, id);
  if (!customer) throw data("Not found", { status: 404 });
  if (customer.erased) throw data("This customer's data was erased.", { status: 409 });
  if (intent === "update") {
    const s = parseWithZod(form, { schema: UpdateSchema });
    if (s.status !== "success") return data({ intent, result: s.reply() }, { status: 400 });
    await updateCustomer(db, id, s.value);
    return { intent, result: s.reply(), saved: true };
  }
  if (intent === "add-bike") {
    const s = parseWithZod(form, { schema: AddBikeSchema });
    if (s.status !== "success") return data({ intent, result: s.reply() }, { status: 400 });
    const bikeId = await addBike(db, id, s.value);
    return redirect(`/bikes/${bikeId}`);
  }
  if (intent === "erase") {
    const s = parseWithZod(form, { schema: EraseSchema });
    if (s.status !== "success") return data({ intent, result: s.reply() }, { status: 400 });
    if (s.value.confirm !== customer.name)
      return data(
        {
          intent,
          result: s.reply({
            fieldErrors: { confirm: [`Type “${customer.name}” exactly to confirm`] },
          }),
        },
        { status: 400 },
      );
    await eraseCustomer(db, id);
    void user;
    return { intent, result: s.reply({ resetForm: true }), saved: true };
  }
  return data(
    { intent: null, result: null, message: "That action was not understood." },
    { status: 400 },
  );
}

type ActionResult = Route.ComponentProps["actionData"];
const resultFor = (a: ActionResult, intent: string) =>
  a && a.intent === intent ? (a.result ?? undefined) : undefined;

export default function CustomerPage({ loaderData, actionData }: Route.ComponentProps) {
  const { customer: c, families, canEdit, canExport, canErase } = loaderData;
  const busy = useNavigation().state !== "idle";
  const [form, fields] = useForm({
    id: "customer",
    lastResult: resultFor(actionData, "update"),
    defaultValue: { name: c.name, email: c.email, phone: c.phone, city: c.city, notes: c.notes },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: UpdateSchema }),
    shouldRevalidate: "onBlur",
  });
  const [bikeForm, bike] = useForm({
    id: "add-bike",
    lastResult: resultFor(actionData, "add-bike"),
    onValidate: ({ formData }) => parseWithZod(formData, { schema: AddBikeSchema }),
    shouldRevalidate: "onBlur",
  });
  const [eraseForm, erase] = useForm({
    id: "erase",
    lastResult: resultFor(actionData, "erase"),
  });
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <PageHeader
        back={{ to: "/customers", label: "Customers" }}
        eyebrow={`Customer #${c.id}`}
        title={c.name}
        lead={[c.email, c.phone, c.city].filter(Boolean).join(" · ") || undefined}
        actions={
          canExport ? (
            <>
              <a href={`/customers/${c.id}/export`} className={buttonClass("quiet")}>
                Export JSON
              </a>
              <a href={`/customers/${c.id}/export?format=csv`} className={buttonClass("quiet")}>
                Export CSV
              </a>
            </>
          ) : undefined
        }
      />
      {c.erased ? (
        <Notice className="mt-4">
          This customer's personal data was erased. The bikes and packages stay, anonymised, for the
          shop's records.
        </Notice>
      ) : null}
      <div className="mt-6 grid gap-6 lg:grid-cols-2">
        <div className="space-y-6">
          <Section id="bikes" title="Bikes">
            <ul className="divide-y divide-steel-100 rounded border border-steel-200 bg-white">
              {c.bikes.map((b) => (
                <li key={b.id} className="px-4 py-3">
                  <Link to={`/bikes/${b.id}`} className="font-semibold text-teal-text underline">
                    {b.year} {b.model}
                  </Link>
                  <p className="text-sm text-steel-700">
                    {b.family ?? "engine family not set"}
                    {b.vin ? ` · VIN ${b.vin}` : ""}
                    {b.mileage !== null ? ` · ${b.mileage.toLocaleString("en-US")} mi` : ""}
                  </p>
                </li>
              ))}
              {c.bikes.length === 0 ? (
                <li className="px-4 py-3 text-steel-700">No bike on file.</li>
              ) : null}
            </ul>
            {canEdit ? (
              <details className="mt-3 rounded border border-steel-200 bg-white p-4">
                <summary className="cursor-pointer font-semibold text-teal-text">
                  Add a bike
                </summary>
                <Form
                  method="post"
                  {...getFormProps(bikeForm)}
                  className="mt-3 grid gap-3 sm:grid-cols-2"
                >
                  <input type="hidden" name="intent" value="add-bike" />
                  <TextField label="Model year" field={bike.year} type="number" step="1" />
                  <TextField label="Model" field={bike.model} />
                  <TextField label="VIN" field={bike.vin} mono />
                  <SelectField
                    label="Engine family"
                    field={bike.engineFamilyId}
                    options={families}
                    placeholder="Not known yet"
                  />
                  <TextField label="Mileage (mi)" field={bike.mileage} type="number" step="1" />
                  <TextAreaField label="Notes" field={bike.notes} rows={2} />
                  <div>
                    <SubmitButton busy={busy}>Add the bike</SubmitButton>
                  </div>
                </Form>
              </details>
            ) : null}
          </Section>
          <Section id="packages" title="Packages">
            <ul className="divide-y divide-steel-100 rounded border border-steel-200 bg-white">
              {c.packages.map((p) => (
                <li key={p.id} className="flex flex-wrap items-center gap-2 px-4 py-3">
                  <Link to={`/packages/${p.id}`} className="font-semibold text-teal-text underline">
                    {p.name}
                  </Link>
                  <StatusBadge status={p.status} />
                  <span className="text-sm text-steel-700">{p.bike}</span>
                </li>
              ))}
              {c.packages.length === 0 ? (
                <li className="px-4 py-3 text-steel-700">No package yet.</li>
              ) : null}
            </ul>
          </Section>
          <Section id="requests" title="Build requests">
            <ul className="divide-y divide-steel-100 rounded border border-steel-200 bg-white">
              {c.requests.map((r) => (
                <li key={r.id} className="flex flex-wrap items-center gap-2 px-4 py-3">
                  <Link to={`/requests/${r.id}`} className="font-semibold text-teal-text underline">
                    Request #{r.id}
                  </Link>
                  <RequestStatusBadge status={r.status} />
                  <span className="text-sm text-steel-700">{r.bike}</span>
                </li>
              ))}
              {c.requests.length === 0 ? (
                <li className="px-4 py-3 text-steel-700">No request on file.</li>
              ) : null}
            </ul>
          </Section>
        </div>
        <div className="space-y-6">
          {canEdit ? (
            <Section id="contact" title="Contact details">
              <Form
                method="post"
                {...getFormProps(form)}
                className="space-y-3 rounded border border-steel-200 bg-white p-4"
              >
                <input type="hidden" name="intent" value="update" />
                {actionData?.intent === "update" && "saved" in actionData ? (
                  <Notice>Saved.</Notice>
                ) : null}
                <FormAlert
                  id={form.errorId}
                  errors={formErrorsOf(form, resultFor(actionData, "update"))}
                />
                <TextField label="Name" field={fields.name} />
                <TextField label="E-mail" field={fields.email} type="email" />
                <TextField label="Phone" field={fields.phone} />
                <TextField label="City" field={fields.city} />
                <TextAreaField label="Notes" field={fields.notes} rows={3} />
                <SubmitButton busy={busy}>Save</SubmitButton>
              </Form>
            </Section>
          ) : (
            <Section id="contact" title="Notes">
              <p className="whitespace-pre-line rounded border border-steel-200 bg-white p-4">
                {c.notes || "No notes."}
              </p>
            </Section>
          )}
          {canErase ? (
            <Section id="erase" title="Erase personal data">
              <Form
                method="post"
                {...getFormProps(eraseForm)}
                className="space-y-3 rounded border border-red bg-white p-4"
              >
                <input type="hidden" name="intent" value="erase" />
                <Caution>
                  Erasing removes the name, contact details, VINs and the rider's words from
                  requests, and cannot be undone. Packages stay for the shop's records, under
                  “Erased customer #{c.id}”. Export first if the customer asked for a copy.
                </Caution>
                <TextField label={`Type “${c.name}” to confirm`} field={erase.confirm} />
                <SubmitButton busy={busy}>Erase this customer's data</SubmitButton>
              </Form>
            </Section>
          ) : null}
        </div>
      </div>
    </main>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `${d?.customer?.name ?? "Customer"} · Torquewright` }];
}
