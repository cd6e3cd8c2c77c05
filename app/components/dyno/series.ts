// The curves the dyno page draws and tabulates, in the user's unit system: for each run
// shown, its corrected curve (or its observed one when the weather is missing), and
// optionally the observed curve beside it. Shared by the chart, the table and the CSV.
import { displayUnits, peakOf, type CurvePoint, type UnitSystem } from "~/lib/dyno/run";

export interface RunForChart {
  id: number;
  label: string;
  observed: CurvePoint[];
  corrected: CurvePoint[] | null;
}

export interface Series {
  key: string;
  runId: number;
  name: string;
  basis: "corrected" | "observed" | "uncorrected";
  color: string;
  points: { rpm: number; torque: number; power: number }[];
  peakPower: { value: number; rpm: number } | null;
  peakTorque: { value: number; rpm: number } | null;
}

/** Run colours: teal, amber, graphite, red, green, steel (the design's tokens). */
export const RUN_COLORS = ["#0f8b8d", "#b07a10", "#1f2933", "#c2362f", "#2f8f4e", "#6b7886"];

export function buildSeries(
  runs: readonly RunForChart[],
  units: UnitSystem,
  showObserved: boolean,
): Series[] {
  const u = displayUnits(units);
  const out: Series[] = [];
  runs.forEach((r, i) => {
    const color = RUN_COLORS[i % RUN_COLORS.length]!;
    const make = (pts: CurvePoint[], basis: Series["basis"]): Series => {
      const pp = peakOf(pts, "powerKw");
      const pt = peakOf(pts, "torqueNm");
      return {
        key: `${r.id}-${basis}`,
        runId: r.id,
        name: `${r.label} (${basis})`,
        basis,
        color,
        points: pts.map((p) => ({
          rpm: p.rpm,
          torque: u.torqueOf(p.torqueNm),
          power: u.powerOf(p.powerKw),
        })),
        peakPower: pp && { value: u.powerOf(pp.value), rpm: pp.rpm },
        peakTorque: pt && { value: u.torqueOf(pt.value), rpm: pt.rpm },
      };
    };
    if (r.corrected) {
      out.push(make(r.corrected, "corrected"));
      if (showObserved) out.push(make(r.observed, "observed"));
    } else out.push(make(r.observed, "uncorrected"));
  });
  return out;
}

/** The shown curves as one CSV (one row per run, basis and point). */
export function seriesCsv(series: readonly Series[], units: UnitSystem): string {
  const u = displayUnits(units);
  const esc = (s: string) => {
    const t = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
    return /[",\n]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
  };
  const lines = [`run,basis,rpm,torque_${u.torque === "lb·ft" ? "lbft" : "nm"},power_${u.power}`];
  for (const s of series)
    for (const p of s.points)
      lines.push(
        [
          esc(s.name.replace(/ \((corrected|observed|uncorrected)\)$/, "")),
          s.basis,
          p.rpm,
          p.torque.toFixed(2),
          p.power.toFixed(2),
        ].join(","),
      );
  return lines.join("\r\n") + "\r\n";
}
