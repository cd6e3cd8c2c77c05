// Drops and recreates the database named in DATABASE_URL, then migrates it.
// Refuses to touch anything but a loopback server unless TW_ALLOW_RESET=1.
import path from "node:path";
import { fileURLToPath } from "node:url";
import pg from "pg";
import { migrate } from "./migrate";

export async function resetDatabase(url: string) {
  const target = new URL(url);
  const name = decodeURIComponent(target.pathname.slice(1));
  if (!/^[a-z0-9_]+$/.test(name))
    throw new Error(`db: refusing to reset an oddly named database "${name}"`);
  const loopback = ["127.0.0.1", "localhost", "[::1]"].includes(target.hostname);
  if (!loopback && process.env.TW_ALLOW_RESET !== "1") {
    throw new Error(
      "db: refusing to reset a database that is not on this machine (set TW_ALLOW_RESET=1)",
    );
  }
  const admin = new URL(url);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    await client.query(`drop database if exists "${name}" with (force)`);
    await client.query(`create database "${name}"`);
  } finally {
    await client.end();
  }
  await migrate(url);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error("db: DATABASE_URL is not set");
    process.exit(1);
  }
  resetDatabase(url)
    .then(() => console.log(`db: reset ${new URL(url).pathname.slice(1)}`))
    .catch((e) => {
      console.error(e instanceof Error ? e.message : e);
      process.exit(1);
    });
}
