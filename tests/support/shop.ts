// The shop row the app reads its rates from (npm start's seed makes it; the test database
// starts empty). Made once, under a lock, whichever test file gets there first.
import { sql } from "kysely";
import type { Db } from "~/lib/db.server";

export const TEST_SHOP = {
  name: "Test shop",
  city: "Testville",
  phone: "555-0100",
  email: "shop@shop.test",
  labour_rate_cents: 12500,
  tax_rate_bp: 825,
};

export async function ensureShop(db: Db): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await sql`select pg_advisory_xact_lock(7301)`.execute(trx);
    const any = await trx.selectFrom("shop").select("id").executeTakeFirst();
    if (!any) await trx.insertInto("shop").values(TEST_SHOP).execute();
  });
}
