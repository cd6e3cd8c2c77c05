// Sessions live in PostgreSQL; the cookie carries only a signed, random id. Signing out,
// disabling an account or changing a role therefore takes effect on the next request.
import { createHash, randomBytes } from "node:crypto";
import { sql } from "kysely";
import { createCookie, type Cookie } from "react-router";
import type { Role } from "../../../db/schema/core";
import type { Db } from "../db.server";
import { env } from "../env.server";

export const SESSION_COOKIE_NAME = "tw_session";
export const SESSION_TTL_SECONDS = 60 * 60 * 24 * 14;

let cookie: Cookie | undefined;

export function sessionCookie(): Cookie {
  if (!cookie) {
    cookie = createCookie(SESSION_COOKIE_NAME, {
      httpOnly: true,
      sameSite: "lax",
      secure: new URL(env().APP_URL).protocol === "https:",
      path: "/",
      maxAge: SESSION_TTL_SECONDS,
      secrets: [env().SESSION_SECRET],
    });
  }
  return cookie;
}

export function hashSecret(value: string): string {
  return createHash("sha256").update(value).digest("hex");
}

export type SessionRecord = { id: number; email: string; name: string; role: Role };

/** Creates a session row and returns the Set-Cookie header value for it. */
export async function createSession(db: Db, userId: number): Promise<string> {
  const id = randomBytes(32).toString("base64url");
  await db
    .insertInto("sessions")
    .values({
      id_hash: hashSecret(id),
      user_id: userId,
      expires_at: new Date(Date.now() + SESSION_TTL_SECONDS * 1000),
    })
    .execute();
  return sessionCookie().serialize(id);
}

// A signed cookie's check is an HMAC through Web Crypto, a job on another thread, on every
// request. The same Cookie header always checks the same way while the secrets stay, so
// the answer (the id's hash, or null) is remembered per header; the session row itself is
// still read on every request, so sign-out, a disabled account or a role change applies at once.
const checkedCookies = new Map<string, string | null>();
const MAX_CHECKED_COOKIES = 2000;

/** The session id from a correctly signed cookie, or null (missing or tampered). */
export async function readSessionId(request: Request): Promise<string | null> {
  const value: unknown = await sessionCookie().parse(request.headers.get("Cookie"));
  return typeof value === "string" && value.length > 0 ? value : null;
}

/** The hash of the request's session id (what the sessions table keeps), or null. */
async function sessionHash(request: Request): Promise<string | null> {
  const header = request.headers.get("Cookie");
  if (!header) return null;
  const known = checkedCookies.get(header);
  if (known !== undefined) return known;
  const id = await readSessionId(request);
  const hash = id ? hashSecret(id) : null;
  if (checkedCookies.size >= MAX_CHECKED_COOKIES) checkedCookies.clear();
  checkedCookies.set(header, hash);
  return hash;
}

/** The active user behind the request's session, or null. */
export async function getSessionRecord(db: Db, request: Request): Promise<SessionRecord | null> {
  const hash = await sessionHash(request);
  if (!hash) return null;
  // SQL text: building this query with the query builder cost more than running it
  const r = await sql<SessionRecord>`
    select u.id, u.email, u.name, u.role
      from sessions s join users u on u.id = s.user_id
     where s.id_hash = ${hash} and s.expires_at > ${new Date()} and u.disabled_at is null`.execute(
    db,
  );
  return r.rows[0] ?? null;
}

/** Ends the request's session; returns the Set-Cookie header value that clears the cookie. */
export async function destroySession(db: Db, request: Request): Promise<string> {
  const id = await readSessionId(request);
  if (id) await db.deleteFrom("sessions").where("id_hash", "=", hashSecret(id)).execute();
  return sessionCookie().serialize("", { maxAge: 0, expires: new Date(0) });
}

export async function destroyUserSessions(db: Db, userId: number): Promise<number> {
  const res = await db.deleteFrom("sessions").where("user_id", "=", userId).executeTakeFirst();
  return Number(res.numDeletedRows);
}

export async function deleteExpiredSessions(db: Db, now = new Date()): Promise<number> {
  const res = await db.deleteFrom("sessions").where("expires_at", "<=", now).executeTakeFirst();
  return Number(res.numDeletedRows);
}
