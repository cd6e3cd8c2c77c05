// Names every object inherits (`__proto__`, `constructor`, `toString`, …) sent where a
// user-supplied name picks something (a sort, a filter, a slot, a field, an attribute, a
// rule name, a key of the calculator's JSON), on every route of app/routes.ts: each is an
// unknown name (a 4xx with a message, or the normal page with the default), never a 500,
// and a refused post changes no row.
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
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

const INHERITED = [
  "__proto__",
  "constructor",
  "toString",
  "valueOf",
  "hasOwnProperty",
  "isPrototypeOf",
  "propertyIsEnumerable",
  "toLocaleString",
  "__defineGetter__",
  "__lookupSetter__",
  "prototype",
  "length",
  "then",
];
const inherited = fc.constantFrom(...INHERITED);
/** Query names the loaders read to pick something. */
const QUERY_NAMES = [
  "sort",
  "dir",
  "status",
  "category",
  "q",
  "mode",
  "bike",
  "archived",
  "saved",
  "redirectTo",
];
/** Form names the actions read to pick something. */
const FORM_NAMES = [
  "intent",
  "slot",
  "field",
  "unit",
  "value",
  "category",
  "kind",
  "mode",
  "role",
  "to",
  "upgrade_category",
  "a",
  "b",
  "name",
];

let f: Fixtures;
let routes: RouteInfo[];
beforeAll(async () => {
  f = await makeFixtures();
  routes = await routeTable();
});

describe("inherited names in the query string", () => {
  it("give the default or a 400, never a 500, on every page and .data", async () => {
    let cases = 0;
    let sortedByDefault = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...QUERY_NAMES),
        inherited,
        fc.boolean(),
        async (name, key, asData) => {
          for (const r of routes.filter((x) => x.hasLoader)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const suffix = asData && r.pattern !== "" ? ".data" : "";
            const a = await dispatch(
              hostileRequest(
                f,
                "owner",
                `${path}${suffix}?${new URLSearchParams({ [name]: key })}`,
              ),
            );
            cases++;
            expect(a.status, `GET ${path}?${name}=${key}: ${a.message}`).toBeLessThan(500);
            if (a.status >= 400) expect(a.message.trim()).not.toBe("");
            if (r.file === "routes/packages.tsx" && name === "sort") {
              expect(a.status).toBe(200);
              expect((a.value as { filters: { sort: string } }).filters.sort).toBe("updated");
              sortedByDefault++;
            }
          }
        },
      ),
      { numRuns: 20 },
    );
    expect(cases).toBeGreaterThanOrEqual(20 * 10);
    // the packages list's sort branch saw inherited names and fell back to its default
    expect(sortedByDefault).toBeGreaterThanOrEqual(1);
  });
});

describe("inherited names in forms", () => {
  it("are unknown values and unknown fields on every action, never a 500", async () => {
    let refused = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...INTENTS),
        fc.constantFrom(...FORM_NAMES),
        inherited,
        inherited,
        async (intent, name, value, fieldName) => {
          for (const r of routes.filter((x) => x.hasAction)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const body = new URLSearchParams({
              intent,
              slot: "cam",
              field: "boreMm",
              expectedRevision: "1",
              [name]: value,
            });
            body.append(fieldName, "1");
            const before = await rowCounts(f);
            const a = await dispatch(hostileRequest(f, "owner", path, { method: "POST", body }));
            expect(a.status, `POST ${path} ${body}: ${a.message}`).toBeLessThan(500);
            if (a.status >= 400) {
              refused++;
              expect(a.message.trim()).not.toBe("");
              expect(await rowCounts(f), `POST ${path} ${body}`).toEqual(before);
            }
          }
        },
      ),
      { numRuns: 20 },
    );
    expect(refused).toBeGreaterThanOrEqual(20 * 5);
  });

  it("a bench post naming an inherited slot, field or intent is refused in plain words", async () => {
    const path = `/packages/${f.packageId}/bench`;
    let cases = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom("slot", "field", "intent", "unit"),
        inherited,
        async (name, key) => {
          const body = new URLSearchParams({
            intent: "set-measured",
            slot: "cylinder",
            field: "boreMm",
            value: "101.6",
            expectedRevision: "1",
            [name]: key,
          });
          const a = await dispatch(hostileRequest(f, "builder", path, { method: "POST", body }));
          expect(a.status).toBe(400);
          const errors = (a.value as { errors: Record<string, string[]> }).errors;
          const [only] = Object.entries(errors);
          expect(Object.keys(errors)).toHaveLength(1);
          expect(only![0]).toMatch(/^(form|cylinder\.boreMm)$/);
          expect(only![1].join(" ")).toMatch(/slot|value|unit|bench/i);
          expect(only![1].join(" ")).not.toMatch(/invalid|expected|discriminator|undefined/i);
          cases++;
        },
      ),
      { numRuns: 20 },
    );
    expect(cases).toBe(20);
  });
});

describe("inherited names as the calculator's JSON keys", () => {
  it("are named as not spec fields, at the top and in thresholds", async () => {
    let named = 0;
    await fc.assert(
      fc.asyncProperty(
        inherited,
        fc.boolean(),
        fc.jsonValue({ maxDepth: 2 }),
        async (key, nested, value) => {
          const inner = `{${JSON.stringify(key)}:${JSON.stringify(value) ?? "null"}}`;
          const body = nested ? `{"boreMm":101.6,"thresholds":${inner}}` : inner;
          const a = await dispatch(
            hostileRequest(f, "builder", "/api/calc", {
              method: "POST",
              body,
              headers: { "Content-Type": "application/json" },
            }),
          );
          expect(a.status, `${body}: ${a.message}`).toBe(400);
          const json = JSON.parse(await (a.value as Response).text()) as {
            fieldErrors: Record<string, string[]>;
          };
          const field = nested ? `thresholds.${key}` : key;
          expect(Object.hasOwn(json.fieldErrors, field), `${body} → ${JSON.stringify(json)}`).toBe(
            true,
          );
          expect(json.fieldErrors[field]).toEqual(["is not a spec field"]);
          named++;
        },
      ),
      { numRuns: 60 },
    );
    expect(named).toBe(60);
  });
});
