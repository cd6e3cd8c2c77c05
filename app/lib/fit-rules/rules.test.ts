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
import { FUNCTIONS } from "./names";

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
    [
      'cylinder["constructor"]["constructor"]("return process")() == 1',
      /^The condition could not be read: Value expected$/,
      ") == 1",
    ],
    ["__proto__ > 1", /Unknown name "__proto__"/, "__proto__"],
    ["constructor > 1", /Unknown name/],
    ["toString > 1", /Unknown name/],
    ["power_hp > 145 and process.exit(1)", /Only the listed functions/],
    ["[1, 2, 3] == 1", /Lists and matrices/],
    ["1:10 == 1", /Ranges/],
    ["{a: 1} == 1", /Objects/],
    [
      "5 cm > 2",
      /^Write an operator between values \(implicit multiplication and units are not allowed\)$/,
      "5 cm",
    ],
    [
      "power_hp > 2 hp",
      /^Write an operator between values \(implicit multiplication and units are not allowed\)$/,
      "2 hp",
    ],
    ["5 cm to inch > 1", /^The operator "to" is not allowed in a condition$/, "5 cm to inch"],
    ["2 ^ 2 ^ 2 ^ 2 ^ 2 ^ 2 > 1", /Powers cannot be stacked/],
    ["power_hp ^ power_hp > 1", /power after \^ must be a plain number/],
    ["2 ^ 1000 > 1", /between -10 and 10/],
    ["(".repeat(500) + "1" + ")".repeat(500) + " > 0", /nested more than/],
    ["(".repeat(30) + "power_hp > 1" + ")".repeat(30), /nested more than/],
    ["x".repeat(100_000), /characters long; the limit is 2000/],
    [
      "1 > 0 and " + "not ".repeat(400) + "true",
      /^The condition is nested more than 40 levels deep; split it into several rules$/,
    ],
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
    ["power_hp > 90%", /^Percent signs are not allowed; write the fraction \(0\.9 for 90 %\)$/],
    [
      "power_hp?.x > 1",
      /^Optional access \(\?\.\) is not allowed; use known\(x\) instead$/,
      "power_hp?.x",
    ],
    ["cam.lift_mm > springs.max_lift_mm \u0000", /control character/],
    ["", /Write a condition/],
  ];

  it("has at least 30 hostile expressions", () => expect(corpus.length).toBeGreaterThanOrEqual(30));

  it.each(corpus.map(([t, m, f]) => [JSON.stringify(t.slice(0, 50)), t, m, f] as const))(
    "refuses %s",
    (_name, text, message, fragment) => {
      const r = refusal(text);
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
  });

  it("evaluates well-formed conditions exactly as a reference evaluator does", () => {
    // Conditions made well-formed by construction, each with the value it must have on
    // FULL, worked out here: true, false, or ERR (a finding with an error).
    let compiledCount = 0;
    const refused: string[] = [];
    const outcomes = { true: 0, false: 0, error: 0 };
    const snap = buildRuleSnapshot(FULL);
    fc.assert(
      fc.property(boolExpr(3), (g) => {
        const c = compileConditionText(g.text);
        if (!c.ok) {
          refused.push(`${g.text} → ${c.message}`);
          return;
        }
        compiledCount += 1;
        const f = evaluateRules(snap, [{ ...RULE, id: 1, version: 1, condition: g.text }]);
        const got = f.length === 0 ? false : f[0]!.error ? ERR : true;
        outcomes[got === ERR ? "error" : got ? "true" : "false"] += 1;
        expect([g.text, got]).toEqual([g.text, g.value]);
      }),
      { numRuns: 1500, seed: 20260412 },
    );
    expect(refused).toEqual([]);
    expect(compiledCount).toBe(1500);
    // every outcome is reached often enough to be tested
    expect(outcomes.true).toBeGreaterThan(150);
    expect(outcomes.false).toBeGreaterThan(150);
    expect(outcomes.error).toBeGreaterThan(150);
  });

  it(`gives a plain answer for the longest allowed text (${CONDITION_LIMITS.maxLength} characters)`, () => {
    // how long these take is measured by the benchmarks, not here
    const long = Array.from({ length: 200 }, () => "power_hp > 1")
      .join(" and ")
      .slice(0, CONDITION_LIMITS.maxLength);
    expect(long).toHaveLength(CONDITION_LIMITS.maxLength);
    expect(refusal(long).message).toBe(
      "The condition could not be read: Unexpected end of expression",
    );
    expect(refusal("(".repeat(2000)).message).toBe("Brackets are nested more than 24 deep");
    expect(refusal("-".repeat(1999) + "1").message).toBe(
      "The condition is nested more than 40 levels deep; split it into several rules",
    );
  });

  it("each limit refuses on its own", () => {
    // too many parts, while nested only a few levels deep and well under the length limit
    const wide = Array.from({ length: 28 }, () => "min(1, 1, 1, 1, 1, 1, 1, 1, 1, 1)").join(" + ");
    const wideText = `max(${wide.split(" + ").slice(0, 10).join(", ")}) > 0 and ${wide} > 0`;
    expect(wideText.length).toBeLessThan(CONDITION_LIMITS.maxLength);
    expect(refusal(wideText).message).toBe(
      `The condition is too long (more than ${CONDITION_LIMITS.maxNodes} parts); split it into several rules`,
    );
    // the same shape with fewer parts is accepted: the refusal above is the count alone
    expect(checkCondition(`max(${wide.split(" + ").slice(0, 10).join(", ")}) > 0`).ok).toBe(true);
    // nested too deep, with few parts and few brackets
    const deep = "not ".repeat(CONDITION_LIMITS.maxDepth + 1) + "true";
    expect(refusal(deep).message).toBe(
      `The condition is nested more than ${CONDITION_LIMITS.maxDepth} levels deep; split it into several rules`,
    );
    expect(checkCondition("not ".repeat(CONDITION_LIMITS.maxDepth - 2) + "true").ok).toBe(true);
    // brackets alone
    const brackets =
      "(".repeat(CONDITION_LIMITS.maxBracketDepth + 1) +
      "power_hp > 1" +
      ")".repeat(CONDITION_LIMITS.maxBracketDepth + 1);
    expect(refusal(brackets).message).toBe(
      `Brackets are nested more than ${CONDITION_LIMITS.maxBracketDepth} deep`,
    );
    // text in quotes: over the limit in a comparison and in has( ), the limit itself accepted
    const max = "a".repeat(CONDITION_LIMITS.maxTextLength);
    const textLimit = `Text in quotes is limited to ${CONDITION_LIMITS.maxTextLength} characters`;
    expect(refusal(`power_basis == "${max}a"`).message).toBe(textLimit);
    expect(refusal(`has("${max}a")`).message).toBe(textLimit);
    expect(checkCondition(`power_basis == "${max}"`).ok).toBe(true);
    expect(checkCondition(`has("${max}")`).ok).toBe(true);
    // the length limit alone
    const lengthy = "power_hp > " + "1".repeat(CONDITION_LIMITS.maxLength);
    expect(refusal(lengthy).message).toBe(
      `The condition is ${lengthy.length} characters long; the limit is ${CONDITION_LIMITS.maxLength}`,
    );
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

/** What a condition gives on FULL: true, false, or the error text of its finding. */
function outcome(condition: string, input: RuleSnapshotInput = FULL): boolean | string {
  const f = evaluateRules(buildRuleSnapshot(input), [{ ...RULE, id: 1, version: 1, condition }]);
  return f.length === 0 ? false : (f[0]!.error ?? true);
}

describe("evaluation of every function, operator and form in the reference", () => {
  // each function's checks: [condition, what it gives on FULL]
  const BY_FUNCTION: Record<string, Array<[string, boolean | string]>> = {
    has: [
      ['has("gear-drive-cam")', true], // a tag of the cam
      ['has("TW-CAM-640")', true], // a part number
      ['has("compression-release")', false],
      ['has("tw-cam-640")', true], // tags and part numbers match whatever the case
    ],
    filled: [
      ['filled("cam")', true],
      ['filled("piston")', false],
    ],
    known: [
      ["known(power_hp)", true],
      ["known(quench_mm)", false],
      ["known(cam.lift_mm)", true],
      ["known(piston.dome_cc)", false],
    ],
    min: [
      ["min(power_hp, 200, 3.5) == 3.5", true],
      ["min(power_hp) == 152", true],
      ["min(1, quench_mm) > 0", "quench_mm has no value in this package"],
    ],
    max: [
      ["max(cam.lift_mm, springs.max_lift_mm) == 16.26", true],
      ["max(-1, -2) == -1", true],
    ],
    abs: [
      ["abs(-2.5) == 2.5", true],
      ["abs(gasket.bore_mm - cylinder.bore_mm) == 101.6 - 100.5", true],
    ],
    round: [
      ["round(2.5) == 3", true],
      ["round(cr_static) == 11", true],
      ["round(1.23456, 2) == 1.23", true],
      ["round(1.5, 7) > 1", "round( ) keeps 0 to 6 decimal places"],
      ["round(1.5, 0.5) > 1", "round( ) keeps 0 to 6 decimal places"],
    ],
    floor: [
      ["floor(-1.5) == -2", true],
      ["floor(cr_static) == 11", true],
    ],
    ceil: [
      ["ceil(1.2) == 2", true],
      ["ceil(-1.2) == -1", true],
    ],
    sqrt: [
      ["sqrt(16) == 4", true],
      ["sqrt(power_hp - 200) > 1", "sqrt( ) of a negative number (-48)"],
    ],
  };

  it("covers every function of the reference panel", () => {
    expect(Object.keys(BY_FUNCTION).sort()).toEqual(FUNCTIONS.map((f) => f.name).sort());
  });

  it.each(Object.entries(BY_FUNCTION).flatMap(([, cases]) => cases))("%s", (text, expected) => {
    expect(outcome(text)).toBe(expected);
  });

  it.each([
    // chained comparisons: every pair must hold
    ["140 < power_hp <= 200", true],
    ["140 < power_hp <= 152", true],
    ["140 < power_hp < 152", false],
    ["200 > power_hp > 150 >= cr_static", true],
    ["1 < quench_mm < 2", "quench_mm has no value in this package"],
    // ternaries pick one branch; the other is not evaluated
    ['power_basis == "measured" ? power_hp > 150 : power_hp > 140', true],
    ['power_basis == "estimate" ? power_hp > 160 : power_hp > 140', false],
    ["true ? power_hp > 1 : quench_mm > 1", true],
    ["(power_hp > 200 ? 1 : 2) == 2", true],
    // text equality: exact, case and all
    ['power_basis == "estimate"', true],
    ["power_basis == 'estimate'", true],
    ['power_basis == "Estimate"', false],
    ['power_basis != "measured"', true],
    ['cam.part_number == "TW-CAM-640"', true],
    ["cam.stock == false and springs.stock == true", true],
    // division by zero and the remainder by zero give a finding with an error, not a pass
    ["power_hp / 0 > 1", "power_hp / 0 gives no finite number (division by zero?)"],
    [
      "power_hp / (rev_limit_rpm - 6200) > 1",
      "power_hp / (rev_limit_rpm - 6200) gives no finite number (division by zero?)",
    ],
    ["power_hp % 0 == 1", "power_hp % 0 gives no finite number (division by zero?)"],
    ["0 / 0 == 0", "0 / 0 gives no finite number (division by zero?)"],
    // and / or stop at the first answer
    ["false and quench_mm > 1", false],
    ["true or quench_mm > 1", true],
    ["quench_mm > 1 or true", "quench_mm has no value in this package"],
    // arithmetic and powers
    ["bore_mm ^ 2 == 101.6 * 101.6", true],
    ["power_hp % 10 == 2", true],
    ["-power_hp < 0", true],
  ] as const)("%s", (text, expected) => {
    expect(outcome(text)).toBe(expected);
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

// ---- a generator of well-formed conditions with their expected value on FULL ----
const ERR = "ERR" as const;
type Value = number | boolean | string | typeof ERR;
type Gen = { text: string; value: Value };

// names and their values in FULL (ERR: no value there, so a rule using it cannot be checked)
const NUM_ATOMS: Gen[] = [
  { text: "power_hp", value: 152 },
  { text: "cr_static", value: 11.2 },
  { text: "riser_in", value: 14 },
  { text: "bore_mm", value: 101.6 },
  { text: "rev_limit_rpm", value: 6200 },
  { text: "quench_mm", value: ERR },
  { text: "cylinder.bore_mm", value: 101.6 },
  { text: "gasket.bore_mm", value: 100.5 },
  { text: "gasket.compressed_thickness_mm", value: 1.02 },
  { text: "cam.lift_mm", value: 16.26 },
  { text: "springs.max_lift_mm", value: 15.24 },
  { text: "piston.dome_cc", value: ERR },
  { text: "0", value: 0 },
  { text: "1", value: 1 },
  { text: "2.5", value: 2.5 },
  { text: "150", value: 150 },
  { text: "(-3)", value: -3 },
];
const BOOL_ATOMS: Gen[] = [
  { text: "true", value: true },
  { text: "false", value: false },
  { text: "cam.stock", value: false },
  { text: "springs.stock", value: true },
  { text: "piston.stock", value: ERR },
  { text: 'has("gear-drive-cam")', value: true },
  { text: 'has("TW-CAM-640")', value: true },
  { text: 'has("compression-release")', value: false },
  { text: 'filled("cam")', value: true },
  { text: 'filled("piston")', value: false },
  { text: "known(power_hp)", value: true },
  { text: "known(quench_mm)", value: false },
  { text: "known(piston.dome_cc)", value: false },
  { text: "known(gasket.bore_mm)", value: true },
];
const TEXT_ATOMS: Gen[] = [
  { text: "power_basis", value: "estimate" },
  { text: "cam.part_number", value: "TW-CAM-640" },
  { text: "piston.part_number", value: ERR },
  { text: '"estimate"', value: "estimate" },
  { text: '"Estimate"', value: "Estimate" },
  { text: "'measured'", value: "measured" },
  { text: '"TW-CAM-640"', value: "TW-CAM-640" },
];

const lift =
  (f: (...xs: any[]) => Value) =>
  (...xs: Value[]): Value =>
    xs.includes(ERR) ? ERR : f(...xs);
const finiteOr = (x: number): Value => (Number.isFinite(x) ? x : ERR);
const ARITH_OPS: Record<string, (a: number, b: number) => number> = {
  "+": (a, b) => a + b,
  "-": (a, b) => a - b,
  "*": (a, b) => a * b,
  "/": (a, b) => a / b,
  "%": (a, b) => a % b,
};
const CMP_OPS: Record<string, (a: any, b: any) => boolean> = {
  "<": (a, b) => a < b,
  "<=": (a, b) => a <= b,
  ">": (a, b) => a > b,
  ">=": (a, b) => a >= b,
  "==": (a, b) => a === b,
  "!=": (a, b) => a !== b,
};
const CHAIN_OPS = ["<", "<=", ">", ">="] as const;

const numCache = new Map<number, fc.Arbitrary<Gen>>();
const boolCache = new Map<number, fc.Arbitrary<Gen>>();

function ternary(d: number, branch: (d: number) => fc.Arbitrary<Gen>): fc.Arbitrary<Gen> {
  return fc.tuple(boolExpr(d - 1), branch(d - 1), branch(d - 1)).map(([c, a, b]) => ({
    text: `(${c.text} ? ${a.text} : ${b.text})`,
    value: c.value === ERR ? ERR : c.value ? a.value : b.value,
  }));
}

function textExpr(d: number): fc.Arbitrary<Gen> {
  const atom = fc.constantFrom(...TEXT_ATOMS);
  return d === 0 ? atom : fc.oneof(atom, ternary(d, textExpr));
}

function numExpr(d: number): fc.Arbitrary<Gen> {
  const hit = numCache.get(d);
  if (hit) return hit;
  const atom = fc.constantFrom(...NUM_ATOMS);
  if (d === 0) return atom;
  const sub = numExpr(d - 1);
  const arb = fc.oneof(
    { arbitrary: atom, weight: 3 },
    fc.tuple(sub, fc.constantFrom(...Object.keys(ARITH_OPS)), sub).map(([a, op, b]) => ({
      text: `(${a.text} ${op} ${b.text})`,
      value: lift((x, y) => finiteOr(ARITH_OPS[op]!(x, y)))(a.value, b.value),
    })),
    sub.map((a) => ({ text: `(-${a.text})`, value: lift((x) => -x)(a.value) })),
    // the base of a power is a name or number (powers cannot be stacked)
    fc.tuple(atom, fc.constantFrom(2, 3, -1)).map(([a, e]) => ({
      text: `(${a.text} ^ ${e})`,
      value: lift((x) => finiteOr(x ** e))(a.value),
    })),
    fc
      .tuple(fc.constantFrom("min", "max"), fc.array(sub, { minLength: 1, maxLength: 3 }))
      .map(([fn, xs]) => ({
        text: `${fn}(${xs.map((x) => x.text).join(", ")})`,
        value: lift((...v: number[]) => (fn === "min" ? Math.min(...v) : Math.max(...v)))(
          ...xs.map((x) => x.value),
        ),
      })),
    fc.tuple(fc.constantFrom("abs", "floor", "ceil", "sqrt"), sub).map(([fn, a]) => ({
      text: `${fn}(${a.text})`,
      value: lift((x: number) =>
        fn === "abs"
          ? Math.abs(x)
          : fn === "floor"
            ? Math.floor(x)
            : fn === "ceil"
              ? Math.ceil(x)
              : x < 0
                ? ERR
                : Math.sqrt(x),
      )(a.value),
    })),
    fc.tuple(sub, fc.constantFrom(0, 1, 2, 6, 7)).map(([a, digits]) => ({
      text: `round(${a.text}, ${digits})`,
      value: lift((x: number) => (digits > 6 ? ERR : Math.round(x * 10 ** digits) / 10 ** digits))(
        a.value,
      ),
    })),
    ternary(d, numExpr),
  );
  numCache.set(d, arb);
  return arb;
}

function boolExpr(d: number): fc.Arbitrary<Gen> {
  const hit = boolCache.get(d);
  if (hit) return hit;
  const atom = fc.constantFrom(...BOOL_ATOMS);
  if (d === 0) return atom;
  const sub = boolExpr(d - 1);
  const num = numExpr(d - 1);
  const arb = fc.oneof(
    atom,
    fc.tuple(num, fc.constantFrom(...Object.keys(CMP_OPS)), num).map(([a, op, b]) => ({
      text: `(${a.text} ${op} ${b.text})`,
      value: lift((x, y) => CMP_OPS[op]!(x, y))(a.value, b.value),
    })),
    // chained comparisons: every value is read, then each pair compared
    fc
      .tuple(num, fc.constantFrom(...CHAIN_OPS), num, fc.constantFrom(...CHAIN_OPS), num)
      .map(([a, op1, b, op2, c]) => ({
        text: `(${a.text} ${op1} ${b.text} ${op2} ${c.text})`,
        value: lift((x, y, z) => CMP_OPS[op1]!(x, y) && CMP_OPS[op2]!(y, z))(
          a.value,
          b.value,
          c.value,
        ),
      })),
    fc.tuple(textExpr(1), fc.constantFrom("==", "!="), textExpr(1)).map(([a, op, b]) => ({
      text: `(${a.text} ${op} ${b.text})`,
      value: lift((x, y) => CMP_OPS[op]!(x, y))(a.value, b.value),
    })),
    fc.tuple(sub, fc.constantFrom("==", "!="), sub).map(([a, op, b]) => ({
      text: `(${a.text} ${op} ${b.text})`,
      value: lift((x, y) => CMP_OPS[op]!(x, y))(a.value, b.value),
    })),
    // and / or stop at the first answer: an error on the right is not reached
    fc.tuple(sub, fc.constantFrom("and", "or"), sub).map(([a, op, b]) => ({
      text: `(${a.text} ${op} ${b.text})`,
      value:
        a.value === ERR
          ? ERR
          : op === "and"
            ? a.value
              ? b.value
              : false
            : a.value
              ? true
              : b.value,
    })),
    sub.map((a) => ({ text: `(not ${a.text})`, value: lift((x) => !x)(a.value) })),
    ternary(d, boolExpr),
  );
  boolCache.set(d, arb);
  return arb;
}
