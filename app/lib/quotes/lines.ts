// From a package to a quote's lines (pure: the store reads the rows, this decides).
// Parts: each slot whose part differs from what the bike carries, and the bike's
// installed parts the keep-check marks for replacement. Labour: the shop's jobs that
// cover the changed slots (the cheapest set of jobs covering all of them, so parts fitted
// in one job are not counted twice); a part's own hours only where no job covers its slot.
import { SLOT_BY_KEY } from "../packages/slots";
import type { LineKind, QuoteLineInput } from "./money";

export type QuotePart = {
  id: number;
  partNumber: string;
  name: string;
  maker: string;
  priceCents: number;
  /** hundredths of an hour */
  labourHundredths: number;
  /** what the bike came with: in its slot with nothing else known, it is not a change */
  stock: boolean;
};

export type QuoteJob = { id: number; name: string; hoursHundredths: number; slots: string[] };

export type ExtraLine = {
  kind: Extract<LineKind, "machine" | "other">;
  description: string;
  quantityHundredths: number;
  unitCents: number;
  taxable: boolean;
};

export type QuoteSource = {
  /** slot key → the part the package puts there */
  slots: Record<string, QuotePart | null>;
  /** slot key → the part id the bike carries there now (stock or installed); absent: unknown */
  baseline: Record<string, number | null>;
  /** installed parts marked "replace" whose slot the package leaves empty or that are extra */
  replaceParts: { slot: string | null; part: QuotePart; reason: string }[];
  jobs: QuoteJob[];
  labourRateCents: number;
  extraLines: ExtraLine[];
};

export type BuiltLine = QuoteLineInput & {
  /** where the line came from, shown on the quote */
  source: string;
  slot: string | null;
};

export type BuiltQuote = {
  lines: BuiltLine[];
  changedSlots: string[];
  jobsUsed: { job: QuoteJob; covers: string[] }[];
  uncoveredSlots: string[];
};

const slotLabel = (key: string) => SLOT_BY_KEY[key]?.label ?? key;

/** The cheapest set of jobs covering every slot some job covers (ties: fewer jobs). */
export function chooseJobs(changed: string[], jobs: QuoteJob[]): QuoteJob[] {
  const relevant = jobs.filter((j) => j.slots.some((s) => changed.includes(s)));
  const coverable = changed.filter((s) => relevant.some((j) => j.slots.includes(s)));
  if (coverable.length === 0) return [];
  if (relevant.length > 16) {
    // more jobs than an exhaustive search should try: take the best hours-per-slot greedily
    const left = new Set(coverable);
    const picked: QuoteJob[] = [];
    while (left.size > 0) {
      let best: QuoteJob | null = null;
      let bestScore = Infinity;
      for (const j of relevant) {
        const gain = j.slots.filter((s) => left.has(s)).length;
        if (gain === 0) continue;
        const score = j.hoursHundredths / gain;
        if (score < bestScore) [best, bestScore] = [j, score];
      }
      if (!best) break;
      picked.push(best);
      for (const s of best.slots) left.delete(s);
    }
    return picked;
  }
  let best: QuoteJob[] = [];
  let bestHours = Infinity;
  for (let mask = 1; mask < 1 << relevant.length; mask++) {
    const set = relevant.filter((_, i) => mask & (1 << i));
    if (!coverable.every((s) => set.some((j) => j.slots.includes(s)))) continue;
    const hours = set.reduce((h, j) => h + j.hoursHundredths, 0);
    if (hours < bestHours || (hours === bestHours && set.length < best.length)) {
      best = set;
      bestHours = hours;
    }
  }
  return best;
}

export function buildQuoteLines(src: QuoteSource): BuiltQuote {
  const changedSlots = Object.entries(src.slots)
    .filter(([slot, part]) => {
      if (!part) return false;
      if (Object.hasOwn(src.baseline, slot)) return src.baseline[slot] !== part.id;
      return !part.stock;
    })
    .map(([slot]) => slot);
  const lines: BuiltLine[] = [];
  for (const slot of changedSlots) {
    const part = src.slots[slot]!;
    lines.push({
      kind: "part",
      description: `${part.maker} ${part.name} (${part.partNumber})`,
      quantityHundredths: 100,
      unitCents: part.priceCents,
      taxable: true,
      source: `${slotLabel(slot)}: new part`,
      slot,
    });
  }
  for (const r of src.replaceParts) {
    if (r.slot && changedSlots.includes(r.slot)) continue; // already priced as the slot's new part
    lines.push({
      kind: "part",
      description: `${r.part.maker} ${r.part.name} (${r.part.partNumber})`,
      quantityHundredths: 100,
      unitCents: r.part.priceCents,
      taxable: true,
      source: `Keep-check: replace — ${r.reason}`,
      slot: r.slot,
    });
  }
  const jobs = chooseJobs(changedSlots, src.jobs);
  const jobsUsed = jobs.map((job) => ({
    job,
    covers: changedSlots.filter((s) => job.slots.includes(s)),
  }));
  for (const { job, covers } of jobsUsed) {
    lines.push({
      kind: "labour",
      description: job.name,
      quantityHundredths: job.hoursHundredths,
      unitCents: src.labourRateCents,
      taxable: false,
      source: `Covers ${covers.map(slotLabel).join(", ")}`,
      slot: null,
    });
  }
  const uncoveredSlots = changedSlots.filter((s) => !jobs.some((j) => j.slots.includes(s)));
  for (const slot of uncoveredSlots) {
    const part = src.slots[slot]!;
    if (part.labourHundredths <= 0) continue;
    lines.push({
      kind: "labour",
      description: `Fit ${part.name}`,
      quantityHundredths: part.labourHundredths,
      unitCents: src.labourRateCents,
      taxable: false,
      source: `${slotLabel(slot)}: the part's own fitting time (no job covers it)`,
      slot,
    });
  }
  for (const x of src.extraLines) {
    lines.push({ ...x, source: x.kind === "machine" ? "Machine work" : "Added line", slot: null });
  }
  return { lines, changedSlots, jobsUsed, uncoveredSlots };
}
