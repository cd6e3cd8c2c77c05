// The local stand-in for the hosted payment service, on loopback. It speaks the few
// endpoints of the service's HTTP API that the `stripe` SDK calls for us (form-encoded
// bodies with bracket keys, errors as `{ error: { type, message } }`), serves a test
// checkout page where the payer succeeds, is declined or cancels, and sends signed
// webhooks the way the hosted service does (retrying while the receiver fails).
//
//   POST /v1/checkout/sessions          create a checkout session
//   GET  /v1/checkout/sessions/:id      read one
//   POST /v1/checkout/sessions/:id/expire
//   POST /v1/refunds                    refund a paid payment (whole or part)
//   GET  /checkout/:id                  the test checkout page
//   POST /checkout/:id                  the payer's choice: outcome=succeed|decline|cancel
//   GET  /_local/events                 every event sent, newest last (tests read these)
//   POST /_local/down  {down: boolean}  make the API answer 503 (a service outage)
//   POST /_local/resend/:eventId        send an event again (a repeated delivery)
import { createHmac, randomBytes } from "node:crypto";
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";

type Json = Record<string, unknown>;

export type FakeEvent = {
  id: string;
  type: string;
  created: number;
  data: { object: Json };
  /** the signed header sent with it, so a test can deliver it again itself */
  signature: string;
  payload: string;
  delivered: boolean;
  attempts: number;
};

type Session = {
  id: string;
  object: "checkout.session";
  mode: "payment";
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  metadata: Record<string, string>;
  success_url: string;
  cancel_url: string;
  url: string;
  payment_intent: string | null;
  customer_email: string | null;
  description: string;
  created: number;
  expires_at: number;
  livemode: false;
};

type Payment = { id: string; amount: number; refunded: number; currency: string; session: string };

export type PaymentFake = {
  port: number;
  url: string;
  events: FakeEvent[];
  stop: () => Promise<void>;
};

const id = (prefix: string) => `${prefix}_${randomBytes(12).toString("hex")}`;
const now = () => Math.floor(Date.now() / 1000);

/** `a[b][0][c]=1` → { a: { b: [ { c: "1" } ] } } — the form encoding the SDK sends. */
export function parseBracketForm(body: string): Json {
  const out: Json = {};
  for (const [rawKey, value] of new URLSearchParams(body)) {
    const parts = rawKey.split(/\[|\]\[|\]/).filter((p) => p !== "");
    let node: Record<string, unknown> = out;
    parts.forEach((part, i) => {
      if (part === "__proto__" || part === "constructor" || part === "prototype") return;
      if (i === parts.length - 1) {
        node[part] = value;
        return;
      }
      const next = Object.hasOwn(node, part) ? node[part] : undefined;
      if (typeof next !== "object" || next === null) node[part] = {};
      node = node[part] as Record<string, unknown>;
    });
  }
  return out;
}

function sign(payload: string, secret: string): string {
  const t = now();
  const v1 = createHmac("sha256", secret).update(`${t}.${payload}`).digest("hex");
  return `t=${t},v1=${v1}`;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export async function startPaymentFake(opts: {
  port?: number;
  webhookSecret: string;
  /** where to post webhooks; unset keeps them only in /_local/events */
  webhookUrl?: string;
  quiet?: boolean;
}): Promise<PaymentFake> {
  const sessions = new Map<string, Session>();
  const payments = new Map<string, Payment>();
  const events: FakeEvent[] = [];
  let down = false;
  let stopped = false;
  const timers = new Set<NodeJS.Timeout>();
  let base = "";

  const log = (line: string) => {
    if (!opts.quiet) console.log(`payments: ${line}`);
  };

  async function deliver(event: FakeEvent) {
    if (!opts.webhookUrl || stopped) return;
    event.attempts += 1;
    try {
      const res = await fetch(opts.webhookUrl, {
        method: "POST",
        headers: { "Content-Type": "application/json", "Stripe-Signature": event.signature },
        body: event.payload,
        signal: AbortSignal.timeout(5000),
      });
      event.delivered = res.ok;
      if (!res.ok) log(`webhook ${event.type} answered ${res.status}`);
    } catch (e) {
      event.delivered = false;
      log(`webhook ${event.type} failed: ${e instanceof Error ? e.message : String(e)}`);
    }
    // The hosted service retries failed deliveries with a growing delay; locally, quickly.
    if (!event.delivered && event.attempts < 8 && !stopped) {
      const t = setTimeout(
        () => {
          timers.delete(t);
          void deliver(event);
        },
        250 * 2 ** event.attempts,
      );
      timers.add(t);
    }
  }

  function emit(type: string, object: Json): FakeEvent {
    const body = {
      id: id("evt"),
      object: "event",
      api_version: "2025-01-01",
      type,
      created: now(),
      livemode: false,
      data: { object },
    };
    const payload = JSON.stringify(body);
    const event: FakeEvent = {
      id: body.id,
      type,
      created: body.created,
      data: body.data,
      payload,
      signature: sign(payload, opts.webhookSecret),
      delivered: false,
      attempts: 0,
    };
    events.push(event);
    log(`event ${type} ${event.id}`);
    void deliver(event);
    return event;
  }

  const apiError = (res: ServerResponse, status: number, type: string, message: string) =>
    send(res, status, { error: { type, message } });

  function send(res: ServerResponse, status: number, body: unknown) {
    res.writeHead(status, { "Content-Type": "application/json", "Cache-Control": "no-store" });
    res.end(JSON.stringify(body));
  }

  function html(res: ServerResponse, status: number, body: string) {
    res.writeHead(status, {
      "Content-Type": "text/html; charset=utf-8",
      "Cache-Control": "no-store",
    });
    res.end(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>Test checkout</title>
<style>body{font-family:system-ui,sans-serif;background:#f4f6f8;color:#1f2933;margin:0;padding:2rem 1rem}main{max-width:28rem;margin:0 auto;background:#fff;border:1px solid #c5ced8;border-radius:8px;padding:1.5rem}h1{font-size:1.25rem;margin:0 0 .25rem}p{margin:.5rem 0}.amount{font-size:2rem;font-variant-numeric:tabular-nums;margin:1rem 0}button{display:block;width:100%;margin:.5rem 0;padding:.75rem;font-size:1rem;border-radius:6px;border:1px solid #46525e;background:#fff;color:#1f2933;cursor:pointer}button.pay{background:#0b6e70;border-color:#0b6e70;color:#fff}.note{font-size:.85rem;color:#46525e}.error{color:#a32b25;font-weight:600}</style></head><body><main>${body}</main></body></html>`);
  }

  function checkoutPage(res: ServerResponse, s: Session, error?: string) {
    const amount = new Intl.NumberFormat("en-US", {
      style: "currency",
      currency: s.currency.toUpperCase(),
    }).format(s.amount_total / 100);
    html(
      res,
      200,
      `<h1>Test checkout</h1><p class="note">Local test payment page: no card is charged and no card number is asked for.</p>
<p>${escapeHtml(s.description)}</p><p class="amount" data-amount>${amount}</p>
${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ""}
${
  s.status === "open"
    ? `<form method="post"><button class="pay" name="outcome" value="succeed">Pay ${amount}</button>
<button name="outcome" value="decline">Pay with a card that is declined</button>
<button name="outcome" value="cancel">Cancel and go back</button></form>`
    : `<p>This checkout is ${s.status === "complete" ? "already paid" : "expired"}.</p>`
}`,
    );
  }

  async function readBody(req: IncomingMessage): Promise<string> {
    const chunks: Buffer[] = [];
    let size = 0;
    for await (const chunk of req) {
      size += (chunk as Buffer).length;
      if (size > 1_000_000) throw new Error("body too large");
      chunks.push(chunk as Buffer);
    }
    return Buffer.concat(chunks).toString("utf8");
  }

  function createSession(params: Json): Session | string {
    const items = params.line_items as Record<string, Json> | undefined;
    let total = 0;
    let description = "";
    if (!items || typeof items !== "object") return "line_items is required";
    for (const item of Object.values(items)) {
      const priceData = item.price_data as Json | undefined;
      const productData = priceData?.product_data as Json | undefined;
      const unit = Number(priceData?.unit_amount);
      const quantity = Number(item.quantity ?? 1);
      if (!Number.isSafeInteger(unit) || unit < 0) return "unit_amount must be an integer";
      if (!Number.isSafeInteger(quantity) || quantity < 1) return "quantity must be positive";
      total += unit * quantity;
      description ||= String(productData?.name ?? "");
    }
    if (total < 50) return "The amount must be at least 0.50";
    const currency = String(
      (Object.values(items)[0]?.price_data as Json | undefined)?.currency ?? "usd",
    );
    const sid = id("cs_test");
    const session: Session = {
      id: sid,
      object: "checkout.session",
      mode: "payment",
      status: "open",
      payment_status: "unpaid",
      amount_total: total,
      currency,
      client_reference_id: params.client_reference_id ? String(params.client_reference_id) : null,
      metadata: Object.fromEntries(
        Object.entries((params.metadata as Json | undefined) ?? {}).map(([k, v]) => [k, String(v)]),
      ),
      success_url: String(params.success_url ?? ""),
      cancel_url: String(params.cancel_url ?? ""),
      url: `${base}/checkout/${sid}`,
      payment_intent: null,
      customer_email: params.customer_email ? String(params.customer_email) : null,
      description,
      created: now(),
      expires_at: now() + 24 * 3600,
      livemode: false,
    };
    if (!session.success_url || !session.cancel_url)
      return "success_url and cancel_url are required";
    sessions.set(sid, session);
    return session;
  }

  const server: Server = createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? "/", "http://127.0.0.1");
      const path = url.pathname;
      const method = req.method ?? "GET";
      try {
        if (path === "/_local/events" && method === "GET") return send(res, 200, events);
        if (path === "/_local/down" && method === "POST") {
          down = Boolean((JSON.parse((await readBody(req)) || "{}") as Json).down);
          return send(res, 200, { down });
        }
        const resend = /^\/_local\/resend\/([\w]+)$/.exec(path);
        if (resend && method === "POST") {
          const event = events.find((e) => e.id === resend[1]);
          if (!event) return send(res, 404, { error: "no such event" });
          event.attempts = 0;
          await deliver(event);
          return send(res, 200, { delivered: event.delivered });
        }

        if (path.startsWith("/v1/")) {
          if (down) return apiError(res, 503, "api_error", "The payment service is unavailable.");
          const auth = req.headers.authorization ?? "";
          if (!/^Bearer sk_test_\w+/.test(auth))
            return apiError(res, 401, "authentication_error", "Invalid API key provided.");
          const params = method === "POST" ? parseBracketForm(await readBody(req)) : {};
          if (path === "/v1/checkout/sessions" && method === "POST") {
            const made = createSession(params);
            if (typeof made === "string") return apiError(res, 400, "invalid_request_error", made);
            return send(res, 200, made);
          }
          const one = /^\/v1\/checkout\/sessions\/([\w]+)(\/expire)?$/.exec(path);
          if (one) {
            const s = sessions.get(one[1]);
            if (!s)
              return apiError(
                res,
                404,
                "invalid_request_error",
                `No such checkout.session: '${one[1]}'`,
              );
            if (one[2] && method === "POST") {
              if (s.status !== "open")
                return apiError(
                  res,
                  400,
                  "invalid_request_error",
                  "Only an open session can expire.",
                );
              s.status = "expired";
              emit("checkout.session.expired", { ...s });
            }
            return send(res, 200, s);
          }
          if (path === "/v1/refunds" && method === "POST") {
            const pi = String(params.payment_intent ?? "");
            const payment = payments.get(pi);
            if (!payment)
              return apiError(res, 404, "invalid_request_error", `No such payment_intent: '${pi}'`);
            const left = payment.amount - payment.refunded;
            const amount = params.amount === undefined ? left : Number(params.amount);
            if (!Number.isSafeInteger(amount) || amount <= 0 || amount > left)
              return apiError(
                res,
                400,
                "invalid_request_error",
                "The refund is more than what is left to refund.",
              );
            payment.refunded += amount;
            const refund = {
              id: id("re"),
              object: "refund",
              amount,
              currency: payment.currency,
              payment_intent: pi,
              status: "succeeded",
              metadata: Object.fromEntries(
                Object.entries((params.metadata as Json | undefined) ?? {}).map(([k, v]) => [
                  k,
                  String(v),
                ]),
              ),
              created: now(),
            };
            emit("refund.created", refund);
            return send(res, 200, refund);
          }
          return apiError(
            res,
            404,
            "invalid_request_error",
            `Unrecognized request URL (${method}: ${path}).`,
          );
        }

        const page = /^\/checkout\/([\w]+)$/.exec(path);
        if (page) {
          const s = sessions.get(page[1]);
          if (!s) return html(res, 404, "<h1>No such checkout</h1>");
          if (method === "GET") return checkoutPage(res, s);
          const outcome = new URLSearchParams(await readBody(req)).get("outcome");
          if (s.status !== "open") return checkoutPage(res, s);
          if (outcome === "cancel") {
            res.writeHead(303, { Location: s.cancel_url });
            return res.end();
          }
          if (outcome === "decline") {
            emit("payment_intent.payment_failed", {
              id: id("pi"),
              object: "payment_intent",
              amount: s.amount_total,
              currency: s.currency,
              status: "requires_payment_method",
              metadata: { ...s.metadata, checkout_session: s.id },
              last_payment_error: { code: "card_declined", message: "Your card was declined." },
            });
            return checkoutPage(res, s, "Your card was declined. Try another card or cancel.");
          }
          if (outcome === "succeed") {
            const pi = id("pi");
            s.status = "complete";
            s.payment_status = "paid";
            s.payment_intent = pi;
            payments.set(pi, {
              id: pi,
              amount: s.amount_total,
              refunded: 0,
              currency: s.currency,
              session: s.id,
            });
            emit("checkout.session.completed", { ...s });
            res.writeHead(303, { Location: s.success_url.replace("{CHECKOUT_SESSION_ID}", s.id) });
            return res.end();
          }
          return checkoutPage(res, s, "Choose one of the buttons.");
        }
        send(res, 404, { error: "not found" });
      } catch (e) {
        apiError(res, 400, "invalid_request_error", e instanceof Error ? e.message : String(e));
      }
    })();
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 0, "127.0.0.1", () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  base = `http://127.0.0.1:${port}`;
  return {
    port,
    url: base,
    events,
    stop: async () => {
      stopped = true;
      for (const t of timers) clearTimeout(t);
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
    },
  };
}
