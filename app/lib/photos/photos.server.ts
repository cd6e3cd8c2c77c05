// Build photos of a package: images only (checked by their bytes), re-encoded on the
// server with sharp so no EXIF (camera, location) survives, a thumbnail beside each, both
// in the private bucket; a row per photo once both objects are stored.
import sharp, { type OutputInfo } from "sharp";
import { parseWithZod } from "@conform-to/zod/v4";
import type { SubmissionResult } from "@conform-to/react";
import { z } from "zod";
import type { Db } from "../db.server";
import type { SessionUser } from "../auth/auth.server";
import { deleteObjects, newObjectKey, putObjectBytes } from "../storage/storage.server";
import { parseUpload, sniffType } from "../storage/upload.server";

export const MAX_PHOTO_BYTES = 15 * 1024 * 1024;
export const PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp"] as const;
/** Longest side kept of the photo itself, and of its thumbnail, in pixels. */
const FULL_PX = 2400;
const THUMB_PX = 360;
/** A camera photo has some tens of megapixels; more is a decompression bomb, not a photo. */
const MAX_INPUT_PIXELS = 80_000_000;

// eslint-disable-next-line no-control-regex -- control characters are what is refused
const CONTROL = /[\u0000-\u001f\u007f]/;
export const PhotoFormSchema = z.object({
  caption: z
    .string()
    .trim()
    .max(200, "A caption is at most 200 characters.")
    .refine((v) => !CONTROL.test(v), "A caption may not hold control characters.")
    .default(""),
  file: z.instanceof(File, { message: "Choose a photo." }),
});

export type PhotoUploadAnswer =
  | { ok: true; photoId: number }
  | { ok: false; message: string; result?: SubmissionResult<string[]> };

const answer = (body: PhotoUploadAnswer, status: number) => Response.json(body, { status });

const KIND_NAMES: Record<string, string> = {
  "application/pdf": "a PDF document",
  "application/x-msdownload": "a Windows program",
  "application/x-elf": "a Linux program",
  "application/x-mach-binary": "a macOS program",
  "application/zip": "a ZIP archive",
};

export async function uploadPhoto(
  db: Db,
  user: SessionUser,
  packageId: number,
  request: Request,
): Promise<Response> {
  const pkg = await db
    .selectFrom("packages")
    .select("id")
    .where("id", "=", packageId)
    .executeTakeFirst();
  if (!pkg) {
    await request.body?.cancel().catch(() => {});
    return answer({ ok: false, message: "This package does not exist." }, 404);
  }
  const parsed = await parseUpload(request, "file", MAX_PHOTO_BYTES, "photo");
  if (!parsed.ok) return answer({ ok: false, message: parsed.message }, parsed.status);
  const submission = parseWithZod(parsed.form, { schema: PhotoFormSchema });
  if (submission.status !== "success")
    return answer(
      { ok: false, message: "Check the fields marked below.", result: submission.reply() },
      400,
    );
  const { file, caption } = submission.value;
  const kind = await sniffType(file);
  if (!kind || !(PHOTO_TYPES as readonly string[]).includes(kind.mime)) {
    const what = kind
      ? (KIND_NAMES[kind.mime] ?? `${kind.ext.toUpperCase()} data (${kind.mime})`)
      : "not an image";
    return answer(
      {
        ok: false,
        message: `This file is ${what}, whatever its name says. Photos are JPEG, PNG or WebP images; nothing was stored.`,
      },
      415,
    );
  }

  const made = await storePhoto(db, {
    packageId,
    userId: user.id,
    input: Buffer.from(await file.arrayBuffer()),
    name: file.name,
    caption,
  });
  if (made === null)
    return answer(
      {
        ok: false,
        message: "The image cannot be read (damaged or too large); nothing was stored.",
      },
      415,
    );
  return answer({ ok: true, photoId: made }, 201);
}

/**
 * Re-encodes an image (orientation applied, no metadata kept), makes its thumbnail,
 * stores both objects and then the rows; null when the image cannot be decoded. If
 * anything fails after the objects went in, both are deleted.
 */
export async function storePhoto(
  db: Db,
  args: { packageId: number; userId: number | null; input: Buffer; name: string; caption: string },
): Promise<number | null> {
  const { packageId, input, caption } = args;
  const user = { id: args.userId };
  let full: { data: Buffer; info: OutputInfo };
  let thumb: Buffer;
  try {
    // rotate() applies the camera's orientation; sharp writes no metadata unless asked to
    const base = sharp(input, { limitInputPixels: MAX_INPUT_PIXELS, failOn: "error" }).rotate();
    full = await base
      .clone()
      .resize(FULL_PX, FULL_PX, { fit: "inside", withoutEnlargement: true })
      .flatten({ background: "#ffffff" })
      .jpeg({ quality: 86, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    thumb = await base
      .clone()
      .resize(THUMB_PX, THUMB_PX, { fit: "inside", withoutEnlargement: true })
      .webp({ quality: 78 })
      .toBuffer();
  } catch {
    return null;
  }

  const fullKey = newObjectKey(packageId, "photos", "jpg");
  const thumbKey = newObjectKey(packageId, "photos", "thumb.webp");
  try {
    const [f, t] = await Promise.all([
      putObjectBytes(fullKey, full.data, "image/jpeg"),
      putObjectBytes(thumbKey, thumb, "image/webp"),
    ]);
    // eslint-disable-next-line no-control-regex -- control characters are what is refused
    const base = args.name.replace(/[\u0000-\u001f\u007f]/g, "").replace(/\.[^.]*$/, "") || "photo";
    const photoId = await db.transaction().execute(async (trx) => {
      const [ff, tf] = await Promise.all(
        [
          { o: f, type: "image/jpeg", kind: "photo" as const, name: `${base}.jpg` },
          { o: t, type: "image/webp", kind: "photo_thumb" as const, name: `${base}-thumb.webp` },
        ].map((x) =>
          trx
            .insertInto("stored_files")
            .values({
              package_id: packageId,
              object_key: x.o.key,
              kind: x.kind,
              content_type: x.type,
              byte_size: x.o.byteSize,
              sha256: x.o.sha256,
              original_name: x.name.slice(0, 200),
              uploaded_by: user.id,
            })
            .returning("id")
            .executeTakeFirstOrThrow(),
        ),
      );
      const row = await trx
        .insertInto("package_photos")
        .values({
          package_id: packageId,
          file_id: ff!.id,
          thumb_file_id: tf!.id,
          width: full.info.width,
          height: full.info.height,
          caption,
          created_by: user.id,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      return row.id;
    });
    return photoId;
  } catch (e) {
    await deleteObjects([fullKey, thumbKey]).catch(() => {});
    throw e;
  }
}

export interface PhotoView {
  id: number;
  fileId: number;
  thumbFileId: number;
  width: number;
  height: number;
  caption: string;
  onSheet: boolean;
}

export async function listPhotos(db: Db, packageId: number): Promise<PhotoView[]> {
  const rows = await db
    .selectFrom("package_photos")
    .select(["id", "file_id", "thumb_file_id", "width", "height", "caption", "on_sheet"])
    .where("package_id", "=", packageId)
    .orderBy("id")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    fileId: r.file_id,
    thumbFileId: r.thumb_file_id,
    width: r.width,
    height: r.height,
    caption: r.caption,
    onSheet: r.on_sheet,
  }));
}

/** Whether the photo goes on the package's spec sheet. */
export async function setPhotoOnSheet(
  db: Db,
  packageId: number,
  photoId: number,
  onSheet: boolean,
): Promise<boolean> {
  const r = await db
    .updateTable("package_photos")
    .set({ on_sheet: onSheet })
    .where("id", "=", photoId)
    .where("package_id", "=", packageId)
    .executeTakeFirst();
  return r.numUpdatedRows > 0n;
}

/** Removes the photo's row, its two stored-file rows and both objects. */
export async function deletePhoto(db: Db, packageId: number, photoId: number): Promise<boolean> {
  const keys = await db.transaction().execute(async (trx) => {
    const p = await trx
      .deleteFrom("package_photos")
      .where("id", "=", photoId)
      .where("package_id", "=", packageId)
      .returning(["file_id", "thumb_file_id"])
      .executeTakeFirst();
    if (!p) return null;
    const files = await trx
      .deleteFrom("stored_files")
      .where("id", "in", [p.file_id, p.thumb_file_id])
      .returning("object_key")
      .execute();
    return files.map((f) => f.object_key);
  });
  if (!keys) return false;
  await deleteObjects(keys);
  return true;
}
