// How the bench shows a figure in the user's unit system. Stored values are mm, cc, °
// and m/s; inch users see in, ci and ft/min, with the unit always beside the number.
import { ccToCi, mmToIn, msToFtMin } from "../../../calc";

export type Units = "inch" | "metric";
export type Quantity =
  "length" | "volume" | "smallVolume" | "speed" | "angle" | "ratio" | "rpm" | "hp";

export function show(
  value: number | null | undefined,
  q: Quantity,
  units: Units,
): { text: string; unit: string } {
  if (value === null || value === undefined || !Number.isFinite(value))
    return { text: "—", unit: unitOf(q, units) };
  switch (q) {
    case "length":
      return units === "inch"
        ? { text: mmToIn(value).toFixed(3), unit: "in" }
        : { text: value.toFixed(2), unit: "mm" };
    case "volume":
      return units === "inch"
        ? { text: ccToCi(value).toFixed(1), unit: "ci" }
        : { text: value.toFixed(0), unit: "cc" };
    case "smallVolume":
      return { text: value.toFixed(1), unit: "cc" };
    case "speed":
      return units === "inch"
        ? { text: msToFtMin(value).toFixed(0), unit: "ft/min" }
        : { text: value.toFixed(1), unit: "m/s" };
    case "angle":
      return { text: value.toFixed(1), unit: "° ABDC" };
    case "ratio":
      return { text: value.toFixed(2), unit: ":1" };
    case "rpm":
      return { text: value.toFixed(0), unit: "rpm" };
    case "hp":
      return { text: value.toFixed(0), unit: "hp" };
  }
}

export function unitOf(q: Quantity, units: Units): string {
  if (q === "length") return units === "inch" ? "in" : "mm";
  if (q === "volume") return units === "inch" ? "ci" : "cc";
  if (q === "speed") return units === "inch" ? "ft/min" : "m/s";
  return { smallVolume: "cc", angle: "° ABDC", ratio: ":1", rpm: "rpm", hp: "hp" }[q];
}

/** The text to put in an input for a stored value, in the user's units. */
export function inputValue(value: number | null | undefined, q: Quantity, units: Units): string {
  if (value === null || value === undefined) return "";
  if (q === "length" && units === "inch") return String(Number(mmToIn(value).toFixed(4)));
  return String(Number(value.toFixed(3)));
}

export function fmtLine(value: number | null | undefined, q: Quantity, units: Units): string {
  const s = show(value, q, units);
  return s.text === "—" ? "—" : `${s.text} ${s.unit}`;
}
