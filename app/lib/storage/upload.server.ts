// Reading one uploaded file from a multipart request, within a size limit, and telling
// what its bytes really are. @mjackson/form-data-parser 0.9.1 hands a file part over once
// it has arrived (holding at most `maxFileSize` of it), and refuses the request as soon as
// a part grows past the limit; from there the file streams on to storage.
import {
  FormDataParseError,
  MaxFileSizeExceededError,
  MaxFilesExceededError,
  parseFormData,
  type FileUpload,
} from "@mjackson/form-data-parser";
import { fileTypeFromBuffer } from "file-type";
import { FIELD_LIMIT_CHARS, readForm } from "../http/body";
import { controlCharField, controlCharMessage, fieldLabel } from "../http/text";

/** Room for the form's other fields and the multipart framing beside the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

export type ParsedUpload =
  | { ok: true; form: FormData; file: File | null }
  | { ok: false; status: 400 | 413 | 415; message: string };

/** What the shared form reader refused (status and plain message), or null. */
function refusal(e: unknown): { status: 400 | 413 | 415; message: string } | null {
  const init = (e as { init?: { status?: number } } | null)?.init;
  const status = init?.status;
  if (status === 400 || status === 413 || status === 415)
    return { status, message: String((e as { data?: unknown }).data) };
  return null;
}

export function megabytes(bytes: number): string {
  return `${Math.round(bytes / (1024 * 1024))} MB`;
}

/** The form, with at most one file (in `fieldName`) of at most `maxBytes`. */
export async function parseUpload(
  request: Request,
  fieldName: string,
  maxBytes: number,
  what: string,
): Promise<ParsedUpload> {
  const tooBig = {
    ok: false as const,
    status: 413 as const,
    message: `The ${what} is larger than ${megabytes(maxBytes)}; nothing was stored.`,
  };
  const type = (request.headers.get("Content-Type") ?? "").trim();
  const mime = type.split(";")[0]!.trim().toLowerCase();
  if (mime !== "multipart/form-data" || !/;\s*boundary=("[^"]+"|[^;\s]+)/i.test(type)) {
    // no file can be in it: the shared reader refuses it or reads its fields
    try {
      const form = await readForm(request);
      return { ok: true, form, file: null };
    } catch (e) {
      const r = refusal(e);
      if (r) return { ok: false, ...r };
      throw e;
    }
  }
  const declared = Number(request.headers.get("Content-Length"));
  if (Number.isFinite(declared) && declared > maxBytes + FORM_OVERHEAD_BYTES) {
    await request.body?.cancel().catch(() => {});
    return tooBig;
  }
  let file: File | null = null;
  try {
    const form = await parseFormData(
      request,
      { maxFiles: 1, maxFileSize: maxBytes },
      (upload: FileUpload) => {
        if (upload.fieldName !== fieldName) return null;
        file = upload;
        return upload;
      },
    );
    for (const [name, value] of form.entries())
      if (typeof value === "string" && value.length > FIELD_LIMIT_CHARS)
        return {
          ok: false,
          status: 400,
          message: `The “${fieldLabel(name)}” field is longer than ${FIELD_LIMIT_CHARS.toLocaleString("en-US")} characters; nothing was stored.`,
        };
    const bad = controlCharField(form.entries());
    if (bad !== null) return { ok: false, status: 400, message: controlCharMessage(bad) };
    return { ok: true, form, file };
  } catch (e) {
    if (e instanceof MaxFileSizeExceededError) return tooBig;
    if (e instanceof MaxFilesExceededError)
      return { ok: false, status: 400, message: `Send one ${what} at a time.` };
    if (e instanceof FormDataParseError || (e as Error)?.name === "MultipartParseError")
      return { ok: false, status: 400, message: "The upload did not arrive whole; try again." };
    throw e;
  }
}

/** Bytes that file-type reads to recognise a format. */
const SNIFF_BYTES = 4100;

export async function headBytes(file: Blob, n = SNIFF_BYTES): Promise<Uint8Array> {
  return new Uint8Array(await file.slice(0, n).arrayBuffer());
}

/** The file's real type by its bytes (null for plain text and other unrecognised data). */
export async function sniffType(file: Blob): Promise<{ ext: string; mime: string } | null> {
  const head = await headBytes(file);
  const t = await fileTypeFromBuffer(head);
  return t ? { ext: t.ext, mime: t.mime } : null;
}
