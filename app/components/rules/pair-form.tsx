import { getFormProps, getInputProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useActionData, useNavigation } from "react-router";
import { FieldErrors, FormAlert } from "~/components/auth-form";
import type { RuleActionData } from "~/lib/rule-actions.server";
import { PreviewPanel } from "./preview-panel";
import { pairSchema } from "./schema";

const input = "mt-1 block w-full rounded border bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-teal";
const border = (f: { errors?: unknown }) => (f.errors ? "border-red" : "border-steel-300");

/** "Part or tag A does not go with part or tag B", written as has("A") and has("B"). */
export function PairForm() {
  const actionData = useActionData<RuleActionData>();
  const navigation = useNavigation();
  const mine = actionData?.form === "pair" ? actionData : undefined;
  const [form, fields] = useForm({
    id: "pair",
    lastResult: navigation.state === "idle" ? mine?.result : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: pairSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const busy = navigation.state === "submitting";
  return (
    <Form method="post" {...getFormProps(form)} className="space-y-3 rounded border border-steel-200 bg-white p-4">
      <h2 className="text-lg font-semibold text-ink">Quick rule: these two do not go together</h2>
      <p className="text-sm text-steel-700">
        Enter two part numbers or tags. The rule is a conflict written as <code className="font-mono">has("A") and has("B")</code>.
      </p>
      <FormAlert id={form.errorId} errors={form.errors} />
      <div>
        <label htmlFor={fields.name.id} className="block text-sm font-semibold text-graphite">
          Name
        </label>
        <input {...getInputProps(fields.name, { type: "text" })} key={fields.name.key} className={`${input} ${border(fields.name)}`} />
        <FieldErrors id={fields.name.errorId} errors={fields.name.errors} />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        {(["a", "b"] as const).map((k) => (
          <div key={k}>
            <label htmlFor={fields[k].id} className="block text-sm font-semibold text-graphite">
              Part number or tag {k.toUpperCase()}
            </label>
            <input {...getInputProps(fields[k], { type: "text" })} key={fields[k].key} className={`${input} font-mono ${border(fields[k])}`} />
            <FieldErrors id={fields[k].errorId} errors={fields[k].errors} />
          </div>
        ))}
      </div>
      <div>
        <label htmlFor={fields.message.id} className="block text-sm font-semibold text-graphite">
          Message for the staff
        </label>
        <textarea {...getTextareaProps(fields.message)} key={fields.message.key} rows={2} className={`${input} ${border(fields.message)}`} />
        <FieldErrors id={fields.message.errorId} errors={fields.message.errors} />
      </div>
      <div className="flex flex-wrap gap-3">
        <button type="submit" name="intent" value="pair-preview" disabled={busy} className="rounded border border-teal-dark bg-white px-4 py-2 font-semibold text-teal-text hover:bg-steel-50 disabled:opacity-60">
          Preview
        </button>
        <button type="submit" name="intent" value="pair-save" disabled={busy} className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink disabled:opacity-60">
          Save conflict rule
        </button>
      </div>
      {mine?.preview && navigation.state === "idle" ? <PreviewPanel preview={mine.preview} /> : null}
    </Form>
  );
}
