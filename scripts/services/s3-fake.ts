// The local stand-in for the shop's object storage: s3rver on loopback, keeping its
// objects in a folder of the project's data directory. The bucket is made on start; it
// has no website or public configuration, so nothing is readable without our routes.
import { mkdirSync } from "node:fs";
import type { AddressInfo } from "node:net";
// @ts-expect-error s3rver ships no type declarations
import S3rver from "s3rver";

export type S3Fake = { port: number; url: string; bucket: string; stop: () => Promise<void> };

export async function startS3Fake(opts: {
  port: number;
  directory: string;
  bucket: string;
}): Promise<S3Fake> {
  mkdirSync(opts.directory, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port: opts.port,
    directory: opts.directory,
    silent: true,
    configureBuckets: [{ name: opts.bucket }],
  });
  const address = (await server.run()) as AddressInfo;
  return {
    port: address.port,
    url: `http://127.0.0.1:${address.port}`,
    bucket: opts.bucket,
    stop: () => server.close() as Promise<void>,
  };
}
