// The keep-check: each installed part marked for each reason — the package puts another
// part in its slot (replace), a fit rule flags it with this package (the same rule, at
// the same version, that the bench reports when the part is in the slot), its rating is
// below the package's power (replace), a caution rule (review), nothing known (review),
// nothing against it (keep) — and an override with its note, kept and shown.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createRule } from "~/lib/fit-rules/rules.server";
import { createPackage } from "~/lib/packages/store.server";
import { emptySpec } from "~/lib/bench/spec";
import { action as benchAction } from "~/routes/packages.$id.bench";
import * as page from "~/routes/packages.$id.keep-check";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { args, post, run } from "../support/route";
import { tagOf } from "../support/requests";

const db = getDb();
const tag = tagOf();
let writer: TestUser;
let builder: TestUser;
let otherBuilder: TestUser;
let apprentice: TestUser;
let bikeId = 0;
let packageId = 0;
let axleRule = 0;
let cautionRule = 0;
const part: Record<string, number> = {};
const bp: Record<string, number> = {};

async function addPart(
  key: string,
  category: string,
  tags: string[],
  attributes: Record<string, number> = {},
) {
  part[key] = (
    await db
      .insertInto("parts")
      .values({
        part_number: `KC-${tag}-${key}`,
        category,
        maker: "Test Works",
        name: `Keep-check ${key}`,
        price_cents: 100,
        tags,
        stock: key.startsWith("stock"),
        attributes: JSON.stringify(attributes),
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
}

async function install(key: string, category: string, partId: number | null, description: string) {
  bp[key] = (
    await db
      .insertInto("bike_parts")
      .values({ bike_id: bikeId, part_id: partId, category, description })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [writer, builder, otherBuilder, apprentice] = await Promise.all([
    createTestUser(db, "service_writer"),
    createTestUser(db, "builder"),
    createTestUser(db, "builder"),
    createTestUser(db, "apprentice"),
  ]);
  await addPart("stockCyl", "cylinders", [], { boreMm: 101.6 });
  await addPart("bigCyl", "cylinders", [], { boreMm: 104.8 });
  await addPart("stockAxle", "axle_adjusters", [`ax-${tag}`]);
  await addPart("lightClutch", "clutch_lines", [], { lengthIn: 62, ratedHp: 120 });
  await addPart("shocks", "rear_shocks", [`sh-${tag}`]);
  await addPart("risers", "risers", [], { heightIn: 4 });
  const axle = await createRule(
    db,
    {
      name: `Stock adjusters above 145 hp ${tag}`,
      kind: "upgrade",
      condition: `power_hp > 145 and has("ax-${tag}")`,
      message: "Fit locking adjusters.",
      upgrade_category: "axle_adjusters",
      suggested_part_id: null,
      active: true,
    },
    null,
  );
  const caution = await createRule(
    db,
    {
      name: `Check these shocks above 100 hp ${tag}`,
      kind: "caution",
      condition: `power_hp > 100 and has("sh-${tag}")`,
      message: "Check the shocks' spring rate for the added weight of the work.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    },
    null,
  );
  if (!axle.ok || !caution.ok) throw new Error("test rules refused");
  axleRule = axle.rule.id;
  cautionRule = caution.rule.id;
  const c = await db
    .insertInto("customers")
    .values({ name: `Keep ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  bikeId = (
    await db
      .insertInto("bikes")
      .values({ customer_id: c.id, year: 2021, model: "Tourer", notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  await install("cyl", "cylinders", part.stockCyl!, "Stock cylinders");
  await install("axle", "axle_adjusters", part.stockAxle!, "Stock adjusters");
  await install("clutch", "clutch_lines", part.lightClutch!, "Light clutch cable");
  await install("shocks", "rear_shocks", part.shocks!, "Shocks");
  await install("risers", "risers", part.risers!, "Low risers");
  await install("exhaust", "exhaust", null, "Exhaust, maker unknown");
  const spec = emptySpec();
  spec.slots.cylinder = { partId: part.bigCyl!, measured: {} };
  spec.powerHp = 150;
  spec.powerBasis = "target";
  packageId = await createPackage(
    db,
    { name: `Keep-check ${tag}`, bikeId, isTemplate: false, builderId: builder.id, spec },
    builder.id,
  );
});

const params = () => ({ id: String(packageId) });
const load = async (who: TestUser) =>
  run(async () =>
    page.loader(args(await requestAs(who, `/packages/${packageId}/keep-check`), params())),
  );
const rowOf = (check: any, key: string) =>
  check.rows.find((r: { bikePartId: number }) => r.bikePartId === bp[key]);

describe("/packages/:id/keep-check", () => {
  it("marks each installed part with its reason", async () => {
    const out = await load(writer);
    expect(out.status).toBe(200);
    const check = out.value.check;
    const mark = (k: string) => [
      rowOf(check, k).mark,
      rowOf(check, k).reasons.map((r: any) => r.text),
    ];
    expect(mark("cyl")).toEqual([
      "replace",
      [`The package puts KC-${tag}-bigCyl Keep-check bigCyl in its slot (Bore (cylinders)).`],
    ]);
    expect(mark("axle")).toEqual([
      "replace",
      [
        `Fit rule “Stock adjusters above 145 hp ${tag}” flags it for this package: Fit locking adjusters.`,
      ],
    ]);
    expect(mark("clutch")).toEqual(["replace", ["Rated for 120 hp; the package aims at 150 hp."]]);
    expect(mark("shocks")).toEqual([
      "review",
      [
        `Fit rule “Check these shocks above 100 hp ${tag}” cautions for this package: Check the shocks' spring rate for the added weight of the work.`,
      ],
    ]);
    expect(mark("exhaust")).toEqual([
      "review",
      ["Not a catalog part: nothing is known about it to check against this package."],
    ]);
    expect(mark("risers")).toEqual([
      "keep",
      ["The package leaves its slot as it is, and no fit rule flags it."],
    ]);
    expect(cautionRule).toBeGreaterThan(0);
  });

  it("finds the same rule, at the same version, that the bench finds with the part in its slot", async () => {
    const benchPkg = await createPackage(
      db,
      { name: `Bench ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
      builder.id,
    );
    let rev = 1;
    const steps: Record<string, string>[] = [
      { intent: "set-part", slot: "axle_adjusters", partId: String(part.stockAxle) },
      { intent: "set-number", field: "powerHp", value: "150", unit: "hp" },
    ];
    for (const f of steps) {
      const out = (await benchAction(
        args(
          await post(builder, `/packages/${benchPkg}/bench`, {
            ...f,
            expectedRevision: String(rev),
          }),
          {
            id: String(benchPkg),
          },
        ),
      )) as { data: { saved: string } };
      rev = JSON.parse(out.data.saved).revision;
    }
    const stored = await db
      .selectFrom("packages")
      .select("findings")
      .where("id", "=", benchPkg)
      .executeTakeFirstOrThrow();
    const onBench = (stored.findings as { ruleId: number; ruleVersion: number; kind: string }[])
      .filter((f) => f.ruleId === axleRule)
      .map((f) => [f.ruleId, f.ruleVersion, f.kind]);
    expect(onBench).toEqual([[axleRule, 1, "upgrade"]]);
    const check = (await load(writer)).value.check;
    expect(rowOf(check, "axle").reasons[0].kind).toBe("rule");
    // the keep-check names the rule by its current name and version 1, as the bench does
    const rule = await db
      .selectFrom("fit_rules")
      .select(["name", "version"])
      .where("id", "=", axleRule)
      .executeTakeFirstOrThrow();
    expect(rule.version).toBe(1);
    expect(rowOf(check, "axle").reasons[0].text).toContain(`“${rule.name}”`);
  });

  it("keeps an override with its note, shows it, and returns to the computed mark", async () => {
    const missing = await run(async () =>
      page.action(
        args(
          await post(writer, `/packages/${packageId}/keep-check`, {
            intent: "override",
            bikePartId: String(bp.exhaust),
            mark: "keep",
            note: "",
          }),
          params(),
        ),
      ),
    );
    expect(missing.status).toBe(400);
    expect(missing.value.error.note).toEqual(["Say why the mark is changed"]);
    const saved = await run(async () =>
      page.action(
        args(
          await post(writer, `/packages/${packageId}/keep-check`, {
            intent: "override",
            bikePartId: String(bp.exhaust),
            mark: "keep",
            note: "Fitted by us last spring; flows enough.",
          }),
          params(),
        ),
      ),
    );
    expect(saved.status).toBe(200);
    const row = rowOf((await load(writer)).value.check, "exhaust");
    expect(row.computed).toBe("review");
    expect(row.mark).toBe("keep");
    expect(row.override).toMatchObject({
      mark: "keep",
      note: "Fitted by us last spring; flows enough.",
      by: writer.name,
    });
    await run(async () =>
      page.action(
        args(await post(writer, `/packages/${packageId}/keep-check`, { intent: "done" }), params()),
      ),
    );
    const recorded = await db
      .selectFrom("keep_checks")
      .select("marks")
      .where("package_id", "=", packageId)
      .executeTakeFirstOrThrow();
    const marks = recorded.marks as { bikePartId: number; mark: string; note: string | null }[];
    expect(marks.find((m) => m.bikePartId === bp.exhaust)).toMatchObject({
      mark: "keep",
      note: "Fitted by us last spring; flows enough.",
    });
    expect(marks.filter((m) => m.mark === "replace").length).toBe(3);
    await run(async () =>
      page.action(
        args(
          await post(writer, `/packages/${packageId}/keep-check`, {
            intent: "clear",
            bikePartId: String(bp.exhaust),
          }),
          params(),
        ),
      ),
    );
    const back = rowOf((await load(writer)).value.check, "exhaust");
    expect([back.mark, back.override]).toEqual(["review", null]);
  });

  it("lets the package's builder read it, and refuses another builder and the apprentice", async () => {
    expect((await load(builder)).status).toBe(200);
    expect((await load(otherBuilder)).status).toBe(403);
    expect((await load(apprentice)).status).toBe(403);
    const edit = await run(async () =>
      page.action(
        args(
          await post(builder, `/packages/${packageId}/keep-check`, { intent: "done" }),
          params(),
        ),
      ),
    );
    expect(edit.status).toBe(403);
  });
});
