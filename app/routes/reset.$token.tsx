import { PUBLIC_FORM, readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/reset.$token";
import { AuthCard } from "~/components/auth/auth-form";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { hashPassword } from "~/lib/auth/auth.server";
import { Honeypot } from "~/components/ui/honeypot";
import { getDb } from "~/lib/db.server";
import { honeypotRefusal, honeypotStamp } from "~/lib/auth/honeypot.server";
import { requireSameOrigin } from "~/lib/auth/origin.server";
import { NewPasswordFields, passwordsMatch } from "~/lib/auth/passwords";
import { resetPassword } from "~/lib/auth/reset.server";
import { createSession } from "~/lib/auth/session.server";
import { checkToken, TOKEN_PROBLEMS } from "~/lib/auth/tokens.server";

const NewPasswordSchema = z.object(NewPasswordFields).superRefine(passwordsMatch);

export async function loader({ params }: Route.LoaderArgs) {
  const check = await checkToken(getDb(), "reset", params.token);
  const page = check.ok
    ? { problem: null, email: check.row.email }
    : { problem: TOKEN_PROBLEMS.reset[check.reason], email: null };
  return { ...page, ...honeypotStamp() };
}

export async function action({ request, params }: Route.ActionArgs) {
  requireSameOrigin(request);
  const formData = await readForm(request, PUBLIC_FORM);
  const submission = parseWithZod(formData, { schema: NewPasswordSchema });
  if (submission.status !== "success") {
    return data(
      { result: submission.reply({ hideFields: ["password", "confirm"] }) },
      { status: 400 },
    );
  }
  const refusal = honeypotRefusal(formData);
  if (refusal) {
    return data(
      {
        result: submission.reply({
          formErrors: [refusal],
          hideFields: ["password", "confirm"],
        }),
      },
      { status: 400 },
    );
  }
  const db = getDb();
  const outcome = await resetPassword(
    db,
    params.token,
    await hashPassword(submission.value.password),
  );
  if (!outcome.ok) {
    return data(
      {
        result: submission.reply({
          formErrors: [outcome.error],
          hideFields: ["password", "confirm"],
        }),
      },
      { status: 410 },
    );
  }
  return redirect("/", { headers: { "Set-Cookie": await createSession(db, outcome.userId) } });
}

export default function ChooseNewPassword({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: NewPasswordSchema }),
    shouldRevalidate: "onInput",
  });
  if (!loaderData.email) {
    return (
      <AuthCard title="Reset link not usable">
        <p role="alert" className="text-red-text">
          {loaderData.problem}
        </p>
        <Link to="/reset" className="mt-6 inline-block font-medium text-teal-text underline">
          Ask for a new link
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard
      title="Choose a new password"
      lead={
        <>
          For <strong>{loaderData.email}</strong>. Every other session of this account ends.
        </>
      }
    >
      <Form method="post" {...getFormProps(form)} className="space-y-4">
        <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
        <Honeypot stamp={loaderData.stamp} />
        <TextField
          label="New password"
          field={fields.password}
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters."
          autoFocus
        />
        <TextField
          label="New password again"
          field={fields.confirm}
          type="password"
          autoComplete="new-password"
        />
        <SubmitButton wide busy={navigation.state !== "idle"}>
          Save the new password
        </SubmitButton>
      </Form>
    </AuthCard>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "New password · Torquewright" }];
}
