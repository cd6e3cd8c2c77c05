// The owner's engine-family form: the figures of the engine as delivered and the stock
// catalog part of each bench slot.
import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form } from "react-router";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { FamilySchema } from "~/lib/engine-families/family";
import { SLOTS } from "~/lib/packages/slots";

export type PartOption = { value: string; label: string; category: string };

export function FamilyForm({
  defaults,
  parts,
  lastResult,
  busy,
  submitLabel,
}: {
  defaults?: Record<string, string>;
  parts: PartOption[];
  lastResult?: SubmissionResult<string[]> | null;
  busy: boolean;
  submitLabel: string;
}) {
  const [form, fields] = useForm({
    lastResult,
    defaultValue: defaults,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: FamilySchema }),
    shouldRevalidate: "onBlur",
  });
  const f = fields as unknown as Record<string, Parameters<typeof TextField>[0]["field"]>;
  return (
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-5 rounded border border-steel-200 bg-white p-4"
    >
      <input type="hidden" name="intent" value="save" />
      <FormAlert id={form.errorId} errors={formErrorsOf(form, lastResult ?? undefined)} />
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField label="Name (the shop's words)" field={fields.name} />
        <TextField label="First model year" field={fields.yearFrom} type="number" step="1" />
        <TextField
          label="Last model year"
          field={fields.yearTo}
          type="number"
          step="1"
          hint="Empty while still built."
        />
        <TextField label="Stock bore (mm)" field={fields.boreMm} type="number" step="0.01" />
        <TextField label="Stock stroke (mm)" field={fields.strokeMm} type="number" step="0.01" />
        <TextField label="Displacement (cc)" field={fields.displacementCc} type="number" step="1" />
        <TextField
          label="Case deck height (mm)"
          field={fields.deckHeightMm}
          type="number"
          step="0.01"
        />
        <TextField
          label="Stock rev limit (rpm)"
          field={fields.revLimitRpm}
          type="number"
          step="1"
        />
      </div>
      <fieldset>
        <legend className="font-semibold text-ink">Stock parts, slot by slot</legend>
        <div className="mt-2 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {SLOTS.map((s) => (
            <SelectField
              key={s.key}
              label={s.label}
              field={f[`stock_${s.key}`]!}
              options={parts.filter((p) => p.category === s.category)}
              placeholder="— none on file —"
            />
          ))}
        </div>
      </fieldset>
      <TextAreaField label="Notes" field={fields.notes} rows={2} />
      <SubmitButton busy={busy}>{submitLabel}</SubmitButton>
    </Form>
  );
}
