import { randomBytes } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { ensureBuiltInCategories, getPartHistory, searchParts } from "~/lib/catalog/parts.server";
import { getDb } from "~/lib/db.server";
import { action as idAction, loader as idLoader } from "~/routes/parts.$id";
import { action as newAction } from "~/routes/parts.new";
import { loader as listLoader } from "~/routes/parts";
import { args, post, run } from "../support/route";
import { createTestUser, requestAs, type TestUser } from "../support/auth";

const db = getDb();
const users = {} as Record<"owner" | "builder" | "service_writer" | "apprentice", TestUser>;
const uniq = () => randomBytes(4).toString("hex").toUpperCase();

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  for (const r of ["owner", "builder", "service_writer", "apprentice"] as const)
    users[r] = await createTestUser(db, r);
});

function cylinder(pn: string, over: Record<string, string> = {}) {
  return {
    intent: "save",
    part_number: pn,
    category: "cylinders",
    maker: "Ironvale",
    name: "Big-bore pair",
    price: "1349.00",
    labour_hours: "6.5",
    tags: "big-bore, Plated",
    "attributes.boreMm": "104.8",
    ...over,
  };
}

async function addCylinder(pn: string) {
  const r = await run(async () =>
    newAction(args(await post(users.owner, "/parts/new", cylinder(pn)))),
  );
  expect(r.status).toBe(302);
  return r.location!.match(/\/parts\/(\d+)/)![1]!;
}

describe("the part form", () => {
  it("saves a part with its attributes and a first history row", async () => {
    const pn = `TW-T-${uniq()}`;
    const id = await addCylinder(pn);
    const row = await db
      .selectFrom("parts")
      .selectAll()
      .where("id", "=", Number(id))
      .executeTakeFirstOrThrow();
    expect(row).toMatchObject({
      part_number: pn,
      price_cents: 134900,
      tags: ["big-bore", "plated"],
      attributes: { boreMm: 104.8 },
      version: 1,
      updated_by: users.owner.id,
    });
    expect((await getPartHistory(db, Number(id))).map((h) => h.change)).toEqual(["Created"]);
  });

  it("puts an out-of-range bore beside its field and keeps the other values", async () => {
    const r = await run(async () =>
      newAction(
        args(
          await post(
            users.owner,
            "/parts/new",
            cylinder(`TW-T-${uniq()}`, { "attributes.boreMm": "140" }),
          ),
        ),
      ),
    );
    expect(r.status).toBe(400);
    expect(r.value.result.error["attributes.boreMm"]).toEqual([
      "Bore must be between 50 and 130 mm",
    ]);
    expect(r.value.result.initialValue.maker).toBe("Ironvale");
  });

  it("refuses a part number already on the shelf (any case)", async () => {
    const pn = `TW-T-${uniq()}`;
    await addCylinder(pn);
    const r = await run(async () =>
      newAction(args(await post(users.owner, "/parts/new", cylinder(pn.toLowerCase())))),
    );
    expect(r.status).toBe(400);
    expect(r.value.result.error.part_number[0]).toMatch(/already on the shelf/);
  });

  it("an edit and an archive each write a version; stale edits are refused", async () => {
    const pn = `TW-T-${uniq()}`;
    const id = await addCylinder(pn);
    expect(
      (
        await run(async () =>
          idAction(
            args(
              await post(
                users.owner,
                `/parts/${id}`,
                cylinder(pn, { price: "1299", version: "1" }),
              ),
              { id },
            ),
          ),
        )
      ).status,
    ).toBe(302);
    expect(
      (
        await run(async () =>
          idAction(
            args(await post(users.owner, `/parts/${id}`, cylinder(pn, { version: "1" })), { id }),
          ),
        )
      ).status,
    ).toBe(409);
    expect(
      (
        await run(async () =>
          idAction(args(await post(users.owner, `/parts/${id}`, { intent: "archive" }), { id })),
        )
      ).status,
    ).toBe(302);
    expect((await getPartHistory(db, Number(id))).map((h) => [h.version, h.change])).toEqual([
      [3, "Archived"],
      [2, "Changed price"],
      [1, "Created"],
    ]);
  });

  it.each(["builder", "service_writer", "apprentice"] as const)(
    "%s gets 403 on every change and nothing is written",
    async (role) => {
      const pn = `TW-T-${uniq()}`;
      const id = await addCylinder(pn);
      expect(
        (
          await run(async () =>
            newAction(args(await post(users[role], "/parts/new", cylinder(`TW-T-${uniq()}`)))),
          )
        ).status,
      ).toBe(403);
      expect(
        (
          await run(async () =>
            idAction(
              args(await post(users[role], `/parts/${id}`, cylinder(pn, { price: "1" })), { id }),
            ),
          )
        ).status,
      ).toBe(403);
      expect(
        (
          await run(async () =>
            idAction(args(await post(users[role], `/parts/${id}`, { intent: "archive" }), { id })),
          )
        ).status,
      ).toBe(403);
      expect(await getPartHistory(db, Number(id))).toHaveLength(1);
    },
  );
});

describe("archive and prices", () => {
  it("archived parts leave the shelf search but stay readable by id", async () => {
    const pn = `TW-ARC-${uniq()}`;
    const id = await addCylinder(pn);
    await run(async () =>
      idAction(args(await post(users.owner, `/parts/${id}`, { intent: "archive" }), { id })),
    );
    expect((await searchParts(db, { q: pn })).rows).toEqual([]);
    expect(
      (await searchParts(db, { q: pn, archived: true })).rows.map((r) => r.part_number),
    ).toEqual([pn]);
    const page = await run(async () =>
      idLoader(args(await requestAs(users.builder, `/parts/${id}`), { id })),
    );
    expect(page.value.part.part_number).toBe(pn);
    expect(page.value.part.archived_at).not.toBeNull();
  });

  it("apprentices never receive prices: not in the list, the part, or its history", async () => {
    const pn = `TW-PRC-${uniq()}`;
    const id = await addCylinder(pn);
    const list = await run(async () =>
      listLoader(args(await requestAs(users.apprentice, `/parts?q=${pn}`))),
    );
    expect(list.value.showPrices).toBe(false);
    expect(list.value.rows[0].price_cents).toBeNull();
    const page = await run(async () =>
      idLoader(args(await requestAs(users.apprentice, `/parts/${id}`), { id })),
    );
    expect(JSON.stringify(page.value)).not.toContain("134900");
    expect(JSON.stringify(page.value)).not.toMatch(/price_cents":\d/);
    const asWriter = await run(async () =>
      idLoader(args(await requestAs(users.service_writer, `/parts/${id}`), { id })),
    );
    expect(asWriter.value.part.price_cents).toBe(134900);
  });

  it("searches by tag and maker, filters by category and sorts", async () => {
    const pn = `TW-SRT-${uniq()}`;
    await addCylinder(pn);
    const r = await run(async () =>
      listLoader(
        args(
          await requestAs(users.owner, `/parts?q=plated&category=cylinders&sort=price&dir=desc`),
        ),
      ),
    );
    expect(r.value.rows.length).toBeGreaterThan(0);
    expect(
      r.value.rows.every((x: any) => x.category === "cylinders" && x.tags.includes("plated")),
    ).toBe(true);
    const prices = r.value.rows.map((x: any) => x.price_cents);
    expect(prices).toEqual([...prices].sort((a: number, b: number) => b - a));
  });
});
