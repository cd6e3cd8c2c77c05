import { type Kysely, sql } from "kysely";

// Packages (one engine + chassis plan for one bike, or a shop template), their numbered
// revisions (every save on the spec bench is one), status changes, and per-user
// preferences such as the bench's unit system.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("packages")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("bike_id", "integer", (c) => c.references("bikes.id").onDelete("restrict"))
    .addColumn("is_template", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("draft")
        .check(
          sql`status in ('draft', 'quoted', 'approved', 'in_build', 'on_dyno', 'delivered', 'cancelled')`,
        ),
    )
    .addColumn("builder_id", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("rev_limit_rpm", "integer")
    .addColumn("power_hp", sql`numeric(7,1)`)
    .addColumn("power_basis", "text", (c) =>
      c.check(sql`power_basis is null or power_basis in ('target', 'estimate', 'measured')`),
    )
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("copied_from_id", "integer", (c) => c.references("packages.id").onDelete("set null"))
    // the optimistic-concurrency token: a save names the revision it was based on
    .addColumn("current_revision", "integer", (c) => c.notNull().defaultTo(1))
    // the current revision's content, copied here so lists and rule previews read one row
    .addColumn("spec", "jsonb", (c) => c.notNull())
    .addColumn("results", "jsonb", (c) => c.notNull())
    .addColumn("rule_snapshot", "jsonb", (c) => c.notNull())
    .addColumn("findings", "jsonb", (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      "packages_template_has_no_bike",
      sql`not (is_template and bike_id is not null)`,
    )
    .addCheckConstraint("packages_bike_or_template", sql`is_template or bike_id is not null`)
    .execute();
  await db.schema
    .createIndex("packages_status_idx")
    .on("packages")
    .columns(["status", "updated_at"])
    .execute();
  await db.schema.createIndex("packages_bike_idx").on("packages").column("bike_id").execute();
  await db.schema.createIndex("packages_builder_idx").on("packages").column("builder_id").execute();

  await db.schema
    .createTable("package_revisions")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("revision", "integer", (c) => c.notNull())
    .addColumn("spec", "jsonb", (c) => c.notNull())
    .addColumn("results", "jsonb", (c) => c.notNull())
    .addColumn("rule_snapshot", "jsonb", (c) => c.notNull())
    .addColumn("findings", "jsonb", (c) => c.notNull())
    .addColumn("change", "text", (c) => c.notNull())
    .addColumn("saved_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("saved_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("package_revisions_package_revision_key", ["package_id", "revision"])
    .execute();

  await db.schema
    .createTable("package_status_changes")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("from_status", "text")
    .addColumn("to_status", "text", (c) => c.notNull())
    .addColumn("changed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("package_status_changes_pkg_idx")
    .on("package_status_changes")
    .column("package_id")
    .execute();

  await db.schema
    .createTable("user_preferences")
    .addColumn("user_id", "integer", (c) =>
      c.primaryKey().references("users.id").onDelete("cascade"),
    )
    .addColumn("units", "text", (c) =>
      c
        .notNull()
        .defaultTo("inch")
        .check(sql`units in ('inch', 'metric')`),
    )
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("user_preferences").execute();
  await db.schema.dropTable("package_status_changes").execute();
  await db.schema.dropTable("package_revisions").execute();
  await db.schema.dropTable("packages").execute();
}
