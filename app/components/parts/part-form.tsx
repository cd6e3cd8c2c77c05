import { getFormProps, getInputProps, getSelectProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { Form, useActionData, useNavigation } from "react-router";
import type { SubmissionResult } from "@conform-to/react";
import { FieldErrors, FormAlert } from "~/components/auth-form";
import { attributeFieldsFor, partSchemaFor, unitText } from "~/lib/part-attributes";

export type PartDefaults = {
  part_number: string;
  category: string;
  maker: string;
  name: string;
  price: string;
  labour_hours: string;
  tags: string;
  stock: boolean;
  notes: string;
  attributes: Record<string, string>;
  version?: number;
};

const input = "mt-1 block w-full rounded border bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-teal";
const border = (f: { errors?: unknown }) => (f.errors ? "border-red" : "border-steel-300");

function Text({ field, label, hint, type = "text", mono, step }: { field: any; label: string; hint?: string; type?: "text" | "number"; mono?: boolean; step?: string }) {
  const hintId = hint ? `${field.id}-hint` : undefined;
  const props = getInputProps(field, { type, ariaDescribedBy: hintId });
  return (
    <div>
      <label htmlFor={field.id} className="block text-sm font-semibold text-graphite">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="mt-0.5 text-xs text-steel-700">
          {hint}
        </p>
      ) : null}
      <input {...props} key={props.key} step={step} inputMode={type === "number" ? "decimal" : undefined} className={`${input} ${mono ? "font-mono" : ""} ${type === "number" ? "num" : ""} ${border(field)}`} />
      <FieldErrors id={field.errorId} errors={field.errors} />
    </div>
  );
}

export function PartForm({ defaults, categories, editing }: { defaults: PartDefaults; categories: { value: string; label: string }[]; editing: boolean }) {
  const actionData = useActionData<{ result?: SubmissionResult<string[]> }>();
  const navigation = useNavigation();
  const slugs = categories.map((c) => c.value);
  const [category, setCategory] = useState(defaults.category);
  const [form, fields] = useForm({
    id: "part",
    lastResult: navigation.state === "idle" ? actionData?.result : undefined,
    defaultValue: { ...defaults, stock: defaults.stock ? "on" : undefined } as never,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: partSchemaFor(String(formData.get("category") ?? ""), slugs) }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const attrs = (fields.attributes as unknown as { getFieldset: () => Record<string, any> }).getFieldset();
  const attrFields = attributeFieldsFor(category);
  const busy = navigation.state === "submitting";
  return (
    <Form method="post" {...getFormProps(form)} className="space-y-4 rounded border border-steel-200 bg-white p-4">
      <FormAlert id={form.errorId} errors={form.errors} />
      <input type="hidden" name="intent" value="save" />
      {defaults.version ? <input type="hidden" name="version" value={defaults.version} /> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <Text field={fields.part_number} label="Part number" mono hint="The shop's own number, e.g. TW-CYL-1048" />
        <div>
          <label htmlFor={fields.category.id} className="block text-sm font-semibold text-graphite">
            Category
          </label>
          <select {...getSelectProps(fields.category)} key={fields.category.key} onChange={(e) => setCategory(e.target.value)} className={`${input} ${border(fields.category)}`}>
            <option value="">Choose…</option>
            {categories.map((c) => (
              <option key={c.value} value={c.value}>
                {c.label}
              </option>
            ))}
          </select>
          <FieldErrors id={fields.category.errorId} errors={fields.category.errors} />
        </div>
        <Text field={fields.maker} label="Maker" />
        <Text field={fields.name} label="Name" />
        <Text field={fields.price} label="Price ($)" type="number" step="0.01" />
        <Text field={fields.labour_hours} label="Labour (hours)" type="number" step="0.1" />
      </div>
      <Text field={fields.tags} label="Tags" mono hint="Words the fit rules test, separated by commas or spaces: stock-axle-adjusters, gear-drive-cam" />
      <div className="flex items-center gap-2">
        <input {...getInputProps(fields.stock, { type: "checkbox" })} key={fields.stock.key} className="h-5 w-5 accent-teal" />
        <label htmlFor={fields.stock.id} className="font-semibold text-graphite">
          Stock part (what a bike comes with)
        </label>
      </div>
      {attrFields.length ? (
        <fieldset className="rounded border border-steel-200 p-3">
          <legend className="px-1 text-sm font-semibold text-ink">Measurements for this category</legend>
          <div className="grid gap-4 sm:grid-cols-2">
            {attrFields.map((f) => (
              <Text key={`${category}-${f.key}`} field={attrs[f.key]} type="number" step="any" label={`${f.label} (${unitText(f.unit)})${f.required ? "" : " — optional"}`} hint={f.hint ?? `${f.min} to ${f.max} ${unitText(f.unit)}`} />
            ))}
          </div>
        </fieldset>
      ) : category ? (
        <p className="text-sm text-steel-700">This category has no measurements to record.</p>
      ) : null}
      <div>
        <label htmlFor={fields.notes.id} className="block text-sm font-semibold text-graphite">
          Notes
        </label>
        <textarea {...getTextareaProps(fields.notes)} key={fields.notes.key} rows={2} className={`${input} ${border(fields.notes)}`} />
        <FieldErrors id={fields.notes.errorId} errors={fields.notes.errors} />
      </div>
      <button type="submit" disabled={busy} className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink disabled:opacity-60">
        {editing ? "Save a new version" : "Add to the shelf"}
      </button>
    </Form>
  );
}
