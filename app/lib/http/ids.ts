// One parser for every id and whole number that arrives from outside: a route param, a
// query string value or a form field. PostgreSQL's `integer` columns hold at most
// 2,147,483,647, so anything beyond it (or a fraction, an exponent, a sign, a space)
// is not an id of ours.
import { data } from "react-router";

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
