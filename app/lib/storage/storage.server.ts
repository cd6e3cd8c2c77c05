// Object storage through the S3 SDK. The bucket is private: objects are read only by our
// own download route, after its role check, and never served from the web root.
import { createHash, randomUUID } from "node:crypto";
import { Readable } from "node:stream";
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { s3Env } from "../env.server";

let client: S3Client | undefined;

export function s3(): S3Client {
  if (!client) {
    const e = s3Env();
    client = new S3Client({
      endpoint: e.S3_ENDPOINT,
      region: e.S3_REGION,
      forcePathStyle: e.S3_FORCE_PATH_STYLE === "1",
      credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
      // checksums only where an operation needs one: a streamed body then goes as it is,
      // not as aws-chunked with a checksum trailer (which S3-compatible stores may not read)
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
    });
  }
  return client;
}

export const bucket = () => s3Env().S3_BUCKET;

/** A fresh object key under a package's prefix (keys never carry user text). */
export function newObjectKey(packageId: number, kind: string, ext: string): string {
  return `packages/${packageId}/${kind}/${randomUUID()}.${ext}`;
}

export interface StoredObject {
  key: string;
  byteSize: number;
  sha256: string;
}

/**
 * Streams a body of known length into the bucket, hashing it on the way (SHA-256 of the
 * bytes stored). The caller has checked the length against its limit.
 */
export async function putObjectStream(
  key: string,
  body: ReadableStream<Uint8Array>,
  byteSize: number,
  contentType: string,
): Promise<StoredObject> {
  const hash = createHash("sha256");
  const hashing = new TransformStream<Uint8Array, Uint8Array>({
    transform(chunk, controller) {
      hash.update(chunk);
      controller.enqueue(chunk);
    },
  });
  const stream = Readable.fromWeb(body.pipeThrough(hashing) as never);
  await s3().send(
    new PutObjectCommand({
      Bucket: bucket(),
      Key: key,
      Body: stream,
      ContentLength: byteSize,
      ContentType: contentType,
    }),
  );
  return { key, byteSize, sha256: hash.digest("hex") };
}

/** Puts bytes made on the server (thumbnails, re-encoded photos). */
export async function putObjectBytes(
  key: string,
  bytes: Uint8Array,
  contentType: string,
): Promise<StoredObject> {
  await s3().send(
    new PutObjectCommand({ Bucket: bucket(), Key: key, Body: bytes, ContentType: contentType }),
  );
  return {
    key,
    byteSize: bytes.byteLength,
    sha256: createHash("sha256").update(bytes).digest("hex"),
  };
}

/** The object's bytes as a web stream, or null when there is no such object. */
export async function getObjectStream(key: string): Promise<ReadableStream<Uint8Array> | null> {
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    return out.Body ? (out.Body.transformToWebStream() as ReadableStream<Uint8Array>) : null;
  } catch (e) {
    if (isNotFound(e)) return null;
    throw e;
  }
}

export async function getObjectBytes(key: string): Promise<Uint8Array | null> {
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    return out.Body ? await out.Body.transformToByteArray() : null;
  } catch (e) {
    if (isNotFound(e)) return null;
    throw e;
  }
}

export async function objectExists(key: string): Promise<boolean> {
  try {
    await s3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }));
    return true;
  } catch (e) {
    if (isNotFound(e)) return false;
    throw e;
  }
}

/** Deletes objects; a key already gone is not an error. */
export async function deleteObjects(keys: readonly string[]): Promise<void> {
  await Promise.all(
    keys.map((Key) => s3().send(new DeleteObjectCommand({ Bucket: bucket(), Key }))),
  );
}

/** Every key under a prefix (for clean-up checks and tests). */
export async function listKeys(prefix: string): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const out = await s3().send(
      new ListObjectsV2Command({ Bucket: bucket(), Prefix: prefix, ContinuationToken: token }),
    );
    for (const o of out.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = out.IsTruncated ? out.NextContinuationToken : undefined;
  } while (token);
  return keys;
}

function isNotFound(e: unknown): boolean {
  const err = e as { name?: string; $metadata?: { httpStatusCode?: number } };
  return (
    err?.name === "NoSuchKey" || err?.name === "NotFound" || err?.$metadata?.httpStatusCode === 404
  );
}
