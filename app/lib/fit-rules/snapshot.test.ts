import { describe, expect, it } from "vitest";
import { buildRuleSnapshot, NUMBER_NAMES, snapshotHas } from "./snapshot";

const base = { numbers: {}, parts: [] };

describe("buildRuleSnapshot", () => {
  it("keeps every documented number, null when missing or not finite", () => {
    const s = buildRuleSnapshot({
      numbers: { power_hp: 152, cr_static: Number.NaN, riser_in: null, power_basis: "estimate" },
      parts: [],
    });
    expect(Object.keys(s.numbers).sort()).toEqual([...NUMBER_NAMES].sort());
    expect(s.numbers.power_hp).toBe(152);
    expect(s.numbers.cr_static).toBeNull();
    expect(s.numbers.riser_in).toBeNull();
    expect(s.numbers.bore_mm).toBeNull();
    expect(s.power_basis).toBe("estimate");
  });

  it("turns camelCase attributes into snake_case, one object per slot, and gives cams lift_mm", () => {
    const s = buildRuleSnapshot({
      numbers: {},
      parts: [
        {
          slot: "gasket",
          partId: 7,
          partNumber: "TW-HG-1010",
          category: "head_gaskets",
          tags: ["MLS"],
          attributes: { boreMm: 102.5, compressedThicknessMm: 1.02 },
          stock: false,
        },
        {
          slot: "cam",
          partId: 9,
          partNumber: "TW-CAM-585",
          category: "cams",
          tags: ["gear-drive-cam"],
          attributes: { intakeLiftMm: 14.86, exhaustLiftMm: 15.2 },
          stock: false,
        },
      ],
    });
    expect(s.slots.gasket).toEqual({
      part_id: 7,
      part_number: "TW-HG-1010",
      category: "head_gaskets",
      stock: false,
      tags: ["mls"],
      attributes: { bore_mm: 102.5, compressed_thickness_mm: 1.02 },
    });
    expect(s.slots.cam!.attributes.lift_mm).toBe(15.2);
    expect(s.words).toEqual(["gear-drive-cam", "mls", "tw-cam-585", "tw-hg-1010"]);
  });

  it("has() matches tags and part numbers without regard to case", () => {
    const s = buildRuleSnapshot({
      numbers: {},
      parts: [
        {
          slot: "axle_adjusters",
          partId: 1,
          partNumber: "TW-AX-STD",
          category: "axle_adjusters",
          tags: ["stock-axle-adjusters"],
          attributes: {},
          stock: true,
        },
      ],
    });
    expect(snapshotHas(s, "stock-axle-adjusters")).toBe(true);
    expect(snapshotHas(s, "STOCK-AXLE-ADJUSTERS")).toBe(true);
    expect(snapshotHas(s, "tw-ax-std")).toBe(true);
    expect(snapshotHas(s, "stock-clutch-cable")).toBe(false);
    expect(snapshotHas(buildRuleSnapshot(base), "x")).toBe(false);
  });

  it("is plain JSON (stored beside the package)", () => {
    const s = buildRuleSnapshot({
      numbers: { power_hp: 140 },
      parts: [
        {
          slot: "risers",
          partId: 2,
          partNumber: "TW-RS-14",
          category: "risers",
          tags: [],
          attributes: { heightIn: 14 },
          stock: false,
        },
      ],
    });
    expect(JSON.parse(JSON.stringify(s))).toEqual(s);
  });
});
