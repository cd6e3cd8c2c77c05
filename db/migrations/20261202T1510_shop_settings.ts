import { type Kysely, sql } from "kysely";

// Frozen: a migration never changes once it has landed; later changes get a new file.
// The owner's shop settings (address, tax, deposit default, time zone) and who changed what.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("shop")
    .addColumn("address", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("tax_rate_bp", "integer", (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`tax_rate_bp between 0 and 10000`),
    )
    .addColumn("deposit_kind", "text", (c) =>
      c
        .notNull()
        .defaultTo("percent")
        .check(sql`deposit_kind in ('percent', 'fixed')`),
    )
    // basis points of the quote for 'percent', cents for 'fixed'
    .addColumn("deposit_value", "integer", (c) =>
      c
        .notNull()
        .defaultTo(2500)
        .check(sql`deposit_value >= 0`),
    )
    .addColumn("time_zone", "text", (c) => c.notNull().defaultTo("America/Chicago"))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("shop_setting_changes")
    .addColumn("id", "serial", (c) => c.primaryKey())
    .addColumn("shop_id", "integer", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("field", "text", (c) => c.notNull())
    .addColumn("before", "text", (c) => c.notNull())
    .addColumn("after", "text", (c) => c.notNull())
    .addColumn("changed_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("changed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("shop_setting_changes_shop_at")
    .on("shop_setting_changes")
    .columns(["shop_id", "changed_at"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("shop_setting_changes").execute();
  await db.schema
    .alterTable("shop")
    .dropColumn("address")
    .dropColumn("tax_rate_bp")
    .dropColumn("deposit_kind")
    .dropColumn("deposit_value")
    .dropColumn("time_zone")
    .dropColumn("updated_at")
    .execute();
}
