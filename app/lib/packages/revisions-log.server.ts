// The writes behind the working copy, its edit log and named revisions, as SQL text: each
// is one statement (one round trip), and every time in it comes from `clock`, so tests can
// move time instead of waiting. A revision opens with its first edit and closes with a
// note, when someone else starts editing, when the status changes, or when the shop's
// quiet period (shop.revision_quiet_minutes, default 60) has passed since its last edit.
import { sql } from "kysely";
import type { Db } from "../db.server";
import type { CloseReason } from "../../../db/schema/packages";

/** Where revision times come from; tests replace `now`. */
export const clock = { now: (): Date => new Date() };

export const DEFAULT_QUIET_MINUTES = 60;

/** The shop's quiet period, as SQL (the first shop row; the default without one). */
const QUIET = sql<number>`coalesce((select s.revision_quiet_minutes from shop s order by s.id limit 1), ${DEFAULT_QUIET_MINUTES})`;

export async function quietMinutes(db: Db): Promise<number> {
  const r = await sql<{ q: number }>`select ${QUIET} as q`.execute(db);
  return Number(r.rows[0]?.q ?? DEFAULT_QUIET_MINUTES);
}

export interface EditInput {
  packageId: number;
  expectedVersion: number;
  userId: number;
  change: string;
  /** the bench action as parsed; null for a restore or a scripted save */
  intent: unknown;
  spec: string;
  results: string;
  ruleSnapshot: string;
  findings: string;
  revLimitRpm: number | null;
  powerHp: number | null;
  powerBasis: string | null;
}

export type EditSaved = {
  version: number;
  revision: number;
  /** how the edit joined a revision: the open one, or a new one after closing the open one for `how` */
  how: "append" | "none" | "other_editor" | "quiet";
  revisionEdits: number;
};

/**
 * Saves one edit when the working copy is still at `expectedVersion`: the package row
 * (the working copy) and one edit-log row, in one statement. The edit joins its editor's
 * open revision; otherwise the open revision (someone else's, or gone quiet) is closed with
 * the working copy's content as it was, and a new one opens. Null when the version moved.
 */
export async function writeEdit(db: Db, e: EditInput): Promise<EditSaved | null> {
  const now = clock.now();
  // Every sub-statement sees the rows as they were before the statement; each write
  // depends on `u`, the conditional update, so a stale base writes nothing at all.
  const r = await sql<EditSaved>`
    with d as (
      select p.id, e.at as last_at, r.saved_by as editor, r.revision as open_revision,
             e.at + make_interval(mins => ${QUIET}) as quiet_end
        from packages p
        left join package_revisions r
          on r.package_id = p.id and r.revision = p.current_revision and r.closed_at is null
        left join package_edits e on e.package_id = p.id and e.version = p.version
       where p.id = ${e.packageId} and p.version = ${e.expectedVersion}
    ), h as (
      select d.*, case
          when d.open_revision is null then 'none'
          when d.quiet_end <= ${now} then 'quiet'
          when d.editor is distinct from ${e.userId}::integer then 'other_editor'
          else 'append' end as how
        from d
    ), u as (
      update packages p
         set version = p.version + 1,
             current_revision = p.current_revision + (case when h.how = 'append' then 0 else 1 end),
             spec = ${e.spec}::jsonb, results = ${e.results}::jsonb,
             rule_snapshot = ${e.ruleSnapshot}::jsonb, findings = ${e.findings}::jsonb,
             updated_at = ${now}, rev_limit_rpm = ${e.revLimitRpm}, power_hp = ${e.powerHp},
             power_basis = ${e.powerBasis}
        from h
       where p.id = h.id and p.version = ${e.expectedVersion}
      returning p.id, p.version, p.current_revision, p.spec, h.how, h.quiet_end, h.open_revision
    ), closed as (
      update package_revisions r
         set closed_at = case when u.how = 'quiet' then u.quiet_end else ${now} end,
             saved_at = case when u.how = 'quiet' then u.quiet_end else ${now} end,
             close_reason = u.how,
             closed_by = case when u.how = 'other_editor' then ${e.userId}::integer end,
             spec = old.spec, results = old.results, rule_snapshot = old.rule_snapshot,
             findings = old.findings
        from u, packages old
       where u.how in ('quiet', 'other_editor') and old.id = u.id
         and r.package_id = u.id and r.revision = u.open_revision
      returning r.revision
    ), opened as (
      insert into package_revisions (package_id, revision, change, saved_by, saved_at, opened_at)
      select u.id, u.current_revision, ${e.change}, ${e.userId}::integer, ${now}, ${now}
        from u
       where u.how <> 'append' and (select count(*) from closed) >= 0
      returning revision
    ), logged as (
      insert into package_edits (package_id, version, revision, user_id, at, change, intent, spec)
      select u.id, u.version, u.current_revision, ${e.userId}::integer, ${now}, ${e.change},
             ${e.intent === null ? null : JSON.stringify(e.intent)}::jsonb, u.spec
        from u
      returning version
    )
    select u.version, u.current_revision as revision, u.how,
           (case when u.how = 'append'
              then (select count(*) from package_edits x
                     where x.package_id = u.id and x.revision = u.current_revision)::integer + 1
              else 1 end) as "revisionEdits"
      from u, logged, (select count(*) from opened) o`.execute(db);
  return r.rows[0] ?? null;
}

/**
 * Closes the package's open revision, with the working copy's content; one that had
 * already gone quiet closes as quiet, at the end of its quiet period (a note still
 * joins it). Returns the closed revision's number and reason, or null when none was open.
 * `expectedVersion`, when given, must still be the working copy's version.
 */
export async function closeOpenRevision(
  db: Db,
  packageId: number,
  reason: Extract<CloseReason, "note" | "status">,
  userId: number,
  opts: { note?: string; expectedVersion?: number } = {},
): Promise<{ revision: number; reason: CloseReason } | null> {
  const now = clock.now();
  const r = await sql<{ revision: number; reason: CloseReason }>`
    with q as (
      select p.id, e.at + make_interval(mins => ${QUIET}) as quiet_end
        from packages p
        left join package_edits e on e.package_id = p.id and e.version = p.version
       where p.id = ${packageId}
         and (${opts.expectedVersion ?? null}::integer is null or p.version = ${opts.expectedVersion ?? null}::integer)
    )
    update package_revisions r
       set closed_at = case when q.quiet_end <= ${now} then q.quiet_end else ${now} end,
           saved_at = case when q.quiet_end <= ${now} then q.quiet_end else ${now} end,
           close_reason = case when q.quiet_end <= ${now} then 'quiet' else ${reason} end,
           closed_by = case when q.quiet_end <= ${now} then null else ${userId}::integer end,
           note = coalesce(${opts.note ?? null}::text, r.note),
           spec = p.spec, results = p.results, rule_snapshot = p.rule_snapshot, findings = p.findings
      from q, packages p
     where p.id = q.id and r.package_id = q.id and r.closed_at is null
    returning r.revision, r.close_reason as reason`.execute(db);
  return r.rows[0] ?? null;
}

/** The first revision and edit of a new package: its starting point, closed at once. */
export async function writeStart(
  db: Db,
  packageId: number,
  userId: number | null,
  change: string,
  spec: string,
) {
  const now = clock.now();
  await sql`
    with rev as (
      insert into package_revisions
        (package_id, revision, spec, results, rule_snapshot, findings, change, saved_by, saved_at,
         opened_at, closed_at, close_reason)
      select p.id, 1, p.spec, p.results, p.rule_snapshot, p.findings, ${change}, ${userId}::integer,
             ${now}, ${now}, ${now}, 'started'
        from packages p where p.id = ${packageId}
      returning package_id
    )
    insert into package_edits (package_id, version, revision, user_id, at, change, spec)
    select package_id, 1, 1, ${userId}::integer, ${now}, ${change}, ${spec}::jsonb from rev`.execute(
    db,
  );
}
