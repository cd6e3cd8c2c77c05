// Parses one posted bench action with Zod. Values typed in inches arrive with
// unit=in and are stored in mm; every refusal names the field it belongs beside.
import { z } from "zod";
import { inToMm } from "../../../calc";
import { SLOT_BY_KEY } from "../packages/slots";
import { parseId, zId } from "../http/ids";
import { hasOwnKey } from "../http/keys";
import { FIELD_SLOT, MEASURED_FIELDS, type BenchIntent, type MeasuredField } from "./spec";

/** Sensible bounds for a typed value, in stored units, with the reason shown when outside. */
const BOUNDS: Record<
  MeasuredField | "deckClearanceMm" | "revLimitRpm" | "powerHp",
  { min: number; max: number; why: string }
> = {
  boreMm: { min: 50, max: 140, why: "a V-twin bore is between 50 and 140 mm" },
  strokeMm: { min: 50, max: 160, why: "a V-twin stroke is between 50 and 160 mm" },
  pistonDomeCc: { min: -60, max: 60, why: "a dome or dish is between −60 and +60 cc" },
  chamberCc: { min: 20, max: 200, why: "a chamber is between 20 and 200 cc" },
  gasketBoreMm: { min: 50, max: 145, why: "a gasket bore is between 50 and 145 mm" },
  gasketThicknessMm: { min: 0.1, max: 5, why: "a compressed gasket is between 0.1 and 5 mm thick" },
  intakeClosesAbdcDeg: { min: 0, max: 179.9, why: "intake closing is 0 to under 180° after BDC" },
  rodLengthMm: { min: 40, max: 300, why: "a rod is between 40 and 300 mm centre to centre" },
  deckClearanceMm: {
    min: -3,
    max: 5,
    why: "deck clearance is between −3 mm (above the deck) and 5 mm",
  },
  revLimitRpm: { min: 1000, max: 12000, why: "a rev limit is between 1,000 and 12,000 rpm" },
  powerHp: { min: 1, max: 1000, why: "power is between 1 and 1,000 hp" },
};

const LENGTH_FIELDS = new Set([
  "boreMm",
  "strokeMm",
  "gasketBoreMm",
  "gasketThicknessMm",
  "rodLengthMm",
  "deckClearanceMm",
]);

const NOT_A_NUMBER = "Enter a number, e.g. 4.125 or 104.8";

function numberField() {
  return z
    .string({ error: NOT_A_NUMBER })
    .trim()
    .min(1, "Enter a value, or use “Back to nominal”")
    .transform((s) => s.replace(",", "."))
    .pipe(z.string().regex(/^[-+−]?\d*\.?\d+$/, NOT_A_NUMBER))
    .transform((s) => Number(s.replace("−", "-")));
}

function checkBounds(field: keyof typeof BOUNDS, mm: number): string | null {
  const b = BOUNDS[field];
  if (!Number.isFinite(mm)) return NOT_A_NUMBER;
  if (mm < 0 && b.min >= 0) return "Cannot be negative";
  if (mm < b.min || mm > b.max) return `Out of range: ${b.why}`;
  return null;
}

/** The units a typed value of this field may come in (lengths in mm or inches). */
function unitsOf(field: string): readonly string[] {
  if (LENGTH_FIELDS.has(field)) return ["mm", "in"];
  if (field.endsWith("Cc")) return ["cc"];
  if (field === "intakeClosesAbdcDeg") return ["deg"];
  if (field === "revLimitRpm") return ["rpm"];
  if (field === "powerHp") return ["hp"];
  return [];
}

const UNKNOWN_SLOT = "That slot is not on the bench; reload the page.";
const UNKNOWN_FIELD = "That value is not one the bench keeps; reload the page.";
const UNKNOWN_UNIT = "Pick the unit from the bench (mm, in, cc, °, rpm or hp).";
const UNKNOWN_INTENT = "The bench did not understand that change; reload the page and try again.";
const PICK_A_PART = "Pick a part from the list";
const UNKNOWN_BASIS = "Pick target or estimate for the power figure.";
const NO_REVISION = "The bench did not say which revision it was based on; reload the page.";
export const ONLY_SPACES =
  "Only spaces: enter a number, or empty the box completely to clear the value.";

const slotKey = z
  .string({ error: UNKNOWN_SLOT })
  .refine((k) => hasOwnKey(SLOT_BY_KEY, k), UNKNOWN_SLOT);
const unit = z.enum(["mm", "in", "cc", "deg", "rpm", "hp"], { error: UNKNOWN_UNIT }).optional();
const measuredField = z.enum(MEASURED_FIELDS as [MeasuredField, ...MeasuredField[]], {
  error: UNKNOWN_FIELD,
});
const benchValue = z.string({ error: NOT_A_NUMBER });

const IntentSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({
      intent: z.literal("set-part"),
      slot: slotKey,
      partId: zId(PICK_A_PART),
    }),
    z.object({ intent: z.literal("clear-slot"), slot: slotKey }),
    z.object({
      intent: z.literal("set-measured"),
      slot: slotKey,
      field: measuredField,
      value: benchValue,
      unit,
    }),
    z.object({
      intent: z.literal("revert-measured"),
      slot: slotKey,
      field: measuredField,
    }),
    z.object({
      intent: z.literal("set-number"),
      field: z.enum(["deckClearanceMm", "revLimitRpm", "powerHp"], { error: UNKNOWN_FIELD }),
      value: benchValue,
      unit,
    }),
    z.object({
      intent: z.literal("set-basis"),
      value: z.enum(["target", "estimate", ""], { error: UNKNOWN_BASIS }),
    }),
  ],
  { error: UNKNOWN_INTENT },
);

const INTENTS = new Set([
  "set-part",
  "clear-slot",
  "set-measured",
  "revert-measured",
  "set-number",
  "set-basis",
]);
const NUMBER_FIELDS = new Set(["deckClearanceMm", "revLimitRpm", "powerHp"]);
const MEASURED = new Set<string>(MEASURED_FIELDS);

/**
 * Where a refusal of a post that did not parse is shown: beside the field when the post
 * names a real slot and field of the bench, else the form's own message.
 */
function refusalKey(raw: Record<string, string>): string {
  const intent = raw.intent ?? "";
  if (!INTENTS.has(intent)) return "form";
  const slot = hasOwnKey(SLOT_BY_KEY, raw.slot) ? raw.slot : null;
  if (intent === "set-measured" || intent === "revert-measured")
    return slot && MEASURED.has(raw.field ?? "") ? `${slot}.${raw.field}` : "form";
  if (intent === "set-part" || intent === "clear-slot") return slot ?? "form";
  if (intent === "set-number") return NUMBER_FIELDS.has(raw.field ?? "") ? raw.field! : "form";
  return "form";
}

export type IntentErrors = Record<string, string[]>;

export type ParsedIntent =
  | { ok: true; action: BenchIntent; expectedRevision: number }
  | { ok: false; errors: IntentErrors; expectedRevision: number | null };

/** Error key for a field: `slot.field` for measured values, the field name for package numbers. */
export function errorKey(action: { intent: string; slot?: string; field?: string }): string {
  if (action.intent === "set-measured" || action.intent === "revert-measured")
    return `${action.slot}.${action.field}`;
  if (action.intent === "set-part" || action.intent === "clear-slot") return `${action.slot}`;
  return action.field ?? "form";
}

export function parseBenchIntent(form: FormData): ParsedIntent {
  // own entries only, and only text: a name like `__proto__` is just an unknown field
  const raw: Record<string, string> = Object.create(null);
  for (const [k, v] of form.entries()) if (!(k in raw)) raw[k] = typeof v === "string" ? v : "";
  const expectedRevision = parseId(raw.expectedRevision);
  const parsed = IntentSchema.safeParse({ ...raw });
  if (!parsed.success) {
    const key = refusalKey(raw);
    const messages = [...new Set(parsed.error.issues.map((i) => i.message))];
    return {
      ok: false,
      errors: { [key]: messages.length ? messages : [UNKNOWN_INTENT] },
      expectedRevision,
    };
  }
  if (expectedRevision === null)
    return {
      ok: false,
      errors: { form: [NO_REVISION] },
      expectedRevision,
    };
  const a = parsed.data;
  if (a.intent === "set-measured" || a.intent === "set-number") {
    const key = errorKey(a);
    if (a.intent === "set-measured" && FIELD_SLOT[a.field] !== a.slot) {
      return {
        ok: false,
        errors: { [key]: ["That value does not belong to this slot"] },
        expectedRevision,
      };
    }
    // a package number empties by an empty box; a measured value has no empty state (it
    // goes back to nominal by its own command), so its spaces get the measured message below
    if (a.intent === "set-number" && a.value !== "" && a.value.trim() === "")
      return { ok: false, errors: { [key]: [ONLY_SPACES] }, expectedRevision };
    if (a.intent === "set-number" && a.value === "") {
      return {
        ok: true,
        action: { intent: "set-number", field: a.field, value: null },
        expectedRevision,
      };
    }
    if (a.unit !== undefined && !unitsOf(a.field).includes(a.unit))
      return {
        ok: false,
        errors: { [key]: [`This value is in ${unitsOf(a.field).join(" or ")}, not ${a.unit}`] },
        expectedRevision,
      };
    const num = numberField().safeParse(a.value);
    if (!num.success)
      return {
        ok: false,
        errors: { [key]: [num.error.issues[0]?.message ?? NOT_A_NUMBER] },
        expectedRevision,
      };
    const stored = a.unit === "in" && LENGTH_FIELDS.has(a.field) ? inToMm(num.data) : num.data;
    const problem = checkBounds(a.field, stored);
    if (problem) return { ok: false, errors: { [key]: [problem] }, expectedRevision };
    if (
      a.intent === "set-number" &&
      a.field === "revLimitRpm" &&
      !Number.isInteger(Math.round(stored))
    ) {
      return { ok: false, errors: { [key]: [NOT_A_NUMBER] }, expectedRevision };
    }
    const value =
      a.intent === "set-number" && a.field === "revLimitRpm" ? Math.round(stored) : stored;
    return a.intent === "set-measured"
      ? {
          ok: true,
          action: { intent: "set-measured", slot: a.slot, field: a.field, value },
          expectedRevision,
        }
      : { ok: true, action: { intent: "set-number", field: a.field, value }, expectedRevision };
  }
  if (a.intent === "set-basis")
    return {
      ok: true,
      action: { intent: "set-basis", value: a.value === "" ? null : a.value },
      expectedRevision,
    };
  return { ok: true, action: a as BenchIntent, expectedRevision };
}
