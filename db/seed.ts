// Loads the demo scenario into the database named by DATABASE_URL.
//   tsx db/seed.ts             seed (refuses when the demo is already there)
//   tsx db/seed.ts --if-empty  seed only an empty database (what npm start does)
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { Kysely } from "kysely";
import { createDb } from "./connect";
import type { Database } from "./schema";
import { seedCore } from "./seed/core";
import { seedAuth } from "./seed/auth";
import { seedCatalog } from "./seed/catalog";
import { seedPackages } from "./seed/packages";
import { seedRequests } from "./seed/requests";
import { seedDyno } from "./seed/dyno";
import { seedQuotes } from "./seed/quotes";

export async function seed(db: Kysely<Database>) {
  await db.transaction().execute(async (trx) => {
    await seedCore(trx);
    await seedAuth(trx);
    await seedCatalog(trx);
    await seedPackages(trx);
    await seedRequests(trx);
    await seedQuotes(trx);
  });
  // objects cannot join the transaction: stored after it, each with its rows
  await seedDyno(db);
}

export async function isEmpty(db: Kysely<Database>) {
  const row = await db
    .selectFrom("shop")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirst();
  return Number(row?.n ?? 0) === 0;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error("db: DATABASE_URL is not set");
    process.exit(1);
  }
  const db = createDb(url, 2);
  const onlyIfEmpty = process.argv.includes("--if-empty");
  (async () => {
    if (!(await isEmpty(db))) {
      console.log(
        onlyIfEmpty ? "db: demo data already present" : "db: not empty; run npm run db:reset first",
      );
      if (!onlyIfEmpty) process.exitCode = 1;
      return;
    }
    await seed(db);
    console.log("db: seeded the demo shop");
  })()
    .catch((e) => {
      console.error(e);
      process.exitCode = 1;
    })
    .finally(() => db.destroy());
}
