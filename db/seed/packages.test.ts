// The demo packages compute to what they are called, and with the shop's default caution
// limits they raise the cautions a builder would: none for piston speed on a stock stroke
// at a stock rev limit.
import { describe, expect, it } from "vitest";
import {
  computeBench,
  emptySpec,
  resolveFields,
  toCalcInput,
  type BenchPart,
  type BenchSpec,
} from "~/lib/bench/spec";
import { DEFAULT_CALC_LIMITS } from "~/lib/settings/limits";
import { DEMO_PARTS } from "./catalog";
import { DEMO_PACKAGES } from "./packages";

// common practice (from memory): large twins as delivered limit at about 5500–5800 rpm
const STOCK_REV_LIMIT = 5800;

const parts = new Map<number, BenchPart>();
const idOf = new Map<string, number>();
DEMO_PARTS.forEach(([partNumber, category, maker, name, , , tags, stock, attributes], i) => {
  const id = i + 1;
  idOf.set(partNumber, id);
  parts.set(id, {
    id,
    partNumber,
    category,
    maker,
    name,
    tags: tags.split(" ").filter(Boolean),
    stock,
    attributes,
  });
});

function computed(d: (typeof DEMO_PACKAGES)[number]) {
  const spec: BenchSpec = { ...emptySpec(), ...d.numbers, slots: { ...emptySpec().slots } };
  for (const [slot, number] of Object.entries(d.parts))
    spec.slots[slot] = { partId: idOf.get(number)!, measured: {} };
  for (const m of d.measured ?? [])
    spec.slots[m.slot]!.measured = { ...spec.slots[m.slot]!.measured, [m.field]: m.value };
  const stockStroke = parts.get(spec.slots.flywheel!.partId!)!.stock;
  return {
    stockStroke,
    out: computeBench(toCalcInput(spec, resolveFields(spec, parts), DEFAULT_CALC_LIMITS, parts)),
  };
}

describe("demo packages", () => {
  it("are named for the cubic inches they compute to (± 0.5 ci)", () => {
    for (const d of DEMO_PACKAGES) {
      const named = Number(/(\d+) ci/.exec(d.name)?.[1]);
      const ci = computed(d).out.results.displacementCi;
      expect(Number.isFinite(named), d.name).toBe(true);
      expect(Math.abs((ci ?? 0) - named), `${d.name}: ${ci} ci`).toBeLessThanOrEqual(0.5);
    }
  });

  it("on a stock stroke at a stock rev limit trip no piston-speed caution", () => {
    let checked = 0;
    for (const d of DEMO_PACKAGES) {
      const { stockStroke, out } = computed(d);
      const codes = out.cautions.map((c) => c.code);
      if (stockStroke && (d.numbers.revLimitRpm ?? Infinity) <= STOCK_REV_LIMIT) {
        checked++;
        expect(codes, d.name).not.toContain("MEAN_PISTON_SPEED_HIGH");
        expect(codes, d.name).not.toContain("PEAK_PISTON_SPEED_HIGH");
      }
    }
    expect(checked).toBeGreaterThanOrEqual(3);
  });

  it("strokers revved past the stock limit do raise the piston-speed caution", () => {
    const fast = DEMO_PACKAGES.filter((d) => !computed(d).stockStroke);
    expect(fast.length).toBeGreaterThanOrEqual(2);
    for (const d of fast)
      expect(
        computed(d).out.cautions.map((c) => c.code),
        d.name,
      ).toContain("MEAN_PISTON_SPEED_HIGH");
  });
});

describe("demo dynamic compression on the shop's lift basis", () => {
  it("converts the cards' 0.053 in closing to seat timing, and cautions only the big builds", () => {
    for (const d of DEMO_PACKAGES) {
      const { stockStroke, out } = computed(d);
      const dcr = out.cautions.find((c) => c.code === "DYNAMIC_CR_HIGH");
      if (stockStroke) expect(dcr, d.name).toBeUndefined();
      else {
        // default: pump 93 (9.2:1) on seat timing, card angle + 15° (from memory)
        expect(dcr?.limit, d.name).toBe(9.2);
        expect(dcr?.message, d.name).toContain(
          "(closing on seat timing: the card's closing at 1.346 mm (0.053 in) + 15°)",
        );
        expect(dcr?.message, d.name).toContain("the limit set for pump 93");
      }
    }
  });
});
