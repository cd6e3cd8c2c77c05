// Prints what the demo holds, for the start command's closing lines.
import { createDb } from "../db/connect";
import { DEMO_SHOP, DEMO_STAFF } from "../db/seed/core";
import { DEMO_PASSWORD } from "../db/seed/auth";

const db = createDb(process.env.DATABASE_URL!, 1);
try {
  const shop = await db.selectFrom("shop").select("name").executeTakeFirst();
  console.log(`demo: ${shop?.name ?? DEMO_SHOP.name}`);
  console.log(`demo staff (password for every demo account: ${DEMO_PASSWORD}):`);
  for (const s of DEMO_STAFF) console.log(`  ${s.role.padEnd(15)} ${s.email}  (${s.name})`);
} finally {
  await db.destroy();
}
