import type { Kysely } from "kysely";
import { data } from "react-router";
import { createDb, isConnectionError } from "../../db/connect";
import type { Database } from "../../db/schema";
import { env } from "./env.server";

/** What a page says while the database is away (a restart, a failover, a network break). */
export const DB_UNREACHABLE_MESSAGE =
  "The database is not reachable right now, so this page cannot be shown and nothing you sent was saved. Try again in a moment.";
/** What a save says in the same case; the screen keeps the change so it can be sent again. */
export const DB_UNREACHABLE_SAVE_MESSAGE =
  "The database is not reachable; your change was not saved. Try again in a moment.";
export const DB_UNREACHABLE_STATUS_TEXT = "Database not reachable";

// The thrown answers, with the driver's error behind each (for /healthz and the log).
const causes = new WeakMap<object, unknown>();

/**
 * A lost connection becomes a thrown 503 answer, so whatever route hit it renders the
 * root error boundary's "database is not reachable" page instead of a bare 500; every
 * other error is thrown as it is.
 */
function mapDbError(e: unknown): unknown {
  if (!isConnectionError(e)) return e;
  const answer = data(DB_UNREACHABLE_MESSAGE, {
    status: 503,
    statusText: DB_UNREACHABLE_STATUS_TEXT,
    headers: { "Retry-After": "5", "Cache-Control": "no-store" },
  });
  causes.set(answer, e);
  return answer;
}

/** True for a driver error or a thrown answer that says the database cannot be reached. */
export function isDatabaseUnreachable(e: unknown): boolean {
  return (typeof e === "object" && e !== null && causes.has(e)) || isConnectionError(e);
}

/** The driver's words for why the database cannot be reached (or any error's message). */
export function dbErrorReason(e: unknown): string {
  const cause = typeof e === "object" && e !== null && causes.has(e) ? causes.get(e) : e;
  if (cause instanceof Error) {
    const code = (cause as { code?: unknown }).code;
    return cause.message || (typeof code === "string" ? code : cause.name);
  }
  return String(cause);
}

// One pool per process; app servers keep no other state, so several can run
// behind a load balancer against one PostgreSQL.
const globalForDb = globalThis as unknown as { __twDb?: Kysely<Database> };

export function getDb(): Kysely<Database> {
  if (!globalForDb.__twDb) {
    globalForDb.__twDb = createDb(env().DATABASE_URL, env().DATABASE_POOL_MAX, {
      mapError: mapDbError,
    });
  }
  return globalForDb.__twDb;
}

export type Db = Kysely<Database>;
