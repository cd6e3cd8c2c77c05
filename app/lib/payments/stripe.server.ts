// The payment service through its SDK. Locally STRIPE_API_URL points at the fake on
// loopback (scripts/services/payment-fake.ts); in production it is unset and the SDK talks
// to the hosted service with the shop's own keys.
import Stripe from "stripe";
import { env } from "../env.server";

let client: Stripe | undefined;
let clientKey = "";

export class PaymentsNotConfigured extends Error {
  constructor() {
    super("Payments are not set up: STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET are needed.");
    this.name = "PaymentsNotConfigured";
  }
}

export function paymentsConfigured(): boolean {
  const e = env();
  return Boolean(e.STRIPE_SECRET_KEY && e.STRIPE_WEBHOOK_SECRET);
}

export function stripe(): Stripe {
  const e = env();
  if (!e.STRIPE_SECRET_KEY) throw new PaymentsNotConfigured();
  const key = `${e.STRIPE_SECRET_KEY}|${e.STRIPE_API_URL ?? ""}`;
  if (!client || clientKey !== key) {
    const local = e.STRIPE_API_URL ? new URL(e.STRIPE_API_URL) : null;
    client = new Stripe(e.STRIPE_SECRET_KEY, {
      maxNetworkRetries: local ? 0 : 2,
      telemetry: false,
      timeout: 10_000,
      ...(local
        ? {
            host: local.hostname,
            port: Number(local.port || (local.protocol === "https:" ? 443 : 80)),
            protocol: local.protocol === "https:" ? "https" : "http",
          }
        : {}),
    });
    clientKey = key;
  }
  return client;
}

export function webhookSecret(): string {
  const secret = env().STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new PaymentsNotConfigured();
  return secret;
}

/** True for the SDK's errors that mean "the service could not be reached or failed". */
export function isServiceDown(e: unknown): boolean {
  return (
    e instanceof Stripe.errors.StripeConnectionError ||
    e instanceof Stripe.errors.StripeAPIError ||
    (e instanceof Stripe.errors.StripeError && (e.statusCode ?? 0) >= 500)
  );
}
