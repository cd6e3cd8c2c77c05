// One installed part's form (add, or edit an existing one): a catalog part, or free
// text with a category; the date it was fitted and the mileage then.
import { getFormProps, getSelectProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form } from "react-router";
import { z } from "zod";
import { SubmitButton } from "~/components/ui/button";
import { controlClass, FieldErrors, SelectField, TextField } from "~/components/ui/field";
import { BikePartSchema } from "~/lib/customers/forms";

export const PartFormSchema = z.intersection(
  BikePartSchema,
  z.object({
    intent: z.enum(["add-part", "edit-part"]),
    partRowId: z.preprocess(
      (v) => (v === "" ? undefined : v),
      z.coerce.number().int().positive().optional(),
    ),
  }),
);

export type PartChoice = { id: number; label: string; category: string };

export function InstalledPartForm({
  id,
  intent,
  partRowId,
  defaults,
  parts,
  categories,
  lastResult,
  busy,
  submitLabel,
}: {
  id: string;
  intent: "add-part" | "edit-part";
  partRowId?: number;
  defaults?: Record<string, string>;
  parts: PartChoice[];
  categories: { value: string; label: string }[];
  lastResult?: SubmissionResult<string[]> | null;
  busy: boolean;
  submitLabel: string;
}) {
  const [form, fields] = useForm({
    id,
    lastResult,
    defaultValue: defaults,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: PartFormSchema }),
    shouldRevalidate: "onBlur",
  });
  return (
    <Form method="post" {...getFormProps(form)} className="grid gap-3 md:grid-cols-2">
      <input type="hidden" name="intent" value={intent} />
      {partRowId ? <input type="hidden" name="partRowId" value={partRowId} /> : null}
      <div>
        <label htmlFor={fields.partId.id} className="block text-sm font-semibold text-graphite">
          Catalog part
        </label>
        <select {...getSelectProps(fields.partId)} className={controlClass(fields.partId.errors)}>
          <option value="">— free text —</option>
          {parts.map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}
            </option>
          ))}
        </select>
        <FieldErrors id={fields.partId.errorId} errors={fields.partId.errors} />
      </div>
      <SelectField
        label="Category (free text)"
        field={fields.category}
        options={categories}
        placeholder="Pick one"
      />
      <TextField
        label="Description"
        field={fields.description}
        hint="The rider's or the shop's words; a catalog part's name when empty."
      />
      <TextField label="Fitted on (YYYY-MM-DD)" field={fields.fittedOn} />
      <TextField label="Mileage when fitted" field={fields.fittedMileage} type="number" step="1" />
      <TextField label="Notes" field={fields.notes} />
      <div>
        <SubmitButton busy={busy}>{submitLabel}</SubmitButton>
      </div>
    </Form>
  );
}
