// What an apprentice receives: every loader of app/routes.ts, as a page and as `.data`,
// plus the root loader that runs under every page, read as one text and searched for the
// shop's labour rate, any part's price and a customer's e-mail or phone. The same reads
// as a service writer (who may see them) show the check can find each one.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { loader as rootLoader } from "~/root";
import {
  dispatch,
  hostileRequest,
  makeFixtures,
  pathFor,
  routeTable,
  type Fixtures,
  type RouteInfo,
} from "../support/hostile";

let f: Fixtures;
let routes: RouteInfo[];
let rate = 0;
beforeAll(async () => {
  f = await makeFixtures();
  routes = await routeTable();
  const db = getDb();
  const shop = await db.selectFrom("shop").selectAll().orderBy("id").limit(1).executeTakeFirst();
  rate =
    shop?.labour_rate_cents ??
    (
      await db
        .insertInto("shop")
        .values({
          name: "Test shop",
          city: "Testville",
          phone: "555-0100",
          email: "shop@shop.test",
          labour_rate_cents: 13_777,
        })
        .returning("labour_rate_cents")
        .executeTakeFirstOrThrow()
    ).labour_rate_cents;
});

/** Everything a role's loaders answer, each under its address. */
async function everything(role: "apprentice" | "service_writer") {
  const out: { url: string; status: number; text: string }[] = [];
  for (const r of routes.filter((x) => x.hasLoader)) {
    const path = pathFor(r.pattern, f.realParams(r.file));
    for (const url of r.pattern === "" ? ["/", "/_root.data"] : [path, `${path}.data`]) {
      const a = await dispatch(hostileRequest(f, role, url));
      const body = a.value instanceof Response ? await a.value.clone().text() : a.value;
      out.push({ url, status: a.status, text: JSON.stringify(body ?? null) });
    }
  }
  const root = (await rootLoader({
    request: await hostileRequest(f, role, "/"),
    params: {},
    context: {},
  } as never)) as unknown;
  out.push({ url: "root loader", status: 200, text: JSON.stringify(root) });
  return out;
}

const leaks = (text: string) => ({
  labourRate: /labour_rate/.test(text) || text.includes(`:${rate}`),
  price: /price_cents":\d/.test(text) || text.includes("42000"),
  customerEmail: text.includes(f.customer.email),
  customerPhone: text.includes(f.customer.phone),
});

describe("what an apprentice receives", () => {
  it("holds no labour rate, price or customer contact in any loader or .data answer", async () => {
    const answers = await everything("apprentice");
    // every loader of the table was read, as a page and as data, and the root
    expect(answers.length).toBe(routes.filter((r) => r.hasLoader).length * 2 + 1);
    const pages = answers.filter((a) => a.status === 200);
    expect(pages.length).toBeGreaterThanOrEqual(8);
    for (const a of answers) {
      expect(a.status, a.url).toBeLessThan(500);
      expect(leaks(a.text), a.url).toEqual({
        labourRate: false,
        price: false,
        customerEmail: false,
        customerPhone: false,
      });
    }
  });

  it("the same reads find each of them for a service writer, who may see them", async () => {
    const answers = await everything("service_writer");
    const found = { labourRate: 0, price: 0 };
    for (const a of answers) {
      const l = leaks(a.text);
      if (l.labourRate) found.labourRate++;
      if (l.price) found.price++;
    }
    expect(found.labourRate).toBeGreaterThanOrEqual(2); // the home page and its .data
    expect(found.price).toBeGreaterThanOrEqual(2);
  });
});
