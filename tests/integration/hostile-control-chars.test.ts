// Control characters (NUL and the rest, other than tab, line feed and carriage return)
// in any text, on every route of app/routes.ts: in a query value it is a 400 naming the
// parameter (or the page, where nothing reads it); in a form field it is a 400 naming
// the field; in a CSV cell the import names the line. Never a 500, and a refused post
// changes no row.
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { hasControlChars } from "~/lib/http/text";
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

/** One refused character: C0 except tab/LF/CR, DEL, C1. */
const control = fc
  .oneof(
    fc.integer({ min: 0, max: 0x1f }).filter((c) => c !== 9 && c !== 10 && c !== 13),
    fc.integer({ min: 0x7f, max: 0x9f }),
  )
  .map((c) => String.fromCharCode(c));
/** Text with at least one control character somewhere in it. */
const hostileText = fc
  .tuple(fc.string({ maxLength: 10 }), control, fc.string({ maxLength: 10 }))
  .map(([a, c, b]) => `${a}${c}${b}`);

const QUERY_NAMES = [
  "q",
  "category",
  "sort",
  "status",
  "mode",
  "redirectTo",
  "saved",
  "archived",
  "dir",
];
const FORM_TEXT = [
  "name",
  "email",
  "password",
  "part_number",
  "maker",
  "notes",
  "label",
  "condition",
  "message",
  "value",
  "csv",
  "tags",
];

let f: Fixtures;
let routes: RouteInfo[];
beforeAll(async () => {
  f = await makeFixtures();
  routes = await routeTable();
});

describe("control characters in the query string", () => {
  it("are a 400 naming the parameter on every page and .data that reads the query", async () => {
    let refused = 0;
    const readers = new Set<string>();
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...QUERY_NAMES),
        hostileText,
        fc.boolean(),
        async (name, text, asData) => {
          expect(hasControlChars(text)).toBe(true);
          for (const r of routes.filter((x) => x.hasLoader)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const suffix = asData && r.pattern !== "" ? ".data" : "";
            const url = `${path}${suffix}?${new URLSearchParams({ [name]: text })}`;
            const a = await dispatch(hostileRequest(f, "owner", url));
            expect(a.status, `GET ${url}: ${a.message}`).toBeLessThan(500);
            if (a.status === 400) {
              refused++;
              readers.add(r.file);
              expect(a.message).toContain(`“${name}”`);
              expect(a.message).toMatch(/control character/);
            }
          }
        },
      ),
      { numRuns: 20 },
    );
    expect([...readers]).toEqual(
      expect.arrayContaining([
        "routes/parts.tsx",
        "routes/api.parts.ts",
        "routes/packages.tsx",
        "routes/parts.export[.]csv.ts",
      ]),
    );
    expect(refused).toBeGreaterThanOrEqual(20 * 4);
  });

  it("/parts?q=%00 and /api/parts?q=%00 are 400", async () => {
    for (const url of ["/parts?q=%00", "/api/parts?q=%00", "/parts.data?q=a%00b"]) {
      const a = await dispatch(hostileRequest(f, "apprentice", url));
      expect(a.status, url).toBe(400);
      expect(a.message).toBe(
        "The “q” field contains a control character (such as a NUL byte) that cannot be stored; remove it.",
      );
    }
  });
});

describe("control characters in forms", () => {
  it("are a 400 naming the field on every action, and change nothing", async () => {
    let refused = 0;
    const readers = new Set<string>();
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...INTENTS),
        fc.constantFrom(...FORM_TEXT),
        hostileText,
        fc.boolean(),
        async (intent, name, text, signedIn) => {
          for (const r of routes.filter((x) => x.hasAction)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const body = new URLSearchParams({ intent, [name]: text });
            const before = await rowCounts(f);
            const a = await dispatch(
              hostileRequest(f, signedIn ? "owner" : null, path, { method: "POST", body }),
            );
            expect(a.status, `POST ${path} ${body}: ${a.message}`).toBeLessThan(500);
            if (a.status === 400 && /control character/.test(a.message)) {
              refused++;
              readers.add(r.file);
              expect(a.message).toContain(`“${name}”`);
            }
            if (a.status >= 400) expect(await rowCounts(f)).toEqual(before);
          }
        },
      ),
      { numRuns: 20 },
    );
    // every action that reads a form refused it; signing out and the JSON calculator read no form
    const formActions = routes
      .filter((r) => r.hasAction)
      .map((r) => r.file)
      .filter((x) => !["routes/logout.ts", "routes/api.calc.ts"].includes(x));
    expect([...readers].sort()).toEqual(formActions.sort());
    expect(refused).toBeGreaterThanOrEqual(5 * formActions.length);
  });

  it("a NUL in a part's name or a CSV cell is refused by name, and nothing is written", async () => {
    const before = await rowCounts(f);
    const part = await dispatch(
      hostileRequest(f, "owner", "/parts/new", {
        method: "POST",
        body: new URLSearchParams({
          category: "cams",
          part_number: `N-${f.tag}`,
          maker: "Test",
          name: "Cam\u0000one",
          price: "10",
        }),
      }),
    );
    expect(part.status).toBe(400);
    expect(part.message).toBe(
      "The “name” field contains a control character (such as a NUL byte) that cannot be stored; remove it.",
    );
    const csv = `part_number,category,maker,name,price,labour_hours,tags,stock,attributes,notes\nN-${f.tag}-2,cams,Test,Cam\u0000two,10,1,,no,,\n`;
    const form = new FormData();
    form.set("intent", "import");
    form.set("file", new File([csv], "parts.csv", { type: "text/csv" }));
    const imp = await dispatch(
      hostileRequest(f, "owner", "/parts/import", { method: "POST", body: form }),
    );
    expect(imp.status).toBe(400);
    expect(imp.message).toBe(
      "Line 2 of the file contains a control character (such as a NUL byte) that cannot be stored; remove it and check the file again.",
    );
    expect(await rowCounts(f)).toEqual(before);
  });
});
