import { type Kysely, sql } from "kysely";

// The shop's caution limits, as the owner sets them on /settings/limits. A row holds one
// limit the owner has changed (a limit without a row takes its default, which lives with
// its source in app/lib/settings/limits.ts); every change is kept in caution_limit_changes.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("caution_limits")
    .addColumn("key", "text", (c) => c.primaryKey())
    .addColumn("value_num", "double precision")
    .addColumn("value_text", "text")
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      "caution_limits_one_value",
      sql`(value_num is null) <> (value_text is null)`,
    )
    .execute();
  await db.schema
    .createTable("caution_limit_changes")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("key", "text", (c) => c.notNull())
    .addColumn("old_value", "text")
    .addColumn("new_value", "text", (c) => c.notNull())
    .addColumn("changed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("caution_limit_changes_at_idx")
    .on("caution_limit_changes")
    .column("changed_at")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("caution_limit_changes").execute();
  await db.schema.dropTable("caution_limits").execute();
}
