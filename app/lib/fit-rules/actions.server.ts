import { readForm } from "../http/body";
// The rule forms' server side: the same schema as the browser, then the condition
// checker, the preview and the store. Used by /rules/new and /rules/:id.
import type { SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, redirect } from "react-router";
import { pairCondition, pairSchema, ruleSchema } from "~/components/fit-rules/schema";
import type { SessionUser } from "../auth/auth.server";
import { categoryOptions, listCategories } from "../catalog/parts.server";
import { getDb } from "../db.server";
import {
  checkCondition,
  createRule,
  previewRule,
  updateRule,
  type PreviewResult,
  type RuleFields,
} from "./rules.server";

export type RuleActionData = {
  form: "rule" | "pair";
  result: SubmissionResult<string[]>;
  preview: PreviewResult | null;
  stale?: number;
};

/** The checker's refusal with where it is: "at character n" only when the place is certain. */
export function conditionError(
  check: Extract<ReturnType<typeof checkCondition>, { ok: false }>,
): string {
  const piece = check.fragment
    ? `“${check.fragment.slice(0, 40)}${check.fragment.length > 40 ? "…" : ""}”`
    : "";
  if (check.index !== undefined)
    return `${check.message} (at character ${check.index + 1}${piece ? `: ${piece}` : ""})`;
  return piece ? `${check.message} (in ${piece})` : check.message;
}

export async function handleRuleAction(
  request: Request,
  user: SessionUser,
  existing: { id: number } | null,
) {
  const db = getDb();
  const formData = await readForm(request);
  const intent = String(formData.get("intent") ?? "save");
  const isPair = intent.startsWith("pair-");
  const form = isPair ? "pair" : "rule";
  const categories = (await listCategories(db)).map((c) => c.slug);

  let fields: RuleFields;
  let note = "";
  let version: number | null = null;
  let submission;
  if (isPair) {
    submission = parseWithZod(formData, { schema: pairSchema });
    if (submission.status !== "success")
      return data<RuleActionData>(
        { form, result: submission.reply(), preview: null },
        { status: 400 },
      );
    const v = submission.value;
    fields = {
      name: v.name,
      kind: "conflict",
      condition: pairCondition(v.a, v.b),
      message: v.message,
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    };
    note = `Written with the pair form: ${v.a} with ${v.b}`;
  } else {
    submission = parseWithZod(formData, { schema: ruleSchema });
    if (submission.status !== "success")
      return data<RuleActionData>(
        { form, result: submission.reply(), preview: null },
        { status: 400 },
      );
    const v = submission.value;
    const fieldErrors: Record<string, string[]> = {};
    const check = checkCondition(v.condition);
    if (!check.ok) fieldErrors.condition = [conditionError(check)];
    if (v.kind === "upgrade" && v.upgrade_category && !categories.includes(v.upgrade_category))
      fieldErrors.upgrade_category = ["Choose one of the listed categories"];
    if (v.suggested_part_id) {
      const part = await db
        .selectFrom("parts")
        .select(["id", "category"])
        .where("id", "=", v.suggested_part_id)
        .executeTakeFirst();
      if (!part) fieldErrors.suggested_part_id = ["That part is not on the shelf"];
      else if (v.kind === "upgrade" && part.category !== v.upgrade_category)
        fieldErrors.suggested_part_id = ["The suggested part must be in the upgrade category"];
    }
    if (Object.keys(fieldErrors).length)
      return data<RuleActionData>(
        { form, result: submission.reply({ fieldErrors }), preview: null },
        { status: 400 },
      );
    fields = {
      name: v.name,
      kind: v.kind,
      condition: v.condition,
      message: v.message,
      upgrade_category: v.kind === "upgrade" ? (v.upgrade_category ?? null) : null,
      suggested_part_id: v.suggested_part_id ?? null,
      active: v.active,
    };
    note = v.change_note;
    version = v.version ?? null;
  }

  if (intent.endsWith("preview")) {
    const preview = await previewRule(db, fields, existing?.id ?? null);
    return data<RuleActionData>({ form, result: submission.reply(), preview });
  }

  if (existing) {
    const saved = await updateRule(db, existing.id, fields, version, user.id, note);
    if (!saved.ok) {
      if ("check" in saved)
        return data<RuleActionData>(
          {
            form,
            result: submission.reply({ fieldErrors: { condition: [conditionError(saved.check)] } }),
            preview: null,
          },
          { status: 400 },
        );
      if ("stale" in saved)
        return data<RuleActionData>(
          {
            form,
            result: submission.reply({
              formErrors: [
                `Someone saved this rule (version ${saved.stale}) while you were editing. Your text is kept below; reload to see theirs.`,
              ],
            }),
            preview: null,
            stale: saved.stale,
          },
          { status: 409 },
        );
      throw data("Rule not found", { status: 404 });
    }
    throw redirect(`/rules/${existing.id}?saved=${saved.rule.version}`);
  }
  const made = await createRule(db, fields, user.id, note || "Created");
  if (!made.ok)
    return data<RuleActionData>(
      {
        form,
        result: submission.reply({ fieldErrors: { condition: [conditionError(made.check)] } }),
        preview: null,
      },
      { status: 400 },
    );
  throw redirect(`/rules/${made.rule.id}?saved=1`);
}

/** The categories and parts the rule form offers for upgrades. */
export async function ruleFormOptions() {
  const db = getDb();
  const [categories, parts] = await Promise.all([
    categoryOptions(db),
    db
      .selectFrom("parts")
      .select(["id", "part_number", "name", "category"])
      .where("archived_at", "is", null)
      .orderBy("part_number")
      .execute(),
  ]);
  return {
    categories,
    parts: parts.map((p) => ({
      value: String(p.id),
      label: `${p.part_number} — ${p.name}`,
      category: p.category,
    })),
  };
}
