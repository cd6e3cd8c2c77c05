import type { Kysely } from "kysely";
import { createDb } from "../../db/connect";
import type { Database } from "../../db/schema";
import { env } from "./env.server";

// One pool per process; app servers keep no other state, so several can run
// behind a load balancer against one PostgreSQL.
const globalForDb = globalThis as unknown as { __twDb?: Kysely<Database> };

export function getDb(): Kysely<Database> {
  if (!globalForDb.__twDb) {
    globalForDb.__twDb = createDb(env().DATABASE_URL, env().DATABASE_POOL_MAX);
  }
  return globalForDb.__twDb;
}

export type Db = Kysely<Database>;
