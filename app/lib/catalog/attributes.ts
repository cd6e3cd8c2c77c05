// The attributes each built-in part category carries, one Zod schema per category.
// Shared by the part form (browser), the server actions, the CSV import and the fit
// rules' reference of names. Shop-added categories carry no attributes.
import { z } from "zod";

export type AttributeField = {
  /** camelCase key stored in parts.attributes */
  key: string;
  label: string;
  unit: "mm" | "cc" | "deg" | "in" | "hp" | "N·m";
  min: number;
  max: number;
  required: boolean;
  /** shown under the field */
  hint?: string;
};

const bore = (label = "Bore"): AttributeField => ({
  key: "boreMm",
  label,
  unit: "mm",
  min: 50,
  max: 130,
  required: true,
});
const ratedHp: AttributeField = {
  key: "ratedHp",
  label: "Rated power",
  unit: "hp",
  min: 1,
  max: 400,
  required: false,
  hint: "The maker's rating, if it gives one",
};
const ratedTorque: AttributeField = {
  key: "ratedTorqueNm",
  label: "Rated torque",
  unit: "N·m",
  min: 1,
  max: 600,
  required: false,
  hint: "The maker's rating, if it gives one",
};

export const ATTRIBUTE_FIELDS: Record<string, readonly AttributeField[]> = {
  cylinders: [bore()],
  flywheels: [{ key: "strokeMm", label: "Stroke", unit: "mm", min: 60, max: 150, required: true }],
  rods: [
    {
      key: "lengthMm",
      label: "Length, centre to centre",
      unit: "mm",
      min: 100,
      max: 250,
      required: true,
    },
  ],
  pistons: [
    {
      key: "domeCc",
      label: "Dome volume",
      unit: "cc",
      min: -40,
      max: 40,
      required: true,
      hint: "+ for a dome, − for a dish or valve reliefs",
    },
    {
      key: "compressionHeightMm",
      label: "Compression height",
      unit: "mm",
      min: 20,
      max: 60,
      required: false,
    },
    { key: "forBoreMm", label: "For bore", unit: "mm", min: 50, max: 130, required: true },
  ],
  heads: [
    { key: "chamberCc", label: "Chamber volume", unit: "cc", min: 40, max: 150, required: true },
    { key: "intakeValveMm", label: "Intake valve", unit: "mm", min: 25, max: 65, required: false },
    {
      key: "exhaustValveMm",
      label: "Exhaust valve",
      unit: "mm",
      min: 20,
      max: 60,
      required: false,
    },
  ],
  head_gaskets: [
    { ...bore("Gasket bore"), max: 135 },
    {
      key: "compressedThicknessMm",
      label: "Compressed thickness",
      unit: "mm",
      min: 0.3,
      max: 3,
      required: true,
    },
  ],
  cams: [
    {
      key: "intakeClosesAbdcDeg",
      label: "Intake closes",
      unit: "deg",
      min: 0,
      max: 90,
      required: true,
      hint: "Degrees after BDC, as the cam card gives it",
    },
    { key: "intakeLiftMm", label: "Intake lift", unit: "mm", min: 5, max: 20, required: true },
    { key: "exhaustLiftMm", label: "Exhaust lift", unit: "mm", min: 5, max: 20, required: true },
    {
      key: "intakeDurationDeg",
      label: "Intake duration",
      unit: "deg",
      min: 150,
      max: 330,
      required: false,
    },
    {
      key: "timingAtLiftMm",
      label: "Timing given at lift",
      unit: "mm",
      min: 0.1,
      max: 2,
      required: true,
      hint: "0.053 in = 1.346 mm; 0.050 in = 1.27 mm",
    },
  ],
  valve_springs: [
    {
      key: "maxLiftMm",
      label: "Rated for lift up to",
      unit: "mm",
      min: 8,
      max: 25,
      required: true,
    },
  ],
  axle_adjusters: [ratedHp, ratedTorque],
  clutch_lines: [
    ratedHp,
    ratedTorque,
    { key: "lengthIn", label: "Length", unit: "in", min: 20, max: 100, required: false },
  ],
  brake_lines: [
    { key: "lengthIn", label: "Length", unit: "in", min: 5, max: 100, required: false },
  ],
  risers: [{ key: "heightIn", label: "Rise", unit: "in", min: 0.5, max: 24, required: true }],
};

export function attributeFieldsFor(category: string): readonly AttributeField[] {
  return Object.hasOwn(ATTRIBUTE_FIELDS, category) ? ATTRIBUTE_FIELDS[category]! : [];
}

const UNIT_WORDS: Record<AttributeField["unit"], string> = {
  mm: "mm",
  cc: "cc",
  deg: "°",
  in: "in",
  hp: "hp",
  "N·m": "N·m",
};

export function unitText(unit: AttributeField["unit"]): string {
  return UNIT_WORDS[unit];
}

function rangeMessage(f: AttributeField): string {
  return `${f.label} must be between ${f.min} and ${f.max} ${unitText(f.unit)}`;
}

function fieldSchema(f: AttributeField) {
  const n = z
    .number({
      error: (issue) =>
        issue.input === undefined
          ? `Enter the ${f.label.toLowerCase()} in ${unitText(f.unit)}`
          : `${f.label} must be a number`,
    })
    .refine(Number.isFinite, { message: `${f.label} must be a number` })
    .refine((v) => v >= f.min && v <= f.max, { message: rangeMessage(f) });
  return f.required ? n : n.optional();
}

const schemaCache = new Map<string, z.ZodType<Record<string, number | undefined>>>();

/** The Zod schema of one category's attributes (an empty strict object for categories without any). */
export function attributeSchemaFor(
  category: string,
): z.ZodType<Record<string, number | undefined>> {
  let s = schemaCache.get(category);
  if (!s) {
    const shape = Object.fromEntries(
      attributeFieldsFor(category).map((f) => [f.key, fieldSchema(f)]),
    );
    s = z.object(shape).strict() as unknown as z.ZodType<Record<string, number | undefined>>;
    schemaCache.set(category, s);
  }
  return s;
}

/** Drops undefined values so the stored JSON holds only what was given. */
export function cleanAttributes(
  a: Record<string, number | undefined> | undefined,
): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(a ?? {})) if (typeof v === "number") out[k] = v;
  return out;
}

export function camelToSnake(key: string): string {
  return key.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
}

export function snakeToCamel(key: string): string {
  return key.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());
}

export const TAG_PATTERN = /^[a-z0-9][a-z0-9-]{0,47}$/;
export const PART_NUMBER_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._/-]{0,39}$/;

/** Free words from a text box or CSV cell ("a, b | c d") → lower-case tags. */
export function splitTags(text: string | undefined | null): string[] {
  return [
    ...new Set(
      (text ?? "")
        .split(/[\s,|;]+/)
        .map((t) => t.trim().toLowerCase())
        .filter(Boolean),
    ),
  ];
}

/** The part form (and CSV row) for one category; categories lists the slugs that exist. */
export function partSchemaFor(category: string, categories: readonly string[]) {
  return z.object({
    part_number: z
      .string({ error: "Enter the shop's part number" })
      .trim()
      .regex(
        PART_NUMBER_PATTERN,
        "Part numbers are 1–40 letters, digits and . _ / -, starting with a letter or digit",
      ),
    category: z
      .string({ error: "Choose a category" })
      .refine((c) => categories.includes(c), "Choose one of the listed categories"),
    maker: z
      .string({ error: "Enter the maker" })
      .trim()
      .min(1, "Enter the maker")
      .max(80, "Keep the maker under 80 characters"),
    name: z
      .string({ error: "Enter a name" })
      .trim()
      .min(1, "Enter a name")
      .max(120, "Keep the name under 120 characters"),
    price: z
      .number({
        error: (i) =>
          i.input === undefined
            ? "Enter the price in dollars (0 for none)"
            : "Price must be a number",
      })
      .min(0, "Price cannot be negative")
      .max(100_000, "Price must be under $100,000"),
    labour_hours: z
      .number({ error: "Labour hours must be a number" })
      .min(0, "Labour hours cannot be negative")
      .max(200, "Labour hours must be 200 or fewer")
      .default(0),
    tags: z
      .string()
      .optional()
      .transform((t) => splitTags(t))
      .superRefine((tags, ctx) => {
        const bad = tags.find((t) => !TAG_PATTERN.test(t));
        if (bad)
          ctx.addIssue({
            code: "custom",
            message: `"${bad.slice(0, 50)}" is not a tag: use lower-case letters, digits and dashes (up to 48)`,
          });
        if (tags.length > 20) ctx.addIssue({ code: "custom", message: "Up to 20 tags per part" });
      }),
    stock: z.boolean().default(false),
    notes: z.string().trim().max(2000, "Keep notes under 2000 characters").default(""),
    attributes: attributeSchemaFor(category).optional().default({}),
  });
}

export type PartInput = z.output<ReturnType<typeof partSchemaFor>>;
