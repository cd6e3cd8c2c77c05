import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useActionData, useNavigation } from "react-router";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextAreaField, TextField } from "~/components/ui/field";
import type { RuleActionData } from "~/lib/fit-rules/actions.server";
import { PreviewPanel } from "./preview-panel";
import { pairSchema } from "./schema";

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
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-3 rounded border border-steel-200 bg-white p-4"
    >
      <h2 className="text-lg font-semibold text-ink">Quick rule: these two do not go together</h2>
      <p className="text-sm text-steel-700">
        Enter two part numbers or tags. The rule is a conflict written as{" "}
        <code className="font-mono">has("A") and has("B")</code>.
      </p>
      <FormAlert
        id={form.errorId}
        errors={formErrorsOf(form, navigation.state === "idle" ? mine?.result : undefined)}
      />
      <TextField field={fields.name} label="Name" />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField field={fields.a} label="Part number or tag A" mono />
        <TextField field={fields.b} label="Part number or tag B" mono />
      </div>
      <TextAreaField field={fields.message} label="Message for the staff" rows={2} />
      <div className="flex flex-wrap gap-3">
        <SubmitButton look="secondary" name="intent" value="pair-preview" busy={busy}>
          Preview
        </SubmitButton>
        <SubmitButton name="intent" value="pair-save" busy={busy}>
          Save conflict rule
        </SubmitButton>
      </div>
      {mine?.preview && navigation.state === "idle" ? (
        <PreviewPanel preview={mine.preview} />
      ) : null}
    </Form>
  );
}
