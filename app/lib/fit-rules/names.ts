// Every name and function a fit-rule condition may use. The condition checker allows
// exactly these, and the rules page prints its reference panel from the same lists.
import { attributeFieldsFor, camelToSnake, unitText } from "../catalog/attributes";
import { NUMBER_NAMES, type NumberName } from "./snapshot";
import { SLOTS } from "../packages/slots";

export type ValueType = "number" | "text" | "boolean";

export type NameDoc = { name: string; type: ValueType; unit?: string; description: string };

const NUMBER_DOCS: Record<NumberName, { unit: string; description: string }> = {
  power_hp: {
    unit: "hp",
    description: "Power of the package (see power_basis for where the figure comes from)",
  },
  torque_nm: { unit: "N·m", description: "Peak torque" },
  rev_limit_rpm: { unit: "rpm", description: "Rev limit" },
  bore_mm: { unit: "mm", description: "Cylinder bore" },
  stroke_mm: { unit: "mm", description: "Stroke" },
  displacement_cc: { unit: "cc", description: "Displacement, both cylinders" },
  displacement_ci: { unit: "ci", description: "Displacement in cubic inches" },
  cr_static: { unit: ":1", description: "Static compression ratio" },
  cr_dynamic: { unit: ":1", description: "Dynamic compression ratio (from intake closing)" },
  piston_speed_mean_ms: { unit: "m/s", description: "Mean piston speed at the rev limit" },
  piston_speed_peak_ms: { unit: "m/s", description: "Peak piston speed at the rev limit" },
  quench_mm: { unit: "mm", description: "Quench (squish) clearance" },
  rod_ratio: { unit: "", description: "Rod length ÷ stroke" },
  deck_mm: { unit: "mm", description: "Deck clearance (+ piston below the deck)" },
  chamber_cc: { unit: "cc", description: "Head chamber volume" },
  dome_cc: { unit: "cc", description: "Piston dome (+) or dish (−) volume" },
  gasket_bore_mm: { unit: "mm", description: "Head gasket bore" },
  gasket_thickness_mm: { unit: "mm", description: "Head gasket compressed thickness" },
  riser_in: { unit: "in", description: "Riser / handlebar rise" },
};

export const TOP_LEVEL_NAMES: readonly NameDoc[] = [
  ...NUMBER_NAMES.map((n) => ({ name: n, type: "number" as const, ...NUMBER_DOCS[n] })),
  {
    name: "power_basis",
    type: "text",
    description: 'Where power_hp comes from: "target", "estimate" or "measured"',
  },
];

export type SlotDoc = { key: string; label: string; category: string; fields: readonly NameDoc[] };

const COMMON_SLOT_FIELDS: readonly NameDoc[] = [
  {
    name: "part_number",
    type: "text",
    description: "The shop's part number of the installed part",
  },
  { name: "stock", type: "boolean", description: "true when the part is what the bike came with" },
];

export const SLOT_OBJECTS: readonly SlotDoc[] = SLOTS.map((s) => {
  const fields: NameDoc[] = attributeFieldsFor(s.category).map((f) => ({
    name: camelToSnake(f.key),
    type: "number",
    unit: unitText(f.unit),
    description: f.label,
  }));
  if (s.category === "cams")
    fields.push({
      name: "lift_mm",
      type: "number",
      unit: "mm",
      description: "The larger of intake and exhaust lift",
    });
  return {
    key: s.key,
    label: s.label,
    category: s.category,
    fields: [...fields, ...COMMON_SLOT_FIELDS],
  };
});

export type FunctionDoc = {
  name: string;
  signature: string;
  returns: ValueType;
  description: string;
  minArgs: number;
  maxArgs: number;
};

export const FUNCTIONS: readonly FunctionDoc[] = [
  {
    name: "has",
    signature: 'has("word")',
    returns: "boolean",
    minArgs: 1,
    maxArgs: 1,
    description: "true when any installed part carries the tag or has the part number",
  },
  {
    name: "filled",
    signature: 'filled("slot")',
    returns: "boolean",
    minArgs: 1,
    maxArgs: 1,
    description: 'true when a part is installed in the slot (e.g. filled("gasket"))',
  },
  {
    name: "known",
    signature: "known(value)",
    returns: "boolean",
    minArgs: 1,
    maxArgs: 1,
    description:
      "true when the value exists in this package (guards a rule against empty slots and missing numbers)",
  },
  {
    name: "min",
    signature: "min(a, b, …)",
    returns: "number",
    minArgs: 1,
    maxArgs: 10,
    description: "The smallest of the numbers",
  },
  {
    name: "max",
    signature: "max(a, b, …)",
    returns: "number",
    minArgs: 1,
    maxArgs: 10,
    description: "The largest of the numbers",
  },
  {
    name: "abs",
    signature: "abs(x)",
    returns: "number",
    minArgs: 1,
    maxArgs: 1,
    description: "Absolute value",
  },
  {
    name: "round",
    signature: "round(x, digits?)",
    returns: "number",
    minArgs: 1,
    maxArgs: 2,
    description: "Rounded to 0–6 decimal places",
  },
  {
    name: "floor",
    signature: "floor(x)",
    returns: "number",
    minArgs: 1,
    maxArgs: 1,
    description: "Rounded down",
  },
  {
    name: "ceil",
    signature: "ceil(x)",
    returns: "number",
    minArgs: 1,
    maxArgs: 1,
    description: "Rounded up",
  },
  {
    name: "sqrt",
    signature: "sqrt(x)",
    returns: "number",
    minArgs: 1,
    maxArgs: 1,
    description: "Square root (x ≥ 0)",
  },
];

export const OPERATORS_DOC: readonly { text: string; description: string }[] = [
  { text: "+  -  *  /  %", description: "arithmetic on numbers (% is the remainder)" },
  { text: "x ^ n", description: "power, with n a plain number between -10 and 10" },
  {
    text: "<  <=  >  >=  ==  !=",
    description: "comparisons (== and != also compare text and true/false)",
  },
  { text: "and  or  not", description: "combine true/false; and / or stop at the first answer" },
  { text: "a ? b : c", description: "b when a is true, else c" },
  { text: '"text"', description: "text in double or single quotes" },
];

export const TOP_LEVEL_BY_NAME: ReadonlyMap<string, NameDoc> = new Map(
  TOP_LEVEL_NAMES.map((n) => [n.name, n]),
);
export const SLOT_BY_NAME: ReadonlyMap<string, SlotDoc> = new Map(
  SLOT_OBJECTS.map((s) => [s.key, s]),
);
export const FUNCTION_BY_NAME: ReadonlyMap<string, FunctionDoc> = new Map(
  FUNCTIONS.map((f) => [f.name, f]),
);
