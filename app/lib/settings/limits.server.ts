// The shop's caution limits in PostgreSQL: read for the bench's evaluation, changed by
// the owner on /settings/limits, every change kept with who made it and when.
import type { Db } from "../db.server";
import {
  DEFAULT_LIMITS,
  LIMIT_BY_KEY,
  LIMIT_DEFS,
  calcLimitsOf,
  limitText,
  type CalcLimits,
  type LimitKey,
  type ShopLimits,
} from "./limits";

export interface LimitState {
  key: LimitKey;
  value: number | string;
  /** Whether the owner set it (else it is the default). */
  changed: boolean;
  updatedBy: string | null;
  updatedAt: string | null;
}

export interface LimitChange {
  id: number;
  key: string;
  label: string;
  oldValue: string | null;
  newValue: string;
  changedBy: string | null;
  changedAt: string;
}

type Row = { key: string; value_num: number | null; value_text: string | null };

function merge(rows: readonly Row[]): ShopLimits {
  const out = { ...DEFAULT_LIMITS } as Record<string, number | string>;
  for (const r of rows) {
    const def = LIMIT_BY_KEY.get(r.key as LimitKey);
    if (!def) continue;
    if (def.kind === "number" && r.value_num !== null) out[def.key] = r.value_num;
    else if (def.kind !== "number" && r.value_text !== null) out[def.key] = r.value_text;
  }
  return out as unknown as ShopLimits;
}

/** Every limit: the owner's value where one is set, else the default. */
export async function getShopLimits(db: Db): Promise<ShopLimits> {
  const rows = await db
    .selectFrom("caution_limits")
    .select(["key", "value_num", "value_text"])
    .execute();
  return merge(rows);
}

/** The shop's limits as calc takes them (thresholds and the bench's fuel grade). */
export async function getCalcLimits(db: Db): Promise<CalcLimits> {
  return calcLimitsOf(await getShopLimits(db));
}

/** Each limit with who set it and when, for the owner's page. */
export async function listLimitStates(db: Db): Promise<LimitState[]> {
  const rows = await db
    .selectFrom("caution_limits as l")
    .leftJoin("users as u", "u.id", "l.updated_by")
    .select(["l.key", "l.value_num", "l.value_text", "l.updated_at", "u.name as updated_by_name"])
    .execute();
  const byKey = new Map(rows.map((r) => [r.key, r]));
  const values = merge(rows);
  return LIMIT_DEFS.map((d) => {
    const r = byKey.get(d.key);
    return {
      key: d.key,
      value: values[d.key],
      changed: r !== undefined,
      updatedBy: r?.updated_by_name ?? null,
      updatedAt: r ? new Date(r.updated_at).toISOString() : null,
    };
  });
}

export async function listLimitChanges(db: Db, limit = 30): Promise<LimitChange[]> {
  const rows = await db
    .selectFrom("caution_limit_changes as c")
    .leftJoin("users as u", "u.id", "c.changed_by")
    .select(["c.id", "c.key", "c.old_value", "c.new_value", "c.changed_at", "u.name"])
    .orderBy("c.id", "desc")
    .limit(limit)
    .execute();
  return rows.map((r) => ({
    id: r.id,
    key: r.key,
    label: LIMIT_BY_KEY.get(r.key as LimitKey)?.label ?? r.key,
    oldValue: r.old_value,
    newValue: r.new_value,
    changedBy: r.name,
    changedAt: new Date(r.changed_at).toISOString(),
  }));
}

/**
 * Saves the limits that differ from the current ones, in one transaction, with a change
 * row for each. Returns the keys changed.
 */
export async function saveShopLimits(
  db: Db,
  next: ShopLimits,
  userId: number,
): Promise<LimitKey[]> {
  return db.transaction().execute(async (trx) => {
    // one owner's save at a time: the old values in the log are the ones replaced
    await trx.selectFrom("caution_limits").select("key").forUpdate().execute();
    const current = await getShopLimits(trx);
    const changed: LimitKey[] = [];
    for (const def of LIMIT_DEFS) {
      const was = current[def.key];
      const now = next[def.key];
      if (was === now) continue;
      changed.push(def.key);
      const isNum = typeof now === "number";
      await trx
        .insertInto("caution_limits")
        .values({
          key: def.key,
          value_num: isNum ? now : null,
          value_text: isNum ? null : now,
          updated_by: userId,
        })
        .onConflict((oc) =>
          oc.column("key").doUpdateSet({
            value_num: isNum ? now : null,
            value_text: isNum ? null : now,
            updated_by: userId,
            updated_at: new Date(),
          }),
        )
        .execute();
      await trx
        .insertInto("caution_limit_changes")
        .values({
          key: def.key,
          old_value: limitText(def, was),
          new_value: limitText(def, now),
          changed_by: userId,
        })
        .execute();
    }
    return changed;
  });
}
