// Revisions, shared by the browser and the server: how a revision or a single edit is
// named in a link ("r3", "e17"), the note's schema, and the words for why one closed.
import { z } from "zod";
import type { CloseReason } from "../../../db/schema/packages";

export type StatePick = { kind: "revision" | "edit"; number: number };

/** "r3" or a plain "3" is revision 3, "e17" the state right after edit 17; else null. */
export function parsePick(raw: string | null | undefined): StatePick | null {
  const m = /^(r|e)?([1-9][0-9]{0,8})$/.exec(raw ?? "");
  if (!m) return null;
  return { kind: m[1] === "e" ? "edit" : "revision", number: Number(m[2]) };
}

export const pickKey = (p: StatePick) => `${p.kind === "edit" ? "e" : "r"}${p.number}`;

export const MAX_NOTE_LENGTH = 200;

export const RevisionNoteSchema = z.object({
  note: z
    .string({ error: "Write a short note saying why" })
    .trim()
    .min(1, "Write a short note saying why")
    .max(MAX_NOTE_LENGTH, `At most ${MAX_NOTE_LENGTH} characters`)
    .refine(
      // eslint-disable-next-line no-control-regex -- control characters are what is refused
      (s) => !/[\u0000-\u001f\u007f]/.test(s),
      "Line breaks and control characters are not kept",
    ),
  expectedVersion: z.coerce.number().int().positive(),
});

export const CLOSE_REASON_TEXT: Record<CloseReason, string> = {
  saved: "saved",
  started: "starting point",
  note: "closed with a note",
  other_editor: "closed when someone else started editing",
  status: "closed by a status change",
  quiet: "closed after the quiet period",
};
