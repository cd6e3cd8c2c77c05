// The owner's form for the caution limits: one Zod schema, used by Conform in the
// browser and by the action on the server.
import { z } from "zod";
import { GRADE_SLOTS, LIMIT_DEFS, type LimitDef, type ShopLimits } from "./limits";

function hasControl(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x20 || c === 0x7f) return true;
  }
  return false;
}

function fieldSchema(d: LimitDef): z.ZodType {
  switch (d.kind) {
    case "number": {
      const unit = d.unit === "" || d.unit === ":1" ? "" : ` ${d.unit}`;
      return z
        .number(`Enter a number for ${d.label.toLowerCase()}.`)
        .min(d.min ?? 0, `Must be at least ${d.min ?? 0}${unit}.`)
        .max(d.max ?? 1e6, `Must be at most ${d.max ?? 1e6}${unit}.`);
    }
    case "name":
      return z
        .string("Name the fuel grade.")
        .trim()
        .min(1, "Name the fuel grade.")
        .max(40, "Keep the name to 40 characters.")
        .refine((s) => !hasControl(s), "Use letters, numbers and spaces only.");
    case "grade":
      return z.enum(GRADE_SLOTS as [string, ...string[]], "Choose one of the three grades.");
    case "basis":
      return z.enum(["seat", "checking"], "Choose the basis of the limits.");
  }
}

const shape = Object.fromEntries(LIMIT_DEFS.map((d) => [d.key, fieldSchema(d)]));

export const LimitsSchema = z.object(shape).superRefine((raw, ctx) => {
  const v = raw as unknown as ShopLimits;
  if (v.quenchMinMm >= v.quenchMaxMm) {
    ctx.addIssue({
      code: "custom",
      path: ["quenchMaxMm"],
      message: "Must be wider than the tightest quench.",
    });
  }
  if (v.peakPistonSpeedMaxMs <= v.meanPistonSpeedMaxMs) {
    ctx.addIssue({
      code: "custom",
      path: ["peakPistonSpeedMaxMs"],
      message: "Peak piston speed is always above the mean: set it higher than the mean.",
    });
  }
  const seen = new Map<string, string>();
  for (const g of GRADE_SLOTS) {
    const name = v[`${g}Name`];
    if (typeof name !== "string") continue;
    const k = name.toLowerCase();
    if (seen.has(k)) {
      ctx.addIssue({
        code: "custom",
        path: [`${g}Name`],
        message: "Two grades have this name: give each its own.",
      });
    }
    seen.set(k, g);
  }
});
