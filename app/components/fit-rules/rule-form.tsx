import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { Form, useActionData, useNavigation } from "react-router";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { CheckboxField, SelectField, TextAreaField, TextField } from "~/components/ui/field";
import type { RuleActionData } from "~/lib/fit-rules/actions.server";
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

const KIND_OPTIONS = RULE_KINDS.map((k) => ({
  value: k,
  label:
    k === "conflict"
      ? "Conflict — these parts must not go together"
      : k === "upgrade"
        ? "Upgrade — a part must be upgraded"
        : "Caution — tell the staff",
}));

export function RuleForm({
  defaults,
  categories,
  parts,
  editing,
}: {
  defaults: RuleDefaults;
  categories: Option[];
  parts: Option[];
  editing: boolean;
}) {
  const actionData = useActionData<RuleActionData>();
  const navigation = useNavigation();
  const mine = actionData?.form === "rule" ? actionData : undefined;
  const [form, fields] = useForm({
    id: "rule",
    lastResult: navigation.state === "idle" ? mine?.result : undefined,
    defaultValue: {
      ...defaults,
      active: defaults.active ? "on" : undefined,
      version: defaults.version ? String(defaults.version) : undefined,
    },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ruleSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const [kind, setKind] = useState(defaults.kind);
  const [category, setCategory] = useState(defaults.upgrade_category);
  const busy = navigation.state === "submitting";
  return (
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-4 rounded border border-steel-200 bg-white p-4"
    >
      <FormAlert
        id={form.errorId}
        errors={formErrorsOf(form, navigation.state === "idle" ? mine?.result : undefined)}
      />
      {defaults.version ? <input type="hidden" name="version" value={defaults.version} /> : null}
      <TextField field={fields.name} label="Name" />
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField field={fields.kind} label="Kind" options={KIND_OPTIONS} onChange={setKind} />
        <CheckboxField
          field={fields.active}
          label="Active (checked on every package)"
          className="self-end pb-2"
        />
      </div>
      <TextAreaField
        field={fields.condition}
        label="Condition"
        mono
        hint={
          'For example: power_hp > 145 and has("stock-axle-adjusters"). Every name and function you can use is listed under “What a condition can use” on this page.'
        }
      />
      <TextAreaField
        field={fields.message}
        label="Message for the staff"
        hint="What the builder and service writer read when the rule flags a package."
      />
      {kind === "upgrade" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            field={fields.upgrade_category}
            label="Category to upgrade"
            placeholder="Choose…"
            options={categories}
            onChange={setCategory}
          />
          <SelectField
            field={fields.suggested_part_id}
            label="Part that solves it (optional)"
            placeholder="None"
            options={parts.filter((p) => !category || p.category === category)}
          />
        </div>
      ) : null}
      {editing ? (
        <TextField field={fields.change_note} label="What changed and why (kept in the history)" />
      ) : null}
      <div className="flex flex-wrap gap-3">
        <SubmitButton look="secondary" name="intent" value="preview" busy={busy}>
          Preview on saved packages
        </SubmitButton>
        <SubmitButton name="intent" value="save" busy={busy}>
          {editing ? "Save a new version" : "Save rule"}
        </SubmitButton>
      </div>
      {mine?.preview && navigation.state === "idle" ? (
        <PreviewPanel preview={mine.preview} />
      ) : null}
    </Form>
  );
}
