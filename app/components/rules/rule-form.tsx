import { getFormProps, getInputProps, getSelectProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { Form, useActionData, useNavigation } from "react-router";
import { FieldErrors, FormAlert } from "~/components/auth-form";
import type { RuleActionData } from "~/lib/rule-actions.server";
import { RULE_KINDS } from "../../../db/schema/catalog";
import { PreviewPanel } from "./preview-panel";
import { ruleSchema } from "./schema";

export type RuleDefaults = {
  name: string;
  kind: string;
  condition: string;
  message: string;
  upgrade_category: string;
  suggested_part_id: string;
  active: boolean;
  version?: number;
};

type Option = { value: string; label: string; category?: string };

const input = "mt-1 block w-full rounded border bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-teal";

function Label({ field, children, hint }: { field: { id: string }; children: React.ReactNode; hint?: string }) {
  return (
    <>
      <label htmlFor={field.id} className="block text-sm font-semibold text-graphite">
        {children}
      </label>
      {hint ? (
        <p id={`${field.id}-hint`} className="mt-0.5 text-sm text-steel-700">
          {hint}
        </p>
      ) : null}
    </>
  );
}

function border(f: { errors?: unknown }) {
  return f.errors ? "border-red" : "border-steel-300";
}

export function RuleForm({ defaults, categories, parts, editing }: { defaults: RuleDefaults; categories: Option[]; parts: Option[]; editing: boolean }) {
  const actionData = useActionData<RuleActionData>();
  const navigation = useNavigation();
  const mine = actionData?.form === "rule" ? actionData : undefined;
  const [form, fields] = useForm({
    id: "rule",
    lastResult: navigation.state === "idle" ? mine?.result : undefined,
    defaultValue: { ...defaults, active: defaults.active ? "on" : undefined, version: defaults.version ? String(defaults.version) : undefined },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ruleSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const [kind, setKind] = useState(defaults.kind);
  const [category, setCategory] = useState(defaults.upgrade_category);
  const busy = navigation.state === "submitting";
  const conditionProps = getTextareaProps(fields.condition, { ariaDescribedBy: `${fields.condition.id}-hint` });
  return (
    <Form method="post" {...getFormProps(form)} className="space-y-4 rounded border border-steel-200 bg-white p-4">
      <FormAlert id={form.errorId} errors={form.errors} />
      {defaults.version ? <input type="hidden" name="version" value={defaults.version} /> : null}
      <div>
        <Label field={fields.name}>Name</Label>
        <input {...getInputProps(fields.name, { type: "text" })} key={fields.name.key} className={`${input} ${border(fields.name)}`} />
        <FieldErrors id={fields.name.errorId} errors={fields.name.errors} />
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <div>
          <Label field={fields.kind}>Kind</Label>
          <select {...getSelectProps(fields.kind)} key={fields.kind.key} onChange={(e) => setKind(e.target.value)} className={`${input} ${border(fields.kind)}`}>
            {RULE_KINDS.map((k) => (
              <option key={k} value={k}>
                {k === "conflict" ? "Conflict — these parts must not go together" : k === "upgrade" ? "Upgrade — a part must be upgraded" : "Caution — tell the staff"}
              </option>
            ))}
          </select>
          <FieldErrors id={fields.kind.errorId} errors={fields.kind.errors} />
        </div>
        <div className="flex items-end gap-2 pb-2">
          <input {...getInputProps(fields.active, { type: "checkbox" })} key={fields.active.key} className="h-5 w-5 accent-teal" />
          <label htmlFor={fields.active.id} className="font-semibold text-graphite">
            Active (checked on every package)
          </label>
        </div>
      </div>
      <div>
        <Label field={fields.condition} hint={'For example: power_hp > 145 and has("stock-axle-adjusters"). The names you can use are listed beside this form.'}>
          Condition
        </Label>
        <textarea {...conditionProps} key={fields.condition.key} rows={3} spellCheck={false} className={`${input} font-mono text-sm ${border(fields.condition)}`} />
        <FieldErrors id={fields.condition.errorId} errors={fields.condition.errors} />
      </div>
      <div>
        <Label field={fields.message} hint="What the builder and service writer read when the rule flags a package.">
          Message for the staff
        </Label>
        <textarea {...getTextareaProps(fields.message, { ariaDescribedBy: `${fields.message.id}-hint` })} key={fields.message.key} rows={3} className={`${input} ${border(fields.message)}`} />
        <FieldErrors id={fields.message.errorId} errors={fields.message.errors} />
      </div>
      {kind === "upgrade" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <div>
            <Label field={fields.upgrade_category}>Category to upgrade</Label>
            <select {...getSelectProps(fields.upgrade_category)} key={fields.upgrade_category.key} onChange={(e) => setCategory(e.target.value)} className={`${input} ${border(fields.upgrade_category)}`}>
              <option value="">Choose…</option>
              {categories.map((c) => (
                <option key={c.value} value={c.value}>
                  {c.label}
                </option>
              ))}
            </select>
            <FieldErrors id={fields.upgrade_category.errorId} errors={fields.upgrade_category.errors} />
          </div>
          <div>
            <Label field={fields.suggested_part_id}>Part that solves it (optional)</Label>
            <select {...getSelectProps(fields.suggested_part_id)} key={fields.suggested_part_id.key} className={`${input} ${border(fields.suggested_part_id)}`}>
              <option value="">None</option>
              {parts
                .filter((p) => !category || p.category === category)
                .map((p) => (
                  <option key={p.value} value={p.value}>
                    {p.label}
                  </option>
                ))}
            </select>
            <FieldErrors id={fields.suggested_part_id.errorId} errors={fields.suggested_part_id.errors} />
          </div>
        </div>
      ) : null}
      {editing ? (
        <div>
          <Label field={fields.change_note}>What changed and why (kept in the history)</Label>
          <input {...getInputProps(fields.change_note, { type: "text" })} key={fields.change_note.key} className={`${input} ${border(fields.change_note)}`} />
          <FieldErrors id={fields.change_note.errorId} errors={fields.change_note.errors} />
        </div>
      ) : null}
      <div className="flex flex-wrap gap-3">
        <button type="submit" name="intent" value="preview" disabled={busy} className="rounded border border-teal-dark bg-white px-4 py-2 font-semibold text-teal-text hover:bg-steel-50 disabled:opacity-60">
          Preview on saved packages
        </button>
        <button type="submit" name="intent" value="save" disabled={busy} className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink disabled:opacity-60">
          {editing ? "Save a new version" : "Save rule"}
        </button>
      </div>
      {mine?.preview && navigation.state === "idle" ? <PreviewPanel preview={mine.preview} /> : null}
    </Form>
  );
}
