import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  fmtLine,
  formatDate,
  formatDifference,
  formatMoney,
  formatNumber,
  formatPercent,
  inputValue,
  MINUS,
  show,
  tidySigns,
} from "./index";

describe("formatMoney", () => {
  it("writes integer cents as dollars with thousands separators", () => {
    expect(formatMoney(129000)).toBe("$1,290.00");
    expect(formatMoney(5)).toBe("$0.05");
    expect(formatMoney(123456789)).toBe("$1,234,567.89");
    expect(formatMoney(-500)).toBe(`${MINUS}$5.00`);
    expect(formatMoney(null)).toBe("—");
    expect(() => formatMoney(12.5)).toThrow(RangeError);
  });

  it("reads back to the same cents for any amount (property)", () => {
    let grouped = 0;
    fc.assert(
      fc.property(fc.integer({ min: -1e11, max: 1e11 }), (cents) => {
        const text = formatMoney(cents);
        if (text.includes(",")) grouped++;
        const back = Math.round(Number(text.replace(MINUS, "-").replace(/[$,]/g, "")) * 100);
        expect(back).toBe(cents);
        // a separator every three digits, and only there
        expect(text).toMatch(/^−?\$\d{1,3}(,\d{3})*\.\d{2}$/);
      }),
      { numRuns: 400 },
    );
    // most integers in ±1e11 are ≥ $1,000: the grouping branch is reached
    expect(grouped).toBeGreaterThan(300);
  });
});

describe("figures in the user's units", () => {
  it("shows lengths, volumes and speeds in each system", () => {
    expect(show(104.775, "length", "inch")).toEqual({ text: "4.125", unit: "in" });
    expect(show(104.775, "length", "metric")).toEqual({ text: "104.775", unit: "mm" });
    expect(show(104.8, "length", "metric")).toEqual({ text: "104.80", unit: "mm" });
    // 1 ci = 16.387064 cc (NIST SP 811, 2008, appendix B.9)
    expect(show(1966.44768, "volume", "inch")).toEqual({ text: "120.0", unit: "ci" });
    expect(show(1966.44768, "volume", "metric")).toEqual({ text: "1,966", unit: "cc" });
    // 1 m/s = 196.850 ft/min (1 ft = 0.3048 m, NIST SP 811, appendix B.9)
    expect(show(20, "speed", "inch")).toEqual({ text: "3,937", unit: "ft/min" });
    expect(fmtLine(10.456, "ratio", "inch")).toBe("10.46:1");
    expect(fmtLine(null, "length", "inch")).toBe("—");
  });

  it("an input shows the same digits as the read-only figure (property)", () => {
    let fourDecimals = 0;
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 200, noNaN: true }), (mm) => {
        const ro = show(mm, "length", "inch").text;
        const typed = inputValue(mm, "length", "inch");
        // same number, the read-only one may pad a trailing zero
        expect(Number(typed)).toBe(Number(ro));
        if (ro.split(".")[1]!.length === 4) fourDecimals++;
      }),
      { numRuns: 300 },
    );
    expect(fourDecimals).toBeGreaterThan(150);
    expect(inputValue(0.25, "length", "inch")).toBe("0.0098");
    expect(show(0.25, "length", "inch").text).toBe("0.0098");
  });

  it("never shows a negative zero", () => {
    expect(formatNumber(-0.0001, 0, 2)).toBe("0");
    expect(formatNumber(-1.5, 1)).toBe(`${MINUS}1.5`);
    expect(inputValue(-4.2, "smallVolume", "metric")).toBe("-4.2");
  });
});

describe("differences and worked formulas", () => {
  it("signs a change once", () => {
    expect(formatDifference(10, 10.5, "length", "metric")).toBe("+0.50 mm");
    expect(formatDifference(-2, -3.2, "smallVolume", "metric")).toBe(`${MINUS}1.2 cc`);
    expect(formatDifference(5, 5.0001, "smallVolume", "metric")).toBe("no change");
  });

  it("subtracting a negative reads as an addition", () => {
    expect(tidySigns("66 + 0.88 − -1.2 cc")).toBe("66 + 0.88 + 1.2 cc");
    expect(tidySigns("66 + -3 cc")).toBe(`66 ${MINUS} 3 cc`);
    expect(tidySigns("(π/4) × -2")).toBe("(π/4) × -2");
  });

  it("no operator is ever followed by a negative number (property)", () => {
    let rewritten = 0;
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.constantFrom("+", "−"),
            fc.integer({ min: -999, max: 999 }).map((x) => x / 10),
          ),
          {
            minLength: 1,
            maxLength: 5,
          },
        ),
        (terms) => {
          const expr = "10" + terms.map(([op, x]) => ` ${op} ${x}`).join("");
          const tidy = tidySigns(expr);
          if (tidy !== expr) rewritten++;
          expect(tidy).not.toMatch(/[+−] -/);
          // the value is unchanged
          const value = (s: string) =>
            s
              .split(" ")
              .reduce(
                (acc, tok, i, all) =>
                  i === 0
                    ? Number(tok)
                    : tok === "+" || tok === "−"
                      ? acc
                      : all[i - 1] === "+"
                        ? acc + Number(tok)
                        : acc - Number(tok),
                0,
              );
          expect(value(tidy)).toBeCloseTo(value(expr), 9);
        },
      ),
      { numRuns: 300 },
    );
    expect(rewritten).toBeGreaterThan(150);
  });
});

describe("dates in the shop's time zone", () => {
  it("one style, with the time where it matters", () => {
    const at = "2026-12-02T21:10:00Z";
    expect(formatDate(at, "America/Chicago")).toBe("Dec 2, 2026");
    expect(formatDate(at, "America/Chicago", { time: true })).toBe("Dec 2, 2026, 3:10 PM CST");
    // past midnight in UTC is still the evening before in Chicago
    expect(formatDate("2026-12-03T02:30:00Z", "America/Chicago")).toBe("Dec 2, 2026");
    expect(formatDate("2026-07-01T12:00:00Z", "America/Chicago", { time: true })).toBe(
      "Jul 1, 2026, 7:00 AM CDT",
    );
    expect(formatDate("not a date", "America/Chicago")).toBe("—");
    // an unknown zone falls back to the default instead of throwing
    expect(formatDate(at, "Nowhere/Town")).toBe("Dec 2, 2026");
  });

  it("rates in basis points", () => {
    expect(formatPercent(825)).toBe("8.25 %");
    expect(formatPercent(1000)).toBe("10 %");
  });
});
