import { readForm } from "~/lib/http/body";
import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/settings";
import { SettingsNav } from "~/components/settings/settings-nav";
import { FormAlert, formErrorsOf, Notice } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { Field, SelectField, TextField } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { When } from "~/components/ui/when";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import {
  settingsFormValues,
  ShopSettingsSchema,
  timeZoneOptions,
} from "~/lib/settings/shop-settings";
import {
  getShopSettings,
  listSettingChanges,
  saveShopSettings,
} from "~/lib/settings/shop-settings.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "rates:edit");
  const db = getDb();
  const [settings, changes] = await Promise.all([getShopSettings(db), listSettingChanges(db)]);
  return { values: settings ? settingsFormValues(settings) : null, changes };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const me = await requirePermission(request, "rates:edit");
  const submission = parseWithZod(form, { schema: ShopSettingsSchema });
  if (submission.status !== "success")
    return data({ result: submission.reply(), saved: null }, { status: 400 });
  const n = await saveShopSettings(getDb(), submission.value, me.id);
  return {
    result: submission.reply(),
    saved: n === 0 ? "Nothing changed." : `Saved: ${n} setting${n === 1 ? "" : "s"} changed.`,
  };
}

const DEPOSIT_KINDS = [
  { value: "percent", label: "A percentage of the quote" },
  { value: "fixed", label: "A fixed amount" },
];

export default function Settings({ loaderData, actionData }: Route.ComponentProps) {
  const { values, changes } = loaderData;
  const busy = useNavigation().state !== "idle";
  const zones = timeZoneOptions();
  const [form, fields] = useForm({
    id: "shop-settings",
    lastResult: actionData?.result,
    defaultValue: values ?? { depositKind: "percent", timeZone: "America/Chicago" },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ShopSettingsSchema }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });
  const fixed = (fields.depositKind.value ?? values?.depositKind) === "fixed";
  return (
    <main className="mx-auto max-w-5xl px-4 py-8">
      <PageHeader
        title="Shop settings"
        lead="The shop's details on quotes and sheets, its rates, and the time its dates are shown in."
      />
      <SettingsNav />
      <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_20rem]">
        <Form method="post" {...getFormProps(form)} className="space-y-5">
          {actionData?.saved && !busy ? <Notice>{actionData.saved}</Notice> : null}
          <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
          <fieldset className="space-y-4 rounded border border-steel-200 bg-white p-4">
            <legend className="px-1 text-lg font-semibold text-ink">Shop details</legend>
            <TextField label="Shop name" field={fields.name} autoComplete="organization" />
            <TextField
              label="Address"
              hint="As it is printed on quotes and spec sheets."
              field={fields.address}
              autoComplete="street-address"
            />
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField label="Phone" field={fields.phone} autoComplete="tel" />
              <TextField label="E-mail" type="email" field={fields.email} autoComplete="email" />
            </div>
            <SelectField
              label="Time zone"
              hint="Every date and time on the screens and sheets is shown in it."
              field={fields.timeZone}
              options={zones.map((z) => ({ value: z, label: z.replace(/_/g, " ") }))}
            />
          </fieldset>
          <fieldset className="space-y-4 rounded border border-steel-200 bg-white p-4">
            <legend className="px-1 text-lg font-semibold text-ink">Rates and deposit</legend>
            <div className="grid gap-4 sm:grid-cols-2">
              <MoneyOrPercent
                field={fields.labourRate}
                label="Labour rate"
                hint="Dollars per hour of shop labour."
                before="$"
                after="per hour"
              />
              <MoneyOrPercent
                field={fields.taxRate}
                label="Tax rate"
                hint="Added to taxable lines of a quote."
                after="%"
              />
            </div>
            <div className="grid gap-4 sm:grid-cols-2">
              <SelectField
                label="Deposit set as"
                field={fields.depositKind}
                options={DEPOSIT_KINDS}
              />
              <MoneyOrPercent
                field={fields.depositValue}
                label="Deposit default"
                hint={
                  fixed ? "Dollars asked on approval." : "Share of the quote asked on approval."
                }
                before={fixed ? "$" : undefined}
                after={fixed ? undefined : "% of the quote"}
              />
            </div>
          </fieldset>
          <SubmitButton busy={busy}>Save settings</SubmitButton>
        </Form>
        <section aria-labelledby="changes-h">
          <h2 id="changes-h" className="text-lg font-semibold text-ink">
            Changes
          </h2>
          {changes.length === 0 ? (
            <p className="mt-2 text-sm text-steel-700">No setting has been changed here yet.</p>
          ) : (
            <ul className="mt-2 space-y-2" data-testid="settings-changes">
              {changes.map((c) => (
                <li key={c.id} className="rounded border border-steel-200 bg-white p-2 text-sm">
                  <p className="font-semibold text-ink">{c.label}</p>
                  <p className="text-graphite">
                    {c.before} → <span className="font-semibold">{c.after}</span>
                  </p>
                  <p className="text-xs text-steel-700">
                    {c.changedBy ?? "A former account"} · <When at={c.changedAt} time />
                  </p>
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>
    </main>
  );
}

function MoneyOrPercent({
  field,
  label,
  hint,
  before,
  after,
}: {
  field: Parameters<typeof getInputProps>[0];
  label: string;
  hint: string;
  before?: string;
  after?: string;
}) {
  const props = getInputProps(field, { type: "text", ariaDescribedBy: `${field.id}-hint` });
  return (
    <Field id={field.id} label={label} hint={hint} errorId={field.errorId} errors={field.errors}>
      <div className="mt-1 flex items-center gap-2">
        {before ? <span className="text-steel-700">{before}</span> : null}
        <input
          {...props}
          key={props.key}
          inputMode="decimal"
          className={`num block w-full rounded border bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-teal ${field.errors ? "border-red" : "border-steel-300"}`}
        />
        {after ? <span className="shrink-0 text-sm text-steel-700">{after}</span> : null}
      </div>
    </Field>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Shop settings · Torquewright" }];
}
