import { type Kysely, sql } from "kysely";

// Sessions, single-use tokens (invites, password resets), sign-in attempts for
// throttling, and the outgoing mail log the queue works from.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("sessions")
    // sha-256 of the id in the cookie: a copy of this table signs nobody in
    .addColumn("id_hash", "text", (c) => c.primaryKey())
    .addColumn("user_id", "integer", (c) => c.notNull().references("users.id").onDelete("cascade"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("expires_at", "timestamptz", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("sessions_user_idx").on("sessions").column("user_id").execute();
  await db.schema.createIndex("sessions_expires_idx").on("sessions").column("expires_at").execute();

  await db.schema
    .createTable("auth_tokens")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('invite', 'reset')`))
    .addColumn("token_hash", "text", (c) => c.notNull().unique())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("role", "text", (c) =>
      c.check(sql`role is null or role in ('owner', 'builder', 'service_writer', 'apprentice')`),
    )
    .addColumn("user_id", "integer", (c) => c.references("users.id").onDelete("cascade"))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("expires_at", "timestamptz", (c) => c.notNull())
    .addColumn("used_at", "timestamptz")
    .addColumn("revoked_at", "timestamptz")
    .execute();
  await sql`create index auth_tokens_email_idx on auth_tokens (kind, lower(email))`.execute(db);

  await db.schema
    .createTable("login_attempts")
    .addColumn("id", "bigserial", (c) => c.primaryKey())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("ip", "text", (c) => c.notNull())
    .addColumn("succeeded", "boolean", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("login_attempts_email_idx")
    .on("login_attempts")
    .columns(["email", "created_at"])
    .execute();
  await db.schema
    .createIndex("login_attempts_ip_idx")
    .on("login_attempts")
    .columns(["ip", "created_at"])
    .execute();

  await db.schema
    .createTable("mail_messages")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("idempotency_key", "text", (c) => c.notNull().unique())
    .addColumn("to_address", "text", (c) => c.notNull())
    .addColumn("subject", "text", (c) => c.notNull())
    .addColumn("text_body", "text", (c) => c.notNull())
    .addColumn("html_body", "text")
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("queued")
        .check(sql`status in ('queued', 'sent', 'failed')`),
    )
    .addColumn("attempts", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("last_error", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("sent_at", "timestamptz")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("mail_messages").execute();
  await db.schema.dropTable("login_attempts").execute();
  await db.schema.dropTable("auth_tokens").execute();
  await db.schema.dropTable("sessions").execute();
}
