import type Stripe from "stripe";
import type { Route } from "./+types/api.webhooks.payments";
import { getDb } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { applyPaymentEvent } from "~/lib/payments/deposits.server";
import { paymentsConfigured, stripe, webhookSecret } from "~/lib/payments/stripe.server";

// POST /api/webhooks/payments — the payment service's signed events. No session: the
// signature (the shop's webhook secret) is the permission. Each event is applied once.
const MAX_BODY = 256 * 1024;

const json = (status: number, body: unknown) =>
  Response.json(body, { status, headers: { "Cache-Control": "no-store" } });

export async function loader() {
  return json(405, { error: "Send events with POST." });
}

export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return json(405, { error: "Send events with POST." });
  // the service posts from its servers, with no Origin; a browser's post from a page is not
  // an event, wherever it comes from
  const origin = request.headers.get("Origin");
  if (origin && origin !== new URL(env().APP_URL).origin)
    return json(403, { error: "Events come from the payment service, not from a web page." });
  if (!paymentsConfigured()) return json(503, { error: "Payments are not set up on this server." });
  const signature = request.headers.get("stripe-signature");
  if (!signature) return json(400, { error: "The event has no signature." });
  const length = Number(request.headers.get("content-length") ?? "0");
  if (length > MAX_BODY) return json(413, { error: "The event is too large." });
  const body = await request.text();
  if (body.length > MAX_BODY) return json(413, { error: "The event is too large." });
  let event: Stripe.Event;
  try {
    event = stripe().webhooks.constructEvent(body, signature, webhookSecret());
  } catch {
    return json(400, { error: "The event's signature does not match; nothing was recorded." });
  }
  const outcome = await applyPaymentEvent(getDb(), event);
  return json(200, { received: true, outcome });
}
