// Who is signed in, and what they may do. Every loader and action asks here.
import bcrypt from "bcryptjs";
import { data, redirect } from "react-router";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import type { Role } from "../../../db/schema/core";
import { getDb } from "../db.server";
import { requireSameOrigin } from "./origin.server";
import { can, ROLE_LABELS, type Permission } from "./permissions";
import { getSessionRecord } from "./session.server";
import {
  clientAddress,
  describeWait,
  normaliseEmail,
  recordAttempt,
  secondsUntilAllowed,
} from "./throttle.server";

export type SessionUser = { id: number; email: string; name: string; role: Role };

export const BCRYPT_COST = 10;

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

// Compared against when the e-mail is unknown, so the answer takes as long either way.
const DUMMY_HASH = "$2b$10$I2gfb9vqgpuFkgH0DreXh.Q0nlUewWB0Zm5P14gyhio.gH0NJCvu2";

/** A same-site path to go to after signing in; anything else becomes the fallback. */
export function safeRedirect(
  to: FormDataEntryValue | string | null | undefined,
  fallback = "/",
): string {
  if (!to || typeof to !== "string") return fallback;
  if (!to.startsWith("/") || to.startsWith("//") || to.startsWith("/\\")) return fallback;
  // eslint-disable-next-line no-control-regex -- control characters are what is refused
  if (/[\u0000-\u001f]/.test(to)) return fallback;
  return to;
}

export async function getUser(request: Request): Promise<SessionUser | null> {
  return getSessionRecord(getDb(), request);
}

/**
 * The signed-in user, or a redirect to the sign-in page that comes back here.
 * Posts must also come from our own pages (every action goes through here).
 */
export async function requireUser(request: Request): Promise<SessionUser> {
  requireSameOrigin(request);
  const user = await getUser(request);
  if (!user) {
    const url = new URL(request.url);
    const back = safeRedirect(`${url.pathname}${url.search}`);
    const query = back === "/" ? "" : `?${new URLSearchParams({ redirectTo: back })}`;
    throw redirect(`/login${query}`);
  }
  return user;
}

/** The signed-in user when their role is one of `roles` (owner is not implied); else 403. */
export async function requireRole(request: Request, ...roles: Role[]): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!roles.includes(user.role)) throw forbidden(user.role);
  return user;
}

/** Like requireRole, with the roles taken from the shared permission table. */
export async function requirePermission(
  request: Request,
  permission: Permission,
): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!can(user.role, permission)) throw forbidden(user.role);
  return user;
}

function forbidden(role: Role) {
  return data(
    `Your role (${ROLE_LABELS[role].toLowerCase()}) does not include this page or action. Ask the owner if you need it.`,
    {
      status: 403,
    },
  );
}

/** A sign-in that did not succeed; the message is safe to show. */
export class SignInError extends Error {
  constructor(
    message: string,
    readonly retryAfterSeconds = 0,
  ) {
    super(message);
    this.name = "SignInError";
  }
}

export const WRONG_CREDENTIALS = "That e-mail and password do not match an active account.";

export async function verifyLogin(
  email: string,
  password: string,
  ip: string,
): Promise<SessionUser> {
  const db = getDb();
  const wait = await secondsUntilAllowed(db, email, ip);
  if (wait > 0) {
    throw new SignInError(
      `Too many failed sign-ins. Wait ${describeWait(wait)} before trying again.`,
      wait,
    );
  }
  const row = await db
    .selectFrom("users")
    .where((eb) => eb(eb.fn("lower", ["email"]), "=", normaliseEmail(email)))
    .select(["id", "email", "name", "role", "password_hash", "disabled_at"])
    .executeTakeFirst();
  const ok = await bcrypt.compare(password, row?.password_hash ?? DUMMY_HASH);
  if (!row || !row.password_hash || row.disabled_at || !ok) {
    await recordAttempt(db, email, ip, false);
    throw new SignInError(WRONG_CREDENTIALS);
  }
  await recordAttempt(db, email, ip, true);
  return { id: row.id, email: row.email, name: row.name, role: row.role };
}

export const authenticator = new Authenticator<SessionUser>();

authenticator.use(
  new FormStrategy(async ({ form, request }) => {
    const email = String(form.get("email") ?? "");
    const password = String(form.get("password") ?? "");
    return verifyLogin(email, password, clientAddress(request));
  }),
  "password",
);
