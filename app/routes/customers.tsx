import { readQuery } from "~/lib/http/text";
import { readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/customers";
import { SubmitButton } from "~/components/ui/button";
import { TextAreaField, TextField } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { createCustomer, searchCustomers } from "~/lib/customers/customers.server";
import { CustomerSchema } from "~/lib/customers/forms";
import { getDb } from "~/lib/db.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "customers:read");
  const q = readQuery(request).get("q") ?? "";
  const rows = await searchCustomers(getDb(), q);
  return { q, rows, canEdit: can(user.role, "customers:edit") };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  await requirePermission(request, "customers:edit");
  const submission = parseWithZod(form, { schema: CustomerSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const id = await createCustomer(getDb(), submission.value);
  return redirect(`/customers/${id}`);
}

export default function Customers({ loaderData, actionData }: Route.ComponentProps) {
  const { q, rows, canEdit } = loaderData;
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: CustomerSchema }),
    shouldRevalidate: "onBlur",
  });
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <PageHeader title="Customers" lead="Search by name, phone, e-mail or a bike's VIN." />
      <Form method="get" role="search" className="mt-4 flex flex-wrap items-end gap-2">
        <div className="min-w-0 flex-1 sm:max-w-md">
          <label htmlFor="q" className="block text-sm font-semibold text-graphite">
            Search
          </label>
          <input
            id="q"
            name="q"
            type="search"
            defaultValue={q}
            className="mt-1 block w-full rounded border border-steel-300 bg-white px-3 py-2"
          />
        </div>
        <button
          type="submit"
          className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink"
        >
          Search
        </button>
      </Form>
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
        <section aria-label="Customers found">
          {rows.length === 0 ? (
            <p className="text-steel-700">No customer matches “{q}”.</p>
          ) : (
            <ul className="divide-y divide-steel-100 rounded border border-steel-200 bg-white">
              {rows.map((c) => (
                <li key={c.id} className="px-4 py-3">
                  <Link
                    to={`/customers/${c.id}`}
                    className="font-semibold text-teal-text underline"
                  >
                    {c.name}
                  </Link>
                  <p className="text-sm text-steel-700">
                    {[c.email, c.phone, c.city].filter(Boolean).join(" · ")}
                  </p>
                  {c.bikes ? <p className="text-sm">{c.bikes}</p> : null}
                </li>
              ))}
            </ul>
          )}
        </section>
        {canEdit ? (
          <section aria-labelledby="new-customer">
            <h2 id="new-customer" className="text-lg font-semibold text-ink">
              New customer
            </h2>
            <Form
              method="post"
              {...getFormProps(form)}
              className="mt-2 space-y-3 rounded border border-steel-200 bg-white p-4"
            >
              <TextField label="Name" field={fields.name} />
              <TextField label="E-mail" field={fields.email} type="email" />
              <TextField label="Phone" field={fields.phone} />
              <TextField label="City" field={fields.city} />
              <TextAreaField label="Notes" field={fields.notes} rows={2} />
              <SubmitButton>Add the customer</SubmitButton>
            </Form>
          </section>
        ) : null}
      </div>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Customers · Torquewright" }];
}
