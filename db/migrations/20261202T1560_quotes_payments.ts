import { type Kysely, sql } from "kysely";

// Quotes and deposits: the shop's labour jobs, each package's editable quote draft, the
// numbered quote versions sent to the customer (frozen), the deposit payments made through
// the payment service, the service's webhook events (kept once each, by event id), and
// the customers' messages to the shop from a quote link.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("labour_jobs")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("name", "text", (c) => c.notNull())
    // hundredths of an hour: 6.5 h = 650
    .addColumn("hours_hundredths", "integer", (c) =>
      c.notNull().check(sql`hours_hundredths > 0 and hours_hundredths <= 100000`),
    )
    // the bench slot keys the job covers (app/lib/packages/slots.ts)
    .addColumn("slots", sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
    .addColumn("description", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("active", "boolean", (c) => c.notNull().defaultTo(true))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await sql`create unique index labour_jobs_name_idx on labour_jobs (lower(name)) where active`.execute(
    db,
  );

  // the quote's own terms beside the shop settings (tax and deposit live on the shop row)
  await db.schema
    .createTable("quote_settings")
    .addColumn("id", "integer", (c) => c.primaryKey().check(sql`id = 1`))
    .addColumn("supplies_bp", "integer", (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`supplies_bp between 0 and 10000`),
    )
    .addColumn("valid_days", "integer", (c) =>
      c
        .notNull()
        .defaultTo(14)
        .check(sql`valid_days between 1 and 90`),
    )
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await sql`insert into quote_settings (id) values (1)`.execute(db);

  // why a status changed when it was not the usual next step (a cancel's reason)
  await db.schema
    .alterTable("package_status_changes")
    .addColumn("reason", "text", (c) => c.notNull().defaultTo(""))
    .execute();

  await db.schema
    .createTable("quote_drafts")
    .addColumn("package_id", "integer", (c) =>
      c.primaryKey().references("packages.id").onDelete("cascade"),
    )
    // lines the service writer adds: machine work, other (kind, description, qty, unit)
    .addColumn("extra_lines", "jsonb", (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn("discount", "jsonb", (c) => c.notNull().defaultTo(sql`'{"kind":"none"}'::jsonb`))
    // null: the shop's default deposit
    .addColumn("deposit", "jsonb")
    .addColumn("note", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("quote_versions")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("number", "integer", (c) => c.notNull())
    // the package's revision counter when the quote was sent: what it prices
    .addColumn("package_revision", "integer", (c) => c.notNull())
    .addColumn("lines", "jsonb", (c) => c.notNull())
    .addColumn("terms", "jsonb", (c) => c.notNull())
    .addColumn("subtotal_cents", "bigint", (c) => c.notNull())
    .addColumn("discount_cents", "bigint", (c) => c.notNull())
    .addColumn("tax_cents", "bigint", (c) => c.notNull())
    .addColumn("total_cents", "bigint", (c) => c.notNull())
    .addColumn("deposit_cents", "bigint", (c) => c.notNull())
    .addColumn("summary", "jsonb", (c) => c.notNull())
    .addColumn("customer_name", "text", (c) => c.notNull())
    .addColumn("customer_email", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("sent")
        .check(sql`status in ('sent', 'changes_requested', 'approved', 'superseded', 'withdrawn')`),
    )
    .addColumn("token_hash", "text", (c) => c.notNull().unique())
    .addColumn("expires_at", "timestamptz", (c) => c.notNull())
    .addColumn("sent_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("sent_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("approved_at", "timestamptz")
    .addUniqueConstraint("quote_versions_number_uq", ["package_id", "number"])
    .addCheckConstraint(
      "quote_versions_total_is_sum",
      sql`total_cents = subtotal_cents - discount_cents + tax_cents and deposit_cents between 0 and total_cents`,
    )
    .execute();

  await db.schema
    .createTable("payments")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("quote_version_id", "integer", (c) =>
      c.notNull().references("quote_versions.id").onDelete("restrict"),
    )
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("restrict"),
    )
    .addColumn("checkout_session_id", "text", (c) => c.notNull().unique())
    .addColumn("payment_intent_id", "text", (c) => c.unique())
    .addColumn("amount_cents", "bigint", (c) => c.notNull().check(sql`amount_cents > 0`))
    .addColumn("refunded_cents", "bigint", (c) => c.notNull().defaultTo(0))
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("open")
        .check(
          sql`status in ('open', 'paid', 'declined', 'expired', 'refunded', 'partly_refunded')`,
        ),
    )
    .addColumn("failure", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("paid_at", "timestamptz")
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint("payments_refund_within", sql`refunded_cents between 0 and amount_cents`)
    .execute();

  await db.schema
    .createTable("payment_events")
    .addColumn("event_id", "text", (c) => c.primaryKey())
    .addColumn("type", "text", (c) => c.notNull())
    .addColumn("payload", "jsonb", (c) => c.notNull())
    .addColumn("received_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    // null while held (e.g. a refund that arrived before its payment)
    .addColumn("applied_at", "timestamptz")
    .addColumn("outcome", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("customer_messages")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("package_id", "integer", (c) =>
      c.notNull().references("packages.id").onDelete("cascade"),
    )
    .addColumn("quote_version_id", "integer", (c) =>
      c.references("quote_versions.id").onDelete("set null"),
    )
    .addColumn("body", "text", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("read_at", "timestamptz")
    .addColumn("read_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("customer_messages").execute();
  await db.schema.dropTable("payment_events").execute();
  await db.schema.dropTable("payments").execute();
  await db.schema.dropTable("quote_versions").execute();
  await db.schema.dropTable("quote_drafts").execute();
  await db.schema.dropTable("quote_settings").execute();
  await db.schema.alterTable("package_status_changes").dropColumn("reason").execute();
  await db.schema.dropTable("labour_jobs").execute();
}
