// The spec bench's action: each action recomputes with calc/, evaluates the fit rules
// from PostgreSQL and saves into the working copy and its edit log; stale saves are
// refused; bad values are refused beside their field.
import { randomBytes } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { computeSpec } from "../../calc";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createRule, updateRule } from "~/lib/fit-rules/rules.server";
import { createPackage } from "~/lib/packages/store.server";
import { decodeFinding } from "~/lib/bench/finding-codes";
import { action as benchAction, loader as benchLoader } from "~/routes/packages.$id.bench";
import { createTestUser, requestAs, type TestUser } from "../support/auth";

const db = getDb();
const tag = randomBytes(4).toString("hex");
let builder: TestUser;
let writer: TestUser;
let apprentice: TestUser;
const part: Record<string, number> = {};
let upgradeRuleId = 0;
let conflictRuleId = 0;
let bikeId = 0;

async function addPart(
  key: string,
  category: string,
  attributes: Record<string, number>,
  tags: string[] = [],
  stock = false,
) {
  const row = await db
    .insertInto("parts")
    .values({
      part_number: `T-${tag}-${key}`,
      category,
      maker: "Test Works",
      name: `Test ${key}`,
      price_cents: 10000,
      tags,
      stock,
      attributes: JSON.stringify(attributes),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  part[key] = row.id;
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [builder, writer, apprentice] = await Promise.all([
    createTestUser(db, "builder"),
    createTestUser(db, "service_writer"),
    createTestUser(db, "apprentice"),
  ]);
  await addPart("cyl", "cylinders", { boreMm: 101.6 });
  await addPart("fly", "flywheels", { strokeMm: 114.3 });
  await addPart("pst", "pistons", { domeCc: -4.8, compressionHeightMm: 38, forBoreMm: 101.6 });
  await addPart("head", "heads", { chamberCc: 89 });
  await addPart("hg", "head_gaskets", { boreMm: 102.1, compressedThicknessMm: 1.02 });
  await addPart("hgsmall", "head_gaskets", { boreMm: 99.1, compressedThicknessMm: 1.02 }, [
    `small-gasket-${tag}`,
  ]);
  await addPart("cam", "cams", {
    intakeClosesAbdcDeg: 32,
    intakeLiftMm: 14.8,
    exhaustLiftMm: 14.8,
    timingAtLiftMm: 1.346,
  });
  await addPart("rod", "rods", { lengthMm: 189 });
  await addPart("axstock", "axle_adjusters", {}, [`stock-axle-${tag}`], true);
  await addPart("axlock", "axle_adjusters", { ratedHp: 220 });
  const up = await createRule(
    db,
    {
      name: `Power ${tag}`,
      kind: "upgrade",
      condition: `power_hp > 145 and has("stock-axle-${tag}")`,
      message: "Upgrade the adjusters.",
      upgrade_category: "axle_adjusters",
      suggested_part_id: part.axlock!,
      active: true,
    },
    null,
  );
  const co = await createRule(
    db,
    {
      name: `Gasket ${tag}`,
      kind: "conflict",
      condition: `has("small-gasket-${tag}") and gasket.bore_mm < cylinder.bore_mm`,
      message: "Gasket bore under the bore.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    },
    null,
  );
  if (!up.ok || !co.ok) throw new Error("rule fixtures did not save");
  upgradeRuleId = up.rule.id;
  conflictRuleId = co.rule.id;
  const c = await db
    .insertInto("customers")
    .values({ name: `Bench ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  bikeId = (
    await db
      .insertInto("bikes")
      .values({ customer_id: c.id, year: 2020, model: "Test twin", notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
});

async function newPackage() {
  return createPackage(
    db,
    { name: `Bench test ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
    builder.id,
  );
}

async function act(user: TestUser, id: number, fields: Record<string, string>) {
  const request = await requestAs(user, `/packages/${id}/bench`, {
    method: "POST",
    body: new URLSearchParams(fields),
  });
  const out = (await benchAction({
    request,
    params: { id: String(id) },
    context: {},
  } as never)) as { data: any; init?: { status?: number } };
  // a saved state is answered as one JSON string, its findings as short codes
  const saved = typeof out.data.saved === "string" ? JSON.parse(out.data.saved) : null;
  const body = saved
    ? { ...out.data, state: { ...saved, findings: saved.findings.map(decodeFinding) } }
    : out.data;
  return { status: out.init?.status ?? 200, body };
}

async function current(id: number) {
  return db.selectFrom("packages").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
}

async function fill(id: number, user = builder) {
  const steps: [string, string][] = [
    ["cylinder", "cyl"],
    ["flywheel", "fly"],
    ["piston", "pst"],
    ["head", "head"],
    ["gasket", "hg"],
    ["cam", "cam"],
    ["rod", "rod"],
  ];
  let rev = (await current(id)).version;
  for (const [slot, key] of steps) {
    const r = await act(user, id, {
      intent: "set-part",
      slot,
      partId: String(part[key]),
      expectedRevision: String(rev),
    });
    expect(r.status).toBe(200);
    rev = r.body.state.version;
  }
  for (const [field, value] of [
    ["deckClearanceMm", "0.25"],
    ["revLimitRpm", "6000"],
  ]) {
    const r = await act(user, id, {
      intent: "set-number",
      field: field!,
      value: value!,
      unit: field === "revLimitRpm" ? "rpm" : "mm",
      expectedRevision: String(rev),
    });
    expect(r.status).toBe(200);
    rev = r.body.state.version;
  }
  return rev;
}

const SPEC = {
  boreMm: 101.6,
  strokeMm: 114.3,
  pistonDomeCc: -4.8,
  chamberCc: 89,
  gasketBoreMm: 102.1,
  gasketThicknessMm: 1.02,
  intakeClosesAbdcDeg: 32,
  rodLengthMm: 189,
  deckClearanceMm: 0.25,
  revLimitRpm: 6000,
  cylinders: 2,
};

describe("bench actions", () => {
  it("recompute with calc/ and store the figures in the working copy, each edit in the log", async () => {
    const id = await newPackage();
    const rev = await fill(id);
    expect(rev).toBe(10);
    // the shop's default lift basis: seat timing, the card's 0.053 in closing + 15°
    const expected = computeSpec({ ...SPEC, intakeClosesAddDeg: 15 });
    if (!expected.ok) throw new Error("fixture spec does not compute");
    const row = await current(id);
    expect((row.results as any).results).toEqual(expected.results);
    expect((row.rule_snapshot as any).numbers.bore_mm).toBe(101.6);
    expect((row.rule_snapshot as any).numbers.cr_static).toBeCloseTo(
      expected.results.staticCr!,
      12,
    );
    expect(row.rev_limit_rpm).toBe(6000);
    const logged = await db
      .selectFrom("package_edits")
      .select(["spec", "change", "revision"])
      .where("package_id", "=", id)
      .where("version", "=", rev)
      .executeTakeFirstOrThrow();
    expect(logged.change).toMatch(/Rev limit: 6000/);
    expect(logged.spec).toEqual(row.spec);
    // one builder's nine edits are one revision
    expect(logged.revision).toBe(2);
    expect(row.current_revision).toBe(2);
  });

  it("takes measured values in inches, stores mm, and reverts to nominal", async () => {
    const id = await newPackage();
    let rev = await fill(id);
    const r = await act(builder, id, {
      intent: "set-measured",
      slot: "gasket",
      field: "gasketThicknessMm",
      value: "0.045",
      unit: "in",
      expectedRevision: String(rev),
    });
    expect(r.status).toBe(200);
    rev = r.body.state.version;
    expect(r.body.state.spec.slots.gasket.measured.gasketThicknessMm).toBeCloseTo(1.143, 9);
    const expected = computeSpec({ ...SPEC, gasketThicknessMm: 0.045 * 25.4 });
    expect(expected.ok && r.body.state.computation.results.staticCr).toBe(
      expected.ok ? expected.results.staticCr : null,
    );
    const back = await act(builder, id, {
      intent: "revert-measured",
      slot: "gasket",
      field: "gasketThicknessMm",
      expectedRevision: String(rev),
    });
    expect(back.body.state.spec.slots.gasket.measured).toEqual({});
  });

  it("reports the fit rules' findings: the power upgrade with its suggested part, and the gasket conflict", async () => {
    const id = await newPackage();
    let rev = await fill(id);
    const steps: Record<string, string>[] = [
      { intent: "set-part", slot: "axle_adjusters", partId: String(part.axstock) },
      { intent: "set-number", field: "powerHp", value: "150", unit: "hp" },
      { intent: "set-basis", value: "target" },
    ];
    const answers: any[] = [];
    for (const f of steps) {
      const r = await act(builder, id, { ...f, expectedRevision: String(rev) });
      expect(r.status).toBe(200);
      rev = r.body.state.version;
      answers.push(r.body.state);
    }
    // without a power figure the rule could not be checked; the answer that made it fire
    // brings its name and message, the next one only names it
    const key = `${upgradeRuleId}@1`;
    expect(answers[0].findings).toContainEqual({
      ruleId: upgradeRuleId,
      ruleVersion: 1,
      kind: "upgrade",
      error: expect.stringMatching(/power_hp/),
    });
    expect(answers[1].findings).toContainEqual({
      ruleId: upgradeRuleId,
      ruleVersion: 1,
      kind: "upgrade",
    });
    expect(answers[1].rules[key]).toEqual({
      name: `Power ${tag}`,
      message: "Upgrade the adjusters.",
      upgradeCategory: "axle_adjusters",
      suggestedPartId: part.axlock,
    });
    expect(answers[2].findings).toContainEqual({
      ruleId: upgradeRuleId,
      ruleVersion: 1,
      kind: "upgrade",
    });
    expect(answers[2].rules).not.toHaveProperty(key);
    expect(answers[2].computation).not.toHaveProperty("steps");

    // saved by rule version on the working copy and, once the revision closes, on the
    // revision; the bench reads the name and message from that version
    const row = await current(id);
    const closed = await act(builder, id, {
      intent: "close-revision",
      note: "Power upgrade checked",
      expectedVersion: String(rev),
    });
    expect(closed.status).toBe(200);
    const saved = await db
      .selectFrom("package_revisions")
      .select(["findings", "results"])
      .where("package_id", "=", id)
      .where("revision", "=", row.current_revision)
      .executeTakeFirstOrThrow();
    expect((row.findings as any[]).find((f) => f.ruleId === upgradeRuleId)).toEqual({
      ruleId: upgradeRuleId,
      ruleVersion: 1,
      kind: "upgrade",
    });
    expect(saved.findings).toEqual(row.findings);
    expect(saved.results).not.toHaveProperty("steps");
    expect((row.rule_snapshot as any).power_basis).toBe("target");
    const view = (await benchLoader({
      request: await requestAs(builder, `/packages/${id}/bench`),
      params: { id: String(id) },
      context: {},
    } as never)) as any;
    expect(view.state.findings.find((f: any) => f.ruleId === upgradeRuleId)).toMatchObject({
      kind: "upgrade",
      ruleName: `Power ${tag}`,
      message: "Upgrade the adjusters.",
      upgradeCategory: "axle_adjusters",
      suggestedPartId: part.axlock,
    });

    const fixed = await act(builder, id, {
      intent: "set-part",
      slot: "axle_adjusters",
      partId: String(part.axlock),
      expectedRevision: String(rev),
    });
    expect(fixed.body.state.findings.some((f: any) => f.ruleId === upgradeRuleId)).toBe(false);
    rev = fixed.body.state.version;

    const bad = await act(builder, id, {
      intent: "set-part",
      slot: "gasket",
      partId: String(part.hgsmall),
      expectedRevision: String(rev),
    });
    expect(bad.status).toBe(200);
    expect(bad.body.state.findings.find((f: any) => f.ruleId === conflictRuleId)).toMatchObject({
      kind: "conflict",
    });
    expect(bad.body.state.computation.inputErrors.map((e: any) => e.field)).toContain(
      "gasketBoreMm",
    );
    expect(bad.body.state.computation.results.displacementCc).not.toBeNull();
    expect(bad.body.state.computation.results.staticCr).toBeNull();
  });

  it("refuses bad measured values beside the field and keeps the last good revision", async () => {
    const id = await newPackage();
    const rev = await fill(id);
    const cases: [Record<string, string>, string, RegExp][] = [
      [
        { intent: "set-measured", slot: "gasket", field: "gasketBoreMm", value: "abc", unit: "mm" },
        "gasket.gasketBoreMm",
        /number/,
      ],
      [
        { intent: "set-measured", slot: "cylinder", field: "boreMm", value: "-101", unit: "mm" },
        "cylinder.boreMm",
        /negative/,
      ],
      [
        { intent: "set-measured", slot: "gasket", field: "gasketBoreMm", value: "99", unit: "mm" },
        "gasket.gasketBoreMm",
        /bore/i,
      ],
      [
        { intent: "set-measured", slot: "rod", field: "rodLengthMm", value: "56", unit: "mm" },
        "rod.rodLengthMm",
        /stroke/i,
      ],
      [
        { intent: "set-number", field: "revLimitRpm", value: "90000", unit: "rpm" },
        "revLimitRpm",
        /range/,
      ],
      [
        { intent: "set-measured", slot: "head", field: "boreMm", value: "100", unit: "mm" },
        "head.boreMm",
        /slot/,
      ],
    ];
    for (const [fields, key, why] of cases) {
      const r = await act(builder, id, { ...fields, expectedRevision: String(rev) });
      expect(r.status, key).toBe(400);
      expect(r.body.errors[key]?.join(" ")).toMatch(why);
    }
    expect((await current(id)).version).toBe(rev);
  });

  it("refuses a save based on a stale revision with what changed, who and when; two concurrent saves cannot both win", async () => {
    const id = await newPackage();
    const rev = await fill(id);
    const first = await act(builder, id, {
      intent: "set-measured",
      slot: "head",
      field: "chamberCc",
      value: "88.4",
      unit: "cc",
      expectedRevision: String(rev),
    });
    expect(first.status).toBe(200);
    const late = await act(builder, id, {
      intent: "set-part",
      slot: "cam",
      partId: String(part.cam),
      expectedRevision: String(rev),
    });
    expect(late.status).toBe(409);
    expect(late.body.stale).toMatchObject({
      currentVersion: rev + 1,
      baseVersion: rev,
      savedBy: builder.name,
    });
    expect(late.body.stale.changes).toEqual([
      {
        key: "head.chamberCc",
        label: "Head: measured chamber",
        before: "nominal",
        after: "88.4 cc",
      },
    ]);
    expect(late.body.current.version).toBe(rev + 1);

    const base = String(rev + 1);
    const [a, b] = await Promise.all([
      act(builder, id, {
        intent: "set-number",
        field: "powerHp",
        value: "120",
        unit: "hp",
        expectedRevision: base,
      }),
      act(builder, id, {
        intent: "set-number",
        field: "powerHp",
        value: "130",
        unit: "hp",
        expectedRevision: base,
      }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const edits = await db
      .selectFrom("package_edits")
      .select("version")
      .where("package_id", "=", id)
      .execute();
    expect(edits.length).toBe(rev + 2);
  });

  it("lets only owner and builder change the bench; the apprentice cannot open it", async () => {
    const id = await newPackage();
    const r = await requestAs(writer, `/packages/${id}/bench`, {
      method: "POST",
      body: new URLSearchParams({ intent: "clear-slot", slot: "cam", expectedRevision: "1" }),
    });
    await expect(
      benchAction({ request: r, params: { id: String(id) }, context: {} } as never),
    ).rejects.toMatchObject({ init: { status: 403 } });
    const view = await benchLoader({
      request: await requestAs(writer, `/packages/${id}/bench`),
      params: { id: String(id) },
      context: {},
    } as never);
    expect(view.canEdit).toBe(false);
    expect(view.options.cylinder?.[0]?.priceCents).toBeTypeOf("number");
    await expect(
      benchLoader({
        request: await requestAs(apprentice, `/packages/${id}/bench`),
        params: { id: String(id) },
        context: {},
      } as never),
    ).rejects.toMatchObject({ init: { status: 403 } });
  });

  it("remembers the unit system per user", async () => {
    const id = await newPackage();
    const r = await act(writer, id, { intent: "set-units", units: "metric" });
    expect(r.body).toEqual({ ok: true, units: "metric" });
    const view = await benchLoader({
      request: await requestAs(writer, `/packages/${id}/bench`),
      params: { id: String(id) },
      context: {},
    } as never);
    expect(view.units).toBe("metric");
    const other = await benchLoader({
      request: await requestAs(builder, `/packages/${id}/bench`),
      params: { id: String(id) },
      context: {},
    } as never);
    expect(other.units).toBe("inch");
  });
});

describe("bench input at the edges", () => {
  async function archivedPart() {
    const row = await db
      .insertInto("parts")
      .values({
        part_number: `T-${tag}-archived-${randomBytes(2).toString("hex")}`,
        category: "cylinders",
        maker: "Test Works",
        name: "Archived cylinder",
        price_cents: 10000,
        tags: [],
        stock: false,
        attributes: JSON.stringify({ boreMm: 104.8 }),
        archived_at: new Date(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    return row.id;
  }

  it("refuses archived, unknown and wrong-category parts beside the slot, saving nothing", async () => {
    const id = await newPackage();
    const rev = await fill(id);
    const cases: [string, string, string[]][] = [
      ["cylinder", String(await archivedPart()), ["That part is not in the active catalog."]],
      ["cylinder", "2147483000", ["That part is not in the active catalog."]],
      [
        "cylinder",
        String(part.fly),
        ["A flywheels part does not go in the bore (cylinders) slot."],
      ],
      ["gasket", String(part.head), ["A heads part does not go in the head gasket slot."]],
    ];
    for (const [slot, partId, errors] of cases) {
      const r = await act(builder, id, {
        intent: "set-part",
        slot,
        partId,
        expectedRevision: String(rev),
      });
      expect([r.status, r.body.errors], `${slot} ← ${partId}`).toEqual([400, { [slot]: errors }]);
    }
    const row = await current(id);
    expect(row.version).toBe(rev);
    expect((row.spec as any).slots.cylinder.partId).toBe(part.cyl);
  });

  it("needs the version a change is based on: missing is refused, one from the future is stale", async () => {
    const id = await newPackage();
    const rev = await fill(id);
    const change = { intent: "set-number", field: "powerHp", value: "120", unit: "hp" };
    const missing = await act(builder, id, change);
    expect([missing.status, missing.body.errors]).toEqual([
      400,
      { form: ["The bench did not say which revision it was based on; reload the page."] },
    ]);
    for (const bad of ["0", "-1", "1.5", "abc"]) {
      const r = await act(builder, id, { ...change, expectedRevision: bad });
      expect(r.status, bad).toBe(400);
    }
    const future = await act(builder, id, { ...change, expectedRevision: String(rev + 5) });
    expect(future.status).toBe(409);
    expect(future.body.current.version).toBe(rev);
    expect((await current(id)).version).toBe(rev);
  });

  it("reads comma decimals and the Unicode minus; refuses empty measured values and units that do not fit", async () => {
    const id = await newPackage();
    let rev = await fill(id);
    const ok = async (fields: Record<string, string>) => {
      const r = await act(builder, id, { ...fields, expectedRevision: String(rev) });
      expect(r.status, JSON.stringify(fields)).toBe(200);
      rev = r.body.state.version;
      return r.body.state.spec;
    };
    const measured = { intent: "set-measured", slot: "head", field: "chamberCc", unit: "cc" };
    expect((await ok({ ...measured, value: "88,4" })).slots.head.measured.chamberCc).toBe(88.4);
    const dome = { intent: "set-measured", slot: "piston", field: "pistonDomeCc", unit: "cc" };
    expect((await ok({ ...dome, value: "\u22124,5" })).slots.piston.measured.pistonDomeCc).toBe(
      -4.5,
    );
    expect(
      (
        await ok({
          intent: "set-number",
          field: "deckClearanceMm",
          value: "\u22120.25",
          unit: "mm",
        })
      ).deckClearanceMm,
    ).toBe(-0.25);
    // an empty package number clears it (a box of only spaces is refused, below)
    await ok({ intent: "set-number", field: "powerHp", value: "120", unit: "hp" });
    expect(
      (await ok({ intent: "set-number", field: "powerHp", value: "", unit: "hp" })).powerHp,
    ).toBeNull();

    const refused: [Record<string, string>, string, string][] = [
      [{ ...measured, value: "" }, "head.chamberCc", "Enter a value, or use “Back to nominal”"],
      [{ ...measured, value: "   " }, "head.chamberCc", "Enter a value, or use “Back to nominal”"],
      [
        { intent: "set-number", field: "powerHp", value: "  ", unit: "hp" },
        "powerHp",
        "Only spaces: enter a number, or empty the box completely to clear the value.",
      ],
      [{ ...measured, value: "88,4,1" }, "head.chamberCc", "Enter a number, e.g. 4.125 or 104.8"],
      [{ ...measured, value: "1e3" }, "head.chamberCc", "Enter a number, e.g. 4.125 or 104.8"],
      [{ ...measured, value: "88.4", unit: "in" }, "head.chamberCc", "This value is in cc, not in"],
      [
        { intent: "set-measured", slot: "cylinder", field: "boreMm", value: "101.6", unit: "cc" },
        "cylinder.boreMm",
        "This value is in mm or in, not cc",
      ],
      [
        { intent: "set-number", field: "revLimitRpm", value: "6000", unit: "mm" },
        "revLimitRpm",
        "This value is in rpm, not mm",
      ],
    ];
    for (const [fields, key, message] of refused) {
      const r = await act(builder, id, { ...fields, expectedRevision: String(rev) });
      expect([r.status, r.body.errors], JSON.stringify(fields)).toEqual([
        400,
        { [key]: [message] },
      ]);
    }
    expect((await current(id)).version).toBe(rev);
  });

  it("a save several edits behind is told every change since its base", async () => {
    const id = await newPackage();
    const base = await fill(id);
    let rev = base;
    for (const fields of [
      { intent: "set-measured", slot: "head", field: "chamberCc", value: "88.4", unit: "cc" },
      { intent: "set-part", slot: "gasket", partId: String(part.hgsmall) },
      { intent: "set-number", field: "powerHp", value: "150", unit: "hp" },
    ] as Record<string, string>[]) {
      const r = await act(builder, id, {
        ...fields,
        expectedRevision: String(rev),
      });
      expect(r.status).toBe(200);
      rev = r.body.state.version;
    }
    const late = await act(builder, id, {
      intent: "set-number",
      field: "revLimitRpm",
      value: "6200",
      unit: "rpm",
      expectedRevision: String(base),
    });
    expect(late.status).toBe(409);
    expect(late.body.stale).toMatchObject({ currentVersion: base + 3, baseVersion: base });
    // every change since the base, oldest first, as the bench shows them
    expect(late.body.stale.changes).toEqual([
      {
        key: "head.chamberCc",
        label: "Head: measured chamber",
        before: "nominal",
        after: "88.4 cc",
      },
      {
        key: "gasket.part",
        label: "Head gasket",
        before: `T-${tag}-hg Test hg`,
        after: `T-${tag}-hgsmall Test hgsmall`,
      },
      { key: "powerHp", label: "Power", before: "—", after: "150 hp" },
    ]);
    expect((await current(id)).version).toBe(base + 3);
  });
});

describe("the bench's rule cache", () => {
  it("a rule added, edited or switched off applies to the very next save", async () => {
    const id = await newPackage();
    let rev = await fill(id);
    const save = async (hp: string) => {
      const r = await act(builder, id, {
        intent: "set-number",
        field: "powerHp",
        value: hp,
        unit: "hp",
        expectedRevision: String(rev),
      });
      expect(r.status).toBe(200);
      rev = r.body.state.version;
      return (r.body.state.findings as { ruleId: number; ruleVersion: number }[]).filter(
        (f) => f.ruleId === ruleId,
      );
    };
    let ruleId = 0;
    expect(await save("100")).toEqual([]); // the bench's cache is warm
    const fields = {
      name: `Cache check ${tag}`,
      kind: "caution" as const,
      condition: `power_hp > 101 and has("stock-axle-${tag}") == false`,
      message: "Cache check.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    };
    const made = await createRule(db, fields, null);
    if (!made.ok) throw new Error("rule did not save");
    ruleId = made.rule.id;
    expect(await save("102")).toMatchObject([{ ruleId, ruleVersion: 1 }]);
    const edited = await updateRule(
      db,
      ruleId,
      { ...fields, condition: "power_hp > 500" },
      1,
      null,
      "raised",
    );
    expect(edited.ok).toBe(true);
    expect(await save("103")).toEqual([]);
    const back = await updateRule(
      db,
      ruleId,
      { ...fields, condition: "power_hp > 101" },
      2,
      null,
      "lowered",
    );
    expect(back.ok).toBe(true);
    expect(await save("104")).toMatchObject([{ ruleId, ruleVersion: 3 }]);
    const off = await updateRule(
      db,
      ruleId,
      { ...fields, condition: "power_hp > 101", active: false },
      3,
      null,
      "off",
    );
    expect(off.ok).toBe(true);
    expect(await save("105")).toEqual([]);
  });
});
