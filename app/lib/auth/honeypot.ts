// Honeypot fields of the public forms (sign-in, reset request, invite, build request).
// People never see them; a script that fills every input, or posts without loading the
// page, trips them. The names are shared by the form (browser) and the check (server).
export const HONEYPOT_TRAP = "website";
export const HONEYPOT_STAMP = "form_loaded";

/** What a page's loader hands its form: the signed moment the page was rendered. */
export type HoneypotStamp = { stamp: string };

/** What a person whose page was loaded before a change of the app would need to do. */
export const FORM_NOT_FROM_PAGE =
  "This form could not be accepted. Reload the page and send it again.";

/** How long a rendered public form may be sent: a person reads it in minutes, not days. */
export const HONEYPOT_LIFETIME_MS = 4 * 60 * 60 * 1000;

/** A form whose page was loaded longer ago than that. */
export const FORM_EXPIRED = "This form has expired; reload the page and send it again.";
