// Ids and whole numbers from outside, tried on every route of app/routes.ts: a path id
// that is not a positive integer within PostgreSQL's range (or names nothing) is a 404;
// a bad number in the query string or a form is a 400 with the field's message; nothing
// answers 500 and a refused post changes no row.
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { MAX_DB_INT } from "~/lib/http/ids";
import {
  dispatch,
  hostileRequest,
  INTENTS,
  makeFixtures,
  pathFor,
  rowCounts,
  routeTable,
  type Fixtures,
  type RouteInfo,
} from "../support/hostile";

/** Strings that are not an id of ours: past the range, fractions, exponents, signs, words. */
const notAnId = fc
  .oneof(
    fc.bigInt({ min: BigInt(MAX_DB_INT) + 1n, max: 10n ** 30n }).map(String),
    fc.constantFrom(
      "2147483648",
      "99999999999999999999",
      "1e20",
      "1e3",
      "1.5",
      "-1",
      "0",
      "00",
      "+1",
      " 1",
      "1 ",
      "0x10",
      "Infinity",
      "NaN",
      "1_000",
      "１２",
      "",
    ),
    fc.double({ noNaN: false }).map(String),
    fc.integer({ min: -1_000_000, max: 0 }).map(String),
    fc.string({ maxLength: 12 }).filter((s) => !/^[1-9][0-9]*$/.test(s)),
  )
  .filter((s) => s.replace(/\./g, "") !== "" || s === "");
/** A well-formed id that names nothing (the fixtures' ids are small). */
const missingId = fc.integer({ min: 2_000_000_000, max: MAX_DB_INT }).map(String);

const QUERY_NUMBERS = ["page", "customer", "builder", "a", "b", "offset", "limit"];
const FORM_NUMBERS = [
  "partId",
  "expectedRevision",
  "revision",
  "bikeId",
  "sourceId",
  "userId",
  "inviteId",
  "version",
];

let f: Fixtures;
let routes: RouteInfo[];
beforeAll(async () => {
  f = await makeFixtures();
  routes = await routeTable();
});

const idRoutes = () => routes.filter((r) => r.params.includes("id"));

describe("path ids", () => {
  it("answers 404 on every route with an :id, for pages, .data and posts", async () => {
    let notFound = 0;
    let sent = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          notAnId.map((id) => ({ id, wellFormed: false })),
          missingId.map((id) => ({ id, wellFormed: true })),
        ),
        fc.constantFrom(...INTENTS),
        async ({ id, wellFormed }, intent) => {
          for (const r of idRoutes()) {
            if (id === "") continue; // an empty segment is another route
            const path = pathFor(r.pattern, { id });
            const tries: Request[] = [];
            const req = async (...a: Parameters<typeof hostileRequest>) =>
              tries.push(await hostileRequest(...a));
            if (r.hasLoader) {
              await req(f, "owner", path);
              await req(f, "owner", `${path}.data`);
            }
            if (r.hasAction)
              await req(f, "owner", path, {
                method: "POST",
                body: new URLSearchParams({ intent, expectedRevision: "1", slot: "cam" }),
              });
            for (const request of tries) {
              const before = request.method === "POST" ? await rowCounts(f) : null;
              const a = await dispatch(request);
              sent++;
              expect(a.status, `${request.method} ${path}: ${a.message}`).toBeLessThan(500);
              // a well-formed number that names nothing may first be refused for its body
              if (wellFormed && request.method === "POST" && a.status === 400) {
                expect(a.message.trim()).not.toBe("");
              } else {
                expect(a.status, `${request.method} ${path}: ${a.message}`).toBe(404);
                notFound++;
              }
              if (before) expect(await rowCounts(f)).toEqual(before);
            }
          }
        },
      ),
      { numRuns: 20 },
    );
    // (almost) every generated case reached the not-found branch of every route with an id
    expect(idRoutes().length).toBeGreaterThanOrEqual(6);
    expect(notFound).toBeGreaterThanOrEqual(sent / 2);
    expect(notFound).toBeGreaterThanOrEqual(20 * idRoutes().length);
  });
});

describe("numbers in the query string", () => {
  it("answers 400 naming the value, or the page, never 500", async () => {
    let refused = 0;
    const readers = new Set<string>();
    await fc.assert(
      fc.asyncProperty(
        notAnId.filter((s) => s !== ""),
        fc.boolean(),
        async (value, asData) => {
          for (const r of routes.filter((x) => x.hasLoader)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const suffix = asData && r.pattern !== "" ? ".data" : "";
            // every number the loaders read, at once: each route refuses the first it reads
            const qs = new URLSearchParams(QUERY_NUMBERS.map((n) => [n, value]));
            const a = await dispatch(hostileRequest(f, "owner", `${path}${suffix}?${qs}`));
            expect(a.status, `GET ${path}?${qs}: ${a.message}`).toBeLessThan(500);
            if (a.status === 400) {
              refused++;
              readers.add(r.file);
              expect(
                QUERY_NUMBERS.some((n) => a.message.includes(`“${n}”`)),
                a.message,
              ).toBe(true);
            }
          }
        },
      ),
      { numRuns: 20 },
    );
    // the routes that read numbers from the query refused the bad ones
    expect([...readers].sort()).toEqual(
      expect.arrayContaining([
        "routes/api.parts.ts",
        "routes/packages.$id.tsx",
        "routes/packages.tsx",
        "routes/parts.tsx",
      ]),
    );
    expect(refused).toBeGreaterThanOrEqual(20 * 4);
  });
});

describe("numbers in forms", () => {
  it("answers 4xx with a message and changes nothing, on every action", async () => {
    let refused = 0;
    let reachedField = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...INTENTS),
        fc.constantFrom(...FORM_NUMBERS),
        notAnId,
        async (intent, name, value) => {
          for (const r of routes.filter((x) => x.hasAction)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const body = new URLSearchParams({
              intent,
              slot: "cam",
              mode: "scratch",
              name: "Hostile",
              to: "quoted",
              expectedRevision: "1",
              revision: "1",
              [name]: value,
            });
            const before = await rowCounts(f);
            const a = await dispatch(hostileRequest(f, "owner", path, { method: "POST", body }));
            expect(a.status, `POST ${path} ${body}: ${a.message}`).toBeLessThan(500);
            if (a.status >= 400) {
              refused++;
              expect(a.message.trim(), `POST ${path} ${body}`).not.toBe("");
              expect(await rowCounts(f), `POST ${path} ${body}`).toEqual(before);
              if (/revision|part|bike|template|package|staff|invite/i.test(a.message))
                reachedField++;
            }
          }
        },
      ),
      { numRuns: 20 },
    );
    expect(refused).toBeGreaterThanOrEqual(40);
    expect(reachedField).toBeGreaterThanOrEqual(10);
  });

  it("names the field when a bench post carries a bad part or revision number", async () => {
    const path = `/packages/${f.packageId}/bench`;
    let cases = 0;
    await fc.assert(
      fc.asyncProperty(notAnId, fc.constantFrom("partId", "expectedRevision"), async (v, name) => {
        const body = new URLSearchParams({
          intent: "set-part",
          slot: "cam",
          partId: String(f.partId),
          expectedRevision: "1",
          [name]: v,
        });
        const a = await dispatch(hostileRequest(f, "builder", path, { method: "POST", body }));
        expect(a.status).toBe(400);
        const errors = (a.value as { errors: Record<string, string[]> }).errors;
        if (name === "partId") expect(errors).toEqual({ cam: ["Pick a part from the list"] });
        else
          expect(errors).toEqual({
            form: ["The bench did not say which revision it was based on; reload the page."],
          });
        cases++;
      }),
      { numRuns: 40 },
    );
    expect(cases).toBe(40);
  });
});
