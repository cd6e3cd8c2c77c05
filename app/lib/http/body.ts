// One reader for every action's body. It refuses, with a plain message and before any
// work is done: a body larger than the route's limit (413, read no further than the
// limit), a type other than a form's (415: JSON, text, or multipart without its
// boundary), a form that cannot be parsed (400), a field longer than its limit (400, so
// nothing over-long is echoed back) and a control character in any text (400 naming the
// field). Public forms pass the small limits.
import { data } from "react-router";
import { controlCharField, controlCharMessage, fieldLabel } from "./text";

/** Signed-in forms: a part's notes or a rule's condition fit many times over. */
export const FORM_LIMIT_BYTES = 256 * 1024;
/** Forms before sign-in (sign-in, reset, invite): an e-mail, a name and a password. */
export const PUBLIC_FORM_LIMIT_BYTES = 16 * 1024;
/** The longest value of one field, unless a route names a longer one. */
export const FIELD_LIMIT_CHARS = 20_000;
export const PUBLIC_FIELD_LIMIT_CHARS = 1_000;

export type ReadFormOptions = {
  limitBytes?: number;
  fieldLimit?: number;
  /** fields allowed to be longer (or required to be shorter) than `fieldLimit` */
  fieldLimits?: Record<string, number>;
  /** file parts allowed (the CSV import); elsewhere a file part is refused */
  files?: boolean;
  /** the message for a body over the limit */
  tooLarge?: string;
};

export const PUBLIC_FORM: ReadFormOptions = {
  limitBytes: PUBLIC_FORM_LIMIT_BYTES,
  fieldLimit: PUBLIC_FIELD_LIMIT_CHARS,
};

const refuse = (message: string, status: number): never => {
  throw data(message, { status });
};

function mb(bytes: number) {
  return bytes >= 1024 * 1024
    ? `${Math.round(bytes / 1024 / 1024)} MB`
    : `${Math.round(bytes / 1024)} KB`;
}

/** The body's bytes, reading no more than `limit` (then 413). */
export async function readBytes(request: Request, limit: number, tooLarge?: string) {
  const message = tooLarge ?? `The form is larger than ${mb(limit)}; nothing was saved.`;
  const declared = request.headers.get("Content-Length");
  if (declared !== null && /^\d+$/.test(declared) && Number(declared) > limit) refuse(message, 413);
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    let step;
    try {
      step = await reader.read();
    } catch {
      return refuse("The form did not arrive whole; send it again.", 400);
    }
    if (step.done) break;
    total += step.value.byteLength;
    if (total > limit) {
      // not awaited: a copy's cancel (the sign-in form reads a copy) waits for the original
      reader.cancel().catch(() => {});
      refuse(message, 413);
    }
    chunks.push(step.value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

const NOT_A_FORM =
  "This address takes a form (URL-encoded or multipart fields), not this kind of body.";

/** The posted form, checked as described above. */
export async function readForm(request: Request, opts: ReadFormOptions = {}): Promise<FormData> {
  const limit = opts.limitBytes ?? FORM_LIMIT_BYTES;
  const type = (request.headers.get("Content-Type") ?? "").trim();
  const mime = type.split(";")[0]!.trim().toLowerCase();
  const multipart = mime === "multipart/form-data";
  if (mime !== "" && mime !== "application/x-www-form-urlencoded" && !multipart)
    refuse(NOT_A_FORM, 415);
  if (multipart && !/;\s*boundary=("[^"]+"|[^;\s]+)/i.test(type))
    refuse("The multipart form has no boundary; it cannot be read.", 415);
  const bytes = await readBytes(request, limit, opts.tooLarge);
  if (mime === "") {
    if (bytes.byteLength > 0) refuse(NOT_A_FORM, 415);
    return new FormData();
  }
  let form: FormData;
  try {
    form = await new Response(bytes, { headers: { "Content-Type": type } }).formData();
  } catch {
    return refuse("The form could not be read; reload the page and send it again.", 400);
  }
  const fieldLimit = opts.fieldLimit ?? FIELD_LIMIT_CHARS;
  for (const [name, value] of form.entries()) {
    if (typeof value !== "string") {
      if (!opts.files) refuse(`The “${fieldLabel(name)}” field cannot be a file.`, 400);
      continue;
    }
    const max =
      opts.fieldLimits && Object.hasOwn(opts.fieldLimits, name)
        ? opts.fieldLimits[name]!
        : fieldLimit;
    if (value.length > max)
      refuse(
        `The “${fieldLabel(name)}” field is longer than ${max.toLocaleString("en-US")} characters; nothing was saved.`,
        400,
      );
  }
  const bad = controlCharField(form.entries());
  if (bad !== null) refuse(controlCharMessage(bad), 400);
  return form;
}

/** A JSON body (the JSON API), with the same size limit; `undefined` when it is not JSON. */
export async function readJson(
  request: Request,
  limit = FORM_LIMIT_BYTES,
): Promise<{ ok: true; value: unknown } | { ok: false; status: number; error: string }> {
  const mime = (request.headers.get("Content-Type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (mime !== "" && mime !== "application/json" && !mime.endsWith("+json"))
    return { ok: false, status: 415, error: "Send the spec as a JSON body (application/json)." };
  let bytes: Uint8Array;
  try {
    bytes = await readBytes(request, limit, `The body is larger than ${mb(limit)}.`);
  } catch (e) {
    const init = (e as { init?: { status?: number } }).init;
    const msg = (e as { data?: unknown }).data;
    return { ok: false, status: init?.status ?? 400, error: String(msg) };
  }
  try {
    return { ok: true, value: JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes)) };
  } catch {
    return { ok: false, status: 400, error: "The body is not JSON." };
  }
}
