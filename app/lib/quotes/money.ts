// Quote arithmetic in integer cents. No floating-point number ever holds money: quantities
// are hundredths (1.5 h of labour = 150), rates are basis points (8.25 % = 825), and each
// amount is rounded once, half away from zero, where the quote says it is.

export type LineKind = "part" | "labour" | "machine" | "supplies" | "other";

export type QuoteLineInput = {
  kind: LineKind;
  description: string;
  /** hundredths of a unit: 2 pistons = 200, 3.25 h = 325 */
  quantityHundredths: number;
  unitCents: number;
  taxable: boolean;
};

export type Adjustment =
  { kind: "none" } | { kind: "percent"; basisPoints: number } | { kind: "fixed"; cents: number };

export type QuoteTerms = {
  taxRateBasisPoints: number;
  discount: Adjustment;
  deposit: Adjustment;
  /** shop supplies as a share of the labour lines, 0 for none */
  suppliesBasisPoints: number;
};

export type PricedLine = QuoteLineInput & { amountCents: number };

export type QuoteTotals = {
  lines: PricedLine[];
  /** the shop-supplies line made from the labour, when the terms ask for one */
  supplies: PricedLine | null;
  subtotalCents: number;
  discountCents: number;
  taxableCents: number;
  taxCents: number;
  totalCents: number;
  depositCents: number;
};

export const MAX_LINE_CENTS = 100_000_000_00; // one hundred million dollars
const MAX_QUANTITY = 1_000_000_00; // a million of anything, in hundredths
const MAX_BASIS_POINTS = 10_000;

export class MoneyError extends Error {
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
    this.name = "MoneyError";
  }
}

/** n / d rounded half away from zero, for integers with d > 0. Exact for safe integers. */
export function divRound(n: number, d: number): number {
  if (!Number.isSafeInteger(n) || !Number.isSafeInteger(d) || d <= 0)
    throw new RangeError("divRound takes safe integers and a positive divisor");
  const sign = n < 0 ? -1 : 1;
  const a = Math.abs(n);
  const q = Math.floor(a / d);
  const r = a - q * d;
  const out = sign * (2 * r >= d ? q + 1 : q);
  return out === 0 ? 0 : out; // never -0
}

/** a × b / d rounded half away from zero, exactly (the product may pass 2^53, so BigInt). */
export function mulDivRound(a: number, b: number, d: number): number {
  if (![a, b, d].every(Number.isSafeInteger) || d <= 0)
    throw new RangeError("mulDivRound takes safe integers and a positive divisor");
  const n = BigInt(a) * BigInt(b);
  const den = BigInt(d);
  const neg = n < 0n;
  const abs = neg ? -n : n;
  const q = abs / den;
  const rounded = 2n * (abs - q * den) >= den ? q + 1n : q;
  const out = Number(neg ? -rounded : rounded);
  if (!Number.isSafeInteger(out)) throw new RangeError("the amount is too large");
  return out;
}

/** amount × basisPoints / 10 000, rounded once. */
export function applyBasisPoints(cents: number, basisPoints: number): number {
  return mulDivRound(cents, basisPoints, 10_000);
}

export function lineAmount(line: Pick<QuoteLineInput, "quantityHundredths" | "unitCents">): number {
  return mulDivRound(line.quantityHundredths, line.unitCents, 100);
}

function checkLine(line: QuoteLineInput, i: number) {
  if (
    !Number.isSafeInteger(line.quantityHundredths) ||
    line.quantityHundredths <= 0 ||
    line.quantityHundredths > MAX_QUANTITY
  )
    throw new MoneyError(
      "The quantity must be more than 0 and at most 1,000,000.",
      `lines.${i}.quantity`,
    );
  if (
    !Number.isSafeInteger(line.unitCents) ||
    line.unitCents < 0 ||
    line.unitCents > MAX_LINE_CENTS
  )
    throw new MoneyError(
      "The price must be a whole number of cents, 0 or more.",
      `lines.${i}.unit`,
    );
}

function checkAdjustment(a: Adjustment, field: string) {
  if (
    a.kind === "percent" &&
    (!Number.isSafeInteger(a.basisPoints) || a.basisPoints < 0 || a.basisPoints > MAX_BASIS_POINTS)
  )
    throw new MoneyError("A percentage must be between 0 and 100.", field);
  if (
    a.kind === "fixed" &&
    (!Number.isSafeInteger(a.cents) || a.cents < 0 || a.cents > MAX_LINE_CENTS)
  )
    throw new MoneyError("An amount must be a whole number of cents, 0 or more.", field);
}

/**
 * Prices a quote. The order, as the quote states it: each line rounded; shop supplies as a
 * share of labour, rounded; the discount off the subtotal (a percentage rounded once, a
 * fixed amount at most the subtotal); the discount shared over the taxable lines in
 * proportion (rounded once); tax on what is taxable after that share (rounded once); the
 * total; the deposit as a share of the total (rounded once) or a fixed amount at most the
 * total. The total is always exactly subtotal − discount + tax.
 */
export function priceQuote(inputs: QuoteLineInput[], terms: QuoteTerms): QuoteTotals {
  inputs.forEach(checkLine);
  checkAdjustment(terms.discount, "discount");
  checkAdjustment(terms.deposit, "deposit");
  for (const [field, bp] of [
    ["taxRate", terms.taxRateBasisPoints],
    ["supplies", terms.suppliesBasisPoints],
  ] as const)
    if (!Number.isSafeInteger(bp) || bp < 0 || bp > MAX_BASIS_POINTS)
      throw new MoneyError("A percentage must be between 0 and 100.", field);

  const lines: PricedLine[] = inputs.map((l) => ({ ...l, amountCents: lineAmount(l) }));
  const labourCents = lines
    .filter((l) => l.kind === "labour")
    .reduce((s, l) => s + l.amountCents, 0);
  const suppliesCents = applyBasisPoints(labourCents, terms.suppliesBasisPoints);
  const supplies: PricedLine | null =
    terms.suppliesBasisPoints > 0 && suppliesCents > 0
      ? {
          kind: "supplies",
          description: `Shop supplies (${formatBasisPoints(terms.suppliesBasisPoints)} of labour)`,
          quantityHundredths: 100,
          unitCents: suppliesCents,
          taxable: true,
          amountCents: suppliesCents,
        }
      : null;
  const all = supplies ? [...lines, supplies] : lines;
  const subtotalCents = all.reduce((s, l) => s + l.amountCents, 0);
  const discountCents =
    terms.discount.kind === "percent"
      ? applyBasisPoints(subtotalCents, terms.discount.basisPoints)
      : terms.discount.kind === "fixed"
        ? Math.min(terms.discount.cents, subtotalCents)
        : 0;
  const taxableBefore = all.filter((l) => l.taxable).reduce((s, l) => s + l.amountCents, 0);
  const taxableShareOfDiscount =
    subtotalCents === 0 ? 0 : mulDivRound(discountCents, taxableBefore, subtotalCents);
  const taxableCents = taxableBefore - taxableShareOfDiscount;
  const taxCents = applyBasisPoints(taxableCents, terms.taxRateBasisPoints);
  const totalCents = subtotalCents - discountCents + taxCents;
  const depositCents =
    terms.deposit.kind === "percent"
      ? applyBasisPoints(totalCents, terms.deposit.basisPoints)
      : terms.deposit.kind === "fixed"
        ? Math.min(terms.deposit.cents, totalCents)
        : 0;
  return {
    lines,
    supplies,
    subtotalCents,
    discountCents,
    taxableCents,
    taxCents,
    totalCents,
    depositCents,
  };
}

/** 825 → "8.25%", 1000 → "10%" */
export function formatBasisPoints(bp: number): string {
  const whole = Math.floor(bp / 100);
  const frac = bp % 100;
  return frac === 0 ? `${whole}%` : `${whole}.${String(frac).padStart(2, "0").replace(/0$/, "")}%`;
}

/** Parses a typed decimal ("1,290.5", "$12", "3.25") into hundredths without floats; null when not one. */
export function parseHundredths(text: string): number | null {
  const t = text
    .trim()
    .replace(/^\$/, "")
    .replace(/,(?=\d{3}(\D|$))/g, "");
  const m = /^(\d{1,12})(?:\.(\d{1,2}))?$/.exec(t);
  if (!m) return null;
  const value = Number(m[1]) * 100 + Number((m[2] ?? "").padEnd(2, "0"));
  return Number.isSafeInteger(value) ? value : null;
}

/** "8.25" (a percentage) → 825 basis points; null when not a percentage with at most two decimals. */
export function parsePercentBasisPoints(text: string): number | null {
  const v = parseHundredths(text.replace(/%$/, ""));
  return v === null || v > MAX_BASIS_POINTS ? null : v;
}
