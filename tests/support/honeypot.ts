// The hidden fields a person's browser sends with a public form (see app/lib/auth/honeypot.ts).
import { HONEYPOT_STAMP, HONEYPOT_TRAP } from "~/lib/auth/honeypot";
import { honeypotStamp } from "~/lib/auth/honeypot.server";

/** `fields` plus what the page's honeypot adds: an empty trap and the page's stamp. */
export function asFromPage(fields: Record<string, string>): Record<string, string> {
  return {
    ...fields,
    [HONEYPOT_TRAP]: "",
    [HONEYPOT_STAMP]: honeypotStamp(Date.now() - 5000).stamp,
  };
}
