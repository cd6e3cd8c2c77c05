import { zId } from "~/lib/http/ids";
import { readForm } from "~/lib/http/body";
import { getFormProps, useForm, type FieldMetadata } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useFetcher, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/staff";
import { FormAlert, formErrorsOf, Notice } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { SelectField, TextField } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { When } from "~/components/ui/when";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { ROLE_LABELS, ROLES, type Role } from "~/lib/auth/permissions";
import {
  changeRole,
  emailInUse,
  inviteStaff,
  listPendingInvites,
  listStaff,
  revokeInvite,
  setDisabled,
  StaffRuleError,
} from "~/lib/auth/staff.server";

const roleField = z.enum(ROLES as [Role, ...Role[]], "Choose a role.");

const StaffSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("invite"),
    email: z.email("Enter the person's e-mail address.").max(200),
    role: roleField,
  }),
  z.object({
    intent: z.literal("role"),
    userId: zId("Pick a staff member from the list"),
    role: roleField,
  }),
  z.object({ intent: z.literal("disable"), userId: zId("Pick a staff member from the list") }),
  z.object({ intent: z.literal("enable"), userId: zId("Pick a staff member from the list") }),
  z.object({ intent: z.literal("revoke"), inviteId: zId("Pick an invite from the list") }),
]);

export async function loader({ request }: Route.LoaderArgs) {
  const me = await requirePermission(request, "staff:manage");
  const db = getDb();
  const [staff, invites] = await Promise.all([listStaff(db), listPendingInvites(db)]);
  return { me: { id: me.id }, staff, invites };
}

export async function action({ request }: Route.ActionArgs) {
  const me = await requirePermission(request, "staff:manage");
  const db = getDb();
  const submission = await parseWithZod(await readForm(request), {
    schema: StaffSchema.superRefine(async (v, ctx) => {
      if (v.intent === "invite" && (await emailInUse(db, v.email))) {
        ctx.addIssue({
          code: "custom",
          path: ["email"],
          message: "An account with this e-mail already exists.",
        });
      }
    }),
    async: true,
  });
  if (submission.status !== "success")
    return data({ result: submission.reply(), done: null }, { status: 400 });
  const v = submission.value;
  try {
    switch (v.intent) {
      case "invite":
        await inviteStaff(db, { email: v.email, role: v.role, invitedBy: me });
        return {
          result: submission.reply({ resetForm: true }),
          done: `Invite sent to ${v.email}.`,
        };
      case "role":
        await changeRole(db, v.userId, v.role);
        return {
          result: submission.reply(),
          done: `Role changed to ${ROLE_LABELS[v.role].toLowerCase()}.`,
        };
      case "disable":
        await setDisabled(db, v.userId, true);
        return { result: submission.reply(), done: "Account disabled; its sessions have ended." };
      case "enable":
        await setDisabled(db, v.userId, false);
        return { result: submission.reply(), done: "Account enabled again." };
      case "revoke":
        await revokeInvite(db, v.inviteId);
        return { result: submission.reply(), done: "Invite withdrawn; its link no longer works." };
    }
  } catch (e) {
    if (e instanceof StaffRuleError)
      return data(
        { result: submission.reply({ formErrors: [e.message] }), done: null },
        { status: 409 },
      );
    throw e;
  }
}

export default function Staff({ loaderData }: Route.ComponentProps) {
  const { staff, invites, me } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <PageHeader
        title="Staff"
        lead="Who signs in, and with which role. Changes apply on their next click."
      />
      <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_22rem]">
        <section aria-labelledby="accounts">
          <h2 id="accounts" className="text-lg font-semibold text-ink">
            Accounts
          </h2>
          <ul className="mt-3 divide-y divide-steel-100 rounded border border-steel-200 bg-white">
            {staff.map((u) => (
              <StaffRow key={u.id} user={u} isMe={u.id === me.id} />
            ))}
          </ul>
        </section>
        <aside className="space-y-8">
          <InviteForm />
          <section aria-labelledby="pending">
            <h2 id="pending" className="text-lg font-semibold text-ink">
              Pending invites
            </h2>
            {invites.length === 0 ? (
              <p className="mt-2 text-sm text-steel-700">No invite is waiting.</p>
            ) : (
              <ul className="mt-2 space-y-2">
                {invites.map((i) => (
                  <li key={i.id} className="rounded border border-steel-200 bg-white p-3 text-sm">
                    <p className="font-medium text-ink">{i.email}</p>
                    <p className="text-steel-700">
                      {ROLE_LABELS[i.role ?? "apprentice"]} · expires{" "}
                      <When at={i.expires_at} time />
                    </p>
                    <Form method="post" className="mt-1">
                      <input type="hidden" name="intent" value="revoke" />
                      <input type="hidden" name="inviteId" value={i.id} />
                      <button type="submit" className="font-medium text-red-text underline">
                        Withdraw
                      </button>
                    </Form>
                  </li>
                ))}
              </ul>
            )}
          </section>
        </aside>
      </div>
    </main>
  );
}

function InviteForm() {
  const fetcher = useFetcher<typeof action>();
  const [form, fields] = useForm({
    id: "invite",
    lastResult: fetcher.data?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: StaffSchema }),
    shouldRevalidate: "onInput",
    defaultValue: { intent: "invite", role: "apprentice" },
  });
  return (
    <section aria-labelledby="invite-h" className="rounded border border-steel-200 bg-white p-4">
      <h2 id="invite-h" className="text-lg font-semibold text-ink">
        Invite a person
      </h2>
      <p className="mt-1 text-sm text-steel-700">
        They get a link, valid for 72 hours, to choose their name and password.
      </p>
      <fetcher.Form method="post" {...getFormProps(form)} className="mt-3 space-y-3">
        {fetcher.data?.done && fetcher.state === "idle" ? (
          <Notice>{fetcher.data.done}</Notice>
        ) : null}
        <FormAlert id={form.errorId} errors={formErrorsOf(form, fetcher.data?.result)} />
        <input type="hidden" name="intent" value="invite" />
        <TextField label="E-mail" field={fields.email as never} type="email" autoComplete="off" />
        <RoleSelect field={fields.role as never} label="Role" />
        <SubmitButton wide busy={fetcher.state !== "idle"}>
          Send invite
        </SubmitButton>
      </fetcher.Form>
    </section>
  );
}

const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

function RoleSelect({
  field,
  label,
  compact,
}: {
  field: FieldMetadata<string>;
  label: string;
  compact?: boolean;
}) {
  return <SelectField field={field} label={label} labelHidden={compact} options={ROLE_OPTIONS} />;
}

type StaffUser = Route.ComponentProps["loaderData"]["staff"][number];

function StaffRow({ user, isMe }: { user: StaffUser; isMe: boolean }) {
  const fetcher = useFetcher<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: `staff-${user.id}`,
    lastResult: fetcher.data?.result,
    defaultValue: { intent: "role", userId: String(user.id), role: user.role },
  });
  const busy = fetcher.state !== "idle" || navigation.state === "submitting";
  const disabled = Boolean(user.disabled_at);
  return (
    <li className="grid gap-3 p-4 sm:grid-cols-[1fr_17rem_auto] sm:items-start">
      <div>
        <p className="font-semibold text-ink">
          {user.name}{" "}
          {isMe ? <span className="text-sm font-normal text-steel-700">(you)</span> : null}
        </p>
        <p className="text-sm text-steel-700">{user.email}</p>
        <p className={`mt-1 text-sm font-medium ${disabled ? "text-red-text" : "text-green-text"}`}>
          {disabled ? "Disabled" : user.hasPassword ? "Active" : "Active · no password set yet"}
        </p>
        <div aria-live="polite">
          {fetcher.data?.done && fetcher.state === "idle" ? (
            <p className="mt-1 text-sm text-green-text">{fetcher.data.done}</p>
          ) : null}
        </div>
        <FormAlert id={form.errorId} errors={formErrorsOf(form, fetcher.data?.result)} />
      </div>
      <fetcher.Form method="post" {...getFormProps(form)} className="flex items-end gap-2">
        <input type="hidden" name="intent" value="role" />
        <input type="hidden" name="userId" value={user.id} />
        <div className="flex-1">
          <RoleSelect field={fields.role as never} label={`Role of ${user.name}`} compact />
        </div>
        <button
          type="submit"
          disabled={busy}
          className="rounded border border-steel-300 bg-steel-50 px-3 py-2 text-sm font-semibold text-ink hover:bg-steel-100"
        >
          Save role
        </button>
      </fetcher.Form>
      {isMe ? (
        <p className="text-sm text-steel-700">Your own account cannot be disabled here.</p>
      ) : (
        <fetcher.Form method="post">
          <input type="hidden" name="intent" value={disabled ? "enable" : "disable"} />
          <input type="hidden" name="userId" value={user.id} />
          <button
            type="submit"
            disabled={busy}
            className={`rounded px-3 py-2 text-sm font-semibold ${disabled ? "bg-teal-dark text-white hover:bg-ink" : "border border-red text-red-text hover:bg-steel-50"}`}
          >
            {disabled ? "Enable" : "Disable"}
          </button>
        </fetcher.Form>
      )}
    </li>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Staff · Torquewright" }];
}
