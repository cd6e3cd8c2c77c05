// What a fit rule sees of one package: its computed numbers and its installed parts.
// Plain data (JSON-safe), built once per package and stored beside it, so the rules can
// be evaluated on the bench, in the rule preview and in bulk without the database.
//
// The mapping, as rule conditions see it:
// - every number below by its snake_case name (`power_hp`, `cr_static`, `riser_in`…),
//   null when the package does not have it yet;
// - `power_basis` as text: "target", "estimate" or "measured" (or null);
// - one object per bench slot key (`cylinder`, `gasket`, `cam`, `springs`,
//   `axle_adjusters`…, see app/lib/slots.ts) holding the installed part's attributes
//   with their camelCase keys turned to snake_case (`boreMm` → `bore_mm`), plus
//   `part_number` and `stock`; cams also get `lift_mm`, the larger of intake and
//   exhaust lift. An empty slot is null;
// - `has("word")` is true when any installed part carries the tag or has that part
//   number (both compared without regard to case).
import { camelToSnake } from "../catalog/attributes";

export const SNAPSHOT_VERSION = 1;

export const NUMBER_NAMES = [
  "power_hp",
  "torque_nm",
  "rev_limit_rpm",
  "bore_mm",
  "stroke_mm",
  "displacement_cc",
  "displacement_ci",
  "cr_static",
  "cr_dynamic",
  "piston_speed_mean_ms",
  "piston_speed_peak_ms",
  "quench_mm",
  "rod_ratio",
  "deck_mm",
  "chamber_cc",
  "dome_cc",
  "gasket_bore_mm",
  "gasket_thickness_mm",
  "riser_in",
] as const;

export type NumberName = (typeof NUMBER_NAMES)[number];
export type PowerBasis = "target" | "estimate" | "measured";
export type AttributeValue = string | number | boolean | null;

export type RuleSnapshotInput = {
  numbers: { [K in NumberName]?: number | null } & { power_basis?: PowerBasis | null };
  parts: Array<{
    slot: string;
    partId: number | null;
    partNumber: string | null;
    category: string;
    tags: string[];
    attributes: Record<string, AttributeValue>;
    stock: boolean;
  }>;
};

export type SlotSnapshot = {
  part_id: number | null;
  part_number: string | null;
  category: string;
  stock: boolean;
  tags: string[];
  /** snake_case attribute names */
  attributes: Record<string, AttributeValue>;
};

export type PackageSnapshot = {
  snapshot_version: number;
  numbers: Record<NumberName, number | null>;
  power_basis: PowerBasis | null;
  slots: Record<string, SlotSnapshot>;
  /** every installed part's tags and part numbers, lower case, sorted, unique */
  words: string[];
};

function finiteOrNull(v: unknown): number | null {
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

export function buildRuleSnapshot(input: RuleSnapshotInput): PackageSnapshot {
  const numbers = {} as Record<NumberName, number | null>;
  for (const name of NUMBER_NAMES) numbers[name] = finiteOrNull(input.numbers[name]);
  const basis = input.numbers.power_basis;
  const words = new Set<string>();
  const slots: Record<string, SlotSnapshot> = {};
  for (const p of input.parts) {
    const tags = p.tags.map((t) => t.trim().toLowerCase()).filter(Boolean);
    for (const t of tags) words.add(t);
    if (p.partNumber) words.add(p.partNumber.trim().toLowerCase());
    const attributes: Record<string, AttributeValue> = {};
    for (const [k, v] of Object.entries(p.attributes)) {
      attributes[camelToSnake(k)] = typeof v === "number" ? finiteOrNull(v) : v;
    }
    if (p.category === "cams") {
      const lifts = [attributes.intake_lift_mm, attributes.exhaust_lift_mm].filter(
        (v): v is number => typeof v === "number",
      );
      if (lifts.length > 0) attributes.lift_mm = Math.max(...lifts);
    }
    slots[p.slot] = {
      part_id: p.partId,
      part_number: p.partNumber,
      category: p.category,
      stock: p.stock,
      tags,
      attributes,
    };
  }
  return {
    snapshot_version: SNAPSHOT_VERSION,
    numbers,
    power_basis: basis === "target" || basis === "estimate" || basis === "measured" ? basis : null,
    slots,
    words: [...words].sort(),
  };
}

/** True when any installed part carries `word` as a tag or part number. */
export function snapshotHas(snapshot: PackageSnapshot, word: string): boolean {
  const w = word.trim().toLowerCase();
  // words is sorted: binary search keeps 500 rules over one package cheap
  let lo = 0;
  let hi = snapshot.words.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const m = snapshot.words[mid]!;
    if (m === w) return true;
    if (m < w) lo = mid + 1;
    else hi = mid - 1;
  }
  return false;
}
