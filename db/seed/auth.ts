// Demo passwords for the demo staff.
//   tsx db/seed/auth.ts   gives demo accounts without a password the demo password
//                         (for a demo database seeded before accounts had passwords)
import path from "node:path";
import { fileURLToPath } from "node:url";
import bcrypt from "bcryptjs";
import type { Kysely } from "kysely";
import { createDb } from "../connect";
import type { Database } from "../schema";
import { DEMO_STAFF } from "./core";

// Every demo account signs in with this password. It is for the demo data only.
export const DEMO_PASSWORD = "bench-and-bore-0142";

/** Sets the demo password on demo accounts that have none; returns how many. */
export async function seedAuth(db: Kysely<Database>): Promise<number> {
  const hash = await bcrypt.hash(DEMO_PASSWORD, 10);
  const res = await db
    .updateTable("users")
    .set({ password_hash: hash })
    .where(
      "email",
      "in",
      DEMO_STAFF.map((s) => s.email),
    )
    .where("password_hash", "is", null)
    .executeTakeFirst();
  return Number(res.numUpdatedRows);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error("db: DATABASE_URL is not set");
    process.exit(1);
  }
  const db = createDb(url, 1);
  seedAuth(db)
    .then((n) => {
      if (n > 0) console.log(`db: gave ${n} demo account(s) the demo password`);
    })
    .catch((e) => {
      console.error(e);
      process.exitCode = 1;
    })
    .finally(() => db.destroy());
}
