import { type Kysely, sql } from "kysely";

// The parts catalog and the fit rules, with their version history.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("part_categories")
    .addColumn("slug", "text", (c) => c.primaryKey())
    .addColumn("label", "text", (c) => c.notNull())
    .addColumn("sort", "integer", (c) => c.notNull().defaultTo(100))
    // built-in categories have a Zod attribute schema in the app; shop-added ones do not
    .addColumn("built_in", "boolean", (c) => c.notNull().defaultTo(false))
    .execute();

  await db.schema
    .createTable("parts")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("part_number", "text", (c) => c.notNull())
    .addColumn("category", "text", (c) => c.notNull().references("part_categories.slug"))
    .addColumn("maker", "text", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("price_cents", "integer", (c) => c.notNull().check(sql`price_cents >= 0`))
    .addColumn("labour_hours", sql`numeric(6,2)`, (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`labour_hours >= 0`),
    )
    .addColumn("tags", sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
    .addColumn("stock", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("attributes", "jsonb", (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("archived_at", "timestamptz")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_by", "integer", (c) => c.references("users.id"))
    .execute();
  await sql`create unique index parts_number_key on parts (lower(part_number))`.execute(db);
  await db.schema
    .createIndex("parts_category_idx")
    .on("parts")
    .columns(["category", "archived_at"])
    .execute();
  await sql`create index parts_tags_idx on parts using gin (tags)`.execute(db);

  await db.schema
    .createTable("part_versions")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("part_id", "integer", (c) => c.notNull().references("parts.id").onDelete("cascade"))
    .addColumn("version", "integer", (c) => c.notNull())
    .addColumn("snapshot", "jsonb", (c) => c.notNull())
    .addColumn("change", "text", (c) => c.notNull())
    .addColumn("changed_by", "integer", (c) => c.references("users.id"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("part_versions_part_version_key", ["part_id", "version"])
    .execute();

  await db.schema
    .createTable("fit_rules")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("kind", "text", (c) =>
      c.notNull().check(sql`kind in ('conflict', 'upgrade', 'caution')`),
    )
    .addColumn("condition", "text", (c) => c.notNull())
    .addColumn("message", "text", (c) => c.notNull())
    .addColumn("upgrade_category", "text", (c) => c.references("part_categories.slug"))
    .addColumn("suggested_part_id", "integer", (c) => c.references("parts.id"))
    .addColumn("active", "boolean", (c) => c.notNull().defaultTo(true))
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_by", "integer", (c) => c.references("users.id"))
    .addCheckConstraint(
      "fit_rules_upgrade_has_category",
      sql`kind <> 'upgrade' or upgrade_category is not null`,
    )
    .execute();

  await db.schema
    .createTable("fit_rule_versions")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("rule_id", "integer", (c) =>
      c.notNull().references("fit_rules.id").onDelete("cascade"),
    )
    .addColumn("version", "integer", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("condition", "text", (c) => c.notNull())
    .addColumn("message", "text", (c) => c.notNull())
    .addColumn("upgrade_category", "text")
    .addColumn("suggested_part_id", "integer")
    .addColumn("active", "boolean", (c) => c.notNull())
    .addColumn("change_note", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("changed_by", "integer", (c) => c.references("users.id"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("fit_rule_versions_rule_version_key", ["rule_id", "version"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("fit_rule_versions").execute();
  await db.schema.dropTable("fit_rules").execute();
  await db.schema.dropTable("part_versions").execute();
  await db.schema.dropTable("parts").execute();
  await db.schema.dropTable("part_categories").execute();
}
