import { type Kysely, sql } from "kysely";

// Frozen: a migration never changes once it has landed; later changes get a new file.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("shop")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("city", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("phone", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("email", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("labour_rate_cents", "integer", (c) =>
      c.notNull().check(sql`labour_rate_cents >= 0`),
    )
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("users")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("role", "text", (c) =>
      c.notNull().check(sql`role in ('owner', 'builder', 'service_writer', 'apprentice')`),
    )
    .addColumn("password_hash", "text")
    .addColumn("disabled_at", "timestamptz")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await sql`create unique index users_email_key on users (lower(email))`.execute(db);

  await db.schema
    .createTable("customers")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("email", "text")
    .addColumn("phone", "text")
    .addColumn("city", "text")
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("bikes")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("customer_id", "integer", (c) =>
      c.notNull().references("customers.id").onDelete("cascade"),
    )
    .addColumn("year", "integer", (c) => c.notNull())
    .addColumn("model", "text", (c) => c.notNull())
    .addColumn("vin", "text")
    .addColumn("engine_ci", "numeric")
    .addColumn("mileage", "integer")
    .addColumn("notes", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex("bikes_customer_idx").on("bikes").column("customer_id").execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("bikes").execute();
  await db.schema.dropTable("customers").execute();
  await db.schema.dropTable("users").execute();
  await db.schema.dropTable("shop").execute();
}
