// The measured figure a package's fit rules read: the best corrected peaks of the dyno
// runs the builder marked as counting. It replaces the spec's hoped-for power in the
// rule snapshot (basis `measured`); the spec itself keeps what the builder typed.
import { kwToHp } from "../../../calc";
import type { PackageSnapshot } from "../fit-rules/snapshot";

export interface MeasuredFigure {
  powerHp: number;
  powerRpm: number;
  torqueNm: number;
  torqueRpm: number;
  /** the runs it came from (those marked as counting) */
  runIds: number[];
}

export interface CountingRunPeaks {
  runId: number;
  powerKw: number;
  powerRpm: number;
  torqueNm: number;
  torqueRpm: number;
}

/** The best corrected peaks over the counting runs (power and torque may come from different runs). */
export function measuredFrom(runs: readonly CountingRunPeaks[]): MeasuredFigure | null {
  if (runs.length === 0) return null;
  const p = runs.reduce((a, b) => (b.powerKw > a.powerKw ? b : a));
  const t = runs.reduce((a, b) => (b.torqueNm > a.torqueNm ? b : a));
  return {
    powerHp: kwToHp(p.powerKw),
    powerRpm: p.powerRpm,
    torqueNm: t.torqueNm,
    torqueRpm: t.torqueRpm,
    runIds: runs.map((r) => r.runId),
  };
}

/** The snapshot the rules see once a package has a measured figure. */
export function withMeasured(
  snapshot: PackageSnapshot,
  measured: MeasuredFigure | null | undefined,
): PackageSnapshot {
  if (!measured) return snapshot;
  return {
    ...snapshot,
    numbers: {
      ...snapshot.numbers,
      power_hp: Math.round(measured.powerHp * 10) / 10,
      torque_nm: Math.round(measured.torqueNm * 10) / 10,
    },
    power_basis: "measured",
  };
}
