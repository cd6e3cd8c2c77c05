import { readQuery } from "~/lib/http/text";
import { PUBLIC_FORM, readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/login";
import { AuthCard } from "~/components/auth/auth-form";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { authenticator, getUser, safeRedirect, SignInError } from "~/lib/auth/auth.server";
import { Honeypot } from "~/components/ui/honeypot";
import { getDb } from "~/lib/db.server";
import { honeypotRefusal, honeypotStamp } from "~/lib/auth/honeypot.server";
import { requireSameOrigin } from "~/lib/auth/origin.server";
import { createSession } from "~/lib/auth/session.server";

export const LoginSchema = z.object({
  email: z.email("Enter the e-mail address of your staff account."),
  password: z.string("Enter your password.").min(1, "Enter your password."),
  redirectTo: z.string().optional(),
});

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (user) throw redirect(safeRedirect(readQuery(request).get("redirectTo")));
  return honeypotStamp();
}

export async function action({ request }: Route.ActionArgs) {
  requireSameOrigin(request);
  // The form strategy reads the body itself, so parse a copy.
  const formData = await readForm(request.clone(), PUBLIC_FORM);
  const submission = parseWithZod(formData, { schema: LoginSchema });
  if (submission.status !== "success") {
    return data({ result: submission.reply({ hideFields: ["password"] }) }, { status: 400 });
  }
  // a script, not a person: no password is checked
  const refusal = honeypotRefusal(formData);
  if (refusal)
    return data(
      { result: submission.reply({ formErrors: [refusal], hideFields: ["password"] }) },
      { status: 400 },
    );
  try {
    const user = await authenticator.authenticate("password", request);
    const setCookie = await createSession(getDb(), user.id);
    return redirect(safeRedirect(submission.value.redirectTo), {
      headers: { "Set-Cookie": setCookie },
    });
  } catch (e) {
    if (!(e instanceof SignInError)) throw e;
    const result = submission.reply({ formErrors: [e.message], hideFields: ["password"] });
    return e.retryAfterSeconds > 0
      ? data({ result }, { status: 429, headers: { "Retry-After": String(e.retryAfterSeconds) } })
      : data({ result }, { status: 401 });
  }
}

/** A refused sign-in's Retry-After reaches the browser (action headers are not passed on by themselves). */
export function headers({ actionHeaders }: Route.HeadersArgs) {
  const out = new Headers();
  const retry = actionHeaders.get("Retry-After");
  if (retry) out.set("Retry-After", retry);
  return out;
}

export default function Login({ loaderData, actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: LoginSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  // A refused attempt clears the password field (a fresh input) and puts the cursor there.
  // (Counted during render, so the field is fresh in the same paint as the error.)
  const [attempt, setAttempt] = useState(0);
  const [answered, setAnswered] = useState(actionData);
  if (actionData !== answered) {
    setAnswered(actionData);
    setAttempt(attempt + 1);
  }
  return (
    <AuthCard
      title="Sign in"
      lead="Staff accounts of the shop. Customers open the link in their quote e-mail instead."
    >
      <Form method="post" {...getFormProps(form)} className="space-y-4">
        <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
        <input type="hidden" name="redirectTo" value={params.get("redirectTo") ?? ""} />
        <Honeypot stamp={loaderData.stamp} />
        <TextField
          label="E-mail"
          field={fields.email}
          type="email"
          autoComplete="username"
          autoFocus={attempt === 0}
        />
        <div key={attempt}>
          <TextField
            label="Password"
            field={fields.password}
            type="password"
            autoComplete="current-password"
            autoFocus={attempt > 0}
          />
        </div>
        <SubmitButton wide busy={navigation.state !== "idle"}>
          Sign in
        </SubmitButton>
      </Form>
      <p className="mt-4 text-sm">
        <Link to="/reset" className="font-medium text-teal-text underline">
          Forgot your password?
        </Link>
      </p>
    </AuthCard>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Sign in · Torquewright" }];
}
