import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/reset";
import { AuthCard } from "~/components/auth-form";
import { Notice } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { getDb } from "~/lib/db.server";
import { requireSameOrigin } from "~/lib/origin.server";
import { requestPasswordReset } from "~/lib/reset.server";

const ResetRequestSchema = z.object({
  email: z.email("Enter the e-mail address of your staff account."),
  // a field people never see; a bot that fills it gets the usual answer and no mail
  website: z.string().optional(),
});

export const RESET_SENT =
  "If an active staff account uses that e-mail, a link to choose a new password is on its way. It works once, within one hour.";

export async function action({ request }: Route.ActionArgs) {
  requireSameOrigin(request);
  const submission = parseWithZod(await request.formData(), { schema: ResetRequestSchema });
  if (submission.status !== "success") return data({ result: submission.reply(), sent: false }, { status: 400 });
  if (!submission.value.website) await requestPasswordReset(getDb(), submission.value.email);
  return { result: submission.reply({ resetForm: true }), sent: true };
}

export default function ResetRequest({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ResetRequestSchema }),
    shouldRevalidate: "onInput",
  });
  return (
    <AuthCard title="Forgot your password?" lead="Enter the e-mail of your staff account; we send a link to choose a new password.">
      <Form method="post" {...getFormProps(form)} className="space-y-4">
        {actionData?.sent ? <Notice>{RESET_SENT}</Notice> : null}
        <TextField label="E-mail" field={fields.email} type="email" autoComplete="username" autoFocus />
        <div aria-hidden="true" className="absolute -left-[9999px] h-0 w-0 overflow-hidden">
          <label htmlFor="reset-website">Website</label>
          <input id="reset-website" name="website" tabIndex={-1} autoComplete="off" />
        </div>
        <SubmitButton wide busy={navigation.state !== "idle"}>Send the link</SubmitButton>
      </Form>
      <p className="mt-4 text-sm">
        <Link to="/login" className="font-medium text-teal-text underline">Back to sign-in</Link>
      </p>
    </AuthCard>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Forgot your password · Torquewright" }];
}
