// Signs a demo user in for an e2e test by putting a session row into the e2e database
// and the matching signed cookie into the browser. One test still types the password
// (tests/e2e/auth.spec.ts).
import { randomBytes } from "node:crypto";
import type { BrowserContext, Page } from "@playwright/test";
import { createCookie } from "react-router";
import { createDb } from "../../../db/connect";
import type { Role } from "../../../db/schema/core";
import { DEMO_STAFF } from "../../../db/seed/core";
import {
  hashSecret,
  SESSION_COOKIE_NAME,
  SESSION_TTL_SECONDS,
} from "../../../app/lib/auth/session.server";
import { e2eDatabaseUrl } from "../../support/db-url";

export const E2E_BASE = `http://127.0.0.1:${process.env.E2E_PORT ?? 3100}`;

export function demoUser(role: Role) {
  const user = DEMO_STAFF.find((s) => s.role === role);
  if (!user) throw new Error(`no demo user with role ${role}`);
  return user;
}

/** Makes a session for the user with this e-mail; returns the cookie value. */
export async function sessionCookieValue(email: string): Promise<string> {
  const secret = process.env.SESSION_SECRET;
  if (!secret)
    throw new Error("SESSION_SECRET is not set (source scripts/local-env.sh, as npm test does)");
  const db = createDb(e2eDatabaseUrl(), 1);
  try {
    const user = await db
      .selectFrom("users")
      .where((eb) => eb(eb.fn("lower", ["email"]), "=", email.toLowerCase()))
      .select("id")
      .executeTakeFirstOrThrow();
    const id = randomBytes(32).toString("base64url");
    await db
      .insertInto("sessions")
      .values({
        id_hash: hashSecret(id),
        user_id: user.id,
        expires_at: new Date(Date.now() + SESSION_TTL_SECONDS * 1000),
      })
      .execute();
    const header = await createCookie(SESSION_COOKIE_NAME, {
      secrets: [secret],
      path: "/",
    }).serialize(id);
    return header.slice(SESSION_COOKIE_NAME.length + 1).split(";")[0]!;
  } finally {
    await db.destroy();
  }
}

/** Signs the demo user of `role` into the page's browser context. */
export async function loginAs(
  target: Page | BrowserContext,
  role: Role,
): Promise<ReturnType<typeof demoUser>> {
  const context = "context" in target ? target.context() : target;
  const user = demoUser(role);
  const value = await sessionCookieValue(user.email);
  await context.addCookies([
    { name: SESSION_COOKIE_NAME, value, url: E2E_BASE, httpOnly: true, sameSite: "Lax" },
  ]);
  return user;
}
