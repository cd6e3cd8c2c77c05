// Reading and saving the shop's settings; every save writes one change row per field that
// moved, so the owner sees who changed what, and when.
import type { Db } from "../db.server";
import { DEFAULT_TIME_ZONE } from "../format";
import {
  describeSetting,
  SETTING_LABELS,
  type ShopSettings,
  type ShopSettingsInput,
} from "./shop-settings";

export async function getShopSettings(db: Db): Promise<(ShopSettings & { id: number }) | null> {
  const row = await db.selectFrom("shop").selectAll().orderBy("id").limit(1).executeTakeFirst();
  if (!row) return null;
  return {
    id: row.id,
    name: row.name,
    address: row.address,
    phone: row.phone,
    email: row.email,
    labourRateCents: row.labour_rate_cents,
    taxRateBp: row.tax_rate_bp,
    depositKind: row.deposit_kind,
    depositValue: row.deposit_value,
    timeZone: row.time_zone,
  };
}

/** The zone the shop's dates are shown in; the default when no shop row exists yet. */
export async function getShopTimeZone(db: Db): Promise<string> {
  const row = await db
    .selectFrom("shop")
    .select("time_zone")
    .orderBy("id")
    .limit(1)
    .executeTakeFirst();
  return row?.time_zone ?? DEFAULT_TIME_ZONE;
}

const KEYS = Object.keys(SETTING_LABELS) as (keyof ShopSettings)[];

/** Saves the settings; returns how many fields changed (0 writes nothing). */
export async function saveShopSettings(
  db: Db,
  input: ShopSettingsInput,
  changedBy: number,
): Promise<number> {
  return db.transaction().execute(async (trx) => {
    const current = await trx
      .selectFrom("shop")
      .selectAll()
      .orderBy("id")
      .limit(1)
      .forUpdate()
      .executeTakeFirst();
    const next: ShopSettings = {
      name: input.name,
      address: input.address,
      phone: input.phone,
      email: input.email,
      labourRateCents: input.labourRate,
      taxRateBp: input.taxRate,
      depositKind: input.depositKind,
      depositValue: input.depositValue,
      timeZone: input.timeZone,
    };
    const columns = {
      name: next.name,
      address: next.address,
      phone: next.phone,
      email: next.email,
      labour_rate_cents: next.labourRateCents,
      tax_rate_bp: next.taxRateBp,
      deposit_kind: next.depositKind,
      deposit_value: next.depositValue,
      time_zone: next.timeZone,
    };
    if (!current) {
      await trx
        .insertInto("shop")
        .values({ ...columns, city: "" })
        .execute();
      return KEYS.length;
    }
    const before: ShopSettings = {
      name: current.name,
      address: current.address,
      phone: current.phone,
      email: current.email,
      labourRateCents: current.labour_rate_cents,
      taxRateBp: current.tax_rate_bp,
      depositKind: current.deposit_kind,
      depositValue: current.deposit_value,
      timeZone: current.time_zone,
    };
    const changed = KEYS.filter((k) => before[k] !== next[k]);
    if (changed.length === 0) return 0;
    await trx
      .updateTable("shop")
      .set({ ...columns, updated_at: new Date() })
      .where("id", "=", current.id)
      .execute();
    await trx
      .insertInto("shop_setting_changes")
      .values(
        changed.map((k) => ({
          shop_id: current.id,
          field: k,
          before: describeSetting(k, before),
          after: describeSetting(k, next),
          changed_by: changedBy,
        })),
      )
      .execute();
    return changed.length;
  });
}

export async function listSettingChanges(db: Db, limit = 30) {
  const rows = await db
    .selectFrom("shop_setting_changes as c")
    .leftJoin("users as u", "u.id", "c.changed_by")
    .select(["c.id", "c.field", "c.before", "c.after", "c.changed_at", "u.name as changedBy"])
    .orderBy("c.changed_at", "desc")
    .orderBy("c.id", "desc")
    .limit(limit)
    .execute();
  return rows.map((r) => ({
    id: r.id,
    label: SETTING_LABELS[r.field as keyof ShopSettings] ?? "Setting",
    before: r.before,
    after: r.after,
    changedAt: new Date(r.changed_at).toISOString(),
    changedBy: r.changedBy,
  }));
}
