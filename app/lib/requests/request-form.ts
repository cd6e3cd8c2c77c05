// The public build-request form's schema (browser and server use the same one).
import { z } from "zod";
import { BUDGETS, CONTACT_BY, RIDING, TIME_FRAMES } from "./options";
import { hasControl, CONTROL_MESSAGE, line, paragraph } from "./text";

export const MAX_PART_LINES = 20;
export const MAX_BODY_BYTES = 16_000;
const YEAR_MAX = new Date().getUTCFullYear() + 1;

const values = <T extends readonly { value: string }[]>(list: T) =>
  list.map((o) => o.value) as [T[number]["value"], ...T[number]["value"][]];

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

export const PHONE_MESSAGE = "Enter a phone number of 7 to 15 digits, e.g. 555-0142";

export const BuildRequestSchema = z
  .object({
    name: line("Tell us your name", 100),
    email: z
      .string({ error: "Enter your e-mail address" })
      .trim()
      .max(200, "Keep the e-mail address under 200 characters")
      .pipe(z.email("Enter an e-mail address like name@example.com")),
    phone: z.preprocess(
      blankToUndefined,
      z
        .string()
        .trim()
        .max(30, PHONE_MESSAGE)
        .refine((v) => /^\+?[0-9 ().-]+$/.test(v), PHONE_MESSAGE)
        .refine((v) => {
          const digits = v.replace(/\D/g, "").length;
          return digits >= 7 && digits <= 15;
        }, PHONE_MESSAGE)
        .optional(),
    ),
    bikeYear: z.coerce
      .number({ error: "Enter the bike's model year" })
      .int("Enter the model year as four digits")
      .min(1936, `Enter a model year between 1936 and ${YEAR_MAX}`)
      .max(YEAR_MAX, `Enter a model year between 1936 and ${YEAR_MAX}`),
    engineFamily: z
      .string({ error: "Pick the engine, or “Not sure”" })
      .refine(
        (v) => v === "unsure" || /^[1-9][0-9]{0,9}$/.test(v),
        "Pick the engine, or “Not sure”",
      ),
    bikeModel: line("Tell us the bike's model", 100),
    mileage: z.preprocess(
      blankToUndefined,
      z.coerce
        .number({ error: "Enter the mileage as a number" })
        .int("Enter the mileage as a whole number")
        .min(0, "Enter the mileage as a whole number")
        .max(999_999, "Enter the mileage in miles, under 1,000,000")
        .optional(),
    ),
    currentParts: paragraph(4000)
      .refine(
        (v) => v.split(/\r?\n/).filter((l) => l.trim()).length <= MAX_PART_LINES,
        `List at most ${MAX_PART_LINES} parts, one a line`,
      )
      .refine(
        (v) => v.split(/\r?\n/).every((l) => l.trim().length <= 200),
        "Keep each line under 200 characters",
      ),
    goals: z
      .string({ error: "Tell us what you want the bike to do" })
      .trim()
      .min(10, "Tell us what you want the bike to do, in a sentence or two")
      .max(2000, "Keep it under 2000 characters")
      .refine((v) => !hasControl(v, true), CONTROL_MESSAGE),
    riding: z.preprocess(
      (v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]),
      z.array(z.enum(values(RIDING), { error: "Pick from the list" })).max(RIDING.length),
    ),
    budget: z.enum(values(BUDGETS), { error: "Pick a budget range" }),
    timeFrame: z.enum(values(TIME_FRAMES), { error: "Pick when you want it done" }),
    contactBy: z.enum(values(CONTACT_BY), { error: "Pick how we should contact you" }),
    consent: z.preprocess(
      (v) => v === "on" || v === true,
      z.literal(true, { error: "Tick this so we may contact you about your request" }),
    ),
  })
  .superRefine((v, ctx) => {
    if ((v.contactBy === "phone" || v.contactBy === "text") && !v.phone)
      ctx.addIssue({
        code: "custom",
        path: ["phone"],
        message: "Enter a phone number, or pick e-mail as the way to contact you",
      });
  });

export type BuildRequestInput = z.infer<typeof BuildRequestSchema>;

export function partLines(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
}
