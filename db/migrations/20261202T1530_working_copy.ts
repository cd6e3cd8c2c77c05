import { type Kysely, sql } from "kysely";

// The working copy and named revisions. Every bench edit is saved into the package row
// (the working copy, with its own version counter for stale-save protection) and one
// small row of the append-only edit log. A revision becomes a named checkpoint holding
// the edits since the last one: open while its editor works, closed with a note, or when
// someone else starts editing, the status changes, or the shop's quiet period passes.
// Existing revisions stay as they are: each was one save, so each becomes a closed
// revision holding that one save as its only edit.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("shop")
    .addColumn("revision_quiet_minutes", "integer", (c) =>
      c
        .notNull()
        .defaultTo(60)
        .check(sql`revision_quiet_minutes between 1 and 10080`),
    )
    .execute();

  await db.schema
    .alterTable("packages")
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .execute();
  await sql`update packages set version = current_revision`.execute(db);

  await db.schema
    .alterTable("package_revisions")
    .addColumn("note", "text")
    .addColumn("opened_at", "timestamptz")
    .addColumn("closed_at", "timestamptz")
    .addColumn("closed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("close_reason", "text", (c) =>
      c.check(
        sql`close_reason is null or close_reason in ('saved', 'started', 'note', 'other_editor', 'status', 'quiet')`,
      ),
    )
    .execute();
  // an open revision's content is the working copy; it is copied here when it closes
  for (const column of ["spec", "results", "rule_snapshot", "findings"])
    await db.schema
      .alterTable("package_revisions")
      .alterColumn(column, (c) => c.dropNotNull())
      .execute();
  await sql`update package_revisions
               set opened_at = saved_at, closed_at = saved_at, close_reason = 'saved'`.execute(db);
  await db.schema
    .alterTable("package_revisions")
    .alterColumn("opened_at", (c) => c.setNotNull())
    .execute();
  await db.schema
    .alterTable("package_revisions")
    .alterColumn("opened_at", (c) => c.setDefault(sql`now()`))
    .execute();
  await db.schema
    .alterTable("package_revisions")
    .addCheckConstraint(
      "package_revisions_closed_has_content",
      sql`closed_at is null or (spec is not null and results is not null and rule_snapshot is not null and findings is not null)`,
    )
    .execute();
  // at most one open revision per package
  await sql`create unique index package_revisions_one_open on package_revisions (package_id) where closed_at is null`.execute(
    db,
  );

  await db.schema
    .createTable("package_edits")
    .addColumn("id", "bigserial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    // the working copy's version this edit made
    .addColumn("version", "integer", (c) => c.notNull())
    // the revision that holds it
    .addColumn("revision", "integer", (c) => c.notNull())
    .addColumn("user_id", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("change", "text", (c) => c.notNull())
    // the bench action as parsed (null for saves older than the log)
    .addColumn("intent", "jsonb")
    // the spec after the edit: enough to compare with or restore it
    .addColumn("spec", "jsonb", (c) => c.notNull())
    .addUniqueConstraint("package_edits_package_version_key", ["package_id", "version"])
    .execute();
  await db.schema
    .createIndex("package_edits_revision_idx")
    .on("package_edits")
    .columns(["package_id", "revision"])
    .execute();
  // Every edit rewrites the working copy's JSON (figures, rule snapshot, findings: several
  // kB, stored compressed); lz4 compresses it at a fraction of the default's CPU.
  const lz4 = await sql<{ ok: boolean }>`
    select exists (select 1 from pg_settings
                    where name = 'default_toast_compression' and 'lz4' = any(enumvals)) as ok`.execute(
    db,
  );
  if (lz4.rows[0]?.ok) {
    for (const column of ["spec", "results", "rule_snapshot", "findings"])
      await sql`alter table packages alter column ${sql.ref(column)} set compression lz4`.execute(
        db,
      );
    await sql`alter table package_edits alter column spec set compression lz4`.execute(db);
  }
  await sql`insert into package_edits (package_id, version, revision, user_id, at, change, spec)
            select package_id, revision, revision, saved_by, saved_at, change, spec
              from package_revisions order by package_id, revision`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("package_edits").execute();
  await sql`drop index if exists package_revisions_one_open`.execute(db);
  // an open revision gets the working copy's content, as a closed one would
  await sql`update package_revisions r
               set spec = p.spec, results = p.results, rule_snapshot = p.rule_snapshot,
                   findings = p.findings
              from packages p
             where p.id = r.package_id and r.closed_at is null`.execute(db);
  await db.schema
    .alterTable("package_revisions")
    .dropConstraint("package_revisions_closed_has_content")
    .execute();
  for (const column of ["spec", "results", "rule_snapshot", "findings"])
    await db.schema
      .alterTable("package_revisions")
      .alterColumn(column, (c) => c.setNotNull())
      .execute();
  for (const column of ["close_reason", "closed_by", "closed_at", "opened_at", "note"])
    await db.schema.alterTable("package_revisions").dropColumn(column).execute();
  await db.schema.alterTable("packages").dropColumn("version").execute();
  await db.schema.alterTable("shop").dropColumn("revision_quiet_minutes").execute();
}
