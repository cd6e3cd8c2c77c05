const POW10: number[] = [];
for (let i = 0; i <= 22; i++) POW10.push(10 ** i);
const ZEROS: string[] = [];
for (let i = 0, z = ""; i <= 22; i++, z += "0") ZEROS.push(z);

/**
 * Formats a number for a worked step: rounded to `digits` significant figures (1–9),
 * trailing zeros dropped, plain decimal notation between 1e-6 and 1e9 (exponent
 * notation outside). Integer arithmetic keeps this fast: computeSpec formats a few
 * dozen numbers per call.
 */
export function fmt(x: number, digits = 6): string {
  if (x === 0) return "0";
  const neg = x < 0;
  const ax = neg ? -x : x;
  if (!(ax >= 1e-6 && ax < 1e9) || !(digits >= 1 && digits <= 9)) {
    return String(Number(x.toPrecision(Math.min(Math.max(Math.round(digits) || 6, 1), 21))));
  }
  // e = floor(log10(ax)), by comparison with exact powers of ten
  let e = 0;
  if (ax >= 1) {
    while (e < 9 && ax >= (POW10[e + 1] as number)) e++;
  } else {
    e = -1;
    while (ax * (POW10[-e] as number) < 1) e--;
  }
  let k = digits - 1 - e;
  let body: string;
  if (k <= 0) {
    const p = POW10[-k] as number;
    body = String(Math.round(ax / p) * p);
  } else {
    let m = Math.round(ax * (POW10[k] as number));
    if (m >= (POW10[digits] as number) && k > 0) {
      // rounding carried into a new digit (e.g. 9.999996 → 10.0000): one fewer decimal
      m = Math.round(m / 10);
      k--;
    }
    while (k > 0 && m % 10 === 0) {
      m /= 10;
      k--;
    }
    if (k === 0) body = String(m);
    else {
      const p = POW10[k] as number;
      const ip = Math.floor(m / p);
      const fs = String(m - ip * p);
      body = String(ip) + "." + (ZEROS[k - fs.length] as string) + fs;
    }
  }
  return neg ? "-" + body : body;
}
