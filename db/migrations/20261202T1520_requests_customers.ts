import { type Kysely, sql } from "kysely";

// Engine families, build requests, installed parts and the keep-check; bikes name their
// engine family. Search over customers and bikes uses trigram indexes (pg_trgm).
export async function up(db: Kysely<any>): Promise<void> {
  await sql`create extension if not exists pg_trgm`.execute(db);

  await db.schema
    .createTable("engine_families")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("year_from", "integer", (c) => c.notNull())
    .addColumn("year_to", "integer")
    .addColumn("stock_bore_mm", "numeric", (c) => c.notNull())
    .addColumn("stock_stroke_mm", "numeric", (c) => c.notNull())
    .addColumn("displacement_cc", "numeric", (c) => c.notNull())
    .addColumn("deck_height_mm", "numeric")
    .addColumn("stock_rev_limit_rpm", "integer")
    .addColumn("stock_parts", "jsonb", (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("archived_at", "timestamptz")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .execute();
  await sql`create unique index engine_families_name_key on engine_families (lower(name))`.execute(
    db,
  );

  await db.schema
    .createTable("engine_family_versions")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("family_id", "integer", (c) =>
      c.notNull().references("engine_families.id").onDelete("cascade"),
    )
    .addColumn("version", "integer", (c) => c.notNull())
    .addColumn("snapshot", "jsonb", (c) => c.notNull())
    .addColumn("change", "text", (c) => c.notNull())
    .addColumn("changed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("engine_family_versions_key", ["family_id", "version"])
    .execute();

  await db.schema
    .alterTable("bikes")
    .addColumn("engine_family_id", "integer", (c) =>
      c.references("engine_families.id").onDelete("set null"),
    )
    .addColumn("erased_at", "timestamptz")
    .execute();
  await db.schema.alterTable("customers").addColumn("erased_at", "timestamptz").execute();

  await db.schema
    .createTable("build_requests")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("phone", "text")
    .addColumn("bike_year", "integer", (c) => c.notNull())
    .addColumn("engine_family_id", "integer", (c) =>
      c.references("engine_families.id").onDelete("set null"),
    )
    .addColumn("bike_model", "text", (c) => c.notNull())
    .addColumn("mileage", "integer")
    .addColumn("current_parts", "jsonb", (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn("goals", "text", (c) => c.notNull())
    .addColumn("riding", sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
    .addColumn("budget", "text", (c) => c.notNull())
    .addColumn("time_frame", "text", (c) => c.notNull())
    .addColumn("contact_by", "text", (c) => c.notNull())
    .addColumn("consent", "boolean", (c) => c.notNull())
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("new")
        .check(sql`status in ('new', 'contacted', 'waiting_on_rider', 'converted', 'declined')`),
    )
    .addColumn("customer_id", "integer", (c) => c.references("customers.id").onDelete("set null"))
    .addColumn("bike_id", "integer", (c) => c.references("bikes.id").onDelete("set null"))
    .addColumn("package_id", "integer", (c) => c.references("packages.id").onDelete("set null"))
    .addColumn("client_address", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("build_requests_status_idx")
    .on("build_requests")
    .columns(["status", "created_at"])
    .execute();
  await db.schema
    .createIndex("build_requests_address_idx")
    .on("build_requests")
    .columns(["client_address", "created_at"])
    .execute();

  await db.schema
    .createTable("build_request_status_changes")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("request_id", "integer", (c) =>
      c.notNull().references("build_requests.id").onDelete("cascade"),
    )
    .addColumn("from_status", "text")
    .addColumn("to_status", "text", (c) => c.notNull())
    .addColumn("changed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("build_request_notes")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("request_id", "integer", (c) =>
      c.notNull().references("build_requests.id").onDelete("cascade"),
    )
    .addColumn("body", "text", (c) => c.notNull())
    .addColumn("author_id", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("bike_parts")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("bike_id", "integer", (c) => c.notNull().references("bikes.id").onDelete("cascade"))
    .addColumn("part_id", "integer", (c) => c.references("parts.id"))
    .addColumn("category", "text", (c) => c.notNull().references("part_categories.slug"))
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("fitted_on", "date")
    .addColumn("fitted_mileage", "integer")
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("removed_at", "timestamptz")
    .addColumn("removed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .execute();
  await db.schema.createIndex("bike_parts_bike_idx").on("bike_parts").column("bike_id").execute();

  await db.schema
    .createTable("keep_check_overrides")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("bike_part_id", "integer", (c) =>
      c.notNull().references("bike_parts.id").onDelete("cascade"),
    )
    .addColumn("mark", "text", (c) => c.notNull().check(sql`mark in ('keep', 'replace', 'review')`))
    .addColumn("note", "text", (c) => c.notNull())
    .addColumn("set_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("set_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint("keep_check_overrides_key", ["package_id", "bike_part_id"])
    .execute();

  await db.schema
    .createTable("keep_checks")
    .addColumn("package_id", "integer", (c) =>
      c.primaryKey().references("packages.id").onDelete("cascade"),
    )
    .addColumn("marks", "jsonb", (c) => c.notNull())
    .addColumn("checked_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("checked_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  // search: trigram indexes on what the service writer types (name, e-mail, phone digits, VIN)
  await sql`create index customers_name_trgm on customers using gin (lower(name) gin_trgm_ops)`.execute(
    db,
  );
  await sql`create index customers_email_trgm on customers using gin (lower(email) gin_trgm_ops)`.execute(
    db,
  );
  await sql`create index customers_phone_trgm on customers using gin ((regexp_replace(coalesce(phone, ''), '[^0-9]', '', 'g')) gin_trgm_ops)`.execute(
    db,
  );
  await sql`create index bikes_vin_trgm on bikes using gin (upper(vin) gin_trgm_ops)`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("keep_checks").execute();
  await db.schema.dropTable("keep_check_overrides").execute();
  await db.schema.dropTable("bike_parts").execute();
  await db.schema.dropTable("build_request_notes").execute();
  await db.schema.dropTable("build_request_status_changes").execute();
  await db.schema.dropTable("build_requests").execute();
  await sql`drop index if exists bikes_vin_trgm`.execute(db);
  await sql`drop index if exists customers_name_trgm`.execute(db);
  await sql`drop index if exists customers_email_trgm`.execute(db);
  await sql`drop index if exists customers_phone_trgm`.execute(db);
  await db.schema.alterTable("customers").dropColumn("erased_at").execute();
  await db.schema
    .alterTable("bikes")
    .dropColumn("engine_family_id")
    .dropColumn("erased_at")
    .execute();
  await db.schema.dropTable("engine_family_versions").execute();
  await db.schema.dropTable("engine_families").execute();
}
