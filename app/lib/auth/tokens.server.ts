// Single-use, expiring links for invites and password resets. The link carries a random
// value and its HMAC; the database keeps only a hash of the value, and when it was used.
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import type { AuthToken, AuthTokenKind } from "../../../db/schema/auth";
import type { Role } from "../../../db/schema/core";
import type { Db } from "../db.server";
import { env } from "../env.server";
import { hashSecret } from "./session.server";

export const TOKEN_TTL_HOURS: Record<AuthTokenKind, number> = { invite: 72, reset: 1 };

function sign(kind: AuthTokenKind, value: string): string {
  return createHmac("sha256", env().SESSION_SECRET)
    .update(`${kind}:${value}`)
    .digest("base64url")
    .slice(0, 32);
}

export async function createToken(
  db: Db,
  input: {
    kind: AuthTokenKind;
    email: string;
    role?: Role | null;
    userId?: number | null;
    createdBy?: number | null;
  },
  now = new Date(),
): Promise<{ token: string; row: AuthToken }> {
  const value = randomBytes(24).toString("base64url");
  const row = await db
    .insertInto("auth_tokens")
    .values({
      kind: input.kind,
      token_hash: hashSecret(value),
      email: input.email.trim(),
      role: input.role ?? null,
      user_id: input.userId ?? null,
      created_by: input.createdBy ?? null,
      expires_at: new Date(now.getTime() + TOKEN_TTL_HOURS[input.kind] * 3600 * 1000),
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return { token: `${value}.${sign(input.kind, value)}`, row };
}

export type TokenCheck =
  { ok: true; row: AuthToken } | { ok: false; reason: "invalid" | "expired" | "used" };

export const TOKEN_PROBLEMS: Record<
  AuthTokenKind,
  Record<"invalid" | "expired" | "used", string>
> = {
  invite: {
    invalid:
      "This invite link is not valid. Check that the whole link was copied, or ask the owner for a new invite.",
    expired: "This invite link has expired. Ask the owner to send a new one.",
    used: "This invite link has already been used. Sign in with the password you set, or ask the owner for a new invite.",
  },
  reset: {
    invalid:
      "This reset link is not valid. Check that the whole link was copied, or ask for a new one.",
    expired: "This reset link has expired (they last one hour). Ask for a new one.",
    used: "This reset link has already been used. Ask for a new one if you still need to change your password.",
  },
};

/** Looks a link's token up; with `lock`, inside a transaction, holds the row until commit. */
export async function checkToken(
  db: Db,
  kind: AuthTokenKind,
  token: string,
  { lock = false, now = new Date() }: { lock?: boolean; now?: Date } = {},
): Promise<TokenCheck> {
  const [value, signature] = token.split(".");
  if (!value || !signature) return { ok: false, reason: "invalid" };
  const expected = Buffer.from(sign(kind, value));
  const given = Buffer.from(signature);
  if (expected.length !== given.length || !timingSafeEqual(expected, given))
    return { ok: false, reason: "invalid" };
  let q = db
    .selectFrom("auth_tokens")
    .where("kind", "=", kind)
    .where("token_hash", "=", hashSecret(value))
    .selectAll();
  if (lock) q = q.forUpdate();
  const row = await q.executeTakeFirst();
  if (!row || row.revoked_at) return { ok: false, reason: "invalid" };
  if (row.used_at) return { ok: false, reason: "used" };
  if (new Date(row.expires_at) <= now) return { ok: false, reason: "expired" };
  return { ok: true, row };
}

export async function markTokenUsed(db: Db, id: number): Promise<void> {
  await db.updateTable("auth_tokens").set({ used_at: new Date() }).where("id", "=", id).execute();
}

export function linkFor(path: string): string {
  return new URL(path, env().APP_URL).toString();
}
