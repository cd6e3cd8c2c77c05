// One way to write numbers, money and dates on every screen, for the server and the
// browser alike. Stored values are SI (mm, cc, m/s) and integer cents; what the user sees
// follows their unit system, with the unit always beside the number.
import { ccToCi, mmToIn, msToFtMin } from "../../../calc";

export type Units = "inch" | "metric";
export type Quantity =
  "length" | "volume" | "smallVolume" | "speed" | "angle" | "ratio" | "rpm" | "hp" | "plain";

/** Fewest and most decimals shown for a quantity; an input shows the same digits. */
type Precision = readonly [min: number, max: number];
const PRECISION: Record<Quantity, Record<Units, Precision>> = {
  // a builder's micrometer reads to 0.0001 in or 0.001 mm; nominal figures keep 3 or 2
  length: { inch: [3, 4], metric: [2, 3] },
  volume: { inch: [1, 1], metric: [0, 0] },
  smallVolume: { inch: [1, 2], metric: [1, 2] },
  speed: { inch: [0, 0], metric: [1, 1] },
  angle: { inch: [1, 1], metric: [1, 1] },
  ratio: { inch: [2, 2], metric: [2, 2] },
  rpm: { inch: [0, 0], metric: [0, 0] },
  hp: { inch: [0, 0], metric: [0, 0] },
  plain: { inch: [3, 3], metric: [3, 3] },
};

const UNIT: Record<Quantity, Record<Units, string>> = {
  length: { inch: "in", metric: "mm" },
  volume: { inch: "ci", metric: "cc" },
  smallVolume: { inch: "cc", metric: "cc" },
  speed: { inch: "ft/min", metric: "m/s" },
  angle: { inch: "° ABDC", metric: "° ABDC" },
  ratio: { inch: ":1", metric: ":1" },
  rpm: { inch: "rpm", metric: "rpm" },
  hp: { inch: "hp", metric: "hp" },
  plain: { inch: "", metric: "" },
};

export const MINUS = "\u2212";
export const NONE = "—";

const numberFormats = new Map<string, Intl.NumberFormat>();
function numberFormat(min: number, max: number, grouping: boolean): Intl.NumberFormat {
  const key = `${min}-${max}-${grouping}`;
  let f = numberFormats.get(key);
  if (!f) {
    f = new Intl.NumberFormat("en-US", {
      minimumFractionDigits: min,
      maximumFractionDigits: max,
      useGrouping: grouping,
    });
    numberFormats.set(key, f);
  }
  return f;
}

/**
 * A number with thousands separators and between `min` and `max` decimals; a negative
 * gets a true minus sign (−), and a value that rounds to zero never shows as "−0".
 */
export function formatNumber(x: number, min = 0, max = min): string {
  if (!Number.isFinite(x)) return NONE;
  const text = numberFormat(min, Math.max(min, max), true).format(Math.abs(x));
  return x < 0 && /[1-9]/.test(text) ? MINUS + text : text;
}

/** The figure converted to the user's system (mm → in, cc → ci, m/s → ft/min). */
export function convert(value: number, q: Quantity, units: Units): number {
  if (units === "metric") return value;
  if (q === "length") return mmToIn(value);
  if (q === "volume") return ccToCi(value);
  if (q === "speed") return msToFtMin(value);
  return value;
}

export function unitOf(q: Quantity, units: Units): string {
  return UNIT[q][units];
}

export function precisionOf(q: Quantity, units: Units): Precision {
  return PRECISION[q][units];
}

/** A stored figure as the user reads it: `{ text: "4.125", unit: "in" }`, "—" when unknown. */
export function show(
  value: number | null | undefined,
  q: Quantity,
  units: Units,
): { text: string; unit: string } {
  const unit = unitOf(q, units);
  if (value === null || value === undefined || !Number.isFinite(value)) return { text: NONE, unit };
  const [min, max] = precisionOf(q, units);
  return { text: formatNumber(convert(value, q, units), min, max), unit };
}

/** "4.125 in", or "—" when unknown. */
export function fmtLine(value: number | null | undefined, q: Quantity, units: Units): string {
  const s = show(value, q, units);
  if (s.text === NONE) return NONE;
  if (!s.unit) return s.text;
  return s.unit.startsWith(":") || s.unit.startsWith("°")
    ? `${s.text}${s.unit}`
    : `${s.text} ${s.unit}`;
}

/**
 * The text to put in an input for a stored value, in the user's units: the same digits
 * the read-only figure shows (no separators, ASCII minus, so it parses back).
 */
export function inputValue(value: number | null | undefined, q: Quantity, units: Units): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "";
  const [, max] = precisionOf(q, units);
  const text = numberFormat(0, max, false).format(Math.abs(convert(value, q, units)));
  return value < 0 && /[1-9]/.test(text) ? `-${text}` : text;
}

/** A change between two figures: "+0.50 mm", "−1.2 cc", "no change". */
export function formatDifference(before: number, after: number, q: Quantity, units: Units): string {
  const [min, max] = precisionOf(q, units);
  const d = convert(after, q, units) - convert(before, q, units);
  const text = numberFormat(min, max, true).format(Math.abs(d));
  if (!/[1-9]/.test(text)) return "no change";
  const unit = unitOf(q, units);
  return `${d > 0 ? "+" : MINUS}${text}${unit ? (unit.startsWith(":") ? unit : ` ${unit}`) : ""}`;
}

/**
 * A worked formula as a reader writes it: subtracting a negative is an addition, adding a
 * negative a subtraction ("a − -1.2" → "a + 1.2", "a + -3" → "a − 3").
 */
export function tidySigns(expr: string): string {
  return expr.replace(/([+−-])(\s+)[-−](?=\d|\.\d)/g, (_m, op: string, sp: string) =>
    op === "+" ? `${MINUS}${sp}` : `+${sp}`,
  );
}

/** Integer cents as dollars: 129000 → "$1,290.00", -500 → "−$5.00". */
export function formatMoney(cents: number | null | undefined): string {
  if (cents === null || cents === undefined || !Number.isFinite(cents)) return NONE;
  if (!Number.isInteger(cents)) throw new RangeError("money is kept in whole cents");
  const abs = Math.abs(cents);
  const dollars = Math.floor(abs / 100);
  const rest = String(abs % 100).padStart(2, "0");
  const body = `$${numberFormat(0, 0, true).format(dollars)}.${rest}`;
  return cents < 0 ? MINUS + body : body;
}

/** A rate kept in basis points (825 = 8.25 %) as "8.25 %". */
export function formatPercent(basisPoints: number): string {
  return `${formatNumber(basisPoints / 100, 0, 2)} %`;
}

export const DEFAULT_TIME_ZONE = "America/Chicago";

export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

const dateFormats = new Map<string, Intl.DateTimeFormat>();
function dateFormat(tz: string, time: boolean): Intl.DateTimeFormat {
  const key = `${tz}|${time}`;
  let f = dateFormats.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone: tz,
      year: "numeric",
      month: "short",
      day: "numeric",
      ...(time ? { hour: "numeric", minute: "2-digit", timeZoneName: "short" } : {}),
    });
    dateFormats.set(key, f);
  }
  return f;
}

/**
 * One date style for every screen, in the shop's time zone: "Dec 2, 2026", or with
 * `time` "Dec 2, 2026, 3:10 PM CST" (for saves, sends and changes, where the hour matters).
 */
export function formatDate(
  at: Date | string | number,
  timeZone: string,
  opts: { time?: boolean } = {},
): string {
  const d = at instanceof Date ? at : new Date(at);
  if (Number.isNaN(d.getTime())) return NONE;
  const tz = isTimeZone(timeZone) ? timeZone : DEFAULT_TIME_ZONE;
  return dateFormat(tz, opts.time ?? false).format(d);
}
