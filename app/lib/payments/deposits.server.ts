// Deposits through the payment service: a checkout session for a sent quote's deposit,
// the service's webhook events applied once each (by event id, whatever the order or
// the number of deliveries), and refunds. No card number ever reaches this server.
import Stripe from "stripe";
import { sql } from "kysely";
import type { Db } from "../db.server";
import { queueMail } from "../mail/mail.server";
import { getQuoteSettings, quoteUrl } from "../quotes/store.server";
import { moveStatus } from "../quotes/status.server";
import { isServiceDown, stripe } from "./stripe.server";

function inTransaction<T>(db: Db, fn: (trx: Db) => Promise<T>): Promise<T> {
  return db.isTransaction ? fn(db) : db.transaction().execute((trx) => fn(trx));
}

export const SERVICE_DOWN =
  "The payment service is not answering right now. Nothing was charged; please try again in a few minutes.";

export type CheckoutOutcome = { ok: true; url: string } | { ok: false; message: string };

export async function startDepositCheckout(
  db: Db,
  versionId: number,
  token: string,
): Promise<CheckoutOutcome> {
  const v = await db
    .selectFrom("quote_versions as q")
    .innerJoin("packages as p", "p.id", "q.package_id")
    .select([
      "q.id",
      "q.package_id",
      "q.number",
      "q.status",
      "q.deposit_cents",
      "q.customer_email",
      "p.name as package_name",
      "p.status as package_status",
    ])
    .where("q.id", "=", versionId)
    .executeTakeFirst();
  if (!v) return { ok: false, message: "This quote no longer exists." };
  const paid = await db
    .selectFrom("payments")
    .select("id")
    .where("quote_version_id", "=", v.id)
    .where("status", "in", ["paid", "partly_refunded", "refunded"])
    .executeTakeFirst();
  if (paid) return { ok: false, message: "The deposit for this quote is already paid. Thank you." };
  if (
    v.package_status !== "quoted" ||
    !["sent", "changes_requested", "approved"].includes(v.status)
  )
    return { ok: false, message: "This quote can no longer take a deposit. Call the shop." };
  const amount = Number(v.deposit_cents);
  if (amount <= 0) return { ok: false, message: "This quote asks for no deposit." };
  const back = quoteUrl(token);
  let session: Stripe.Checkout.Session;
  try {
    session = await stripe().checkout.sessions.create({
      mode: "payment",
      client_reference_id: `quote-${v.id}`,
      customer_email: v.customer_email,
      line_items: [
        {
          quantity: 1,
          price_data: {
            currency: "usd",
            unit_amount: amount,
            product_data: { name: `Deposit — quote ${v.number}, ${v.package_name}` },
          },
        },
      ],
      metadata: { quote_version_id: String(v.id), package_id: String(v.package_id) },
      payment_intent_data: {
        metadata: { quote_version_id: String(v.id), package_id: String(v.package_id) },
      },
      success_url: `${back}?deposit=paid`,
      cancel_url: `${back}?deposit=cancelled`,
    });
  } catch (e) {
    if (isServiceDown(e)) return { ok: false, message: SERVICE_DOWN };
    throw e;
  }
  if (!session.url) return { ok: false, message: SERVICE_DOWN };
  await db
    .insertInto("payments")
    .values({
      quote_version_id: v.id,
      package_id: v.package_id,
      checkout_session_id: session.id,
      amount_cents: amount,
    })
    .execute();
  return { ok: true, url: session.url };
}

export type EventOutcome = "applied" | "duplicate" | "held" | "ignored";

const str = (v: unknown) => (typeof v === "string" ? v : null);

/**
 * Applies one verified event once. The event row is inserted first (its id is the
 * primary key), so a repeated delivery finds it and changes nothing; a refund that comes
 * before the payment it refunds is held and applied when that payment arrives.
 */
export async function applyPaymentEvent(db: Db, event: Stripe.Event): Promise<EventOutcome> {
  return inTransaction(db, async (trx) => {
    const inserted = await trx
      .insertInto("payment_events")
      .values({
        event_id: event.id,
        type: event.type,
        payload: JSON.stringify(event),
        outcome: "received",
      })
      .onConflict((oc) => oc.column("event_id").doNothing())
      .returning("event_id")
      .executeTakeFirst();
    if (!inserted) return "duplicate";
    const outcome = await applyOne(trx, event);
    await trx
      .updateTable("payment_events")
      .set({ outcome, applied_at: outcome === "held" ? null : sql`now()` })
      .where("event_id", "=", event.id)
      .execute();
    return outcome;
  });
}

async function applyOne(trx: Db, event: Stripe.Event): Promise<EventOutcome> {
  const obj = event.data.object as unknown as Record<string, unknown>;
  switch (event.type) {
    case "checkout.session.completed": {
      const sessionId = str(obj.id);
      if (!sessionId || obj.payment_status !== "paid") return "ignored";
      const payment = await trx
        .selectFrom("payments")
        .selectAll()
        .where("checkout_session_id", "=", sessionId)
        .forUpdate()
        .executeTakeFirst();
      if (!payment || payment.status === "paid") return "ignored";
      const intent = str(obj.payment_intent);
      await trx
        .updateTable("payments")
        .set({
          status: "paid",
          payment_intent_id: intent,
          paid_at: sql`now()`,
          updated_at: sql`now()`,
          failure: null,
        })
        .where("id", "=", payment.id)
        .execute();
      await trx
        .updateTable("quote_versions")
        .set({ status: "approved", approved_at: sql`coalesce(approved_at, now())` })
        .where("id", "=", payment.quote_version_id)
        .execute();
      await moveStatus(trx, payment.package_id, "quoted", "approved", null, "Deposit paid");
      await sendReceipt(trx, payment.id);
      if (intent) await applyHeldRefunds(trx, intent);
      return "applied";
    }
    case "payment_intent.payment_failed": {
      const meta = (obj.metadata ?? {}) as Record<string, string>;
      const sessionId = meta.checkout_session;
      const message =
        str((obj.last_payment_error as Record<string, unknown> | undefined)?.message) ??
        "The payment failed.";
      if (!sessionId) return "ignored";
      const done = await trx
        .updateTable("payments")
        .set({ status: "declined", failure: message, updated_at: sql`now()` })
        .where("checkout_session_id", "=", sessionId)
        .where("status", "=", "open")
        .executeTakeFirst();
      return Number(done.numUpdatedRows) > 0 ? "applied" : "ignored";
    }
    case "checkout.session.expired": {
      const sessionId = str(obj.id);
      if (!sessionId) return "ignored";
      await trx
        .updateTable("payments")
        .set({ status: "expired", updated_at: sql`now()` })
        .where("checkout_session_id", "=", sessionId)
        .where("status", "in", ["open", "declined"])
        .execute();
      return "applied";
    }
    case "refund.created": {
      const intent = str(obj.payment_intent);
      const amount = Number(obj.amount);
      if (!intent || !Number.isSafeInteger(amount) || amount <= 0) return "ignored";
      const payment = await trx
        .selectFrom("payments")
        .select(["id", "status"])
        .where("payment_intent_id", "=", intent)
        .forUpdate()
        .executeTakeFirst();
      if (!payment) return "held";
      await applyRefund(trx, payment.id, amount);
      return "applied";
    }
    default:
      return "ignored";
  }
}

async function applyRefund(trx: Db, paymentId: number, amount: number) {
  await trx
    .updateTable("payments")
    .set({
      refunded_cents: sql`least(amount_cents, refunded_cents + ${amount})`,
      status: sql`case when refunded_cents + ${amount} >= amount_cents then 'refunded' else 'partly_refunded' end`,
      updated_at: sql`now()`,
    })
    .where("id", "=", paymentId)
    .execute();
}

async function applyHeldRefunds(trx: Db, intent: string) {
  const held = await trx
    .selectFrom("payment_events")
    .select(["event_id", "payload"])
    .where("outcome", "=", "held")
    .where("type", "=", "refund.created")
    .where(sql<boolean>`payload->'data'->'object'->>'payment_intent' = ${intent}`)
    .orderBy("received_at")
    .execute();
  for (const h of held) {
    const amount = Number(
      ((h.payload as Stripe.Event).data.object as unknown as { amount?: unknown }).amount,
    );
    if (!Number.isSafeInteger(amount) || amount <= 0) continue;
    const payment = await trx
      .selectFrom("payments")
      .select("id")
      .where("payment_intent_id", "=", intent)
      .executeTakeFirstOrThrow();
    await applyRefund(trx, payment.id, amount);
    await trx
      .updateTable("payment_events")
      .set({ outcome: "applied", applied_at: sql`now()` })
      .where("event_id", "=", h.event_id)
      .execute();
  }
}

async function sendReceipt(trx: Db, paymentId: number) {
  const p = await trx
    .selectFrom("payments as pay")
    .innerJoin("quote_versions as q", "q.id", "pay.quote_version_id")
    .innerJoin("packages as pk", "pk.id", "pay.package_id")
    .select([
      "pay.id",
      "pay.amount_cents",
      "q.number",
      "q.customer_email",
      "q.customer_name",
      "q.total_cents",
      "pk.name",
    ])
    .where("pay.id", "=", paymentId)
    .executeTakeFirstOrThrow();
  const s = await getQuoteSettings(trx);
  const money = (c: number) =>
    new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(c / 100);
  await queueMail(trx, {
    key: `deposit-receipt:${p.id}`,
    to: p.customer_email,
    subject: `Deposit received — ${s.shopName}`,
    text: [
      `Hello ${p.customer_name},`,
      "",
      `We received your deposit of ${money(Number(p.amount_cents))} for quote ${p.number}, "${p.name}".`,
      `The quote total is ${money(Number(p.total_cents))}; the rest is due when the bike is delivered.`,
      "We will call you to book the bike in.",
      "",
      `${s.shopName} · ${s.shopPhone}`,
    ].join("\n"),
  });
}

export type RefundOutcome = { ok: true } | { ok: false; message: string };

/** The owner refunds a paid deposit (whole, or the amount given); the webhook records it. */
export async function refundDeposit(
  db: Db,
  paymentId: number,
  amountCents?: number,
): Promise<RefundOutcome> {
  const p = await db
    .selectFrom("payments")
    .select(["id", "status", "payment_intent_id", "amount_cents", "refunded_cents"])
    .where("id", "=", paymentId)
    .executeTakeFirst();
  if (!p || !p.payment_intent_id || !["paid", "partly_refunded"].includes(p.status))
    return { ok: false, message: "Only a paid deposit can be refunded." };
  const left = Number(p.amount_cents) - Number(p.refunded_cents);
  if (amountCents !== undefined && (amountCents <= 0 || amountCents > left))
    return {
      ok: false,
      message: "The refund must be more than 0 and at most what is left of the deposit.",
    };
  try {
    await stripe().refunds.create({
      payment_intent: p.payment_intent_id,
      ...(amountCents !== undefined ? { amount: amountCents } : {}),
      metadata: { payment_id: String(p.id) },
    });
  } catch (e) {
    if (isServiceDown(e))
      return {
        ok: false,
        message: SERVICE_DOWN.replace("Nothing was charged", "Nothing was refunded"),
      };
    if (e instanceof Stripe.errors.StripeError)
      return { ok: false, message: `The payment service refused the refund: ${e.message}` };
    throw e;
  }
  return { ok: true };
}

export async function listPayments(db: Db, packageId: number) {
  const rows = await db
    .selectFrom("payments as p")
    .innerJoin("quote_versions as q", "q.id", "p.quote_version_id")
    .select([
      "p.id",
      "p.status",
      "p.amount_cents",
      "p.refunded_cents",
      "p.failure",
      "p.created_at",
      "p.paid_at",
      "q.number",
    ])
    .where("p.package_id", "=", packageId)
    .orderBy("p.created_at", "desc")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    status: r.status,
    amountCents: Number(r.amount_cents),
    refundedCents: Number(r.refunded_cents),
    failure: r.failure,
    createdAt: new Date(r.created_at).toISOString(),
    paidAt: r.paid_at ? new Date(r.paid_at).toISOString() : null,
    quoteNumber: r.number,
  }));
}
