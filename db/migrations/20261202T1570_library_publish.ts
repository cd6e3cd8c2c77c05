import { type Kysely, sql } from "kysely";

// The library: a package is published for study (templates are in the library from the
// start); who published it and when, and a note for the reader. Withdrawing clears it.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("packages")
    .addColumn("published_at", "timestamptz")
    .addColumn("published_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("publish_note", "text", (c) => c.notNull().defaultTo(""))
    .execute();
  await db.schema
    .createIndex("packages_published_idx")
    .on("packages")
    .column("published_at")
    .where(sql.ref("published_at"), "is not", null)
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex("packages_published_idx").execute();
  await db.schema
    .alterTable("packages")
    .dropColumn("published_at")
    .dropColumn("published_by")
    .dropColumn("publish_note")
    .execute();
}
