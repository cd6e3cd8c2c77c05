/** Formats a number for a worked step: up to `digits` significant figures, no trailing zeros. */
export function fmt(x: number, digits = 6): string {
  if (x === 0) return "0";
  if (Number.isInteger(x) && Math.abs(x) < 1e15) return String(x);
  return String(Number(x.toPrecision(digits)));
}
