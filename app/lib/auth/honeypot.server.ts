import { createHmac, timingSafeEqual } from "node:crypto";
import { env } from "../env.server";
import { HONEYPOT_STAMP, HONEYPOT_TRAP, type HoneypotStamp } from "./honeypot";

function sign(at: string): string {
  return createHmac("sha256", env().SESSION_SECRET)
    .update(`honeypot:${at}`)
    .digest("base64url")
    .slice(0, 22);
}

/** A fresh stamp for a public form's loader. */
export function honeypotStamp(now = Date.now()): HoneypotStamp {
  const at = String(now);
  return { stamp: `${at}.${sign(at)}` };
}

/**
 * True when the post did not come from a person using our page: the trap field has a
 * value, or the stamp is missing, altered, or from the future. Such posts get the usual
 * answer of the form and nothing is done.
 */
export function trippedHoneypot(form: FormData, now = Date.now()): boolean {
  const trap = form.get(HONEYPOT_TRAP);
  if (typeof trap === "string" ? trap !== "" : trap !== null) return true;
  const stamp = form.get(HONEYPOT_STAMP);
  if (typeof stamp !== "string") return true;
  const [at, signature] = stamp.split(".");
  if (!at || !signature || !/^\d{1,15}$/.test(at)) return true;
  const expected = Buffer.from(sign(at));
  const given = Buffer.from(signature);
  if (expected.length !== given.length || !timingSafeEqual(expected, given)) return true;
  // a little slack for clocks of several app servers
  return Number(at) > now + 60_000;
}
