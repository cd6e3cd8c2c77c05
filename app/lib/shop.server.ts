import type { Db } from "./db.server";

export async function getShopOverview(db: Db) {
  const shop = await db.selectFrom("shop").selectAll().orderBy("id").limit(1).executeTakeFirst();
  const [customers, bikes, staff] = await Promise.all([
    db
      .selectFrom("customers")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirstOrThrow(),
    db
      .selectFrom("bikes")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirstOrThrow(),
    db
      .selectFrom("users")
      .where("disabled_at", "is", null)
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirstOrThrow(),
  ]);
  return {
    shop: shop ?? null,
    counts: { customers: Number(customers.n), bikes: Number(bikes.n), staff: Number(staff.n) },
  };
}
