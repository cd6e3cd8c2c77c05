// Fixtures for build requests, engine families and customers (integration tests).
import { randomBytes } from "node:crypto";
import type { Db } from "~/lib/db.server";
import { CLIENT_ADDRESS_HEADER } from "~/lib/auth/throttle.server";
import { form, signedOutRequest } from "./auth";
import { asFromPage } from "./honeypot";

export const tagOf = () => randomBytes(4).toString("hex");

/** A shop row with an e-mail, so the shop's copy of a request has somewhere to go. */
export async function ensureShop(db: Db) {
  const shop = await db.selectFrom("shop").select("id").executeTakeFirst();
  if (!shop)
    await db
      .insertInto("shop")
      .values({
        name: "Test Twin Shop",
        city: "Testville",
        phone: "555-0100",
        email: "shop@shop.test",
        labour_rate_cents: 10000,
      })
      .execute();
}

/** A rider's valid form, as the page posts it. */
export function riderFields(tag: string, over: Record<string, string> = {}) {
  return asFromPage({
    name: `Rider ${tag}`,
    email: `rider-${tag}@example.test`,
    phone: "555-0199",
    contactBy: "phone",
    bikeYear: "2019",
    engineFamily: "unsure",
    bikeModel: "Longhaul tourer",
    mileage: "31000",
    currentParts: "big-bore kit two years ago\naftermarket exhaust",
    goals: "More passing power two-up in the mountains.",
    riding: "two_up",
    budget: "6k_10k",
    timeFrame: "3_months",
    consent: "on",
    ...over,
  });
}

/** A post to /build-request from one client address (each test its own). */
export function postRequest(fields: Record<string, string>, address: string) {
  return signedOutRequest("/build-request", {
    method: "POST",
    body: form(fields),
    headers: {
      "Content-Type": "application/x-www-form-urlencoded",
      [CLIENT_ADDRESS_HEADER]: address,
    },
  });
}
