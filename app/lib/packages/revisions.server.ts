// A package's revisions with the edits each holds, compare and restore on any revision or
// single edit, and closing the open revision with a note. Writes: revisions-log.server.ts.
import { parseWithZod } from "@conform-to/zod/v4";
import { data } from "react-router";
import type { Db } from "../db.server";
import type { CloseReason } from "../../../db/schema/packages";
import {
  diffSpecs,
  normaliseSpec,
  storedComputation,
  type BenchComputation,
  type BenchFinding,
  type BenchSpec,
} from "../bench/spec";
import {
  evaluateSpec,
  loadParts,
  partIds,
  partLabel,
  readFindings,
  RESULT_ROWS,
  saveEdit,
  type SaveOutcome,
} from "./store.server";
import { clock, closeOpenRevision, quietMinutes } from "./revisions-log.server";
import { MAX_NOTE_LENGTH, RevisionNoteSchema, type StatePick } from "./revisions";

export interface EditSummary {
  version: number;
  change: string;
  by: string | null;
  at: string;
}

export interface RevisionSummary {
  revision: number;
  /** the builder's note, when closed with one */
  note: string | null;
  /** the first edit's line, or what a save of the time before named revisions changed */
  change: string;
  /** whose edits it holds */
  editor: string | null;
  openedAt: string;
  /** null while open */
  closedAt: string | null;
  closeReason: CloseReason | null;
  closedBy: string | null;
  /** while open: when the quiet period closes it, unless it is edited again */
  quietAt: string | null;
  findings: number;
  conflicts: number;
  /** newest first */
  edits: EditSummary[];
  /** the working copy's version at its last edit (what compare and restore name) */
  lastVersion: number;
}

type RefList = { kind: string; error?: string }[];

/**
 * Revisions newest first, each with its edits folded under it. An open revision whose
 * quiet period has passed is shown closed as the next write will close it.
 */
export async function listRevisions(db: Db, packageId: number): Promise<RevisionSummary[]> {
  const [revs, edits, pkg, quiet] = await Promise.all([
    db
      .selectFrom("package_revisions as r")
      .leftJoin("users as u", "u.id", "r.saved_by")
      .leftJoin("users as c", "c.id", "r.closed_by")
      .select([
        "r.revision",
        "r.note",
        "r.change",
        "r.opened_at",
        "r.closed_at",
        "r.close_reason",
        "r.findings",
        "u.name as editor",
        "c.name as closed_by_name",
      ])
      .where("r.package_id", "=", packageId)
      .orderBy("r.revision", "desc")
      .execute(),
    db
      .selectFrom("package_edits as e")
      .leftJoin("users as u", "u.id", "e.user_id")
      .select(["e.version", "e.revision", "e.change", "e.at", "u.name"])
      .where("e.package_id", "=", packageId)
      .orderBy("e.version", "desc")
      .execute(),
    db.selectFrom("packages").select(["findings"]).where("id", "=", packageId).executeTakeFirst(),
    quietMinutes(db),
  ]);
  const byRevision = new Map<number, EditSummary[]>();
  for (const e of edits) {
    const list = byRevision.get(e.revision) ?? [];
    list.push({
      version: e.version,
      change: e.change,
      by: e.name,
      at: new Date(e.at).toISOString(),
    });
    byRevision.set(e.revision, list);
  }
  const now = clock.now().getTime();
  return revs.map((r) => {
    const list = byRevision.get(r.revision) ?? [];
    const f = ((r.closed_at ? r.findings : pkg?.findings) as RefList | null) ?? [];
    const lastAt = list[0] ? new Date(list[0].at).getTime() : null;
    const quietEnd = lastAt === null ? null : lastAt + quiet * 60_000;
    const goneQuiet = !r.closed_at && quietEnd !== null && quietEnd <= now;
    return {
      revision: r.revision,
      note: r.note,
      change: r.change,
      editor: r.editor,
      openedAt: new Date(r.opened_at).toISOString(),
      closedAt: r.closed_at
        ? new Date(r.closed_at).toISOString()
        : goneQuiet
          ? new Date(quietEnd!).toISOString()
          : null,
      closeReason: r.close_reason ?? (goneQuiet ? "quiet" : null),
      closedBy: r.closed_by_name,
      quietAt:
        !r.closed_at && !goneQuiet && quietEnd !== null ? new Date(quietEnd).toISOString() : null,
      findings: f.length,
      conflicts: f.filter((x) => x.kind === "conflict").length,
      edits: list,
      lastVersion: list[0]?.version ?? 0,
    };
  });
}

export interface PackageState {
  pick: StatePick;
  label: string;
  spec: BenchSpec;
  computation: BenchComputation;
  findings: BenchFinding[];
  /** for a single edit: figures recomputed by calc/ and findings by the fit rules active now */
  recomputed: boolean;
}

/**
 * The package as it stood at a revision (its content when closed, the working copy while
 * open) or right after a single edit (its spec, recomputed).
 */
export async function getState(
  db: Db,
  packageId: number,
  pick: StatePick,
): Promise<PackageState | null> {
  if (pick.kind === "revision") {
    const r = await db
      .selectFrom("package_revisions as r")
      .innerJoin("packages as p", "p.id", "r.package_id")
      .select([
        "r.closed_at",
        "r.spec",
        "r.results",
        "r.findings",
        "p.spec as wc_spec",
        "p.results as wc_results",
        "p.findings as wc_findings",
      ])
      .where("r.package_id", "=", packageId)
      .where("r.revision", "=", pick.number)
      .executeTakeFirst();
    if (!r) return null;
    const open = r.closed_at === null;
    return {
      pick,
      label: `revision ${pick.number}`,
      spec: normaliseSpec(open ? r.wc_spec : r.spec),
      computation: storedComputation(open ? r.wc_results : r.results),
      findings: await readFindings(db, open ? r.wc_findings : r.findings),
      recomputed: false,
    };
  }
  const e = await db
    .selectFrom("package_edits")
    .select(["spec", "revision"])
    .where("package_id", "=", packageId)
    .where("version", "=", pick.number)
    .executeTakeFirst();
  if (!e) return null;
  const ev = await evaluateSpec(db, e.spec, false);
  return {
    pick,
    label: `edit ${pick.number} (revision ${e.revision})`,
    spec: ev.spec,
    computation: ev.computation,
    findings: ev.findings,
    recomputed: true,
  };
}

/** Two states side by side: the spec changes, each figure that differs, findings gone and new. */
export async function compareStates(db: Db, packageId: number, a: StatePick, b: StatePick) {
  const [ra, rb] = await Promise.all([getState(db, packageId, a), getState(db, packageId, b)]);
  if (!ra || !rb) return null;
  const parts = await loadParts(db, [...partIds(ra.spec), ...partIds(rb.spec)], false);
  const fmt = (v: number | null, d: number) => (v === null ? "—" : v.toFixed(d));
  const results = RESULT_ROWS.map((row) => ({
    key: row.key,
    label: `${row.label}${row.unit ? ` (${row.unit})` : ""}`,
    before: fmt(ra.computation.results[row.key], row.digits),
    after: fmt(rb.computation.results[row.key], row.digits),
  })).filter((r) => r.before !== r.after);
  const names = (f: BenchFinding[]) => new Set(f.map((x) => x.ruleName));
  const fa = names(ra.findings);
  const fb = names(rb.findings);
  return {
    a: { ...ra.pick, label: ra.label, recomputed: ra.recomputed },
    b: { ...rb.pick, label: rb.label, recomputed: rb.recomputed },
    specChanges: diffSpecs(ra.spec, rb.spec, partLabel(parts)),
    resultChanges: results,
    findingsAdded: [...fb].filter((n) => !fa.has(n)),
    findingsGone: [...fa].filter((n) => !fb.has(n)),
  };
}

/** Restores a revision or a single edit's state as a new edit (nothing in between is lost). */
export async function restoreState(
  db: Db,
  packageId: number,
  pick: StatePick,
  expectedVersion: number,
  userId: number,
): Promise<SaveOutcome | null> {
  const s = await getState(db, packageId, pick);
  if (!s) return null;
  return saveEdit(db, {
    packageId,
    expectedVersion,
    spec: s.spec,
    change: `Restored ${s.label}`,
    userId,
  });
}

export type CloseOutcome =
  | { ok: true; revision: number; reason: CloseReason }
  | { ok: false; status: 400 | 409; message: string };

/** Closes the open revision with the builder's note (the note is checked by the caller's schema). */
export async function closeWithNote(
  db: Db,
  packageId: number,
  userId: number,
  note: string,
  expectedVersion: number,
): Promise<CloseOutcome> {
  if (note.length === 0 || note.length > MAX_NOTE_LENGTH)
    return { ok: false, status: 400, message: "Write a short note" };
  const out = await closeOpenRevision(db, packageId, "note", userId, { note, expectedVersion });
  if (out) return { ok: true, ...out };
  const row = await db
    .selectFrom("packages")
    .select("version")
    .where("id", "=", packageId)
    .executeTakeFirst();
  if (!row) throw data("No package with this number.", { status: 404 });
  if (row.version !== expectedVersion)
    return {
      ok: false,
      status: 409,
      message: "Someone saved an edit since this page was loaded; look at it, then close again.",
    };
  return {
    ok: false,
    status: 400,
    message: "No revision is open: the next edit opens one.",
  };
}

/** The bench's "close revision" form: the note checked by its schema, answered for Conform. */
export async function closeRevisionAction(
  db: Db,
  user: { id: number },
  packageId: number,
  form: FormData,
) {
  const submission = parseWithZod(form, { schema: RevisionNoteSchema });
  if (submission.status !== "success")
    return data({ result: submission.reply(), closed: null }, { status: 400 });
  const { note, expectedVersion } = submission.value;
  const out = await closeWithNote(db, packageId, user.id, note, expectedVersion);
  if (!out.ok)
    return data(
      { result: submission.reply({ formErrors: [out.message] }), closed: null },
      { status: out.status },
    );
  return data({
    result: submission.reply({ resetForm: true }),
    closed: { revision: out.revision, reason: out.reason, note },
  });
}
