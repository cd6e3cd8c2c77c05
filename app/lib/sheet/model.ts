// The spec sheet's content, one model for the printable page and the PDF: the package's
// numbers in both unit systems, parts by slot with measured values marked, the findings,
// and the safety cautions. Pure: the route reads the package and passes it in.
import type { BenchComputation, BenchFinding, BenchPart, BenchSpec } from "../bench/spec";
import { FIELD_LABELS, SLOT_FIELDS, resolveFields } from "../bench/spec";
import { fmtLine, type Quantity } from "../bench/units";
import { SLOTS } from "../packages/slots";

export type SheetFigure = { label: string; inch: string; metric: string };
export type SheetSlot = {
  label: string;
  group: "engine" | "chassis";
  part: string | null;
  values: { label: string; value: string; measured: boolean }[];
};
export type SheetModel = {
  title: string;
  subtitle: string;
  figures: SheetFigure[];
  slots: SheetSlot[];
  findings: { kind: string; message: string }[];
  cautions: string[];
  safety: string[];
};

export const SAFETY_LINES = [
  "Torque every fastener to the parts maker's instructions for that part; no torque value on this sheet replaces them.",
  "Check piston-to-valve clearance, valve-spring installed height and coil-bind margin on the engine before first start-up.",
  "Brakes, axles, wheels and suspension are fitted and checked by a qualified technician before the bike is ridden.",
  "Compression and piston speed limits are the parts makers'; the shop's cautions are a reminder, not a rating.",
  "Local rules on emissions and noise apply to the finished bike.",
];

const KIND_LABEL: Record<string, string> = {
  conflict: "Conflict",
  upgrade: "Upgrade needed",
  caution: "Caution",
};

const both = (label: string, value: number | null | undefined, q: Quantity): SheetFigure => ({
  label,
  inch: fmtLine(value, q, "inch"),
  metric: fmtLine(value, q, "metric"),
});

const UNIT_OF: Record<string, Quantity> = { mm: "length", cc: "smallVolume", deg: "angle" };

export function sheetModel(input: {
  name: string;
  bike: string | null;
  customer: string | null;
  status: string;
  revision: number;
  spec: BenchSpec;
  computation: BenchComputation;
  findings: BenchFinding[];
  parts: BenchPart[];
}): SheetModel {
  const r = input.computation.results;
  const partMap = new Map(input.parts.map((p) => [p.id, p]));
  const resolved = resolveFields(input.spec, partMap);
  const figures: SheetFigure[] = [
    both("Displacement", r.displacementCc, "volume"),
    both("Bore", resolved.boreMm.value, "length"),
    both("Stroke", resolved.strokeMm.value, "length"),
    both("Static compression", r.staticCr, "ratio"),
    both("Dynamic compression", r.dynamicCr, "ratio"),
    both("Quench", r.quenchMm, "length"),
    both("Deck clearance", input.spec.deckClearanceMm, "length"),
    both("Rev limit", input.spec.revLimitRpm, "rpm"),
    both("Mean piston speed at the rev limit", r.meanPistonSpeedMs, "speed"),
    both("Peak piston speed at the rev limit", r.peakPistonSpeedMs, "speed"),
    both("Rod ratio", r.rodRatio, "ratio"),
  ];
  const slots: SheetSlot[] = SLOTS.map((s) => {
    const fill = input.spec.slots[s.key];
    const part = fill?.partId != null ? partMap.get(fill.partId) : undefined;
    const values = (SLOT_FIELDS[s.key] ?? [])
      .map((f) => {
        const v = resolved[f.field];
        if (v.value === null) return null;
        const q = UNIT_OF[f.unit] ?? "length";
        const text =
          q === "length"
            ? `${fmtLine(v.value, q, "inch")} (${fmtLine(v.value, q, "metric")})`
            : fmtLine(v.value, q, "metric");
        return { label: FIELD_LABELS[f.field] ?? f.label, value: text, measured: v.measured };
      })
      .filter((v): v is NonNullable<typeof v> => v !== null);
    return {
      label: s.label,
      group: s.group,
      part: part ? `${part.maker} ${part.name} (${part.partNumber})` : null,
      values,
    };
  }).filter((s) => s.part || s.values.length);
  return {
    title: input.name,
    subtitle: [
      input.customer,
      input.bike,
      `revision ${input.revision}`,
      input.status.replace("_", " "),
    ]
      .filter(Boolean)
      .join(" · "),
    figures,
    slots,
    findings: input.findings.map((f) => ({
      kind: KIND_LABEL[f.kind] ?? f.kind,
      message: f.message,
    })),
    cautions: input.computation.cautions.map((c) => c.message),
    safety: SAFETY_LINES,
  };
}
