// An engine family as the owner edits it: the form's schema (shared by the browser and
// the server) and the figures it carries.
import { z } from "zod";
import { SLOTS } from "../packages/slots";
import { line, paragraph } from "../requests/text";

const YEAR_MAX = new Date().getUTCFullYear() + 2;

const text = (label: string, max: number) => line(`Enter the ${label}`, max);

const num = (label: string, min: number, max: number, unit: string) =>
  z.coerce
    .number({ error: `Enter the ${label} in ${unit}` })
    .min(min, `The ${label} must be between ${min} and ${max} ${unit}`)
    .max(max, `The ${label} must be between ${min} and ${max} ${unit}`);

const optionalNum = (label: string, min: number, max: number, unit: string) =>
  z.preprocess((v) => (v === "" ? undefined : v), num(label, min, max, unit).optional());

export const FamilySchema = z
  .object({
    name: text("family's name", 80),
    yearFrom: z.coerce
      .number({ error: "Enter the first model year" })
      .int("Enter a whole year")
      .min(1936, `A model year between 1936 and ${YEAR_MAX}`)
      .max(YEAR_MAX, `A model year between 1936 and ${YEAR_MAX}`),
    yearTo: z.preprocess(
      (v) => (v === "" ? undefined : v),
      z.coerce
        .number()
        .int("Enter a whole year")
        .min(1936, `A model year between 1936 and ${YEAR_MAX}`)
        .max(YEAR_MAX, `A model year between 1936 and ${YEAR_MAX}`)
        .optional(),
    ),
    boreMm: num("stock bore", 50, 130, "mm"),
    strokeMm: num("stock stroke", 50, 150, "mm"),
    displacementCc: num("displacement", 500, 3000, "cc"),
    deckHeightMm: optionalNum("case deck height", 100, 400, "mm"),
    revLimitRpm: optionalNum("stock rev limit", 3000, 10000, "rpm"),
    notes: paragraph(2000),
    ...Object.fromEntries(
      SLOTS.map((s) => [
        `stock_${s.key}`,
        z.preprocess(
          (v) => (v === "" ? undefined : v),
          z.coerce.number().int().positive().optional(),
        ),
      ]),
    ),
  })
  .refine((v) => v.yearTo === undefined || v.yearTo >= v.yearFrom, {
    path: ["yearTo"],
    message: "The last year cannot be before the first",
  });

export type FamilyInput = z.infer<typeof FamilySchema>;

export function familyYears(f: { yearFrom: number; yearTo: number | null }): string {
  return f.yearTo === null ? `${f.yearFrom} on` : `${f.yearFrom}–${f.yearTo}`;
}
