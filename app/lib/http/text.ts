// One guard for text that arrives from outside and is stored or searched: control
// characters other than tab, line feed and carriage return (browsers send a textarea's
// new lines as CR LF) are refused. PostgreSQL cannot store a NUL at all, and the others
// are never typed by a person.
import { data } from "react-router";

// C0 controls except \t \n \r, DEL, and the C1 block
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;

export const CONTROL_CHAR_MESSAGE =
  "Contains a control character (such as a NUL byte) that cannot be stored; remove it";

export function hasControlChars(s: string): boolean {
  return CONTROL.test(s);
}

/** The first field whose text (name or value) holds a control character, or null. */
export function controlCharField(entries: Iterable<[string, FormDataEntryValue]>): string | null {
  for (const [k, v] of entries) {
    if (hasControlChars(k)) return "form";
    if (typeof v === "string" && hasControlChars(v)) return k;
  }
  return null;
}

/** The field name as shown in a message: printable, short. */
export function fieldLabel(name: string): string {
  const clean = name.replace(CONTROL, "").slice(0, 40);
  return clean || "form";
}

export function controlCharMessage(field: string): string {
  return `The “${fieldLabel(field)}” field ${CONTROL_CHAR_MESSAGE.charAt(0).toLowerCase()}${CONTROL_CHAR_MESSAGE.slice(1)}.`;
}

/**
 * The query string of a request with every value checked: a control character in any
 * value is a 400 naming the parameter (a page's error page, or JSON for an API route).
 */
export function readQuery(request: Request, opts: { json?: boolean } = {}): URLSearchParams {
  const params = new URL(request.url).searchParams;
  const bad = controlCharField(params.entries());
  if (bad !== null) {
    const message = controlCharMessage(bad);
    if (opts.json) throw Response.json({ error: message, field: fieldLabel(bad) }, { status: 400 });
    throw data(message, { status: 400 });
  }
  return params;
}
