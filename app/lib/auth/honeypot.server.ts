import { createHmac, timingSafeEqual } from "node:crypto";
import { env } from "../env.server";
import {
  FORM_EXPIRED,
  FORM_NOT_FROM_PAGE,
  HONEYPOT_LIFETIME_MS,
  HONEYPOT_STAMP,
  HONEYPOT_TRAP,
  type HoneypotStamp,
} from "./honeypot";

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
 * Why a public form's post is refused, or null: FORM_NOT_FROM_PAGE when the trap field
 * has a value or the stamp is missing, altered or from the future (a script, not our
 * page); FORM_EXPIRED when the page was loaded more than HONEYPOT_LIFETIME_MS ago.
 */
export function honeypotRefusal(form: FormData, now = Date.now()): string | null {
  const trap = form.get(HONEYPOT_TRAP);
  if (typeof trap === "string" ? trap !== "" : trap !== null) return FORM_NOT_FROM_PAGE;
  const stamp = form.get(HONEYPOT_STAMP);
  if (typeof stamp !== "string") return FORM_NOT_FROM_PAGE;
  const [at, signature] = stamp.split(".");
  if (!at || !signature || !/^\d{1,15}$/.test(at)) return FORM_NOT_FROM_PAGE;
  const expected = Buffer.from(sign(at));
  const given = Buffer.from(signature);
  if (expected.length !== given.length || !timingSafeEqual(expected, given))
    return FORM_NOT_FROM_PAGE;
  // a little slack for clocks of several app servers
  if (Number(at) > now + 60_000) return FORM_NOT_FROM_PAGE;
  if (Number(at) < now - HONEYPOT_LIFETIME_MS) return FORM_EXPIRED;
  return null;
}

/** True when the post is refused for any of the reasons above. */
export function trippedHoneypot(form: FormData, now = Date.now()): boolean {
  return honeypotRefusal(form, now) !== null;
}
