// Fixtures for integration tests: users of a role, and requests signed in as them
// through a real session row and a signed cookie.
import { randomBytes } from "node:crypto";
import type { Role, User } from "../../db/schema";
import { hashPassword } from "~/lib/auth/auth.server";
import type { Db } from "~/lib/db.server";
import { getDb } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { createSession } from "~/lib/auth/session.server";

export const TEST_PASSWORD = "bench-test-pass-4417";
/**
 * bcrypt (cost 10, as `BCRYPT_COST`) of TEST_PASSWORD, made once: hashing in pure JS costs
 * tens of milliseconds per user. auth-login.test.ts checks that it still matches.
 */
export const TEST_PASSWORD_HASH = "$2b$10$gajtEJA0KS3hr51a2Fvd7e1Zr38vZszvLhXgVrN.Cwd..3cqMxWO2";

export type TestUser = User & { password: string };

export async function createTestUser(
  db: Db,
  role: Role,
  overrides: Partial<Pick<User, "email" | "name" | "disabled_at">> & {
    password?: string | null;
  } = {},
): Promise<TestUser> {
  const tag = randomBytes(5).toString("hex");
  const password = overrides.password === undefined ? TEST_PASSWORD : overrides.password;
  const row = await db
    .insertInto("users")
    .values({
      email: overrides.email ?? `${role.replace("_", "-")}-${tag}@staff.test`,
      name: overrides.name ?? `Test ${role.replace("_", " ")} ${tag}`,
      role,
      password_hash:
        password === null
          ? null
          : password === TEST_PASSWORD
            ? TEST_PASSWORD_HASH
            : await hashPassword(password),
      disabled_at: overrides.disabled_at ?? null,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return { ...row, password: password ?? "" };
}

/** A `Cookie` header value for a fresh session of this user. */
export async function cookieFor(user: Pick<User, "id">, db: Db = getDb()): Promise<string> {
  const setCookie = await createSession(db, user.id);
  return setCookie.split(";")[0]!;
}

/** A Request as this user; relative URLs resolve against APP_URL; posts carry our Origin. */
export async function requestAs(
  user: Pick<User, "id">,
  url: string,
  init: RequestInit = {},
): Promise<Request> {
  return signedOutRequest(url, {
    ...init,
    headers: withCookie(init.headers, await cookieFor(user)),
  });
}

/** A Request with no session; posts carry our Origin unless the caller set one. */
export function signedOutRequest(url: string, init: RequestInit = {}): Request {
  const absolute = new URL(url, env().APP_URL);
  const headers = new Headers(init.headers);
  const method = (init.method ?? "GET").toUpperCase();
  if (method !== "GET" && method !== "HEAD" && !headers.has("Origin"))
    headers.set("Origin", absolute.origin);
  return new Request(absolute, { ...init, headers });
}

function withCookie(headers: HeadersInit | undefined, cookie: string): Headers {
  const h = new Headers(headers);
  const existing = h.get("Cookie");
  h.set("Cookie", existing ? `${existing}; ${cookie}` : cookie);
  return h;
}

/** A url-encoded form body, for action requests. */
export function form(fields: Record<string, string>): URLSearchParams {
  return new URLSearchParams(fields);
}
