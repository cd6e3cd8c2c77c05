// Each user's unit system for the bench and the sheets (inch or metric), kept in PostgreSQL.
import type { UnitSystem } from "../../db/schema/packages";
import type { Db } from "./db.server";

export async function getUnits(db: Db, userId: number): Promise<UnitSystem> {
  const row = await db
    .selectFrom("user_preferences")
    .select("units")
    .where("user_id", "=", userId)
    .executeTakeFirst();
  return row?.units ?? "inch";
}

export async function setUnits(db: Db, userId: number, units: UnitSystem): Promise<void> {
  await db
    .insertInto("user_preferences")
    .values({ user_id: userId, units })
    .onConflict((oc) => oc.column("user_id").doUpdateSet({ units, updated_at: new Date() }))
    .execute();
}
