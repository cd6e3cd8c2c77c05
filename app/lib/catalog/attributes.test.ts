import { describe, expect, it } from "vitest";
import { BUILT_IN_CATEGORIES } from "../packages/slots";
import {
  ATTRIBUTE_FIELDS,
  attributeSchemaFor,
  camelToSnake,
  partSchemaFor,
  snakeToCamel,
  splitTags,
} from "./attributes";

function issues(category: string, value: unknown) {
  const r = attributeSchemaFor(category).safeParse(value);
  return r.success ? [] : r.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
}

describe("attribute schemas per category", () => {
  it("exist only for built-in categories", () => {
    const slugs = BUILT_IN_CATEGORIES.map((c) => c.slug) as string[];
    for (const k of Object.keys(ATTRIBUTE_FIELDS)) expect(slugs).toContain(k);
  });

  it.each([
    ["cylinders", { boreMm: 101.6 }],
    ["flywheels", { strokeMm: 114.3 }],
    ["rods", { lengthMm: 190.5 }],
    ["pistons", { domeCc: -4.5, forBoreMm: 101.6, compressionHeightMm: 38 }],
    ["heads", { chamberCc: 85, intakeValveMm: 50.8 }],
    ["head_gaskets", { boreMm: 102.1, compressedThicknessMm: 1.02 }],
    [
      "cams",
      { intakeClosesAbdcDeg: 38, intakeLiftMm: 15.2, exhaustLiftMm: 15.2, timingAtLiftMm: 1.346 },
    ],
    ["valve_springs", { maxLiftMm: 16.5 }],
    ["axle_adjusters", {}],
    ["axle_adjusters", { ratedHp: 180 }],
    ["clutch_lines", { ratedTorqueNm: 200, lengthIn: 62 }],
    ["brake_lines", { lengthIn: 58 }],
    ["risers", { heightIn: 14 }],
    ["exhaust", {}],
    ["shop-added-thing", {}],
  ])("accepts a good %s part", (category, value) => {
    expect(issues(category, value)).toEqual([]);
  });

  it.each([
    ["cylinders", { boreMm: 140 }, "boreMm: Bore must be between 50 and 130 mm"],
    ["cylinders", {}, "boreMm: Enter the bore in mm"],
    ["flywheels", { strokeMm: 20 }, "strokeMm: Stroke must be between 60 and 150 mm"],
    ["rods", { lengthMm: 90 }, "lengthMm: Length, centre to centre must be between 100 and 250 mm"],
    [
      "pistons",
      { domeCc: 55, forBoreMm: 101.6 },
      "domeCc: Dome volume must be between -40 and 40 cc",
    ],
    ["heads", { chamberCc: 30 }, "chamberCc: Chamber volume must be between 40 and 150 cc"],
    [
      "head_gaskets",
      { boreMm: 102, compressedThicknessMm: 5 },
      "compressedThicknessMm: Compressed thickness must be between 0.3 and 3 mm",
    ],
    [
      "cams",
      { intakeClosesAbdcDeg: 120, intakeLiftMm: 15, exhaustLiftMm: 15, timingAtLiftMm: 1.3 },
      "intakeClosesAbdcDeg: Intake closes must be between 0 and 90 °",
    ],
    ["valve_springs", { maxLiftMm: "lots" }, "maxLiftMm: Rated for lift up to must be a number"],
    ["axle_adjusters", { ratedHp: -5 }, "ratedHp: Rated power must be between 1 and 400 hp"],
    ["risers", { heightIn: 30 }, "heightIn: Rise must be between 0.5 and 24 in"],
    ["brake_lines", { lengthIn: Number.NaN }, "lengthIn: Length must be a number"],
  ])("refuses a bad %s value with a clear message", (category, value, message) => {
    expect(issues(category, value)).toContain(message);
  });

  it("refuses attributes a category does not have", () => {
    expect(issues("cylinders", { boreMm: 100, strokeMm: 114 }).join()).toMatch(/strokeMm/);
    expect(issues("exhaust", { boreMm: 100 }).length).toBe(1);
  });
});

describe("part schema", () => {
  const cats = ["cylinders", "axle_adjusters"];
  it("normalises tags and checks the category exists", () => {
    const r = partSchemaFor("axle_adjusters", cats).safeParse({
      part_number: "TW-AX-1",
      category: "axle_adjusters",
      maker: "Ironvale",
      name: "Locking adjusters",
      price: 129,
      tags: "Stock-Axle-Adjusters, locking | locking",
    });
    expect(r.success && r.data.tags).toEqual(["stock-axle-adjusters", "locking"]);
    const bad = partSchemaFor("wheels", cats).safeParse({
      part_number: "TW-W-1",
      category: "wheels",
      maker: "m",
      name: "n",
      price: 1,
    });
    expect(bad.success).toBe(false);
  });
  it("refuses odd part numbers and tags", () => {
    const r = partSchemaFor("cylinders", cats).safeParse({
      part_number: "=cmd",
      category: "cylinders",
      maker: "m",
      name: "n",
      price: 1,
      tags: "ok, b@d",
      attributes: { boreMm: 100 },
    });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues.map((i) => i.path[0])).toEqual(["part_number", "tags"]);
  });
  it("splits tags and converts key cases", () => {
    expect(splitTags(" a b,c|d;a ")).toEqual(["a", "b", "c", "d"]);
    expect(camelToSnake("compressedThicknessMm")).toBe("compressed_thickness_mm");
    expect(snakeToCamel("compressed_thickness_mm")).toBe("compressedThicknessMm");
  });
});
