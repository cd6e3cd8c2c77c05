// Runs the migrations in db/migrations with Kysely's Migrator.
//   tsx db/migrate.ts            migrate to the latest
//   tsx db/migrate.ts down       undo the last one
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { FileMigrationProvider, Migrator } from "kysely";
import { createDb } from "./connect";

const here = path.dirname(fileURLToPath(import.meta.url));

export async function migrate(url: string, direction: "latest" | "down" = "latest") {
  const db = createDb(url, 2);
  const migrator = new Migrator({
    db,
    provider: new FileMigrationProvider({
      fs,
      path,
      migrationFolder: path.join(here, "migrations"),
    }),
  });
  try {
    const { error, results } =
      direction === "down" ? await migrator.migrateDown() : await migrator.migrateToLatest();
    for (const r of results ?? []) {
      const verb = r.direction === "Up" ? "applied" : "reverted";
      if (r.status === "Success") console.log(`db: ${verb} ${r.migrationName}`);
      else if (r.status === "Error") console.error(`db: failed ${r.migrationName}`);
    }
    if (error) throw error;
  } finally {
    await db.destroy();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error("db: DATABASE_URL is not set");
    process.exit(1);
  }
  migrate(url, process.argv[2] === "down" ? "down" : "latest").catch((e) => {
    console.error(e);
    process.exit(1);
  });
}
