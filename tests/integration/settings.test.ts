import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { action, loader } from "~/routes/settings";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { args, post, run } from "../support/route";

const db = getDb();
let owner: TestUser;

beforeAll(async () => {
  owner = await createTestUser(db, "owner");
  const shop = await db.selectFrom("shop").select("id").executeTakeFirst();
  if (!shop)
    await db
      .insertInto("shop")
      .values({ name: "Test shop", labour_rate_cents: 10000, city: "", phone: "", email: "" })
      .execute();
});

afterAll(async () => {
  await db.deleteFrom("shop_setting_changes").execute();
});

const form = (over: Record<string, string> = {}) => ({
  name: "Prairie Bench Works",
  address: "12 Mill Row, Millbrook Falls",
  phone: "555-0199",
  email: "bench@example.test",
  labourRate: "1,290.00",
  taxRate: "8.25",
  depositKind: "percent",
  depositValue: "30",
  timeZone: "America/Denver",
  ...over,
});
const save = async (body: Record<string, string>) =>
  run(async () => action(args(await post(owner, "/settings", body))));
const read = async () =>
  (await run(async () => loader(args(await requestAs(owner, "/settings"))))).value as Awaited<
    ReturnType<typeof loader>
  >;

describe("/settings", () => {
  it("saves the owner's settings and logs each field that changed, with who and when", async () => {
    const res = await save(form());
    expect(res.status).toBe(200);
    const shop = await db.selectFrom("shop").selectAll().orderBy("id").executeTakeFirstOrThrow();
    expect(shop.labour_rate_cents).toBe(129000);
    expect(shop.tax_rate_bp).toBe(825);
    expect(shop.deposit_value).toBe(3000);
    expect(shop.time_zone).toBe("America/Denver");
    const page = await read();
    const rate = page.changes.find((c) => c.label === "Labour rate");
    expect(rate?.after).toBe("$1,290.00 per hour");
    expect(rate?.changedBy).toBe(owner.name);
    expect(page.values?.labourRate).toBe("1290.00");

    // the same values again change nothing and log nothing
    const before = page.changes.length;
    await save(form());
    const again = await read();
    expect(again.changes.length).toBe(before);
  });

  it("refuses bad values beside their fields and keeps the rest", async () => {
    const res = await save(
      form({ taxRate: "120", depositKind: "fixed", depositValue: "lots", timeZone: "Mars/Base" }),
    );
    expect(res.status).toBe(400);
    const errors = res.value.result.error;
    expect(errors.taxRate).toEqual([
      "Enter the tax rate as a percentage from 0 to 100, e.g. 8.25.",
    ]);
    expect(errors.timeZone).toEqual(["Choose a time zone from the list."]);
    expect(errors.name).toBeUndefined();
    expect(errors.depositValue).toEqual([
      "Enter the deposit: a percentage such as 30, or dollars such as 500.00.",
    ]);
    expect(res.value.result.initialValue.name).toBe("Prairie Bench Works");
  });

  it("a percentage deposit over 100 is refused beside the deposit", async () => {
    const res = await save(form({ depositValue: "150" }));
    expect(res.status).toBe(400);
    expect(res.value.result.error.depositValue).toEqual([
      "A deposit set as a percentage is at most 100 % of the quote.",
    ]);
  });

  it("a fixed deposit is kept in cents", async () => {
    await save(form({ depositKind: "fixed", depositValue: "$500" }));
    const shop = await db.selectFrom("shop").selectAll().orderBy("id").executeTakeFirstOrThrow();
    expect(shop.deposit_kind).toBe("fixed");
    expect(shop.deposit_value).toBe(50000);
  });
});
