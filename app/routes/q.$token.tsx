import { readQuery } from "~/lib/http/text";
import { readForm } from "~/lib/http/body";
import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/q.$token";
import { QuoteTable } from "~/components/quotes/quote-table";
import { FormAlert, formErrorsOf, Notice } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextAreaField } from "~/components/ui/field";
import { requireSameOrigin } from "~/lib/auth/origin.server";
import { getDb } from "~/lib/db.server";
import { startDepositCheckout } from "~/lib/payments/deposits.server";
import { formatCents } from "~/lib/quotes/display";
import { CONTROL } from "~/lib/quotes/forms";
import {
  approveByCustomer,
  checkQuoteLink,
  getQuoteSettings,
  getVersion,
  LINK_PROBLEMS,
  recordCustomerMessage,
} from "~/lib/quotes/store.server";

// The customer's view of one sent quote, from the signed link in their e-mail. No account:
// the link is the permission, and it shows only this quote.

const MessageSchema = z.object({
  intent: z.literal("changes"),
  message: z
    .string({ error: "Tell the shop what you would like changed." })
    .trim()
    .min(3, "Tell the shop what you would like changed.")
    .max(2000, "Keep the message to 2,000 characters; the shop will call you for the rest.")
    .refine(
      (s) => !CONTROL.test(s.replace(/[\r\n\t]/g, "")),
      "The message contains characters that cannot be sent.",
    ),
});

const NO_STORE = { "Cache-Control": "private, no-store", "Referrer-Policy": "no-referrer" };

export async function loader({ request, params }: Route.LoaderArgs) {
  const db = getDb();
  const check = await checkQuoteLink(db, params.token);
  const shop = await getQuoteSettings(db);
  const contact = { shopName: shop.shopName, shopPhone: shop.shopPhone, shopEmail: shop.shopEmail };
  if (!check.ok)
    return data(
      { problem: LINK_PROBLEMS[check.reason], quote: null, ...contact, deposit: null, paid: false },
      { status: check.reason === "invalid" ? 404 : 410, headers: NO_STORE },
    );
  const v = await getVersion(db, check.versionId);
  if (!v) throw data("This quote no longer exists.", { status: 404 });
  const payment = await db
    .selectFrom("payments")
    .select(["status"])
    .where("quote_version_id", "=", v.id)
    .orderBy("created_at", "desc")
    .executeTakeFirst();
  const paid = payment ? ["paid", "partly_refunded", "refunded"].includes(payment.status) : false;
  const query = readQuery(request);
  return data(
    {
      problem: null,
      quote: {
        number: v.number,
        status: v.status,
        lines: v.lines.map(
          ({ kind, description, quantityHundredths, unitCents, taxable, ...rest }) => ({
            kind,
            description,
            quantityHundredths,
            unitCents,
            taxable,
            amountCents: (rest as { amountCents?: number }).amountCents ?? 0,
          }),
        ),
        totals: v.totals,
        terms: v.terms,
        summary: v.summary,
        customerName: v.customerName,
        expiresAt: v.expiresAt,
        approvedAt: v.approvedAt,
        declined: payment?.status === "declined",
      },
      ...contact,
      deposit: query.get("deposit"),
      paid,
    },
    { headers: NO_STORE },
  );
}

type ActionData = { result?: SubmissionResult<string[]>; message?: string; ok?: boolean };

export async function action({ request, params }: Route.ActionArgs) {
  requireSameOrigin(request);
  const formData = await readForm(request);
  const db = getDb();
  const check = await checkQuoteLink(db, params.token);
  if (!check.ok)
    return data<ActionData>({ ok: false, message: LINK_PROBLEMS[check.reason] }, { status: 410 });
  const intent = formData.get("intent");
  if (intent === "changes") {
    const submission = parseWithZod(formData, { schema: MessageSchema });
    if (submission.status !== "success")
      return data<ActionData>({ result: submission.reply() }, { status: 400 });
    await recordCustomerMessage(db, check.versionId, submission.value.message);
    return data<ActionData>({
      ok: true,
      message: "Thank you — the shop has your message and will call or write to you.",
      result: submission.reply({ resetForm: true }),
    });
  }
  if (intent === "approve" || intent === "pay") {
    const v = await getVersion(db, check.versionId);
    if (!v)
      return data<ActionData>(
        { ok: false, message: "This quote no longer exists." },
        { status: 404 },
      );
    if (intent === "approve") await approveByCustomer(db, v.id);
    if (v.totals.depositCents <= 0)
      return data<ActionData>({ ok: true, message: "Thank you — the shop has your approval." });
    const out = await startDepositCheckout(db, v.id, params.token);
    if (!out.ok) return data<ActionData>({ ok: false, message: out.message }, { status: 503 });
    throw redirect(out.url);
  }
  return data<ActionData>(
    { ok: false, message: "That was not understood; use the buttons on the page." },
    { status: 400 },
  );
}

function ChangesForm() {
  const actionData = useActionData<ActionData>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "changes",
    lastResult: navigation.state === "idle" ? actionData?.result : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: MessageSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  return (
    <Form method="post" {...getFormProps(form)} className="space-y-3">
      <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
      <input type="hidden" name="intent" value="changes" />
      <TextAreaField
        field={fields.message}
        label="Ask for changes"
        hint="What you would like different, in your words."
        rows={3}
      />
      <SubmitButton
        look="secondary"
        busy={navigation.state === "submitting" && navigation.formData?.get("intent") === "changes"}
      >
        Send to the shop
      </SubmitButton>
    </Form>
  );
}

const fmt1 = (n: number | null, digits = 1) => (n === null ? "—" : n.toFixed(digits));

export default function CustomerQuote({ loaderData }: Route.ComponentProps) {
  const actionData = useActionData<ActionData>();
  const navigation = useNavigation();
  const { problem, quote, shopName, shopPhone, deposit, paid } = loaderData;
  if (problem || !quote)
    return (
      <main className="mx-auto max-w-2xl px-4 py-12">
        <h1 className="text-2xl font-semibold text-ink">{shopName}</h1>
        <div role="alert" className="mt-4 rounded border border-amber bg-white px-4 py-3">
          <p className="font-semibold text-ink">This quote cannot be opened</p>
          <p className="mt-1 text-graphite">{problem}</p>
          <p className="mt-2 text-graphite">
            {shopName} · {shopPhone}
          </p>
        </div>
      </main>
    );
  const s = quote.summary;
  const busy = navigation.state === "submitting";
  return (
    <main className="mx-auto max-w-3xl px-4 py-8">
      <p className="text-sm font-semibold uppercase tracking-widest text-steel-700">{shopName}</p>
      <h1 className="mt-1 text-3xl font-semibold text-ink">
        Quote {quote.number}: {s.packageName}
      </h1>
      <p className="mt-1 text-graphite">
        For {quote.customerName}
        {s.bike ? `, your ${s.bike}` : ""}. Valid until{" "}
        {new Date(quote.expiresAt).toLocaleDateString("en-US", { dateStyle: "long" })}.
      </p>
      {deposit === "paid" && !paid ? (
        <Notice className="mt-4">
          Thank you — your payment is being confirmed. This page shows it once it is recorded.
        </Notice>
      ) : null}
      {paid ? (
        <Notice className="mt-4">
          Your deposit is paid. Thank you — the shop will call you to book the bike in.
        </Notice>
      ) : null}
      {deposit === "cancelled" && !paid ? (
        <p className="mt-4 rounded border border-steel-300 bg-white px-4 py-3" role="status">
          You left the payment page; nothing was charged. You can pay the deposit whenever you are
          ready.
        </p>
      ) : null}
      {quote.declined && !paid ? (
        <p className="mt-4 rounded border border-amber bg-white px-4 py-3" role="status">
          The last card was declined; nothing was charged. You can try again with another card.
        </p>
      ) : null}
      {actionData?.message ? (
        actionData.ok ? (
          <Notice className="mt-4">{actionData.message}</Notice>
        ) : (
          <FormAlert id="quote-error" errors={[actionData.message]} />
        )
      ) : null}

      <section className="mt-6" aria-labelledby="what-title">
        <h2 id="what-title" className="text-xl font-semibold text-ink">
          What we will do
        </h2>
        <ul className="mt-2 list-disc space-y-1 pl-6 text-graphite">
          {s.changes.length ? (
            s.changes.map((c, i) => <li key={i}>{c}</li>)
          ) : (
            <li>The work listed below.</li>
          )}
        </ul>
        <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4">
          <Figure
            label="Displacement"
            value={
              s.displacementCi === null
                ? "—"
                : `${fmt1(s.displacementCi)} ci (${fmt1(s.displacementCc, 0)} cc)`
            }
          />
          <Figure
            label="Static compression"
            value={s.staticCr === null ? "—" : `${fmt1(s.staticCr)}:1`}
          />
          <Figure
            label="Dynamic compression"
            value={s.dynamicCr === null ? "—" : `${fmt1(s.dynamicCr, 2)}:1`}
          />
          <Figure
            label="Expected power"
            value={s.powerHp === null ? "—" : `about ${fmt1(s.powerHp, 0)} hp`}
            note={s.powerHp === null ? undefined : (POWER_BASIS[s.powerBasis ?? ""] ?? "")}
          />
        </dl>
        {s.cautions.length || s.findings.length ? (
          <div className="mt-4 rounded border border-amber bg-white px-4 py-3">
            <p className="font-semibold text-ink">What the builder watches on this engine</p>
            <ul className="mt-1 list-disc space-y-1 pl-6 text-graphite">
              {[...new Set([...s.cautions, ...s.findings.map((f) => f.message)])].map((m) => (
                <li key={m}>{m}</li>
              ))}
            </ul>
          </div>
        ) : null}
      </section>

      <section className="mt-6" aria-labelledby="price-title">
        <h2 id="price-title" className="text-xl font-semibold text-ink">
          The price
        </h2>
        <QuoteTable
          lines={quote.lines}
          totals={quote.totals}
          terms={quote.terms}
          showSource={false}
        />
      </section>

      {!paid &&
      (quote.status === "sent" ||
        quote.status === "changes_requested" ||
        quote.status === "approved") ? (
        <section
          className="mt-6 grid gap-6 rounded border border-steel-200 bg-white p-4 sm:grid-cols-2"
          aria-label="Your answer"
        >
          <Form method="post" className="space-y-2">
            <h2 className="text-lg font-semibold text-ink">Approve the quote</h2>
            <p className="text-sm text-graphite">
              {quote.totals.depositCents > 0
                ? `Approving takes you to a secure payment page for the ${formatCents(quote.totals.depositCents)} deposit. The shop never sees your card number.`
                : "No deposit is asked for this quote."}
            </p>
            <input type="hidden" name="intent" value={quote.approvedAt ? "pay" : "approve"} />
            <SubmitButton busy={busy && navigation.formData?.get("intent") !== "changes"}>
              {quote.approvedAt
                ? `Pay the ${formatCents(quote.totals.depositCents)} deposit`
                : quote.totals.depositCents > 0
                  ? `Approve and pay the ${formatCents(quote.totals.depositCents)} deposit`
                  : "Approve the quote"}
            </SubmitButton>
          </Form>
          <ChangesForm />
        </section>
      ) : null}

      <aside className="mt-8 rounded border border-steel-300 bg-steel-50 px-4 py-3 text-sm text-graphite">
        <p className="font-semibold text-ink">Safety</p>
        <p className="mt-1">
          Engine and chassis work can hurt people when it is done wrong. Parts are fitted and
          torqued to the parts maker's instructions; brakes, axles and suspension are checked by a
          qualified technician before the bike leaves; local rules on emissions and noise apply to
          the finished bike.
        </p>
      </aside>
    </main>
  );
}

const POWER_BASIS: Record<string, string> = {
  target: "the builder's target",
  estimate: "an estimate from the engine's figures",
  measured: "measured on the dyno",
};

function Figure({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <div className="rounded border border-steel-200 bg-white px-3 py-2">
      <dt className="text-xs font-semibold uppercase tracking-wide text-steel-700">{label}</dt>
      <dd className="mt-0.5 font-semibold tabular-nums text-ink">{value}</dd>
      {note ? <dd className="text-xs text-steel-700">{note}</dd> : null}
    </div>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [
    {
      title: d?.quote ? `Quote ${d.quote.number} · ${d.shopName}` : `Quote · ${d?.shopName ?? ""}`,
    },
    { name: "robots", content: "noindex" },
  ];
}
