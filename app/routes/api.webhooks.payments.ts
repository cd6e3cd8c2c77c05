import type Stripe from "stripe";
import type { Route } from "./+types/api.webhooks.payments";
import { getDb } from "~/lib/db.server";
import { readBytes, readForm } from "~/lib/http/body";
import { env } from "~/lib/env.server";
import { applyPaymentEvent } from "~/lib/payments/deposits.server";
import { paymentsConfigured, stripe, webhookSecret } from "~/lib/payments/stripe.server";

// POST /api/webhooks/payments — the payment service's signed events. No session: the
// signature (the shop's webhook secret) is the permission. Each event is applied once.
const MAX_BODY = 256 * 1024;

const json = (status: number, body: unknown) =>
  Response.json(body, { status, headers: { "Cache-Control": "no-store" } });

/** A refusal thrown by the shared body reader, as this route's JSON answer. */
function refused(e: unknown) {
  const init = (e as { init?: { status?: number } } | null)?.init;
  if (typeof init?.status !== "number") throw e;
  return json(init.status, { error: String((e as { data?: unknown }).data) });
}

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
  const mime = (request.headers.get("Content-Type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (mime === "application/x-www-form-urlencoded" || mime === "multipart/form-data") {
    // not an event; a form still gets the shared reader's checks (size, control characters)
    try {
      await readForm(request, { limitBytes: MAX_BODY });
    } catch (e) {
      return refused(e);
    }
    return json(415, { error: "Events are JSON, not a form; nothing was recorded." });
  }
  let body: string;
  try {
    body = new TextDecoder().decode(
      await readBytes(request, MAX_BODY, "The event is larger than 256 KB."),
    );
  } catch (e) {
    return refused(e);
  }
  if (!paymentsConfigured()) return json(503, { error: "Payments are not set up on this server." });
  const signature = request.headers.get("stripe-signature");
  if (!signature) return json(400, { error: "The event has no signature." });
  let event: Stripe.Event;
  try {
    event = stripe().webhooks.constructEvent(body, signature, webhookSecret());
  } catch {
    return json(400, { error: "The event's signature does not match; nothing was recorded." });
  }
  const outcome = await applyPaymentEvent(getDb(), event);
  return json(200, { received: true, outcome });
}
