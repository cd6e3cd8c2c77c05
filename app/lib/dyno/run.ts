// A dyno run file, row by row (shared by the server, which is the authority, and the
// browser's chart): which columns hold rpm, torque and power, the checks on every row,
// the SI points kept, the correction to standard conditions, peaks and the power band.
import {
  KW_TORQUE_CONSTANT,
  SAE_J1349_REVISION,
  dryAirPressureKPa,
  hpToKw,
  kwToHp,
  lbFtToNm,
  nmToLbFt,
  powerKw,
  sae1349Factor,
} from "../../../calc";
import type { PowerUnit, TorqueUnit } from "../../../db/schema/dyno";

export type { PowerUnit, TorqueUnit };

export const MAX_RUN_BYTES = 10 * 1024 * 1024;
/** A sweep logs some hundreds to a few thousand points; far more is not a run file. */
export const MAX_RUN_ROWS = 20_000;
/** Fewer points than this cannot show a curve or a peak. */
export const MIN_RUN_POINTS = 5;
/** Bad rows listed by line; the rest are counted. */
export const BAD_ROWS_SHOWN = 10;
/** Engine speeds a motorcycle dyno run can plausibly log (common practice). */
export const RPM_RANGE = { min: 100, max: 20_000 } as const;

export interface RunColumns {
  rpm: number;
  torque: number | null;
  power: number | null;
}

/** A header cell reduced to what names it: "Torque (lb-ft)" → "torque". */
function headerName(cell: string): string {
  return cell
    .replace(/\(.*?\)|\[.*?\]/g, "")
    .toLowerCase()
    .replace(/[^a-z]/g, "");
}

const NAMES: Record<keyof RunColumns, readonly string[]> = {
  rpm: ["rpm", "enginerpm", "enginespeed", "speedrpm"],
  torque: ["torque", "tq", "trq", "enginetorque"],
  power: ["power", "hp", "kw", "pwr", "horsepower", "enginepower"],
};

export type ColumnsResult = { ok: true; columns: RunColumns } | { ok: false; message: string };

export function findColumns(header: readonly string[]): ColumnsResult {
  const names = header.map(headerName);
  const found: Partial<Record<keyof RunColumns, number>> = {};
  for (const key of Object.keys(NAMES) as (keyof RunColumns)[]) {
    const hits = names.flatMap((n, i) => (NAMES[key].includes(n) ? [i] : []));
    if (hits.length > 1)
      return {
        ok: false,
        message: `The first row names more than one ${key} column (${hits.map((i) => `"${header[i]}"`).join(", ")}); keep one.`,
      };
    if (hits.length === 1) found[key] = hits[0]!;
  }
  const shown = header
    .filter((h) => h.trim() !== "")
    .slice(0, 12)
    .map((h) => `"${h.trim().slice(0, 40)}"`)
    .join(", ");
  if (found.rpm === undefined || (found.torque === undefined && found.power === undefined)) {
    return {
      ok: false,
      message:
        `The first row must name an rpm column and a torque and/or power column ` +
        `(e.g. "rpm,torque,power"); this file's first row has ${shown || "no column names"}.`,
    };
  }
  return {
    ok: true,
    columns: { rpm: found.rpm, torque: found.torque ?? null, power: found.power ?? null },
  };
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** A plain decimal number, or null (no thousands separators, units or words). */
export function parseNumberCell(cell: string | undefined): number | null {
  const t = (cell ?? "").trim();
  if (!NUMBER.test(t)) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : null;
}

export interface RunPoint {
  /** line of the file (1 is the column names) */
  line: number;
  rpm: number;
  torqueNm: number;
  powerKw: number;
}

export interface BadRow {
  line: number;
  message: string;
}

/**
 * Takes a run file's rows one at a time: the first non-empty row names the columns, each
 * later row is checked and kept or listed as bad. Feeding stops being useful once
 * `tooMany` is set (the caller stops reading).
 */
export class RunParser {
  columns: RunColumns | null = null;
  columnsError: string | null = null;
  readonly points: RunPoint[] = [];
  readonly badRows: BadRow[] = [];
  badCount = 0;
  rows = 0;
  tooMany = false;
  private lastRpm = -Infinity;

  constructor(private readonly units: { torque: TorqueUnit; power: PowerUnit }) {}

  row(cells: readonly string[], line: number): void {
    if (this.columnsError || this.tooMany) return;
    if (cells.every((c) => c.trim() === "")) return;
    if (!this.columns) {
      const found = findColumns(cells);
      if (found.ok) this.columns = found.columns;
      else this.columnsError = found.message;
      return;
    }
    if (++this.rows > MAX_RUN_ROWS) {
      this.tooMany = true;
      return;
    }
    const problem = this.check(cells, line);
    if (problem) {
      this.badCount++;
      if (this.badRows.length < BAD_ROWS_SHOWN) this.badRows.push({ line, message: problem });
    }
  }

  private check(cells: readonly string[], line: number): string | null {
    const c = this.columns!;
    const rpm = parseNumberCell(cells[c.rpm]);
    if (rpm === null) return `rpm "${cut(cells[c.rpm])}" is not a number`;
    if (rpm < RPM_RANGE.min || rpm > RPM_RANGE.max)
      return `rpm ${rpm} is outside ${RPM_RANGE.min}–${RPM_RANGE.max}`;
    let torque: number | null = null;
    let power: number | null = null;
    if (c.torque !== null) {
      torque = parseNumberCell(cells[c.torque]);
      if (torque === null) return `torque "${cut(cells[c.torque])}" is not a number`;
      if (torque < 0) return `torque ${torque} is negative`;
    }
    if (c.power !== null) {
      power = parseNumberCell(cells[c.power]);
      if (power === null) return `power "${cut(cells[c.power])}" is not a number`;
      if (power < 0) return `power ${power} is negative`;
    }
    if (rpm === this.lastRpm) return `rpm ${rpm} repeats the row before`;
    if (rpm < this.lastRpm) return `rpm goes backwards (${rpm} after ${this.lastRpm})`;
    const torqueNm =
      torque !== null ? (this.units.torque === "lbft" ? lbFtToNm(torque) : torque) : null;
    const pKw = power !== null ? (this.units.power === "hp" ? hpToKw(power) : power) : null;
    this.points.push({
      line,
      rpm,
      torqueNm: torqueNm ?? ((pKw as number) * KW_TORQUE_CONSTANT) / rpm,
      powerKw: pKw ?? powerKw(torqueNm as number, rpm),
    });
    this.lastRpm = rpm;
    return null;
  }

  /** Why the whole file is refused, or null. `dropBad`: the user accepted dropping bad rows. */
  refusal(dropBad: boolean): string | null {
    if (this.columnsError) return this.columnsError;
    if (!this.columns)
      return "The file is empty: it needs a row of column names and the run's rows.";
    if (this.tooMany)
      return `The file has more than ${MAX_RUN_ROWS.toLocaleString("en-US")} rows; a run file has at most that many. Split it or thin it out.`;
    if (this.rows < MIN_RUN_POINTS)
      return `The file has ${this.rows} row${this.rows === 1 ? "" : "s"} of figures; a run needs at least ${MIN_RUN_POINTS}.`;
    if (this.badCount > 0 && !dropBad)
      return `${this.badCount} row${this.badCount === 1 ? " is" : "s are"} not usable (listed below). Nothing was stored. Fix the file, or tick "drop the bad rows" and upload it again.`;
    if (this.points.length < MIN_RUN_POINTS)
      return `Only ${this.points.length} usable row${this.points.length === 1 ? "" : "s"} would be left; a run needs at least ${MIN_RUN_POINTS}.`;
    return null;
  }
}

function cut(s: string | undefined): string {
  const t = (s ?? "").trim();
  return t.length > 24 ? `${t.slice(0, 24)}…` : t;
}

export interface RunWeather {
  airTempC: number | null;
  baroKPa: number | null;
  humidityPct: number | null;
}

export type Correction =
  | { ok: true; factor: number; standard: string; dryAirKPa: number }
  | { ok: false; missing: string[] };

/** The run's correction to standard conditions, or what weather is missing for it. */
export function correctionFor(w: RunWeather): Correction {
  const missing = [
    w.airTempC === null ? "air temperature" : null,
    w.baroKPa === null ? "barometric pressure" : null,
    w.humidityPct === null ? "humidity" : null,
  ].filter((m): m is string => m !== null);
  if (missing.length > 0) return { ok: false, missing };
  const dryAirKPa = dryAirPressureKPa(w.baroKPa!, w.airTempC!, w.humidityPct!);
  const factor = sae1349Factor({ airTempC: w.airTempC!, dryAirPressureKPa: dryAirKPa });
  return { ok: true, factor, standard: SAE_J1349_REVISION, dryAirKPa };
}

export interface CurvePoint {
  rpm: number;
  torqueNm: number;
  powerKw: number;
}

export interface Peak {
  value: number;
  rpm: number;
}

/** The highest value of a curve and the rpm where it is (the first, on a tie). */
export function peakOf(points: readonly CurvePoint[], key: "torqueNm" | "powerKw"): Peak | null {
  let best: Peak | null = null;
  for (const p of points) if (!best || p[key] > best.value) best = { value: p[key], rpm: p.rpm };
  return best;
}

function powerAt(points: readonly CurvePoint[], rpm: number): number {
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!;
    const b = points[i]!;
    if (rpm >= a.rpm && rpm <= b.rpm)
      return a.powerKw + ((b.powerKw - a.powerKw) * (rpm - a.rpm)) / (b.rpm - a.rpm);
  }
  return Number.NaN;
}

export interface PowerBand {
  fromRpm: number;
  toRpm: number;
  /** ∫ P d(rpm) by the trapezoid rule, kW·rpm */
  areaKwRpm: number;
  /** the area over the band's width: the average power across it, kW */
  averageKw: number;
}

/**
 * The area under the power curve between two rpm (trapezoid rule over the logged points,
 * interpolated linearly at the ends), and the average power it means. Null when the run
 * does not cover the whole band.
 */
export function powerBand(
  points: readonly CurvePoint[],
  fromRpm: number,
  toRpm: number,
): PowerBand | null {
  if (!(toRpm > fromRpm) || points.length < 2) return null;
  if (fromRpm < points[0]!.rpm || toRpm > points.at(-1)!.rpm) return null;
  const xs: CurvePoint[] = [
    { rpm: fromRpm, powerKw: powerAt(points, fromRpm), torqueNm: 0 },
    ...points.filter((p) => p.rpm > fromRpm && p.rpm < toRpm),
    { rpm: toRpm, powerKw: powerAt(points, toRpm), torqueNm: 0 },
  ];
  let area = 0;
  for (let i = 1; i < xs.length; i++)
    area += ((xs[i]!.powerKw + xs[i - 1]!.powerKw) / 2) * (xs[i]!.rpm - xs[i - 1]!.rpm);
  return { fromRpm, toRpm, areaKwRpm: area, averageKw: area / (toRpm - fromRpm) };
}

export type UnitSystem = "inch" | "metric";

/** Torque and power in the user's unit system: lb·ft and hp, or N·m and kW. */
export function displayUnits(units: UnitSystem) {
  return units === "inch"
    ? {
        torque: "lb·ft",
        power: "hp",
        torqueOf: (nm: number) => nmToLbFt(nm),
        powerOf: (kw: number) => kwToHp(kw),
      }
    : { torque: "N·m", power: "kW", torqueOf: (nm: number) => nm, powerOf: (kw: number) => kw };
}
