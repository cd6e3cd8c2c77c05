import { PUBLIC_FORM, readForm } from "~/lib/http/body";
import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/invite.$token";
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
import { ROLE_LABELS } from "~/lib/auth/permissions";
import { createSession } from "~/lib/auth/session.server";
import { emailInUse } from "~/lib/auth/staff.server";
import { checkToken, markTokenUsed, TOKEN_PROBLEMS } from "~/lib/auth/tokens.server";

const AcceptSchema = z
  .object({
    name: z
      .string("Enter your name as the shop should show it.")
      .trim()
      .min(2, "Enter your name as the shop should show it.")
      .max(80),
    ...NewPasswordFields,
  })
  .superRefine(passwordsMatch);

export async function loader({ params }: Route.LoaderArgs) {
  const check = await checkToken(getDb(), "invite", params.token);
  if (!check.ok)
    return { problem: TOKEN_PROBLEMS.invite[check.reason], invite: null, ...honeypotStamp() };
  return {
    problem: null,
    invite: { email: check.row.email, role: check.row.role ?? "apprentice" },
    ...honeypotStamp(),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  requireSameOrigin(request);
  const formData = await readForm(request, PUBLIC_FORM);
  const submission = parseWithZod(formData, { schema: AcceptSchema });
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
  const passwordHash = await hashPassword(submission.value.password);
  const outcome = await db.transaction().execute(async (trx) => {
    const check = await checkToken(trx, "invite", params.token, { lock: true });
    if (!check.ok) return { error: TOKEN_PROBLEMS.invite[check.reason] };
    if (await emailInUse(trx, check.row.email)) {
      await markTokenUsed(trx, check.row.id);
      return {
        error:
          "An account with this e-mail already exists. Sign in, or use “Forgot your password?”.",
      };
    }
    const user = await trx
      .insertInto("users")
      .values({
        email: check.row.email,
        name: submission.value.name,
        role: check.row.role ?? "apprentice",
        password_hash: passwordHash,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await markTokenUsed(trx, check.row.id);
    return { userId: user.id };
  });
  if ("error" in outcome) {
    return data(
      {
        result: submission.reply({
          formErrors: [outcome.error!],
          hideFields: ["password", "confirm"],
        }),
      },
      { status: 410 },
    );
  }
  const setCookie = await createSession(db, outcome.userId);
  return redirect("/", { headers: { "Set-Cookie": setCookie } });
}

export default function AcceptInvite({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: AcceptSchema }),
    shouldRevalidate: "onInput",
  });
  if (!loaderData.invite) {
    return (
      <AuthCard title="Invite link not usable">
        <p role="alert" className="text-red-text">
          {loaderData.problem}
        </p>
        <Link to="/login" className="mt-6 inline-block font-medium text-teal-text underline">
          Go to sign-in
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard
      title="Join the shop"
      lead={
        <>
          You are invited as <strong>{ROLE_LABELS[loaderData.invite.role].toLowerCase()}</strong>{" "}
          with <strong>{loaderData.invite.email}</strong>. Choose the name the shop will see and a
          password.
        </>
      }
    >
      <Form method="post" {...getFormProps(form)} className="space-y-4">
        <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
        <Honeypot stamp={loaderData.stamp} />
        <TextField label="Your name" field={fields.name} autoComplete="name" autoFocus />
        <TextField
          label="Password"
          field={fields.password}
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters."
        />
        <TextField
          label="Password again"
          field={fields.confirm}
          type="password"
          autoComplete="new-password"
        />
        <SubmitButton wide busy={navigation.state !== "idle"}>
          Create my account
        </SubmitButton>
      </Form>
    </AuthCard>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Join the shop · Torquewright" }];
}
