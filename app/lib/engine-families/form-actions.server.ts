// Saving the owner's engine-family form: schema, stock parts of the right category, and a
// name no other family has.
import { parseWithZod } from "@conform-to/zod/v4";
import type { Db } from "../db.server";
import { FamilySchema } from "./family";
import {
  checkStockParts,
  createFamily,
  DuplicateFamilyName,
  updateFamily,
} from "./families.server";

export async function saveFamilyForm(db: Db, formData: FormData, userId: number, id?: number) {
  const submission = parseWithZod(formData, { schema: FamilySchema });
  if (submission.status !== "success") return { ok: false as const, result: submission.reply() };
  const partErrors = await checkStockParts(db, submission.value);
  if (Object.keys(partErrors).length)
    return { ok: false as const, result: submission.reply({ fieldErrors: partErrors }) };
  try {
    const savedId = id
      ? (await updateFamily(db, id, submission.value, userId))?.id
      : await createFamily(db, submission.value, userId);
    return { ok: true as const, id: savedId ?? null, result: submission.reply() };
  } catch (e) {
    if (e instanceof DuplicateFamilyName)
      return {
        ok: false as const,
        result: submission.reply({
          fieldErrors: { name: ["Another engine family already has this name"] },
        }),
      };
    throw e;
  }
}

export async function partOptions(db: Db) {
  const rows = await db
    .selectFrom("parts")
    .select(["id", "part_number", "name", "category"])
    .where("archived_at", "is", null)
    .orderBy("stock", "desc")
    .orderBy("name")
    .execute();
  return rows.map((p) => ({
    value: String(p.id),
    label: `${p.part_number} ${p.name}`,
    category: p.category,
  }));
}
