// The quote page's forms, checked the same way in the browser and on the server.
import { z } from "zod";
import { parseHundredths, parsePercentBasisPoints, type Adjustment } from "./money";

// eslint-disable-next-line no-control-regex -- the point is to refuse control characters
export const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;

const text = (label: string, max: number) =>
  z
    .string({ error: `Enter the ${label}.` })
    .trim()
    .min(1, `Enter the ${label}.`)
    .max(max, `The ${label} can be at most ${max} characters.`)
    .refine((s) => !CONTROL.test(s), `The ${label} contains characters that cannot be stored.`);

const amount = (label: string) =>
  z
    .string({ error: `Enter the ${label}.` })
    .trim()
    .transform((s, ctx) => {
      const v = parseHundredths(s);
      if (v === null || v > 100_000_000) {
        ctx.addIssue({
          code: "custom",
          message: `Enter the ${label} in dollars and cents, e.g. 185.00 (at most 1,000,000).`,
        });
        return z.NEVER;
      }
      return v;
    });

export const AddLineSchema = z.object({
  intent: z.literal("add-line"),
  kind: z.enum(["machine", "other"], { error: "Choose machine work or another line." }),
  description: text("description", 200),
  quantity: z
    .string({ error: "Enter the quantity." })
    .trim()
    .transform((s, ctx) => {
      const v = parseHundredths(s);
      if (v === null || v <= 0 || v > 100_000_000) {
        ctx.addIssue({
          code: "custom",
          message: "Enter a quantity above 0 with at most two decimals, e.g. 1 or 2.5.",
        });
        return z.NEVER;
      }
      return v;
    }),
  unit: amount("price"),
  taxable: z
    .string()
    .optional()
    .transform((v) => v === "on"),
});

export const TermsSchema = z
  .object({
    intent: z.literal("terms"),
    discountKind: z.enum(["none", "percent", "fixed"], {
      error: "Choose how the discount is given.",
    }),
    discountValue: z.string().trim().max(20).optional().default(""),
    depositKind: z.enum(["shop", "percent", "fixed"], { error: "Choose the deposit." }),
    depositValue: z.string().trim().max(20).optional().default(""),
    note: z
      .string()
      .max(2000, "The note can be at most 2,000 characters.")
      .optional()
      .default("")
      .refine(
        (s) => !CONTROL.test(s.replace(/[\r\n\t]/g, "")),
        "The note contains characters that cannot be stored.",
      ),
  })
  .transform((v, ctx) => {
    const adj = (kind: string, value: string, field: string, what: string): Adjustment | null => {
      if (kind === "percent") {
        const bp = parsePercentBasisPoints(value);
        if (bp === null) {
          ctx.addIssue({
            code: "custom",
            path: [field],
            message: `Enter the ${what} as a percentage from 0 to 100, e.g. 10 or 12.5.`,
          });
          return null;
        }
        return { kind: "percent", basisPoints: bp };
      }
      if (kind === "fixed") {
        const cents = parseHundredths(value);
        if (cents === null || cents > 100_000_000) {
          ctx.addIssue({
            code: "custom",
            path: [field],
            message: `Enter the ${what} in dollars and cents, e.g. 250.00.`,
          });
          return null;
        }
        return { kind: "fixed", cents };
      }
      return null;
    };
    const discount =
      v.discountKind === "none"
        ? ({ kind: "none" } as const)
        : adj(v.discountKind, v.discountValue, "discountValue", "discount");
    const deposit =
      v.depositKind === "shop"
        ? null
        : adj(v.depositKind, v.depositValue, "depositValue", "deposit");
    return { discount: discount ?? { kind: "none" as const }, deposit, note: v.note.trim() };
  });

export const RemoveLineSchema = z.object({
  intent: z.literal("remove-line"),
  index: z.coerce.number().int().min(0).max(199),
});

/** "12.50" for 1250 cents, for putting a value back in a box */
export function centsToInput(cents: number): string {
  return `${Math.floor(cents / 100)}.${String(cents % 100).padStart(2, "0")}`;
}
