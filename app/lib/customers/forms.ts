// The customer, bike and installed-part forms (browser and server).
import { z } from "zod";
import { line, optionalLine, paragraph } from "../requests/text";
import { PHONE_MESSAGE } from "../requests/request-form";

const YEAR_MAX = new Date().getUTCFullYear() + 1;
export const VIN_MESSAGE = "A VIN has 17 letters and digits (no I, O or Q)";

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

const optionalId = z.preprocess(
  blank,
  z.coerce.number().int().positive().max(2_147_483_647).optional(),
);

const optionalInt = (label: string, max: number) =>
  z.preprocess(
    blank,
    z.coerce
      .number({ error: `Enter the ${label} as a whole number` })
      .int(`Enter the ${label} as a whole number`)
      .min(0, `Enter the ${label} as a whole number`)
      .max(max, `The ${label} must be under ${max.toLocaleString("en-US")}`)
      .optional(),
  );

export const CustomerSchema = z.object({
  name: line("Enter the customer's name", 100),
  email: z.preprocess(
    blank,
    z.string().trim().max(200).pipe(z.email("Enter an e-mail like name@example.com")).optional(),
  ),
  phone: z.preprocess(
    blank,
    z
      .string()
      .trim()
      .max(30, PHONE_MESSAGE)
      .refine((v) => /^\+?[0-9 ().-]+$/.test(v), PHONE_MESSAGE)
      .refine((v) => {
        const d = v.replace(/\D/g, "").length;
        return d >= 7 && d <= 15;
      }, PHONE_MESSAGE)
      .optional(),
  ),
  city: optionalLine(80),
  notes: paragraph(2000),
});

export const BikeSchema = z.object({
  year: z.coerce
    .number({ error: "Enter the model year" })
    .int("Enter the model year as four digits")
    .min(1936, `A model year between 1936 and ${YEAR_MAX}`)
    .max(YEAR_MAX, `A model year between 1936 and ${YEAR_MAX}`),
  model: line("Enter the model", 100),
  vin: z.preprocess(
    blank,
    z
      .string()
      .trim()
      .transform((v) => v.toUpperCase())
      .refine((v) => /^[A-HJ-NPR-Z0-9]{17}$/.test(v), VIN_MESSAGE)
      .optional(),
  ),
  engineFamilyId: optionalId,
  mileage: optionalInt("mileage", 1_000_000),
  notes: paragraph(2000),
});

export const BikePartSchema = z
  .object({
    partId: optionalId,
    category: z.preprocess(blank, z.string().max(60).optional()),
    description: optionalLine(200),
    fittedOn: z.preprocess(
      blank,
      z
        .string()
        .regex(/^\d{4}-\d{2}-\d{2}$/, "Enter the date as YYYY-MM-DD")
        .refine((v) => !Number.isNaN(Date.parse(`${v}T00:00:00Z`)), "Enter a real date")
        .refine(
          (v) => !(Date.parse(`${v}T00:00:00Z`) > Date.now() + 86_400_000),
          "A date not in the future",
        )
        .optional(),
    ),
    fittedMileage: optionalInt("mileage", 1_000_000),
    notes: paragraph(1000),
  })
  .superRefine((v, ctx) => {
    if (v.partId === undefined && !v.category)
      ctx.addIssue({
        code: "custom",
        path: ["category"],
        message: "Pick the catalog part, or a category for the free text",
      });
    if (v.partId === undefined && !v.description)
      ctx.addIssue({
        code: "custom",
        path: ["description"],
        message: "Describe the part (it is not from the catalog)",
      });
  });

export type CustomerInput = z.infer<typeof CustomerSchema>;
export type BikeInput = z.infer<typeof BikeSchema>;
export type BikePartInput = z.infer<typeof BikePartSchema>;
