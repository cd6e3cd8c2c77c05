// Bodies larger than a route allows, on every action of app/routes.ts: small limits for
// the forms before sign-in, the usual one for signed-in forms and the calculator, the
// import's own for CSV uploads. Over the limit is a 413 with a plain message, whether the
// size is declared or only streamed, and no more than the limit is read; a field longer
// than its limit is a 400 that does not echo it. Never a 500, nothing changes.
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { MAX_CSV_BYTES } from "~/components/catalog/csv-columns";
import {
  FORM_LIMIT_BYTES,
  PUBLIC_FIELD_LIMIT_CHARS,
  PUBLIC_FORM_LIMIT_BYTES,
} from "~/lib/http/body";
import { signedOutRequest } from "../support/auth";
import { asFromPage } from "../support/honeypot";
import {
  dispatch,
  makeFixtures,
  pathFor,
  rowCounts,
  routeTable,
  type Fixtures,
  type RouteInfo,
} from "../support/hostile";

const PUBLIC = new Set([
  "routes/login.tsx",
  "routes/reset.tsx",
  "routes/reset.$token.tsx",
  "routes/invite.$token.tsx",
]);
const limitFor = (file: string) =>
  PUBLIC.has(file)
    ? PUBLIC_FORM_LIMIT_BYTES
    : file === "routes/parts.import.tsx"
      ? MAX_CSV_BYTES * 1.1 + 64 * 1024
      : FORM_LIMIT_BYTES;

/** A body streamed in 64 KB chunks, counting how much of it was pulled. */
const CHUNK = 64 * 1024;
function streamed(total: number) {
  const chunk = new TextEncoder().encode("x".repeat(CHUNK));
  let sent = 0;
  const stream = new ReadableStream<Uint8Array>({
    pull(c) {
      if (sent >= total) return c.close();
      const piece = chunk.subarray(0, Math.min(chunk.byteLength, total - sent));
      sent += piece.byteLength;
      c.enqueue(piece);
    },
  });
  return { stream, pulled: () => sent };
}

let f: Fixtures;
let routes: RouteInfo[];
beforeAll(async () => {
  f = await makeFixtures();
  routes = await routeTable();
});

const readers = () =>
  routes.filter((r) => r.hasAction && r.file !== "routes/logout.ts").map((r) => r.file);

describe("bodies over a route's limit", () => {
  it("are 413 on every action, declared or streamed, reading no more than the limit", async () => {
    let tooLarge = 0;
    const seen = new Set<string>();
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 1, max: 128 * 1024 }),
        fc.boolean(),
        fc.boolean(),
        async (extra, declared, signedIn) => {
          for (const r of routes.filter((x) => x.hasAction && x.file !== "routes/logout.ts")) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const limit = limitFor(r.file);
            const total = Math.ceil(limit) + extra;
            const { stream, pulled } = streamed(total);
            const headers = new Headers({
              "Content-Type":
                r.file === "routes/api.calc.ts"
                  ? "application/json"
                  : "application/x-www-form-urlencoded",
            });
            if (signedIn) headers.set("Cookie", f.cookies.owner);
            if (declared) headers.set("Content-Length", String(total));
            const before = await rowCounts(f);
            const a = await dispatch(
              signedOutRequest(path, {
                method: "POST",
                body: stream,
                headers,
                duplex: "half",
              } as RequestInit),
            );
            expect(a.status, `POST ${path} ${total} bytes: ${a.message}`).toBeLessThan(500);
            if (a.status === 413) {
              tooLarge++;
              seen.add(r.file);
              expect(a.message).toMatch(/larger than/);
              // (a stream reads one chunk ahead of its reader by itself)
              expect(pulled(), `read of ${path}`).toBeLessThanOrEqual(limit + 2 * CHUNK);
              if (declared) expect(pulled()).toBeLessThanOrEqual(2 * CHUNK);
            } else {
              // only a signed-out visitor of a staff page is sent away before the body is read
              expect(signedIn, `POST ${path}: ${a.status}`).toBe(false);
              expect([302, 401, 403]).toContain(a.status);
            }
            expect(await rowCounts(f)).toEqual(before);
          }
        },
      ),
      { numRuns: 6 },
    );
    expect([...seen].sort()).toEqual(readers().sort());
    expect(tooLarge).toBeGreaterThanOrEqual(readers().length);
  });

  it("a long e-mail before sign-in is refused without being echoed", async () => {
    let refused = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: PUBLIC_FIELD_LIMIT_CHARS + 1, max: PUBLIC_FORM_LIMIT_BYTES - 2000 }),
        fc.constantFrom("/login", "/reset"),
        async (n, path) => {
          const email = `${"a".repeat(n - 11)}@staff.test`;
          const a = await dispatch(
            signedOutRequest(path, {
              method: "POST",
              body: new URLSearchParams(asFromPage({ email, password: "x" })),
            }),
          );
          expect(a.status).toBe(400);
          expect(a.message).toBe(
            "The “email” field is longer than 1,000 characters; nothing was saved.",
          );
          expect(JSON.stringify(a.value).length).toBeLessThan(500);
          refused++;
        },
      ),
      { numRuns: 20 },
    );
    expect(refused).toBe(20);
  });

  it("a CSV past the import's own limit is answered with it", async () => {
    const form = new FormData();
    form.set("intent", "preview");
    form.set("file", new File(["x".repeat(MAX_CSV_BYTES + 10)], "big.csv", { type: "text/csv" }));
    const headers = new Headers({ Cookie: f.cookies.owner });
    const a = await dispatch(
      signedOutRequest("/parts/import", { method: "POST", body: form, headers }),
    );
    expect(a.status).toBe(413);
    expect(a.message).toBe("The file is larger than 2 MB. Split it into smaller files.");
  });
});
