// Where a new package for a bike starts: its engine family's stock parts, with the
// parts the bike carries now in their slots (a catalog part fitted since the factory
// replaces the stock one), and the family's stock rev limit. "What changes" on the
// bench is then always relative to what is on the bike.
import type { Db } from "../db.server";
import { emptySpec, type BenchSpec } from "../bench/spec";
import { SLOTS } from "./slots";

export async function startingSpecForBike(db: Db, bikeId: number): Promise<BenchSpec> {
  const spec = emptySpec();
  const bike = await db
    .selectFrom("bikes as b")
    .leftJoin("engine_families as f", "f.id", "b.engine_family_id")
    .select(["f.stock_parts", "f.stock_rev_limit_rpm"])
    .where("b.id", "=", bikeId)
    .executeTakeFirst();
  if (!bike) return spec;
  const stock = (bike.stock_parts ?? {}) as Record<string, number>;
  for (const s of SLOTS) {
    const id = stock[s.key];
    if (typeof id === "number") spec.slots[s.key] = { partId: id, measured: {} };
  }
  const installed = await db
    .selectFrom("bike_parts")
    .select(["part_id", "category"])
    .where("bike_id", "=", bikeId)
    .where("removed_at", "is", null)
    .where("part_id", "is not", null)
    .orderBy("fitted_on", "asc")
    .orderBy("id", "asc")
    .execute();
  for (const p of installed) {
    const slot = SLOTS.find((s) => s.category === p.category);
    if (slot && p.part_id !== null) spec.slots[slot.key] = { partId: p.part_id, measured: {} };
  }
  spec.revLimitRpm = bike.stock_rev_limit_rpm ?? null;
  return spec;
}
