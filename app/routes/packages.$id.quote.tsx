import { readQuery } from "~/lib/http/text";
import { readForm } from "~/lib/http/body";
import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useNavigation } from "react-router";
import type { Route } from "./+types/packages.$id.quote";
import { FormAlert, formErrorsOf, Notice } from "~/components/ui/alert";
import { buttonClass, SubmitButton } from "~/components/ui/button";
import { CheckboxField, SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { StatusBadge } from "~/components/packages/status-badge";
import { QuoteTable } from "~/components/quotes/quote-table";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { getDb } from "~/lib/db.server";
import { requireIdParam, zId } from "~/lib/http/ids";
import { getPackageHeader } from "~/lib/packages/store.server";
import { listPayments, refundDeposit } from "~/lib/payments/deposits.server";
import { AddLineSchema, centsToInput, RemoveLineSchema, TermsSchema } from "~/lib/quotes/forms";
import { formatCents, formatPercent } from "~/lib/quotes/display";
import { MoneyError } from "~/lib/quotes/money";
import {
  getDraft,
  listCustomerMessages,
  listVersions,
  priceCurrent,
  saveDraft,
  sendQuote,
} from "~/lib/quotes/store.server";
import { z } from "zod";

const QUOTABLE = ["draft", "quoted"];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "prices:read");
  const id = requireIdParam(params);
  const shown = readQuery(request).get("version");
  const db = getDb();
  const header = await getPackageHeader(db, id);
  if (!header || header.isTemplate) throw data("No package with this number.", { status: 404 });
  let priced = null;
  let priceError: string | null = null;
  try {
    priced = await priceCurrent(db, id);
  } catch (e) {
    if (!(e instanceof MoneyError)) throw e;
    priceError = e.message;
  }
  const [draft, versions, payments, messages] = await Promise.all([
    getDraft(db, id),
    listVersions(db, id),
    listPayments(db, id),
    listCustomerMessages(db, id),
  ]);
  return {
    header,
    priced,
    priceError,
    draft,
    versions,
    shownVersion: shown ? (versions.find((v) => String(v.number) === shown) ?? null) : null,
    payments,
    messages: messages.map((m) => ({ ...m, created_at: new Date(m.created_at).toISOString() })),
    canEdit: can(user.role, "quotes:send") && QUOTABLE.includes(header.status),
    canRefund: can(user.role, "deposits:refund"),
  };
}

type ActionData =
  | { form: "add-line" | "terms" | "send" | "remove-line"; result: SubmissionResult<string[]> }
  | { form: "refund"; message: string; ok: boolean }
  | { form: "sent"; message: string; ok: true };

export async function action({ request, params }: Route.ActionArgs) {
  const formData = await readForm(request);
  const user = await requirePermission(request, "prices:read");
  const id = requireIdParam(params);
  const db = getDb();
  const intent = String(formData.get("intent") ?? "");
  if (intent === "refund") {
    await requirePermission(request, "deposits:refund");
    const paymentId = zId("Choose a deposit to refund.").safeParse(formData.get("payment"));
    if (!paymentId.success)
      return data<ActionData>(
        { form: "refund", ok: false, message: "Choose a deposit to refund." },
        { status: 400 },
      );
    const out = await refundDeposit(db, paymentId.data);
    return data<ActionData>(
      out.ok
        ? {
            form: "refund",
            ok: true,
            message: "Refund asked for. It shows here once the payment service confirms it.",
          }
        : { form: "refund", ok: false, message: out.message },
      { status: out.ok ? 200 : 400 },
    );
  }
  if (!can(user.role, "quotes:send"))
    throw data("Your role cannot change quotes.", { status: 403 });
  const header = await getPackageHeader(db, id);
  if (!header || header.isTemplate) throw data("No package with this number.", { status: 404 });
  if (!QUOTABLE.includes(header.status)) {
    const submission = parseWithZod(formData, { schema: z.object({ intent: z.string() }) });
    return data<ActionData>(
      {
        form: "send",
        result: submission.reply({
          formErrors: ["This package is past its quote; the quote can no longer change."],
        }),
      },
      { status: 409 },
    );
  }
  const draft = await getDraft(db, id);
  if (intent === "add-line") {
    const submission = parseWithZod(formData, { schema: AddLineSchema });
    if (submission.status !== "success")
      return data<ActionData>({ form: "add-line", result: submission.reply() }, { status: 400 });
    const v = submission.value;
    if (draft.extraLines.length >= 50)
      return data<ActionData>(
        {
          form: "add-line",
          result: submission.reply({ formErrors: ["A quote can have at most 50 added lines."] }),
        },
        { status: 400 },
      );
    await saveDraft(
      db,
      id,
      {
        ...draft,
        extraLines: [
          ...draft.extraLines,
          {
            kind: v.kind,
            description: v.description,
            quantityHundredths: v.quantity,
            unitCents: v.unit,
            taxable: v.taxable,
          },
        ],
      },
      user.id,
    );
    return data<ActionData>({ form: "add-line", result: submission.reply({ resetForm: true }) });
  }
  if (intent === "remove-line") {
    const submission = parseWithZod(formData, { schema: RemoveLineSchema });
    if (submission.status !== "success" || submission.value.index >= draft.extraLines.length)
      return data<ActionData>(
        {
          form: "remove-line",
          result: submission.reply({ formErrors: ["That line is no longer on the quote."] }),
        },
        { status: 400 },
      );
    await saveDraft(
      db,
      id,
      { ...draft, extraLines: draft.extraLines.filter((_, i) => i !== submission.value.index) },
      user.id,
    );
    return data<ActionData>({ form: "remove-line", result: submission.reply() });
  }
  if (intent === "terms") {
    const submission = parseWithZod(formData, { schema: TermsSchema });
    if (submission.status !== "success")
      return data<ActionData>({ form: "terms", result: submission.reply() }, { status: 400 });
    await saveDraft(db, id, { ...draft, ...submission.value }, user.id);
    return data<ActionData>({ form: "terms", result: submission.reply() });
  }
  if (intent === "send") {
    const submission = parseWithZod(formData, { schema: z.object({ intent: z.literal("send") }) });
    const out = await sendQuote(db, id, user.id);
    if (!out.ok)
      return data<ActionData>(
        { form: "send", result: submission.reply({ formErrors: [out.message] }) },
        { status: 400 },
      );
    return data<ActionData>({
      form: "sent",
      ok: true,
      message: `Quote ${out.version.number} sent to ${out.version.customerEmail}.`,
    });
  }
  return data<ActionData>(
    {
      form: "send",
      result: { status: "error", error: { "": ["That action was not understood."] } },
    },
    { status: 400 },
  );
}

function AddLineForm() {
  const actionData = useActionData<ActionData>();
  const navigation = useNavigation();
  const last = actionData && actionData.form === "add-line" ? actionData.result : undefined;
  const [form, fields] = useForm({
    id: "add-line",
    lastResult: navigation.state === "idle" ? last : undefined,
    defaultValue: { kind: "machine", quantity: "1", taxable: undefined },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: AddLineSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  return (
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-3 rounded border border-steel-200 bg-white p-4"
    >
      <h3 className="font-semibold text-ink">Add machine work or another line</h3>
      <FormAlert id={form.errorId} errors={formErrorsOf(form, last)} />
      <input type="hidden" name="intent" value="add-line" />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          field={fields.kind}
          label="Kind"
          options={[
            { value: "machine", label: "Machine work (boring, head work, balancing)" },
            { value: "other", label: "Another line" },
          ]}
        />
        <TextField
          field={fields.description}
          label="Description"
          hint="e.g. Bore and hone cylinders to 4.125 in"
        />
        <TextField
          field={fields.quantity}
          label="Quantity"
          hint="Hours or pieces, up to two decimals"
        />
        <TextField field={fields.unit} label="Price each ($)" />
      </div>
      <CheckboxField field={fields.taxable} label="Taxed" />
      <SubmitButton
        busy={
          navigation.state === "submitting" && navigation.formData?.get("intent") === "add-line"
        }
      >
        Add the line
      </SubmitButton>
    </Form>
  );
}

function TermsForm({ draft }: { draft: Route.ComponentProps["loaderData"]["draft"] }) {
  const actionData = useActionData<ActionData>();
  const navigation = useNavigation();
  const last = actionData && actionData.form === "terms" ? actionData.result : undefined;
  const d = draft.discount;
  const p = draft.deposit;
  const [form, fields] = useForm({
    id: "terms",
    lastResult: navigation.state === "idle" ? last : undefined,
    defaultValue: {
      discountKind: d.kind,
      discountValue:
        d.kind === "percent"
          ? String(d.basisPoints / 100)
          : d.kind === "fixed"
            ? centsToInput(d.cents)
            : "",
      depositKind: p ? p.kind : "shop",
      depositValue:
        p?.kind === "percent"
          ? String(p.basisPoints / 100)
          : p?.kind === "fixed"
            ? centsToInput(p.cents)
            : "",
      note: draft.note,
    },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: TermsSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  return (
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-3 rounded border border-steel-200 bg-white p-4"
    >
      <h3 className="font-semibold text-ink">Discount, deposit and note</h3>
      <FormAlert id={form.errorId} errors={formErrorsOf(form, last)} />
      <input type="hidden" name="intent" value="terms" />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          field={fields.discountKind}
          label="Discount"
          options={[
            { value: "none", label: "No discount" },
            { value: "percent", label: "A percentage of the subtotal" },
            { value: "fixed", label: "A fixed amount" },
          ]}
        />
        <TextField field={fields.discountValue} label="Discount (% or $)" />
        <SelectField
          field={fields.depositKind}
          label="Deposit"
          options={[
            { value: "shop", label: "The shop's usual deposit" },
            { value: "percent", label: "A percentage of the total" },
            { value: "fixed", label: "A fixed amount" },
          ]}
        />
        <TextField field={fields.depositValue} label="Deposit (% or $)" />
      </div>
      <TextAreaField field={fields.note} label="Note to the customer (on the quote)" rows={2} />
      <SubmitButton
        look="secondary"
        busy={navigation.state === "submitting" && navigation.formData?.get("intent") === "terms"}
      >
        Save the terms
      </SubmitButton>
    </Form>
  );
}

export default function PackageQuote({ loaderData }: Route.ComponentProps) {
  const {
    header,
    priced,
    priceError,
    draft,
    versions,
    shownVersion,
    payments,
    messages,
    canEdit,
    canRefund,
  } = loaderData;
  const actionData = useActionData<ActionData>();
  const navigation = useNavigation();
  const sendResult = actionData?.form === "send" ? actionData.result : undefined;
  const lastSent = versions[0];
  const changedSinceSent = Boolean(
    lastSent && priced && lastSent.packageRevision !== priced.revision,
  );
  return (
    <main className="mx-auto max-w-5xl px-4 py-8">
      <PageHeader
        back={{ to: `/packages/${header.id}`, label: header.name }}
        eyebrow="Quote"
        title={
          <>
            {header.name} <StatusBadge status={header.status} />
          </>
        }
        lead={
          <>
            {header.customerName ?? "No customer"} · {header.bikeLabel ?? "no bike"}
          </>
        }
      />
      {actionData?.form === "sent" ? <Notice className="mt-4">{actionData.message}</Notice> : null}
      {actionData?.form === "refund" ? (
        actionData.ok ? (
          <Notice className="mt-4">{actionData.message}</Notice>
        ) : (
          <FormAlert id="refund-error" errors={[actionData.message]} />
        )
      ) : null}

      {shownVersion ? (
        <section className="mt-6" aria-labelledby="version-title">
          <h2 id="version-title" className="text-xl font-semibold text-ink">
            Quote {shownVersion.number} as sent ({shownVersion.status.replace("_", " ")})
          </h2>
          <p className="text-sm text-steel-700">
            Sent to {shownVersion.customerEmail}{" "}
            {shownVersion.sentBy ? `by ${shownVersion.sentBy}` : ""} · prices revision{" "}
            {shownVersion.packageRevision} ·{" "}
            <Link to="?" className="text-teal-text underline">
              back to the current quote
            </Link>
          </p>
          <QuoteTable
            lines={shownVersion.lines}
            totals={shownVersion.totals}
            terms={shownVersion.terms}
          />
        </section>
      ) : (
        <section className="mt-6" aria-labelledby="current-title">
          <h2 id="current-title" className="text-xl font-semibold text-ink">
            {canEdit ? "The quote as it stands" : "The package's price today"}
          </h2>
          {priceError ? <FormAlert id="price-error" errors={[priceError]} /> : null}
          {priced ? (
            <>
              {priced.unresolved.length ? (
                <div
                  role="status"
                  className="mt-2 rounded border border-amber bg-white px-3 py-2 text-sm"
                >
                  <p className="font-semibold text-ink">
                    The keep-check marks these installed parts for replacement, and nothing on the
                    quote replaces them yet:
                  </p>
                  <ul className="list-disc pl-5">
                    {priced.unresolved.map((u, i) => (
                      <li key={i}>{u}</li>
                    ))}
                  </ul>
                  <p>
                    Put the replacement on the bench, add it as a line, or mark the part keep on the{" "}
                    <Link
                      to={`/packages/${header.id}/keep-check`}
                      className="text-teal-text underline"
                    >
                      keep-check
                    </Link>
                    .
                  </p>
                </div>
              ) : null}
              <p className="text-sm text-steel-700">
                From revision {priced.revision} of the package: {priced.changedSlots.length} slot
                {priced.changedSlots.length === 1 ? "" : "s"} with a new part, labour from the
                shop's jobs at{" "}
                {formatCents(priced.lines.find((l) => l.kind === "labour")?.unitCents ?? 0)} an
                hour.
              </p>
              <QuoteTable
                lines={priced.lines}
                totals={priced.totals}
                terms={priced.terms}
                onRemove={
                  canEdit
                    ? (i) => (
                        <Form method="post">
                          <input type="hidden" name="intent" value="remove-line" />
                          <input type="hidden" name="index" value={i} />
                          <button type="submit" className="text-sm text-teal-text underline">
                            Remove
                          </button>
                        </Form>
                      )
                    : undefined
                }
              />
            </>
          ) : null}
          {canEdit ? (
            <>
              <div className="mt-6 grid gap-4 lg:grid-cols-2">
                <AddLineForm />
                <TermsForm draft={draft} />
              </div>
              <Form
                method="post"
                className="mt-6 space-y-2 rounded border border-steel-200 bg-white p-4"
              >
                <h3 className="font-semibold text-ink">Send to the customer</h3>
                <FormAlert id="send-errors" errors={sendResult?.error?.[""] ?? undefined} />
                <p className="text-sm text-steel-700">
                  Sending freezes this quote as quote {(lastSent?.number ?? 0) + 1} and e-mails the
                  customer a private link to read it, approve it or ask for changes, and pay the
                  deposit.
                  {lastSent ? ` Quote ${lastSent.number} is then replaced.` : ""}
                  {changedSinceSent
                    ? " The package has changed since the last quote was sent."
                    : ""}
                </p>
                <input type="hidden" name="intent" value="send" />
                <SubmitButton
                  busy={
                    navigation.state === "submitting" &&
                    navigation.formData?.get("intent") === "send"
                  }
                >
                  {lastSent ? "Send the new quote" : "Send the quote"}
                </SubmitButton>
              </Form>
            </>
          ) : null}
        </section>
      )}

      <section className="mt-8" aria-labelledby="versions-title">
        <h2 id="versions-title" className="text-xl font-semibold text-ink">
          Quotes sent
        </h2>
        {versions.length === 0 ? (
          <p className="mt-2 text-steel-700">No quote has been sent for this package yet.</p>
        ) : (
          <ul className="mt-2 divide-y divide-steel-200 rounded border border-steel-200 bg-white">
            {versions.map((v) => (
              <li
                key={v.id}
                className="flex flex-wrap items-center justify-between gap-2 px-4 py-3"
              >
                <span>
                  <Link
                    to={`?version=${v.number}`}
                    className="font-semibold text-teal-text underline"
                  >
                    Quote {v.number}
                  </Link>{" "}
                  ·{" "}
                  {new Date(v.sentAt).toLocaleString("en-US", {
                    dateStyle: "medium",
                    timeStyle: "short",
                  })}
                  {v.sentBy ? ` by ${v.sentBy}` : ""}
                </span>
                <span className="tabular-nums">
                  {formatCents(v.totals.totalCents)} · deposit {formatCents(v.totals.depositCents)}{" "}
                  · {VERSION_STATUS[v.status] ?? v.status} ·{" "}
                  <a
                    href={`/packages/${header.id}/quote.pdf?version=${v.number}`}
                    className="text-teal-text underline"
                    download
                  >
                    PDF
                  </a>
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section className="mt-8" aria-labelledby="payments-title">
        <h2 id="payments-title" className="text-xl font-semibold text-ink">
          Deposits
        </h2>
        {payments.length === 0 ? (
          <p className="mt-2 text-steel-700">No deposit has been started.</p>
        ) : (
          <ul className="mt-2 divide-y divide-steel-200 rounded border border-steel-200 bg-white">
            {payments.map((p) => (
              <li
                key={p.id}
                className="flex flex-wrap items-center justify-between gap-2 px-4 py-3"
              >
                <span className="tabular-nums">
                  Quote {p.quoteNumber}: {formatCents(p.amountCents)} —{" "}
                  {PAYMENT_STATUS[p.status] ?? p.status}
                  {p.refundedCents > 0 ? ` (${formatCents(p.refundedCents)} refunded)` : ""}
                  {p.failure ? ` — ${p.failure}` : ""}
                </span>
                {canRefund && (p.status === "paid" || p.status === "partly_refunded") ? (
                  <Form method="post">
                    <input type="hidden" name="intent" value="refund" />
                    <input type="hidden" name="payment" value={p.id} />
                    <button type="submit" className={buttonClass("secondary")}>
                      Refund the deposit
                    </button>
                  </Form>
                ) : null}
              </li>
            ))}
          </ul>
        )}
      </section>

      {messages.length ? (
        <section className="mt-8" aria-labelledby="messages-title">
          <h2 id="messages-title" className="text-xl font-semibold text-ink">
            From the customer
          </h2>
          <ul className="mt-2 space-y-2">
            {messages.map((m) => (
              <li key={m.id} className="rounded border border-steel-200 bg-white px-4 py-3">
                <p className="text-sm text-steel-700">
                  On quote {m.number ?? "—"} ·{" "}
                  {new Date(m.created_at).toLocaleString("en-US", {
                    dateStyle: "medium",
                    timeStyle: "short",
                  })}
                </p>
                <p className="mt-1 whitespace-pre-line">{m.body}</p>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <p className="mt-8 text-sm text-steel-700">
        Tax {priced ? formatPercent(priced.terms.taxRateBasisPoints) : ""} and the usual deposit
        come from the shop settings; labour from the shop's jobs.
      </p>
    </main>
  );
}

const VERSION_STATUS: Record<string, string> = {
  sent: "waiting for the customer",
  changes_requested: "customer asked for changes",
  approved: "approved",
  superseded: "replaced by a newer quote",
  withdrawn: "withdrawn",
};

const PAYMENT_STATUS: Record<string, string> = {
  open: "started, not paid",
  paid: "paid",
  declined: "card declined",
  expired: "checkout expired",
  refunded: "refunded",
  partly_refunded: "partly refunded",
};

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `Quote · ${d?.header.name ?? "Package"} · Torquewright` }];
}
