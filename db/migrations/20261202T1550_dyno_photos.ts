import { type Kysely, sql } from "kysely";

// Uploaded files (kept in object storage; a row per stored object, with its hash), dyno
// runs with their points (observed and corrected to standard conditions), and build
// photos of a package.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("stored_files")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("object_key", "text", (c) => c.notNull().unique())
    .addColumn("kind", "text", (c) =>
      c.notNull().check(sql`kind in ('dyno_run', 'photo', 'photo_thumb')`),
    )
    .addColumn("content_type", "text", (c) => c.notNull())
    .addColumn("byte_size", "integer", (c) => c.notNull().check(sql`byte_size >= 0`))
    .addColumn("sha256", "text", (c) => c.notNull().check(sql`sha256 ~ '^[0-9a-f]{64}$'`))
    .addColumn("original_name", "text", (c) => c.notNull())
    .addColumn("uploaded_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("stored_files_package_idx")
    .on("stored_files")
    .column("package_id")
    .execute();

  await db.schema
    .createTable("dyno_runs")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("file_id", "integer", (c) =>
      c.notNull().references("stored_files.id").onDelete("restrict"),
    )
    .addColumn("label", "text", (c) => c.notNull())
    .addColumn("run_date", "date")
    .addColumn("gear", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("torque_unit", "text", (c) => c.notNull().check(sql`torque_unit in ('lbft', 'nm')`))
    .addColumn("power_unit", "text", (c) => c.notNull().check(sql`power_unit in ('hp', 'kw')`))
    .addColumn("air_temp_c", sql`numeric(6,2)`)
    .addColumn("baro_kpa", sql`numeric(7,3)`)
    .addColumn("humidity_pct", sql`numeric(5,2)`)
    // null when the weather is missing: the run is shown uncorrected
    .addColumn("correction_factor", sql`double precision`)
    .addColumn("correction_standard", "text")
    .addColumn("point_count", "integer", (c) => c.notNull())
    .addColumn("dropped_rows", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("counts", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      "dyno_runs_counts_corrected",
      sql`not counts or correction_factor is not null`,
    )
    .execute();
  await db.schema
    .createIndex("dyno_runs_package_idx")
    .on("dyno_runs")
    .column("package_id")
    .execute();

  // SI units: N·m and kW, observed as measured and corrected by the run's factor
  await db.schema
    .createTable("dyno_points")
    .addColumn("run_id", "integer", (c) =>
      c.notNull().references("dyno_runs.id").onDelete("cascade"),
    )
    .addColumn("seq", "integer", (c) => c.notNull())
    .addColumn("line", "integer", (c) => c.notNull())
    .addColumn("rpm", sql`double precision`, (c) => c.notNull())
    .addColumn("torque_nm", sql`double precision`, (c) => c.notNull())
    .addColumn("power_kw", sql`double precision`, (c) => c.notNull())
    .addColumn("torque_nm_corrected", sql`double precision`)
    .addColumn("power_kw_corrected", sql`double precision`)
    .addPrimaryKeyConstraint("dyno_points_pk", ["run_id", "seq"])
    .execute();

  await db.schema
    .createTable("package_photos")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("file_id", "integer", (c) =>
      c.notNull().references("stored_files.id").onDelete("restrict"),
    )
    .addColumn("thumb_file_id", "integer", (c) =>
      c.notNull().references("stored_files.id").onDelete("restrict"),
    )
    .addColumn("width", "integer", (c) => c.notNull())
    .addColumn("height", "integer", (c) => c.notNull())
    .addColumn("caption", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("on_sheet", "boolean", (c) => c.notNull().defaultTo(false))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("package_photos_package_idx")
    .on("package_photos")
    .column("package_id")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("package_photos").execute();
  await db.schema.dropTable("dyno_points").execute();
  await db.schema.dropTable("dyno_runs").execute();
  await db.schema.dropTable("stored_files").execute();
}
