import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  checkCondition,
  CONDITION_LIMITS,
  evaluateRules,
  previewAgainst,
  compileCondition,
  type RuleForEval,
} from "./rules.server";
import { conditionError } from "./actions.server";
import { compileConditionText } from "./condition.server";
import { buildRuleSnapshot, type RuleSnapshotInput } from "./snapshot";
import { FUNCTIONS, SLOT_OBJECTS, TOP_LEVEL_NAMES } from "./names";

function refusal(text: string) {
  const r = checkCondition(text);
  if (r.ok) throw new Error(`accepted: ${text.slice(0, 80)}`);
  return r;
}

describe("checkCondition accepts the shop's usual conditions", () => {
  it.each([
    ['power_hp > 145 and has("stock-axle-adjusters")', ["power_hp"], ["has"]],
    ['cr_static > 11 and not has("compression-release")', ["cr_static"], ["has"]],
    ["cylinder.bore_mm > gasket.bore_mm", ["cylinder.bore_mm", "gasket.bore_mm"], []],
    ['riser_in > 12 and has("stock-clutch-cable")', ["riser_in"], ["has"]],
    ["cam.lift_mm > springs.max_lift_mm", ["cam.lift_mm", "springs.max_lift_mm"], []],
    [
      "known(axle_adjusters.rated_hp) and power_hp > axle_adjusters.rated_hp",
      ["axle_adjusters.rated_hp", "power_hp"],
      ["known"],
    ],
    [
      'power_basis == "measured" ? power_hp > 150 : power_hp > 140',
      ["power_basis", "power_hp"],
      [],
    ],
    ["140 < power_hp <= 200", ["power_hp"], []],
    ['gasket["bore_mm"] - cylinder.bore_mm < 0.5', ["gasket.bore_mm", "cylinder.bore_mm"], []],
    [
      "max(abs(deck_mm), 0) + gasket_thickness_mm < 0.9 and round(rod_ratio, 2) >= 1.5",
      ["deck_mm", "gasket_thickness_mm", "rod_ratio"],
      ["max", "abs", "round"],
    ],
    ["bore_mm ^ 2 > 10000", ["bore_mm"], []],
  ])("%s", (text, names, functions) => {
    const r = checkCondition(text);
    expect(r).toEqual({
      ok: true,
      names: expect.arrayContaining(names),
      functions: expect.arrayContaining(functions),
    });
    if (r.ok) expect(r.names).toHaveLength(names.length);
  });
});

describe("checkCondition refuses a hostile corpus with a message that points at the part", () => {
  const corpus: Array<[string, RegExp, string?]> = [
    ["power_hp = 200", /Assignment/],
    ["a = 1", /Assignment/],
    ["f(x) = x", /Defining functions/],
    ["import({x: 1})", /import.*not a function/, "import"],
    ['evaluate("1+1")', /evaluate.*not a function/, "evaluate"],
    ['createUnit("foo")', /createUnit.*not a function/, "createUnit"],
    ['parse("1") == 1', /parse.*not a function/, "parse"],
    ['simplify("x") == 1', /simplify/],
    ["cylinder.__proto__ == 1", /__proto__.*not an attribute of cylinder/, "__proto__"],
    ["cylinder.constructor == 1", /constructor.*not an attribute/, "constructor"],
    ['cylinder["constructor"]["constructor"]("return process")() == 1', /not/],
    ["__proto__ > 1", /Unknown name "__proto__"/, "__proto__"],
    ["constructor > 1", /Unknown name/],
    ["toString > 1", /Unknown name/],
    ["power_hp > 145 and process.exit(1)", /Only the listed functions/],
    ["[1, 2, 3] == 1", /Lists and matrices/],
    ["1:10 == 1", /Ranges/],
    ["{a: 1} == 1", /Objects/],
    ["5 cm > 2", /implicit multiplication|Unknown name/],
    ["power_hp > 2 hp", /implicit|Unknown/],
    ["5 cm to inch > 1", /Unknown name|not allowed/],
    ["2 ^ 2 ^ 2 ^ 2 ^ 2 ^ 2 > 1", /Powers cannot be stacked/],
    ["power_hp ^ power_hp > 1", /power after \^ must be a plain number/],
    ["2 ^ 1000 > 1", /between -10 and 10/],
    ["(".repeat(500) + "1" + ")".repeat(500) + " > 0", /nested more than/],
    ["(".repeat(30) + "power_hp > 1" + ")".repeat(30), /nested more than/],
    ["x".repeat(100_000), /characters long; the limit is 2000/],
    ["1 > 0 and " + "not ".repeat(400) + "true", /nested|too long/],
    ["power_hp > 1; cr_static > 1", /one condition only/i],
    ["power_hp > 1\ncr_static > 1", /one condition only/i],
    ["power_hp", /true or false; this one gives a number/],
    ['"text"', /true or false; this one gives text/],
    ["power_hp > 145 and", /could not be read/],
    ["power_hp >> 2 > 1", /operator ">>" is not allowed/],
    ["5! > 1", /not allowed/],
    ["power_hp' > 1", /not allowed/],
    ["has(power_basis)", /takes a word in quotes/],
    ['has("a", "b")', /takes 1 value/],
    ['filled("carburettor")', /not a slot/],
    ["power_hp and true", /combines true\/false/],
    ['power_hp == "150"', /like with like/],
    ["cylinder > 1", /is a slot/],
    ["cylinder.bore_mm.length > 1", /Only slots have attributes/],
    ["null == null", /Empty values/],
    ["1e999 > 1", /finite/],
    ["pi > 3", /Unknown name "pi"/],
    ["power_hp > 90%", /Percent|not allowed|could not be read/],
    ["power_hp?.x > 1", /Optional|Only slots|could not be read/],
    ["cam.lift_mm > springs.max_lift_mm \u0000", /control character/],
    ["", /Write a condition/],
  ];

  it("has at least 30 hostile expressions", () => expect(corpus.length).toBeGreaterThanOrEqual(30));

  it.each(corpus.map(([t, m, f]) => [JSON.stringify(t.slice(0, 50)), t, m, f] as const))(
    "refuses %s",
    (_name, text, message, fragment) => {
      const started = performance.now();
      const r = refusal(text);
      expect(performance.now() - started).toBeLessThan(500);
      expect(r.message).toMatch(message);
      if (fragment) {
        expect(r.fragment).toBe(fragment);
        expect(r.index).toBe(text.indexOf(fragment));
      }
    },
  );

  it.each([
    // the offending node's text, and its place when it stands in the condition once
    ["power_hp   =   200", /Assignment/, "power_hp = 200", 0],
    ["cr_static > 9 and has('a', 'b')", /takes 1 value/, 'has("a", "b")', 18],
    [
      "cr_static > 9 and (cam.lift_mm) ^ cr_static > 1",
      /plain number/,
      "(cam.lift_mm) ^ cr_static",
      18,
    ],
    ["power_hp > 1 and cylinder.nonsense > 1", /not an attribute of cylinder/, "nonsense", 26],
    // the same name twice: which one is meant is not certain, so no place is given
    ["pi > 3 and pi < 4", /Unknown name "pi"/, "pi", undefined],
    // mathjs prints 1000.0 as 1000: the text is not found, so no place is claimed
    ["2 ^ 1000.0 > 1", /between -10 and 10/, "2 ^ 1000", undefined],
    // a name inside a longer name is not that name
    ["quench > 1 and quench_mm > 1", /Unknown name "quench"/, "quench", 0],
  ] as const)("points at the offending part of %j", (text, message, fragment, index) => {
    const r = refusal(text);
    expect(r.message).toMatch(message);
    expect(r.fragment).toBe(fragment);
    expect(r.index).toBe(index);
  });

  it("says where only when it is certain", () => {
    expect(conditionError(refusal("power_hp > 1 and pi > 2"))).toBe(
      'Unknown name "pi": use one of the names listed in the reference (at character 18: “pi”)',
    );
    expect(conditionError(refusal("pi > 3 and pi < 4"))).toBe(
      'Unknown name "pi": use one of the names listed in the reference (in “pi”)',
    );
    expect(conditionError(refusal("power_hp > 145 and"))).toMatch(
      /^The condition could not be read: .* \(at character \d+/,
    );
  });

  it("refuses something that is not text at all", () => {
    expect(checkCondition(undefined).ok).toBe(false);
    expect(checkCondition(42 as unknown).ok).toBe(false);
  });

  it("never throws on random text or random expressions over the documented names", () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 300 }), (s) => {
        const r = checkCondition(s);
        expect(typeof r.ok).toBe("boolean");
      }),
      { numRuns: 2000 },
    );
    const atoms = [
      ...TOP_LEVEL_NAMES.map((n) => n.name),
      ...SLOT_OBJECTS.flatMap((s) => s.fields.map((f) => `${s.key}.${f.name}`)),
      ...FUNCTIONS.map((f) => `${f.name}("x")`),
      "1",
      "0",
      "-3.5",
      "true",
      '"stock"',
      "__proto__",
      "constructor",
      "import",
      "[1]",
      "{}",
    ];
    const ops = [
      " + ",
      " - ",
      " * ",
      " / ",
      " ^ ",
      " > ",
      " < ",
      " == ",
      " != ",
      " and ",
      " or ",
      " ? ",
      " : ",
      " = ",
      ".",
      "(",
      ")",
      " not ",
      ";",
      ",",
    ];
    const expr = fc
      .array(fc.oneof(fc.constantFrom(...atoms), fc.constantFrom(...ops)), { maxLength: 40 })
      .map((parts) => parts.join(""));
    const snap = buildRuleSnapshot(FULL);
    fc.assert(
      fc.property(expr, (s) => {
        const r = compileConditionText(s);
        if (r.ok) {
          // a checked condition evaluates to a boolean or a clear evaluation error, never a crash
          const f = evaluateRules(snap, [{ ...RULE, id: 1, version: 1, condition: s }]);
          for (const x of f) expect(typeof x.message).toBe("string");
        }
      }),
      { numRuns: 2000 },
    );
  });

  it(`answers quickly even for the longest allowed text (${CONDITION_LIMITS.maxLength} characters)`, () => {
    const long = Array.from({ length: 200 }, () => "power_hp > 1")
      .join(" and ")
      .slice(0, CONDITION_LIMITS.maxLength);
    const started = performance.now();
    checkCondition(long);
    checkCondition("(".repeat(2000));
    checkCondition("-".repeat(1999) + "1");
    expect(performance.now() - started).toBeLessThan(1000);
  });
});

const RULE: Omit<RuleForEval, "id" | "version" | "condition"> = {
  name: "r",
  kind: "caution",
  message: "m",
  upgrade_category: null,
  suggested_part_id: null,
};

// A 107 ci style build with stock chassis parts (invented numbers).
const FULL: RuleSnapshotInput = {
  numbers: {
    power_hp: 152,
    power_basis: "estimate",
    cr_static: 11.2,
    riser_in: 14,
    bore_mm: 101.6,
    gasket_bore_mm: 100.5,
    rev_limit_rpm: 6200,
  },
  parts: [
    {
      slot: "cylinder",
      partId: 1,
      partNumber: "TW-CYL-1016",
      category: "cylinders",
      tags: [],
      attributes: { boreMm: 101.6 },
      stock: false,
    },
    {
      slot: "gasket",
      partId: 2,
      partNumber: "TW-HG-1005",
      category: "head_gaskets",
      tags: [],
      attributes: { boreMm: 100.5, compressedThicknessMm: 1.02 },
      stock: false,
    },
    {
      slot: "cam",
      partId: 3,
      partNumber: "TW-CAM-640",
      category: "cams",
      tags: ["gear-drive-cam"],
      attributes: {
        intakeLiftMm: 16.26,
        exhaustLiftMm: 16.0,
        intakeClosesAbdcDeg: 38,
        timingAtLiftMm: 1.346,
      },
      stock: false,
    },
    {
      slot: "springs",
      partId: 4,
      partNumber: "TW-VS-600",
      category: "valve_springs",
      tags: [],
      attributes: { maxLiftMm: 15.24 },
      stock: true,
    },
    {
      slot: "axle_adjusters",
      partId: 5,
      partNumber: "TW-AX-STD",
      category: "axle_adjusters",
      tags: ["stock-axle-adjusters"],
      attributes: {},
      stock: true,
    },
    {
      slot: "clutch_line",
      partId: 6,
      partNumber: "TW-CL-STD",
      category: "clutch_lines",
      tags: ["stock-clutch-cable"],
      attributes: {},
      stock: true,
    },
  ],
};

const SHOP_RULES: RuleForEval[] = [
  {
    id: 11,
    version: 3,
    name: "Axle adjusters above 145 hp",
    kind: "upgrade",
    condition: 'power_hp > 145 and has("stock-axle-adjusters")',
    message: "Fit locking adjusters",
    upgrade_category: "axle_adjusters",
    suggested_part_id: 50,
  },
  {
    id: 12,
    version: 1,
    name: "Tall risers",
    kind: "upgrade",
    condition: 'riser_in > 12 and has("stock-clutch-cable")',
    message: "Longer clutch cable",
    upgrade_category: "clutch_lines",
    suggested_part_id: null,
  },
  {
    id: 13,
    version: 1,
    name: "Gasket bore",
    kind: "conflict",
    condition: "gasket.bore_mm < cylinder.bore_mm",
    message: "Gasket bore under cylinder bore",
    upgrade_category: null,
    suggested_part_id: null,
  },
  {
    id: 14,
    version: 2,
    name: "High static",
    kind: "caution",
    condition: 'cr_static > 11 and not has("compression-release")',
    message: "No compression release",
    upgrade_category: null,
    suggested_part_id: null,
  },
  {
    id: 15,
    version: 1,
    name: "Cam over springs",
    kind: "conflict",
    condition: "cam.lift_mm > springs.max_lift_mm",
    message: "Springs not rated for the lift",
    upgrade_category: null,
    suggested_part_id: null,
  },
  {
    id: 16,
    version: 1,
    name: "Pistons",
    kind: "caution",
    condition: "piston.dome_cc > 5",
    message: "Dome",
    upgrade_category: null,
    suggested_part_id: null,
  },
  {
    id: 17,
    version: 1,
    name: "Quench",
    kind: "caution",
    condition: "known(quench_mm) and quench_mm > 1.3",
    message: "Quench wide",
    upgrade_category: null,
    suggested_part_id: null,
  },
  {
    id: 18,
    version: 1,
    name: "Rev limit",
    kind: "caution",
    condition: "rev_limit_rpm > 7000",
    message: "High revs",
    upgrade_category: null,
    suggested_part_id: null,
  },
];

describe("evaluateRules against fixed package snapshots", () => {
  it("gives exactly the expected findings, conflicts first, with the values used", () => {
    const findings = evaluateRules(buildRuleSnapshot(FULL), SHOP_RULES);
    expect(findings.map((f) => [f.kind, f.ruleId, f.error ? "error" : "hit"])).toEqual([
      ["conflict", 15, "hit"],
      ["conflict", 13, "hit"],
      ["upgrade", 11, "hit"],
      ["upgrade", 12, "hit"],
      ["caution", 14, "hit"],
      ["caution", 16, "error"],
    ]);
    const axle = findings.find((f) => f.ruleId === 11)!;
    expect(axle).toEqual({
      ruleId: 11,
      ruleVersion: 3,
      ruleName: "Axle adjusters above 145 hp",
      kind: "upgrade",
      message: "Fit locking adjusters",
      upgradeCategory: "axle_adjusters",
      suggestedPartId: 50,
      triggeredBy: { power_hp: 152, 'has("stock-axle-adjusters")': true },
    });
    expect(findings.find((f) => f.ruleId === 15)!.triggeredBy).toEqual({
      "cam.lift_mm": 16.26,
      "springs.max_lift_mm": 15.24,
    });
    const piston = findings.find((f) => f.ruleId === 16)!;
    expect(piston.error).toBe("no part in the piston slot (for piston.dome_cc)");
    expect(piston.message).toBe(
      "Rule could not be checked: no part in the piston slot (for piston.dome_cc)",
    );
  });

  it("reports a null number compared as a finding of its own, not a pass", () => {
    const s = buildRuleSnapshot({ numbers: {}, parts: [] });
    const f = evaluateRules(s, [SHOP_RULES[0]!, SHOP_RULES[6]!]);
    expect(f).toHaveLength(1);
    expect(f[0]!.error).toBe("power_hp has no value in this package");
  });

  it("a bike kept stock under the threshold gives no findings", () => {
    const s = buildRuleSnapshot({
      numbers: { power_hp: 95, cr_static: 9.7, riser_in: 10, rev_limit_rpm: 5800 },
      parts: [
        {
          slot: "cylinder",
          partId: 1,
          partNumber: "TW-CYL-984",
          category: "cylinders",
          tags: [],
          attributes: { boreMm: 98.4 },
          stock: true,
        },
        {
          slot: "gasket",
          partId: 2,
          partNumber: "TW-HG-990",
          category: "head_gaskets",
          tags: [],
          attributes: { boreMm: 99.0, compressedThicknessMm: 1.02 },
          stock: true,
        },
        {
          slot: "cam",
          partId: 3,
          partNumber: "TW-CAM-STD",
          category: "cams",
          tags: [],
          attributes: { intakeLiftMm: 13.5, exhaustLiftMm: 13.5 },
          stock: true,
        },
        {
          slot: "springs",
          partId: 4,
          partNumber: "TW-VS-600",
          category: "valve_springs",
          tags: [],
          attributes: { maxLiftMm: 15.24 },
          stock: true,
        },
        {
          slot: "piston",
          partId: 7,
          partNumber: "TW-PS-984",
          category: "pistons",
          tags: [],
          attributes: { domeCc: -2 },
          stock: true,
        },
      ],
    });
    expect(evaluateRules(s, SHOP_RULES)).toEqual([]);
  });

  it("a stored condition that no longer passes the checker is reported, not skipped", () => {
    const f = evaluateRules(buildRuleSnapshot(FULL), [
      { ...RULE, id: 90, version: 1, condition: "retired_name > 1" },
    ]);
    expect(f[0]!.error).toMatch(/its condition is not valid \(Unknown name "retired_name"/);
  });

  it("caches compiled conditions by rule id and version", () => {
    const a = compileCondition({ id: 501, version: 1, condition: "power_hp > 1" });
    expect(compileCondition({ id: 501, version: 1, condition: "power_hp > 1" })).toBe(a);
    expect(compileCondition({ id: 501, version: 2, condition: "power_hp > 2" })).not.toBe(a);
  });
});

describe("previewAgainst", () => {
  it("tells which packages a changed rule starts and stops flagging", () => {
    const pkg = (id: number, hp: number | null) => ({
      packageId: id,
      name: `P${id}`,
      snapshot: buildRuleSnapshot({ numbers: { power_hp: hp }, parts: [] }),
    });
    const packages = [pkg(1, 120), pkg(2, 140), pkg(3, 160), pkg(4, null)];
    const saved = { ...RULE, id: 7, version: 1, condition: "power_hp > 130", active: true };
    const next = compileConditionText("power_hp > 150");
    if (!next.ok) throw new Error("compile");
    const r = previewAgainst(
      { ...RULE, condition: "power_hp > 150", active: true },
      next.compiled,
      saved,
      packages,
    );
    expect(r.willFlag).toEqual([]);
    expect(r.stillFlags.map((p) => p.packageId)).toEqual([3]);
    expect(r.stopsFlagging.map((p) => p.packageId)).toEqual([2]);
    expect(r.cannotCheck.map((p) => p.packageId)).toEqual([4]);
    const wider = compileConditionText("power_hp > 100");
    if (!wider.ok) throw new Error("compile");
    const r2 = previewAgainst(
      { ...RULE, condition: "power_hp > 100", active: true },
      wider.compiled,
      saved,
      packages,
    );
    expect(r2.willFlag.map((p) => p.packageId)).toEqual([1]);
    expect(r2.willFlag[0]!.triggeredBy).toEqual({ power_hp: 120 });
  });
});
