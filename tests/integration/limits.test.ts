// The shop's caution limits: the owner's page validates and records who changed what,
// other roles are refused, and the limits decide which of calc's cautions the bench raises.
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { emptySpec, type BenchSpec } from "~/lib/bench/spec";
import { evaluateSpec } from "~/lib/packages/store.server";
import { DEFAULT_LIMITS, type ShopLimits } from "~/lib/settings/limits";
import { getShopLimits } from "~/lib/settings/limits.server";
import { action, loader } from "~/routes/settings.limits";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { args, post, run } from "../support/route";

const db = getDb();
const tag = randomBytes(4).toString("hex");
let owner: TestUser;
let builder: TestUser;
let apprentice: TestUser;
const part: Record<string, number> = {};

async function addPart(key: string, category: string, attributes: Record<string, number>) {
  const row = await db
    .insertInto("parts")
    .values({
      part_number: `L-${tag}-${key}`,
      category,
      maker: "Test Works",
      name: `Limits ${key}`,
      price_cents: 10000,
      tags: [],
      stock: false,
      attributes: JSON.stringify(attributes),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  part[key] = row.id;
}

/** The whole form as the page posts it: every limit, with some changed. */
function limitsForm(over: Partial<Record<keyof ShopLimits, string>> = {}) {
  const f: Record<string, string> = {};
  for (const [k, v] of Object.entries(DEFAULT_LIMITS)) f[k] = String(v);
  return { ...f, ...over };
}

// 101.6 × 114.3 mm, 189 mm rods, 0.25 + 1.02 mm quench (1.27 mm), 6000 rpm:
// mean piston speed 2 × 0.1143 m × 6000 / 60 = 22.86 m/s (derived), just under 22.9 m/s.
function spec(): BenchSpec {
  const s = emptySpec();
  for (const [slot, key] of [
    ["cylinder", "cyl"],
    ["flywheel", "fly"],
    ["piston", "pst"],
    ["head", "head"],
    ["gasket", "hg"],
    ["cam", "cam"],
    ["rod", "rod"],
  ] as const)
    s.slots[slot] = { partId: part[key]!, measured: {} };
  return { ...s, deckClearanceMm: 0.25, revLimitRpm: 6000 };
}

async function cautionsNow() {
  const ev = await evaluateSpec(db, spec());
  return ev.computation;
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [owner, builder, apprentice] = await Promise.all([
    createTestUser(db, "owner"),
    createTestUser(db, "builder"),
    createTestUser(db, "apprentice"),
  ]);
  await addPart("cyl", "cylinders", { boreMm: 101.6 });
  await addPart("fly", "flywheels", { strokeMm: 114.3 });
  await addPart("pst", "pistons", { domeCc: -4.8, compressionHeightMm: 38, forBoreMm: 101.6 });
  await addPart("head", "heads", { chamberCc: 89 });
  await addPart("hg", "head_gaskets", { boreMm: 102.1, compressedThicknessMm: 1.02 });
  await addPart("cam", "cams", { intakeClosesAbdcDeg: 32, intakeLiftMm: 14.8 });
  // the same cam, carded at 0.050 in and in seat timing (0.3 mm)
  await addPart("cam050", "cams", { intakeClosesAbdcDeg: 32, timingAtLiftMm: 1.27 });
  await addPart("camseat", "cams", { intakeClosesAbdcDeg: 47, timingAtLiftMm: 0.3 });
  await addPart("rod", "rods", { lengthMm: 189 });
});

afterAll(async () => {
  // the limits are the shop's: leave them at their defaults for every other test
  await db.deleteFrom("caution_limits").execute();
  await db.deleteFrom("caution_limit_changes").where("changed_by", "=", owner.id).execute();
});

describe("the caution limits page", () => {
  it("shows every limit with its default and source to the owner", async () => {
    const out = await run(async () => loader(args(await requestAs(owner, "/settings/limits"))));
    expect(out.status).toBe(200);
    const mean = out.value.states.find((s: { key: string }) => s.key === "meanPistonSpeedMaxMs");
    expect(mean).toEqual({
      key: "meanPistonSpeedMaxMs",
      value: 22.9,
      changed: false,
      updatedBy: null,
      updatedAt: null,
    });
  });

  it("is refused to every other role, on read and on save", async () => {
    for (const who of [builder, apprentice]) {
      const read = await run(async () => loader(args(await requestAs(who, "/settings/limits"))));
      expect(read.status).toBe(403);
      const save = await run(async () =>
        action(args(await post(who, "/settings/limits", limitsForm()))),
      );
      expect(save.status).toBe(403);
    }
    expect(await db.selectFrom("caution_limits").select("key").execute()).toEqual([]);
  });

  it("puts each bad value's message beside its field and saves nothing", async () => {
    const save = async (over: Partial<Record<keyof ShopLimits, string>>) =>
      run(async () => action(args(await post(owner, "/settings/limits", limitsForm(over)))));
    const out = await save({ meanPistonSpeedMaxMs: "fast", grade2Name: "", rodRatioMin: "9" });
    expect(out.status).toBe(400);
    const errors = out.value.result.error;
    expect(errors.meanPistonSpeedMaxMs).toEqual(["Enter a number for mean piston speed, highest."]);
    expect(errors.grade2Name).toEqual(["Name the fuel grade."]);
    expect(errors.rodRatioMin).toEqual(["Must be at most 2.5."]);
    // the other values come back as typed
    expect(out.value.result.initialValue.peakPistonSpeedMaxMs).toBe("37.5");
    // limits that must agree with each other are checked once each is a usable value
    const cross = await save({
      quenchMaxMm: "0.5",
      grade3Name: "Pump 91",
      peakPistonSpeedMaxMs: "20",
    });
    expect(cross.status).toBe(400);
    expect(cross.value.result.error).toEqual({
      quenchMaxMm: ["Must be wider than the tightest quench."],
      grade3Name: ["Two grades have this name: give each its own."],
      peakPistonSpeedMaxMs: [
        "Peak piston speed is always above the mean: set it higher than the mean.",
      ],
    });
    expect(await db.selectFrom("caution_limits").select("key").execute()).toEqual([]);
  });
});

describe("the dynamic ratio on the shop's lift basis", () => {
  it("compares two cards at different lifts on one basis", async () => {
    const withCam = (key: string) => {
      const s = spec();
      s.slots.cam = { partId: part[key]!, measured: {} };
      return evaluateSpec(db, s);
    };
    const [checking, seat] = await Promise.all([withCam("cam050"), withCam("camseat")]);
    // default: seat timing, a checking-lift closing + 15° (from memory): 32° + 15° = 47° = the seat card
    expect(checking.computation.results.dcrClosingDeg).toBe(47);
    expect(seat.computation.results.dcrClosingDeg).toBe(47);
    expect(checking.computation.results.dynamicCr).toBe(seat.computation.results.dynamicCr);
  });
});

describe("the shop's limits decide the bench's cautions", () => {
  it("with the defaults, a stock stroke at 6000 rpm trips no piston-speed caution", async () => {
    const c = await cautionsNow();
    expect(c.results.meanPistonSpeedMs).toBeCloseTo(22.86, 10);
    expect(c.cautions.map((x) => x.code)).not.toContain("MEAN_PISTON_SPEED_HIGH");
    expect(c.cautions.map((x) => x.code)).not.toContain("QUENCH_WIDE");
  });

  it("a lower mean-speed limit, a narrower quench window and another fuel grade change them", async () => {
    const before = await cautionsNow();
    const dcr = before.results.dynamicCr!;
    // the bench grade's limit set just under this package's dynamic ratio
    const out = await run(async () =>
      action(
        args(
          await post(
            owner,
            "/settings/limits",
            limitsForm({
              meanPistonSpeedMaxMs: "21",
              quenchMaxMm: "1.1",
              grade1Name: "regular 91",
              grade1DcrMax: String(Math.floor((dcr - 0.1) * 100) / 100),
              benchGrade: "grade1",
              grade2DcrMax: "16",
            }),
          ),
        ),
      ),
    );
    expect(out.status).toBe(200);
    expect(out.value.done).toBe("Saved 6 limits. The bench uses them from its next figure.");
    const after = await cautionsNow();
    const mean = after.cautions.find((x) => x.code === "MEAN_PISTON_SPEED_HIGH");
    expect(mean?.limit).toBe(21);
    expect(mean?.by).toBeCloseTo(1.86, 10);
    expect(mean?.message).toContain("above the limit of 21 m/s by 1.86 m/s");
    const quench = after.cautions.find((x) => x.code === "QUENCH_WIDE");
    expect(quench?.limit).toBe(1.1);
    expect(quench?.by).toBeCloseTo(0.17, 10);
    const d = after.cautions.find((x) => x.code === "DYNAMIC_CR_HIGH");
    expect(d?.message).toContain("the limit set for regular 91");

    // race fuel on the bench: no dynamic-compression caution at this ratio
    await run(async () =>
      action(
        args(
          await post(
            owner,
            "/settings/limits",
            limitsForm({
              meanPistonSpeedMaxMs: "21",
              quenchMaxMm: "1.1",
              grade1Name: "regular 91",
              benchGrade: "grade3",
            }),
          ),
        ),
      ),
    );
    const race = await cautionsNow();
    expect(race.cautions.map((x) => x.code)).not.toContain("DYNAMIC_CR_HIGH");
    expect((await getShopLimits(db)).benchGrade).toBe("grade3");
  });

  it("keeps who changed which limit when", async () => {
    const out = await run(async () => loader(args(await requestAs(owner, "/settings/limits"))));
    const mean = out.value.states.find((s: { key: string }) => s.key === "meanPistonSpeedMaxMs");
    expect(mean.changed).toBe(true);
    expect(mean.value).toBe(21);
    expect(mean.updatedBy).toBe(owner.name);
    const bench = out.value.changes.filter((c: { key: string }) => c.key === "benchGrade");
    expect(
      bench.map((c: { oldValue: string; newValue: string }) => [c.oldValue, c.newValue]),
    ).toEqual([
      ["grade1", "grade3"],
      ["grade2", "grade1"],
    ]);
    expect(bench[0].changedBy).toBe(owner.name);
  });
});
