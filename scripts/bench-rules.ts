// Fit-rule speed: 500 active rules against one package, and one rule's preview against
// 10,000 saved package snapshots. Prints median and p95; asserts nothing.
import { compileConditionText } from "../app/lib/fit-rules/condition.server";
import { evaluateRules, previewAgainst, type RuleForEval } from "../app/lib/fit-rules/rules.server";
import { buildRuleSnapshot, type RuleSnapshotInput } from "../app/lib/fit-rules/snapshot";
import { generatedCondition } from "./lib/generated-rules";

const rules: RuleForEval[] = Array.from({ length: 500 }, (_, i) => ({
  id: i + 1,
  version: 1,
  name: `Rule ${i + 1}`,
  kind: (["conflict", "upgrade", "caution"] as const)[i % 3]!,
  condition: generatedCondition(i),
  message: "m",
  upgrade_category: null,
  suggested_part_id: null,
}));

function pkg(i: number): RuleSnapshotInput {
  return {
    numbers: {
      power_hp: 100 + (i % 80),
      cr_static: 9.5 + (i % 25) / 10,
      riser_in: 4 + (i % 14),
      bore_mm: 101.6,
      stroke_mm: 114.3,
      rev_limit_rpm: 5800 + (i % 8) * 100,
      piston_speed_peak_ms: 20 + (i % 9),
    },
    parts: [
      {
        slot: "cylinder",
        partId: 1,
        partNumber: "TW-CYL-1016",
        category: "cylinders",
        tags: [],
        attributes: { boreMm: 101.6 },
        stock: true,
      },
      {
        slot: "gasket",
        partId: 2,
        partNumber: "TW-HG-1021",
        category: "head_gaskets",
        tags: ["mls"],
        attributes: { boreMm: i % 50 === 0 ? 100.5 : 102.1, compressedThicknessMm: 1.02 },
        stock: false,
      },
      {
        slot: "cam",
        partId: 3,
        partNumber: "TW-CAM-640",
        category: "cams",
        tags: i % 3 ? [] : ["gear-drive-cam"],
        attributes: { intakeLiftMm: 16.26, exhaustLiftMm: 16 },
        stock: false,
      },
      {
        slot: "springs",
        partId: 4,
        partNumber: "TW-VS-650",
        category: "valve_springs",
        tags: [],
        attributes: { maxLiftMm: i % 4 ? 16.51 : 15.24 },
        stock: false,
      },
      {
        slot: "axle_adjusters",
        partId: 5,
        partNumber: "TW-AX-STD",
        category: "axle_adjusters",
        tags: i % 2 ? ["stock-axle-adjusters"] : ["locking-axle-adjusters"],
        attributes: {},
        stock: i % 2 === 1,
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
}

function stats(samples: number[]) {
  const s = [...samples].sort((a, b) => a - b);
  const at = (q: number) => s[Math.min(s.length - 1, Math.floor(q * s.length))]!;
  return { median: at(0.5), p95: at(0.95) };
}
const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(0)} µs` : `${ms.toFixed(2)} ms`);

const one = buildRuleSnapshot(pkg(7));
for (let i = 0; i < 50; i++) evaluateRules(one, rules); // warm: compiles and caches every rule
const evalTimes: number[] = [];
let findings = 0;
for (let i = 0; i < 300; i++) {
  const t = performance.now();
  findings = evaluateRules(one, rules).length;
  evalTimes.push(performance.now() - t);
}
const e = stats(evalTimes);
console.log(
  `fit rules: 500 active rules × 1 package: median ${fmt(e.median)}, p95 ${fmt(e.p95)} (target < 1 ms; ${findings} findings)`,
);

const snapshots = Array.from({ length: 10_000 }, (_, i) => ({
  packageId: i + 1,
  name: `Package ${i + 1}`,
  snapshot: buildRuleSnapshot(pkg(i)),
}));
const candidate = {
  name: "c",
  kind: "upgrade" as const,
  condition: 'power_hp > 145 and has("stock-axle-adjusters")',
  message: "m",
  upgrade_category: "axle_adjusters",
  suggested_part_id: null,
  active: true,
};
const compiled = compileConditionText(candidate.condition);
if (!compiled.ok) throw new Error(compiled.message);
const saved = {
  ...candidate,
  id: 9001,
  version: 1,
  condition: 'power_hp > 150 and has("stock-axle-adjusters")',
};
const previewTimes: number[] = [];
let flagged = 0;
for (let i = 0; i < 15; i++) {
  const t = performance.now();
  flagged = previewAgainst(candidate, compiled.compiled, saved, snapshots).willFlag.length;
  previewTimes.push(performance.now() - t);
}
const p = stats(previewTimes);
console.log(
  `fit rules: preview 1 rule × 10,000 package snapshots: median ${fmt(p.median)}, p95 ${fmt(p.p95)} (target < 1 s; would newly flag ${flagged})`,
);
