const POW10: number[] = [];
for (let i = 0; i <= 22; i++) POW10.push(10 ** i);

/**
 * Formats a number for a worked step: rounded to `digits` significant figures (1–15),
 * trailing zeros dropped, plain decimal notation between 1e-6 and 1e15 (exponent
 * notation outside). Integer arithmetic keeps this fast: computeSpec formats a few
 * dozen numbers per call.
 */
export function fmt(x: number, digits = 6): string {
  if (x === 0) return "0";
  const neg = x < 0;
  const ax = neg ? -x : x;
  if (!(ax >= 1e-6 && ax < 1e15) || !(digits >= 1 && digits <= 15)) {
    return String(Number(x.toPrecision(Math.min(Math.max(Math.round(digits) || 6, 1), 21))));
  }
  let k = digits - 1 - Math.floor(Math.log10(ax));
  let body: string;
  if (k <= 0) {
    const p = POW10[-k] ?? 1;
    body = String(Math.round(ax / p) * p);
  } else {
    let m = Math.round(ax * (POW10[k] ?? 1));
    while (k > 0 && m % 10 === 0) {
      m /= 10;
      k--;
    }
    body = String(m);
    if (k > 0) {
      if (body.length <= k) body = "0".repeat(k - body.length + 1) + body;
      body = body.slice(0, body.length - k) + "." + body.slice(body.length - k);
    }
  }
  return neg && body !== "0" ? "-" + body : body;
}
