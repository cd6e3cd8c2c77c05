// Sign-in throttling, kept in PostgreSQL so every app server sees the same count.
import { sql } from "kysely";
import type { Db } from "../db.server";
import { env } from "../env.server";

export const THROTTLE_WINDOW_SECONDS = 15 * 60;
/** Failures of one account from one address before each next try waits. */
export const MAX_PAIR_FAILURES = 5;
/** Failures of one account from every address together before unfamiliar addresses wait. */
export const MAX_ACCOUNT_FAILURES = 20;
/** Failures from one address, whichever accounts, before that address waits. */
export const MAX_ADDRESS_FAILURES = 30;
/** The first wait, doubling with each further failure, up to the window. */
export const FIRST_DELAY_SECONDS = 60;
/** How long a successful sign-in keeps its address known-good for the account. */
export const KNOWN_GOOD_DAYS = 90;

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

/**
 * The wait after `failures` failures, the last at `last`: none below `limit`, then
 * FIRST_DELAY_SECONDS doubling with each further failure, never longer than the window.
 */
export function growingDelay(failures: number, limit: number): number {
  if (failures < limit) return 0;
  return Math.min(FIRST_DELAY_SECONDS * 2 ** (failures - limit), THROTTLE_WINDOW_SECONDS);
}

const secondsLeft = (last: Date | string | null, delay: number, now: Date) =>
  last === null || delay === 0
    ? 0
    : Math.max(0, Math.ceil((new Date(last).getTime() + delay * 1000 - now.getTime()) / 1000));

/**
 * Seconds until the next try is allowed (0 when it is allowed now). Three counts, in
 * the last 15 minutes:
 * - this account from this address, since its last success here: growing delays after
 *   MAX_PAIR_FAILURES (a person who mistypes waits a minute, then two, …);
 * - this account from every address, since its last success: growing delays after
 *   MAX_ACCOUNT_FAILURES, but not for an address the account signed in from before, so a
 *   stranger guessing cannot keep the owner out;
 * - this address, whichever accounts: a wait until those failures age out.
 */
export async function secondsUntilAllowed(
  db: Db,
  email: string,
  ip: string,
  now = new Date(),
): Promise<number> {
  const since = new Date(now.getTime() - THROTTLE_WINDOW_SECONDS * 1000);
  const knownSince = new Date(now.getTime() - KNOWN_GOOD_DAYS * 86_400_000);
  const key = normaliseEmail(email);
  const r = await sql<{
    pair_n: string;
    pair_last: Date | null;
    account_n: string;
    account_last: Date | null;
    known_good: boolean;
  }>`
    with s as (
      select max(created_at) filter (where ip = ${ip}) as pair_ok, max(created_at) as account_ok,
             bool_or(ip = ${ip} and created_at > ${knownSince}) as known_good
      from login_attempts where email = ${key} and succeeded
    ), f as (
      select a.ip, a.created_at from login_attempts a
      where a.email = ${key} and not a.succeeded and a.created_at > ${since}
    ), pair as (
      select f.created_at from f, s where f.ip = ${ip} and f.created_at > coalesce(s.pair_ok, '-infinity')
    ), account as (
      select f.created_at from f, s where f.created_at > coalesce(s.account_ok, '-infinity')
    )
    select
      (select count(*) from pair) as pair_n,
      (select max(created_at) from pair) as pair_last,
      (select count(*) from account) as account_n,
      (select max(created_at) from account) as account_last,
      coalesce((select known_good from s), false) as known_good
  `.execute(db);
  const row = r.rows[0]!;
  const address = await db
    .selectFrom("login_attempts")
    .where("ip", "=", ip)
    .where("succeeded", "=", false)
    .where("created_at", ">", since)
    .orderBy("created_at", "desc")
    .select("created_at")
    .limit(MAX_ADDRESS_FAILURES)
    .execute();
  const waits = [
    secondsLeft(row.pair_last, growingDelay(Number(row.pair_n), MAX_PAIR_FAILURES), now),
    row.known_good
      ? 0
      : secondsLeft(
          row.account_last,
          growingDelay(Number(row.account_n), MAX_ACCOUNT_FAILURES),
          now,
        ),
    address.length >= MAX_ADDRESS_FAILURES ? retryAfter(address.at(-1)!.created_at, now) : 0,
  ];
  return Math.max(...waits);
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

/** Failures are kept a day; successes as long as they make an address known-good. */
export async function deleteOldAttempts(db: Db, now = new Date()): Promise<number> {
  const before = new Date(now.getTime() - 24 * 60 * 60 * 1000);
  const knownBefore = new Date(now.getTime() - KNOWN_GOOD_DAYS * 86_400_000);
  const res = await db
    .deleteFrom("login_attempts")
    .where((eb) =>
      eb.or([
        eb.and([eb("succeeded", "=", false), eb("created_at", "<", before)]),
        eb("created_at", "<", knownBefore),
      ]),
    )
    .executeTakeFirst();
  return Number(res.numDeletedRows);
}
