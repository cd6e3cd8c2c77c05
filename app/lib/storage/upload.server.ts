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

/** Room for the form's other fields and the multipart framing beside the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

export type ParsedUpload =
  | { ok: true; form: FormData; file: File | null }
  | { ok: false; status: 400 | 413; message: string };

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
