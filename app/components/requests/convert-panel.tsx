// Convert a request: link to a matched customer (or create one, on purpose), pick or add
// the bike, match each of the rider's lines to a catalog part or a category, and pick
// the builder who drafts the package.
import { getFormProps, getInputProps, getSelectProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import type { SubmissionResult } from "@conform-to/react";
import { Form } from "react-router";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { controlClass, FieldErrors, SelectField, TextField } from "~/components/ui/field";
import { ConvertSchema } from "~/lib/requests/convert-form";

export type Match = {
  id: number;
  name: string;
  email: string | null;
  phone: string | null;
  city: string | null;
  by: "email" | "phone";
  bikes: { id: number; label: string; vin: string | null }[];
};

export type ConvertData = {
  matches: Match[];
  builders: { id: number; name: string; role: string }[];
  families: { value: string; label: string }[];
  parts: { id: number; label: string; category: string }[];
  categories: { value: string; label: string }[];
  lines: string[];
  defaultName: string;
  familyId: number | null;
};

export function ConvertPanel({
  data,
  lastResult,
  busy,
}: {
  data: ConvertData;
  lastResult?: SubmissionResult<string[]> | null;
  busy: boolean;
}) {
  const [form, fields] = useForm({
    lastResult,
    defaultValue: {
      intent: "convert",
      customer: data.matches.length ? String(data.matches[0]!.id) : "new",
      bike: "new",
      engineFamilyId: data.familyId ? String(data.familyId) : "",
      packageName: data.defaultName,
      parts: data.lines.map((l) => ({ include: "on", description: l, partId: "", category: "" })),
    },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ConvertSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onBlur",
  });
  const customer = String(fields.customer.value ?? "new");
  const linked = data.matches.find((m) => String(m.id) === customer);
  const lines = fields.parts.getFieldList();
  return (
    <Form method="post" {...getFormProps(form)} className="space-y-5">
      <input type="hidden" name="intent" value="convert" />
      <FormAlert id={form.errorId} errors={formErrorsOf(form, lastResult ?? undefined)} />
      <fieldset>
        <legend className="font-semibold text-ink">Customer</legend>
        {data.matches.length ? (
          <p className="mt-1 text-sm text-amber-text">
            On file with the same {data.matches[0]!.by === "email" ? "e-mail" : "phone"}: check it
            is the same person before linking.
          </p>
        ) : (
          <p className="mt-1 text-sm text-steel-700">
            No customer on file has this e-mail or phone.
          </p>
        )}
        <div className="mt-2 space-y-2">
          {data.matches.map((m) => (
            <label key={m.id} className="flex items-start gap-2">
              <input
                type="radio"
                name={fields.customer.name}
                value={String(m.id)}
                defaultChecked={customer === String(m.id)}
                className="mt-1 h-5 w-5 accent-teal"
              />
              <span>
                Link to <strong>{m.name}</strong> (#{m.id}) — {m.email ?? "no e-mail"},{" "}
                {m.phone ?? "no phone"}
                {m.city ? `, ${m.city}` : ""}; {m.bikes.length} bike(s)
              </span>
            </label>
          ))}
          <label className="flex items-center gap-2">
            <input
              type="radio"
              name={fields.customer.name}
              value="new"
              defaultChecked={customer === "new"}
              className="h-5 w-5 accent-teal"
            />
            Create a new customer from the request
          </label>
        </div>
        <FieldErrors id={fields.customer.errorId} errors={fields.customer.errors} />
        {data.matches.length ? (
          <div className="mt-2">
            <label className="flex items-center gap-2 text-sm">
              <input
                {...getInputProps(fields.confirmNew, { type: "checkbox" })}
                className="h-5 w-5 accent-teal"
              />
              Yes, create a second customer although one matches
            </label>
            <FieldErrors id={fields.confirmNew.errorId} errors={fields.confirmNew.errors} />
          </div>
        ) : null}
      </fieldset>
      <fieldset>
        <legend className="font-semibold text-ink">Bike</legend>
        <div className="mt-2 space-y-2">
          {(linked?.bikes ?? []).map((b) => (
            <label key={b.id} className="flex items-center gap-2">
              <input
                type="radio"
                name={fields.bike.name}
                value={String(b.id)}
                defaultChecked={String(fields.bike.initialValue) === String(b.id)}
                className="h-5 w-5 accent-teal"
              />
              {b.label}
              {b.vin ? <span className="font-mono text-sm">{b.vin}</span> : null}
            </label>
          ))}
          <label className="flex items-center gap-2">
            <input
              type="radio"
              name={fields.bike.name}
              value="new"
              defaultChecked={String(fields.bike.initialValue ?? "new") === "new"}
              className="h-5 w-5 accent-teal"
            />
            A new bike from the request
          </label>
        </div>
        <FieldErrors id={fields.bike.errorId} errors={fields.bike.errors} />
        <div className="mt-3 grid gap-3 sm:grid-cols-2">
          <TextField label="VIN (new bike, if known)" field={fields.vin} mono />
          <SelectField
            label="Engine family"
            field={fields.engineFamilyId}
            options={data.families}
            placeholder="Not known yet"
          />
        </div>
      </fieldset>
      <fieldset>
        <legend className="font-semibold text-ink">What the rider says is on it</legend>
        {lines.length === 0 ? (
          <p className="mt-1 text-sm text-steel-700">The rider listed nothing.</p>
        ) : (
          <ul className="mt-2 space-y-3">
            {lines.map((line, i) => {
              const f = line.getFieldset();
              return (
                <li key={line.key} className="rounded border border-steel-200 p-3">
                  <label className="flex items-center gap-2 font-medium">
                    <input
                      {...getInputProps(f.include, { type: "checkbox" })}
                      className="h-5 w-5 accent-teal"
                    />
                    Record as installed
                  </label>
                  <div className="mt-2 grid gap-3 md:grid-cols-3">
                    <TextField label={`Part ${i + 1}`} field={f.description} />
                    <div>
                      <label htmlFor={f.partId.id} className="block text-sm font-semibold">
                        Catalog part
                      </label>
                      <select
                        {...getSelectProps(f.partId)}
                        className={controlClass(f.partId.errors)}
                      >
                        <option value="">— free text —</option>
                        {data.parts.map((p) => (
                          <option key={p.id} value={p.id}>
                            {p.label}
                          </option>
                        ))}
                      </select>
                      <FieldErrors id={f.partId.errorId} errors={f.partId.errors} />
                    </div>
                    <SelectField
                      label="Category (free text)"
                      field={f.category}
                      options={data.categories}
                      placeholder="Pick one"
                    />
                  </div>
                </li>
              );
            })}
          </ul>
        )}
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-2">
        <legend className="font-semibold text-ink">Draft package</legend>
        <TextField label="Package name" field={fields.packageName} />
        <SelectField
          label="Builder"
          field={fields.builderId}
          options={data.builders.map((b) => ({
            value: String(b.id),
            label: `${b.name}${b.role === "owner" ? " (owner)" : ""}`,
          }))}
          placeholder="Pick the builder"
        />
      </fieldset>
      <SubmitButton busy={busy}>Convert and open a draft package</SubmitButton>
    </Form>
  );
}
