// How quote money reads on a screen and in mail: dollars with thousands separators.
import { formatBasisPoints } from "./money";

const USD = new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" });

export function formatCents(cents: number): string {
  return USD.format(cents / 100);
}

export function formatPercent(basisPoints: number): string {
  return formatBasisPoints(basisPoints);
}

/** 325 hundredths → "3.25"; 100 → "1" */
export function formatHundredths(h: number): string {
  const whole = Math.floor(h / 100);
  const frac = h % 100;
  return frac === 0 ? String(whole) : `${whole}.${String(frac).padStart(2, "0").replace(/0$/, "")}`;
}
