import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { Form, useActionData, useNavigation } from "react-router";
import type { SubmissionResult } from "@conform-to/react";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { CheckboxField, SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { attributeFieldsFor, partSchemaFor, unitText } from "~/lib/catalog/attributes";

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

export function PartForm({
  defaults,
  categories,
  editing,
}: {
  defaults: PartDefaults;
  categories: { value: string; label: string; builtIn?: boolean }[];
  editing: boolean;
}) {
  const actionData = useActionData<{ result?: SubmissionResult<string[]> }>();
  const navigation = useNavigation();
  const slugs = categories.map((c) => c.value);
  const [category, setCategory] = useState(defaults.category);
  const [form, fields] = useForm({
    id: "part",
    lastResult: navigation.state === "idle" ? actionData?.result : undefined,
    defaultValue: { ...defaults, stock: defaults.stock ? "on" : undefined } as never,
    onValidate: ({ formData }) =>
      parseWithZod(formData, {
        schema: partSchemaFor(String(formData.get("category") ?? ""), slugs),
      }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const attrs =
    // eslint-disable-next-line @typescript-eslint/no-explicit-any -- Conform types a fieldset of unknown keys loosely
    (fields.attributes as unknown as { getFieldset: () => Record<string, any> }).getFieldset();
  const attrFields = attributeFieldsFor(category);
  const builtIn = categories.find((c) => c.value === category)?.builtIn ?? true;
  const busy = navigation.state === "submitting";
  return (
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-4 rounded border border-steel-200 bg-white p-4"
    >
      <FormAlert
        id={form.errorId}
        errors={formErrorsOf(form, navigation.state === "idle" ? actionData?.result : undefined)}
      />
      <input type="hidden" name="intent" value="save" />
      {defaults.version ? <input type="hidden" name="version" value={defaults.version} /> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          field={fields.part_number}
          label="Part number"
          mono
          hint="The shop's own number, e.g. TW-CYL-1048"
        />
        <SelectField
          field={fields.category}
          label="Category"
          placeholder="Choose…"
          options={categories}
          onChange={setCategory}
        />
        <TextField field={fields.maker} label="Maker" />
        <TextField field={fields.name} label="Name" />
        <TextField field={fields.price} label="Price ($)" type="number" step="0.01" />
        <TextField field={fields.labour_hours} label="Labour (hours)" type="number" step="0.1" />
      </div>
      <TextField
        field={fields.tags}
        label="Tags"
        mono
        hint="Words the fit rules test, separated by commas or spaces: stock-axle-adjusters, gear-drive-cam"
      />
      <CheckboxField field={fields.stock} label="Stock part (what a bike comes with)" />
      {attrFields.length ? (
        <fieldset className="rounded border border-steel-200 p-3">
          <legend className="px-1 text-sm font-semibold text-ink">
            Measurements for this category
          </legend>
          <div className="grid gap-4 sm:grid-cols-2">
            {attrFields.map((f) => (
              <TextField
                key={`${category}-${f.key}`}
                field={attrs[f.key]}
                type="number"
                step="any"
                label={`${f.label} (${unitText(f.unit)})${f.required ? "" : " — optional"}`}
                hint={f.hint ?? `${f.min} to ${f.max} ${unitText(f.unit)}`}
              />
            ))}
          </div>
        </fieldset>
      ) : category ? (
        <p className="text-sm text-steel-700">
          {builtIn
            ? "This category has no measurements to record."
            : "Categories the shop adds carry no measurements. Fit rules can still test this part by its number or tags with has( ); put anything else in the notes."}
        </p>
      ) : null}
      <TextAreaField field={fields.notes} label="Notes" rows={2} />
      <SubmitButton busy={busy}>{editing ? "Save a new version" : "Add to the shelf"}</SubmitButton>
    </Form>
  );
}
