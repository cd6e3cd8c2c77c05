// Sign-in throttling, kept in PostgreSQL so every app server sees the same count.
import type { Db } from "../db.server";
import { env } from "../env.server";

export const THROTTLE_WINDOW_SECONDS = 15 * 60;
export const MAX_ACCOUNT_FAILURES = 5;
export const MAX_ADDRESS_FAILURES = 30;

/** Set by scripts/serve.mjs from the socket; a client's own value is overwritten there. */
export const CLIENT_ADDRESS_HEADER = "x-torquewright-client-address";

/**
 * The client's address: X-Forwarded-For only behind our own proxy (TRUST_PROXY=1),
 * else the socket address our server reports. A server that reports none (a test
 * calling an action directly) counts as one local address.
 */
export function clientAddress(request: Request, trustProxy = env().TRUST_PROXY === "1"): string {
  if (trustProxy) {
    const first = request.headers.get("X-Forwarded-For")?.split(",")[0]?.trim();
    if (first) return first.slice(0, 64);
  }
  const socket = request.headers.get(CLIENT_ADDRESS_HEADER)?.trim();
  return socket ? socket.slice(0, 64) : "127.0.0.1";
}

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

/** Seconds until the next try is allowed (0 when it is allowed now). */
export async function secondsUntilAllowed(
  db: Db,
  email: string,
  ip: string,
  now = new Date(),
): Promise<number> {
  const since = new Date(now.getTime() - THROTTLE_WINDOW_SECONDS * 1000);
  const key = normaliseEmail(email);
  const success = await db
    .selectFrom("login_attempts")
    .where("email", "=", key)
    .where("succeeded", "=", true)
    .orderBy("created_at", "desc")
    .select("created_at")
    .limit(1)
    .executeTakeFirst();
  const accountSince = success && success.created_at > since ? success.created_at : since;
  const [account, address] = await Promise.all([
    recentFailures(db, "email", key, accountSince, MAX_ACCOUNT_FAILURES),
    recentFailures(db, "ip", ip, since, MAX_ADDRESS_FAILURES),
  ]);
  const waits = [0];
  if (account.length >= MAX_ACCOUNT_FAILURES)
    waits.push(retryAfter(account.at(-1)!.created_at, now));
  if (address.length >= MAX_ADDRESS_FAILURES)
    waits.push(retryAfter(address.at(-1)!.created_at, now));
  return Math.max(...waits);
}

/** The newest `limit` failures for one account or one address since `since`. */
function recentFailures(db: Db, column: "email" | "ip", value: string, since: Date, limit: number) {
  return db
    .selectFrom("login_attempts")
    .where(column, "=", value)
    .where("succeeded", "=", false)
    .where("created_at", ">", since)
    .orderBy("created_at", "desc")
    .select("created_at")
    .limit(limit)
    .execute();
}

function retryAfter(oldestCounted: Date | string, now: Date): number {
  const until = new Date(oldestCounted).getTime() + THROTTLE_WINDOW_SECONDS * 1000;
  return Math.max(0, Math.ceil((until - now.getTime()) / 1000));
}

export async function recordAttempt(
  db: Db,
  email: string,
  ip: string,
  succeeded: boolean,
): Promise<void> {
  await db
    .insertInto("login_attempts")
    .values({ email: normaliseEmail(email), ip, succeeded })
    .execute();
}

export function describeWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? "" : "s"}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? "" : "s"}`;
}

export async function deleteOldAttempts(db: Db, now = new Date()): Promise<number> {
  const before = new Date(now.getTime() - 24 * 60 * 60 * 1000);
  const res = await db
    .deleteFrom("login_attempts")
    .where("created_at", "<", before)
    .executeTakeFirst();
  return Number(res.numDeletedRows);
}
