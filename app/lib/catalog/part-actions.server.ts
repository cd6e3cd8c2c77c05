// The part form's server side: the category's schema, the unique part number, the store.
import type { SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, redirect } from "react-router";
import type { SessionUser } from "../auth/auth.server";
import {
  createPart,
  getPartByNumber,
  listCategories,
  setArchived,
  updatePart,
} from "./parts.server";
import { getDb } from "../db.server";
import { partSchemaFor } from "./attributes";

export type PartActionData = { result: SubmissionResult<string[]> };

export async function handlePartSave(
  formData: FormData,
  user: SessionUser,
  existingId: number | null,
) {
  const db = getDb();
  const slugs = (await listCategories(db)).map((c) => c.slug);
  const submission = parseWithZod(formData, {
    schema: partSchemaFor(String(formData.get("category") ?? ""), slugs),
  });
  if (submission.status !== "success")
    return data<PartActionData>({ result: submission.reply() }, { status: 400 });
  const v = submission.value;
  const clash = await getPartByNumber(db, v.part_number);
  if (clash && clash.id !== existingId) {
    return data<PartActionData>(
      {
        result: submission.reply({
          fieldErrors: {
            part_number: [`${clash.part_number} is already on the shelf (${clash.name})`],
          },
        }),
      },
      { status: 400 },
    );
  }
  if (existingId === null) {
    const part = await db.transaction().execute((trx) => createPart(trx, v, user.id));
    throw redirect(`/parts/${part.id}?saved=1`);
  }
  const version = Number(formData.get("version")) || null;
  const part = await db
    .transaction()
    .execute((trx) => updatePart(trx, existingId, v, version, user.id));
  if (!part) {
    return data<PartActionData>(
      {
        result: submission.reply({
          formErrors: [
            "Someone saved this part while you were editing. Your values are kept; reload to see theirs.",
          ],
        }),
      },
      { status: 409 },
    );
  }
  throw redirect(`/parts/${part.id}?saved=${part.version}`);
}

export async function handleArchive(id: number, archived: boolean, user: SessionUser) {
  const db = getDb();
  await db.transaction().execute((trx) => setArchived(trx, id, archived, user.id));
  throw redirect(`/parts/${id}`);
}
