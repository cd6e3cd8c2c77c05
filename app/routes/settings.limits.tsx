import { readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/settings.limits";
import { FormAlert, formErrorsOf, Notice } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { SelectField, TextField } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import {
  BASIS_LABELS,
  DEFAULT_LIMITS,
  GRADE_SLOTS,
  type GradeSlot,
  LIMIT_DEFS,
  type LimitDef,
  type ShopLimits,
} from "~/lib/settings/limits";
import { LimitsSchema } from "~/lib/settings/limits-schema";
import {
  listLimitChanges,
  listLimitStates,
  saveShopLimits,
  type LimitState,
} from "~/lib/settings/limits.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "limits:edit");
  const db = getDb();
  const [states, changes] = await Promise.all([listLimitStates(db), listLimitChanges(db)]);
  return { states, changes };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const me = await requirePermission(request, "limits:edit");
  const submission = parseWithZod(form, { schema: LimitsSchema });
  if (submission.status !== "success")
    return data({ result: submission.reply(), done: null }, { status: 400 });
  const changed = await saveShopLimits(getDb(), submission.value as unknown as ShopLimits, me.id);
  return {
    result: submission.reply(),
    done:
      changed.length === 0
        ? "Nothing changed."
        : `Saved ${changed.length} ${changed.length === 1 ? "limit" : "limits"}. The bench uses them from its next figure.`,
  };
}

const dateFmt = new Intl.DateTimeFormat("en-US", {
  dateStyle: "medium",
  timeStyle: "short",
  timeZone: "UTC",
});

const GROUPS: LimitDef["group"][] = [
  "Piston speed",
  "Compression and fuel",
  "Chamber and rod",
  "Valvetrain",
  "Power",
];

function unitText(d: LimitDef): string {
  return d.unit === "" ? "" : d.unit === ":1" || d.unit === "°" ? d.unit : ` ${d.unit}`;
}

export default function CautionLimits({ loaderData, actionData }: Route.ComponentProps) {
  const { states, changes } = loaderData;
  const navigation = useNavigation();
  const byKey = new Map(states.map((s) => [s.key, s]));
  const values = Object.fromEntries(states.map((s) => [s.key, String(s.value)]));
  const [form, fields] = useForm({
    id: "caution-limits",
    lastResult: navigation.state === "idle" ? actionData?.result : undefined,
    defaultValue: values,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: LimitsSchema }),
    shouldRevalidate: "onBlur",
  });
  const gradeOptions = GRADE_SLOTS.map((g, i) => ({
    value: g,
    label: String(fields[`${g}Name`]?.value ?? values[`${g}Name`] ?? `grade ${i + 1}`),
  }));
  const basisOptions = (["seat", "checking"] as const).map((b) => ({
    value: b,
    label: BASIS_LABELS[b],
  }));

  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <PageHeader
        back={{ to: "/settings", label: "Shop settings" }}
        title="Caution limits"
        lead="The limits the spec bench checks every package against. A caution names the limit it crossed and by how much. These are planning limits: the parts makers' ratings and instructions come first."
      />
      <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_22rem]">
        <Form method="post" {...getFormProps(form)} className="space-y-6">
          {actionData?.done && navigation.state === "idle" ? (
            <Notice>{actionData.done}</Notice>
          ) : null}
          <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
          {GROUPS.map((g) => (
            <fieldset key={g} className="rounded border border-steel-200 bg-white p-4">
              <legend className="px-1 text-lg font-semibold text-ink">{g}</legend>
              <div className="grid gap-4 md:grid-cols-2">
                {LIMIT_DEFS.filter((d) => d.group === g).map((d) => {
                  const field = fields[d.key];
                  const hint = <LimitHint def={d} state={byKey.get(d.key)} />;
                  const label = `${d.label}${d.unit && d.unit !== ":1" ? ` (${d.unit})` : ""}`;
                  if (d.kind === "grade")
                    return (
                      <SelectField
                        key={d.key}
                        field={field as never}
                        label={label}
                        hint={hint}
                        options={gradeOptions}
                      />
                    );
                  if (d.kind === "basis")
                    return (
                      <SelectField
                        key={d.key}
                        field={field as never}
                        label={label}
                        hint={hint}
                        options={basisOptions}
                      />
                    );
                  return (
                    <TextField
                      key={d.key}
                      field={field as never}
                      label={label}
                      hint={hint}
                      type={d.kind === "number" ? "number" : "text"}
                      step="any"
                    />
                  );
                })}
              </div>
            </fieldset>
          ))}
          <SubmitButton busy={navigation.state !== "idle"}>Save limits</SubmitButton>
        </Form>
        <aside aria-labelledby="changes-h">
          <h2 id="changes-h" className="text-lg font-semibold text-ink">
            Changes
          </h2>
          {changes.length === 0 ? (
            <p className="mt-2 text-sm text-steel-700">
              Every limit still has its default. Changes appear here with who made them.
            </p>
          ) : (
            <ul className="mt-2 space-y-2">
              {changes.map((c) => (
                <li key={c.id} className="rounded border border-steel-200 bg-white p-3 text-sm">
                  <p className="font-medium text-ink">{c.label}</p>
                  <p className="num text-steel-700">
                    {c.oldValue ?? "—"} → {c.newValue}
                  </p>
                  <p className="text-steel-700">
                    {c.changedBy ?? "a former account"} ·{" "}
                    <span className="num">{dateFmt.format(new Date(c.changedAt))} UTC</span>
                  </p>
                </li>
              ))}
            </ul>
          )}
        </aside>
      </div>
    </main>
  );
}

function LimitHint({ def, state }: { def: LimitDef; state: LimitState | undefined }) {
  const shown =
    def.kind === "grade"
      ? `fuel grade ${GRADE_SLOTS.indexOf(def.default as never) + 1} (${DEFAULT_LIMITS[`${def.default as GradeSlot}Name`]})`
      : def.kind === "basis"
        ? BASIS_LABELS[def.default as "seat" | "checking"].toLowerCase()
        : `${def.default}${unitText(def)}`;
  return (
    <>
      Default {shown} — {def.source}.{" "}
      {state?.changed && state.updatedAt ? (
        <span className="font-medium text-graphite">
          Set by {state.updatedBy ?? "a former account"} on{" "}
          <span className="num">{dateFmt.format(new Date(state.updatedAt))} UTC</span>.
        </span>
      ) : (
        <span>Not changed.</span>
      )}
    </>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Caution limits · Torquewright" }];
}
