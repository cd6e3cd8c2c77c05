// One parser for every id and whole number that arrives from outside: a route param, a
// query string value or a form field. PostgreSQL's `integer` columns hold at most
// 2,147,483,647, so anything beyond it (or a fraction, an exponent, a sign, a space)
// is not an id of ours.
import { data } from "react-router";
import { z } from "zod";

export const MAX_DB_INT = 2_147_483_647;

/** A positive whole number within PostgreSQL's integer range, written in plain digits. */
export function parseId(raw: unknown): number | null {
  if (typeof raw !== "string" || !/^[1-9][0-9]{0,9}$/.test(raw)) return null;
  const n = Number(raw);
  return n <= MAX_DB_INT ? n : null;
}

/** A route param that must be an id: anything else is a page that does not exist. */
export function requireIdParam(params: Record<string, string | undefined>, name = "id"): number {
  const id = parseId(params[name]);
  if (id === null) throw data("Not found", { status: 404 });
  return id;
}

/** A refused query-string or form value: 400 with the field's own message. */
export class BadValue extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/** Throws what a page's loader answers for a bad query value (the error page shows the message). */
export function badQuery(field: string, message: string): never {
  throw data(`${message} (the “${field}” value in the address)`, { status: 400 });
}

/**
 * An optional whole number from the query string: absent or empty → null; otherwise a
 * positive integer up to `max` (an id by default), else 400 naming the field.
 */
export function queryInt(
  params: URLSearchParams,
  name: string,
  opts: { max?: number; message?: string; json?: boolean } = {},
): number | null {
  const raw = params.get(name);
  if (raw === null || raw === "") return null;
  const max = opts.max ?? MAX_DB_INT;
  const n = parseId(raw);
  if (n === null || n > max) {
    const message =
      opts.message ?? `Must be a whole number from 1 to ${max.toLocaleString("en-US")}`;
    if (opts.json)
      throw Response.json(
        { error: `${message} (the “${name}” value in the address)`, field: name },
        { status: 400 },
      );
    badQuery(name, message);
  }
  return n;
}

/** A form field that must be an id (a select's value, a revision number). */
export function zId(message: string) {
  return z
    .string({ error: message })
    .refine((s) => parseId(s) !== null, message)
    .transform((s) => parseId(s) as number);
}

/** An optional form id: empty means none. */
export function zOptionalId(message: string) {
  return z.preprocess((v) => (v === "" ? undefined : v), zId(message).optional());
}
