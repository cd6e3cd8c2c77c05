import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { PUBLIC_FORM, readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/reset";
import { AuthCard } from "~/components/auth/auth-form";
import { Notice } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { Honeypot } from "~/components/ui/honeypot";
import { getDb } from "~/lib/db.server";
import { honeypotRefusal, honeypotStamp } from "~/lib/auth/honeypot.server";
import { FORM_EXPIRED } from "~/lib/auth/honeypot";
import { requireSameOrigin } from "~/lib/auth/origin.server";
import { requestPasswordReset } from "~/lib/auth/reset.server";

const ResetRequestSchema = z.object({
  email: z.email("Enter the e-mail address of your staff account."),
});

export const RESET_SENT =
  "If an active staff account uses that e-mail, a link to choose a new password is on its way. It works once, within one hour.";

export async function loader(_: Route.LoaderArgs) {
  return honeypotStamp();
}

export async function action({ request }: Route.ActionArgs) {
  requireSameOrigin(request);
  const formData = await readForm(request, PUBLIC_FORM);
  const submission = parseWithZod(formData, { schema: ResetRequestSchema });
  if (submission.status !== "success")
    return data({ result: submission.reply(), sent: false }, { status: 400 });
  // a page loaded too long ago is told so; a script that trips the honeypot gets the
  // usual answer, and no mail goes out
  const refusal = honeypotRefusal(formData);
  if (refusal === FORM_EXPIRED)
    return data(
      { result: submission.reply({ formErrors: [FORM_EXPIRED] }), sent: false },
      { status: 400 },
    );
  if (!refusal) await requestPasswordReset(getDb(), submission.value.email);
  return { result: submission.reply({ resetForm: true }), sent: true };
}

export default function ResetRequest({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ResetRequestSchema }),
    shouldRevalidate: "onInput",
  });
  return (
    <AuthCard
      title="Forgot your password?"
      lead="Enter the e-mail of your staff account; we send a link to choose a new password."
    >
      <Form method="post" {...getFormProps(form)} className="space-y-4">
        {actionData?.sent ? <Notice>{RESET_SENT}</Notice> : null}
        <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
        <TextField
          label="E-mail"
          field={fields.email}
          type="email"
          autoComplete="username"
          autoFocus
        />
        <Honeypot stamp={loaderData.stamp} />
        <SubmitButton wide busy={navigation.state !== "idle"}>
          Send the link
        </SubmitButton>
      </Form>
      <p className="mt-4 text-sm">
        <Link to="/login" className="font-medium text-teal-text underline">
          Back to sign-in
        </Link>
      </p>
    </AuthCard>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Forgot your password · Torquewright" }];
}
