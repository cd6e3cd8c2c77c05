import { describe, expect, it } from "vitest";
import { buildQuoteLines, chooseJobs, type QuoteJob, type QuotePart } from "./lines";

const part = (id: number, over: Partial<QuotePart> = {}): QuotePart => ({
  id,
  partNumber: `P-${id}`,
  name: `Part ${id}`,
  maker: "Test",
  priceCents: 10000 * id,
  labourHundredths: 100,
  stock: false,
  ...over,
});
const job = (id: number, hours: number, slots: string[]): QuoteJob => ({
  id,
  name: `Job ${id}`,
  hoursHundredths: hours,
  slots,
});

describe("which jobs a quote's labour takes", () => {
  it("the cheapest set covering every changed slot a job covers, not one job per part", () => {
    const jobs = [
      job(1, 800, ["cylinder", "piston", "head"]),
      job(2, 300, ["cylinder"]),
      job(3, 350, ["head"]),
    ];
    // cylinder + head: job 1 (8 h) against jobs 2 + 3 (6.5 h): the pair is cheaper
    expect(chooseJobs(["cylinder", "head"], jobs).map((j) => j.id)).toEqual([2, 3]);
    // cylinder + head + piston: only job 1 covers the piston, and then covers all three
    expect(chooseJobs(["cylinder", "head", "piston"], jobs).map((j) => j.id)).toEqual([1]);
    expect(chooseJobs(["rotors"], jobs)).toEqual([]);
  });
});

describe("lines from a package", () => {
  const src = (over: Partial<Parameters<typeof buildQuoteLines>[0]> = {}) => ({
    slots: {
      cylinder: part(1),
      head: part(2),
      rotors: part(3, { labourHundredths: 150 }),
      rod: part(4, { stock: true }),
    },
    baseline: {},
    replaceParts: [],
    jobs: [job(1, 800, ["cylinder", "head"])],
    labourRateCents: 12000,
    extraLines: [],
    ...over,
  });

  it("prices the changed slots, one job for the parts it covers, a part's own hours where none does", () => {
    const q = buildQuoteLines(src());
    expect(q.changedSlots).toEqual(["cylinder", "head", "rotors"]); // the stock rod is no change
    expect(q.lines.map((l) => [l.kind, l.description, l.quantityHundredths, l.unitCents])).toEqual([
      ["part", "Test Part 1 (P-1)", 100, 10000],
      ["part", "Test Part 2 (P-2)", 100, 20000],
      ["part", "Test Part 3 (P-3)", 100, 30000],
      ["labour", "Job 1", 800, 12000],
      ["labour", "Fit Part 3", 150, 12000],
    ]);
    expect(q.uncoveredSlots).toEqual(["rotors"]);
  });

  it("what the bike already carries is no change; a keep-check replacement is priced once", () => {
    const q = buildQuoteLines(
      src({
        baseline: { cylinder: 1, rod: null },
        replaceParts: [
          { slot: "head", part: part(2), reason: "the package fits a new head" },
          { slot: null, part: part(9), reason: "rated below the package's torque" },
        ],
      }),
    );
    // the cylinder is on the bike already; the rod slot was empty on the bike, so the
    // stock rod now is a change
    expect(q.changedSlots).toEqual(["head", "rotors", "rod"]);
    const parts = q.lines.filter((l) => l.kind === "part").map((l) => l.description);
    expect(parts).toEqual([
      "Test Part 2 (P-2)",
      "Test Part 3 (P-3)",
      "Test Part 4 (P-4)",
      "Test Part 9 (P-9)",
    ]);
    expect(q.lines.at(-1)?.kind).toBe("labour");
  });
});
