// Text that is stored: no control characters (tabs and line breaks only where a field
// holds several lines). Shared by the forms of requests, customers, bikes and families.
import { z } from "zod";

// eslint-disable-next-line no-control-regex -- control characters are what is refused
const CONTROL_ONE_LINE = /[\u0000-\u001F\u007F]/;
// eslint-disable-next-line no-control-regex -- control characters are what is refused
const CONTROL_MULTI_LINE = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

export const CONTROL_MESSAGE = "Remove the control characters (type it as plain text)";

export function hasControl(v: string, multiLine = false): boolean {
  return (multiLine ? CONTROL_MULTI_LINE : CONTROL_ONE_LINE).test(v);
}

/** A required one-line text of at most `max` characters. */
export const line = (missing: string, max: number) =>
  z
    .string({ error: missing })
    .trim()
    .min(1, missing)
    .max(max, `Keep it under ${max} characters`)
    .refine((v) => !hasControl(v), CONTROL_MESSAGE);

/** An optional one-line text (empty becomes undefined). */
export const optionalLine = (max: number) =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z
      .string()
      .trim()
      .max(max, `Keep it under ${max} characters`)
      .refine((v) => !hasControl(v), CONTROL_MESSAGE)
      .optional(),
  );

/** Several lines of text, optional. */
export const paragraph = (max: number) =>
  z
    .string()
    .max(max, `Keep it under ${max} characters`)
    .refine((v) => !hasControl(v, true), CONTROL_MESSAGE)
    .optional()
    .transform((v) => (v ?? "").trim());
