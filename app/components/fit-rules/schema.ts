// The rule forms' schemas, shared by the browser (Conform) and the actions. The
// condition's allow-list check runs on the server only (its parser stays off the bundle).
import { z } from "zod";
import { RULE_KINDS } from "../../../db/schema/catalog";

export const ruleSchema = z
  .object({
    name: z
      .string({ error: "Give the rule a name" })
      .trim()
      .min(1, "Give the rule a name")
      .max(120, "Keep the name under 120 characters"),
    kind: z.enum(RULE_KINDS, { error: "Choose conflict, upgrade or caution" }),
    condition: z
      .string({ error: "Write a condition" })
      .trim()
      .min(1, "Write a condition")
      .max(2000, "The condition is longer than 2000 characters"),
    message: z
      .string({ error: "Write what the staff should be told" })
      .trim()
      .min(1, "Write what the staff should be told")
      .max(1000, "Keep the message under 1000 characters"),
    upgrade_category: z.string().optional(),
    suggested_part_id: z
      .number({ error: "Choose a part from the list" })
      .int()
      .positive()
      .optional(),
    active: z.boolean().default(false),
    change_note: z.string().trim().max(300, "Keep the note under 300 characters").default(""),
    version: z.number().int().positive().optional(),
  })
  .superRefine((r, ctx) => {
    if (r.kind === "upgrade" && !r.upgrade_category)
      ctx.addIssue({
        code: "custom",
        path: ["upgrade_category"],
        message: "An upgrade rule names the category that must be upgraded",
      });
  });

export type RuleInput = z.output<typeof ruleSchema>;

const WORD = /^[A-Za-z0-9][A-Za-z0-9._/-]{0,47}$/;

/** "Part or tag A does not go with part or tag B": written as has("A") and has("B"). */
export const pairSchema = z.object({
  name: z.string({ error: "Give the rule a name" }).trim().min(1, "Give the rule a name").max(120),
  a: z
    .string({ error: "Enter a part number or tag" })
    .trim()
    .regex(WORD, "A part number or tag: letters, digits and . _ / - only"),
  b: z
    .string({ error: "Enter a part number or tag" })
    .trim()
    .regex(WORD, "A part number or tag: letters, digits and . _ / - only"),
  message: z
    .string({ error: "Write what the staff should be told" })
    .trim()
    .min(1, "Write what the staff should be told")
    .max(1000),
});

export function pairCondition(a: string, b: string): string {
  return `has("${a.toLowerCase()}") and has("${b.toLowerCase()}")`;
}
