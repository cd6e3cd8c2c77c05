// Engine families, kept by the owner: a new family with its stock parts, each save a
// version with what changed, a stock part of the wrong category or a taken name refused
// beside its field; everyone on the staff may read them.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import * as create from "~/routes/engine-families.new";
import * as one from "~/routes/engine-families.$id";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { args, post, run } from "../support/route";
import { tagOf } from "../support/requests";

const db = getDb();
const tag = tagOf();
let owner: TestUser;
let apprentice: TestUser;
let cyl = 0;
let cam = 0;

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [owner, apprentice] = await Promise.all([
    createTestUser(db, "owner"),
    createTestUser(db, "apprentice"),
  ]);
  const add = async (key: string, category: string) =>
    (
      await db
        .insertInto("parts")
        .values({
          part_number: `EF-${tag}-${key}`,
          category,
          maker: "Test Works",
          name: `Family ${key}`,
          price_cents: 0,
          tags: [],
          attributes: "{}",
        })
        .returning("id")
        .executeTakeFirstOrThrow()
    ).id;
  cyl = await add("cyl", "cylinders");
  cam = await add("cam", "cams");
});

const body = (over: Record<string, string> = {}) => ({
  intent: "save",
  name: `Family twin ${tag}`,
  yearFrom: "2017",
  yearTo: "2023",
  boreMm: "101.6",
  strokeMm: "114.3",
  displacementCc: "1853",
  deckHeightMm: "257.3",
  revLimitRpm: "5600",
  stock_cylinder: String(cyl),
  notes: "",
  ...over,
});

describe("/engine-families", () => {
  it("adds a family, versions each save and refuses bad stock parts and taken names", async () => {
    const wrongPart = await run(async () =>
      create.action(
        args(await post(owner, "/engine-families/new", body({ stock_cylinder: String(cam) }))),
      ),
    );
    expect(wrongPart.status).toBe(400);
    expect(wrongPart.value.result.error.stock_cylinder).toEqual([
      "Pick a bore (cylinders) part from the catalog",
    ]);
    const badYears = await run(async () =>
      create.action(args(await post(owner, "/engine-families/new", body({ yearTo: "2001" })))),
    );
    expect(badYears.value.result.error.yearTo).toEqual([
      "The last year cannot be before the first",
    ]);
    const made = await run(async () =>
      create.action(args(await post(owner, "/engine-families/new", body()))),
    );
    expect(made.status).toBe(302);
    const id = Number(made.location!.split("/").pop());
    const taken = await run(async () =>
      create.action(
        args(await post(owner, "/engine-families/new", body({ name: `FAMILY TWIN ${tag}` }))),
      ),
    );
    expect(taken.value.result.error.name).toEqual(["Another engine family already has this name"]);
    const params = { id: String(id) };
    const saved = await run(async () =>
      one.action(
        args(await post(owner, `/engine-families/${id}`, body({ revLimitRpm: "5800" })), params),
      ),
    );
    expect(saved.value.saved).toBe("Saved as a new version.");
    const page = await run(async () =>
      one.loader(args(await requestAs(apprentice, `/engine-families/${id}`), params)),
    );
    expect(page.status).toBe(200);
    expect(page.value.canEdit).toBe(false);
    expect(page.value.family).toMatchObject({
      version: 2,
      revLimitRpm: 5800,
      stockParts: { cylinder: cyl },
    });
    expect(
      page.value.history.map((h: { version: number; change: string }) => [h.version, h.change]),
    ).toEqual([
      [2, "Changed stock rev limit"],
      [1, "Added"],
    ]);
    const refused = await run(async () =>
      one.action(args(await post(apprentice, `/engine-families/${id}`, body()), params)),
    );
    expect(refused.status).toBe(403);
  });
});
