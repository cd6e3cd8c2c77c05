// Staff accounts: invites, roles, disabling. The shop always keeps one active owner.
import { sql } from "kysely";
import type { Role } from "../../../db/schema/core";
import type { Db } from "../db.server";
import { queueMail } from "../mail/mail.server";
import { ROLE_LABELS } from "./permissions";
import { destroyUserSessions } from "./session.server";
import { createToken, linkFor, TOKEN_TTL_HOURS } from "./tokens.server";

export const LAST_OWNER =
  "The shop needs at least one active owner. Make another person an owner first, then change this account.";

export class StaffRuleError extends Error {}

// Runs `fn` in the caller's transaction when there is one, else in a new one.
function inTransaction<T>(db: Db, fn: (trx: Db) => Promise<T>): Promise<T> {
  return db.isTransaction ? fn(db) : db.transaction().execute(fn);
}

export async function listStaff(db: Db) {
  return db
    .selectFrom("users")
    .select(["id", "email", "name", "role", "disabled_at", "password_hash", "created_at"])
    .orderBy("disabled_at", (ob) => ob.asc().nullsFirst())
    .orderBy("name")
    .execute()
    .then((rows) =>
      rows.map(({ password_hash, ...r }) => ({ ...r, hasPassword: password_hash !== null })),
    );
}

export async function listPendingInvites(db: Db, now = new Date()) {
  return db
    .selectFrom("auth_tokens")
    .where("kind", "=", "invite")
    .where("used_at", "is", null)
    .where("revoked_at", "is", null)
    .where("expires_at", ">", now)
    .select(["id", "email", "role", "expires_at", "created_at"])
    .orderBy("created_at", "desc")
    .execute();
}

export async function emailInUse(db: Db, email: string): Promise<boolean> {
  const row = await db
    .selectFrom("users")
    .where((eb) => eb(eb.fn("lower", ["email"]), "=", email.trim().toLowerCase()))
    .select("id")
    .executeTakeFirst();
  return Boolean(row);
}

export async function inviteStaff(
  db: Db,
  input: { email: string; role: Role; invitedBy: { id: number; name: string } },
) {
  return db.transaction().execute(async (trx) => {
    // A new invite replaces any earlier one for the same address.
    await trx
      .updateTable("auth_tokens")
      .set({ revoked_at: new Date() })
      .where("kind", "=", "invite")
      .where("used_at", "is", null)
      .where("revoked_at", "is", null)
      .where((eb) => eb(eb.fn("lower", ["email"]), "=", input.email.trim().toLowerCase()))
      .execute();
    const { token, row } = await createToken(trx, {
      kind: "invite",
      email: input.email,
      role: input.role,
      createdBy: input.invitedBy.id,
    });
    const link = linkFor(`/invite/${token}`);
    await queueMail(trx, {
      key: `invite:${row.id}`,
      to: row.email,
      subject: "You are invited to the shop's Torquewright",
      text: [
        `${input.invitedBy.name} invited you to join the shop's Torquewright as ${ROLE_LABELS[input.role].toLowerCase()}.`,
        "",
        "Open this link to choose your name and password:",
        link,
        "",
        `The link works once and expires in ${TOKEN_TTL_HOURS.invite} hours.`,
        "If you did not expect this, ignore this e-mail.",
      ].join("\n"),
    });
    return row;
  });
}

async function activeOwnersOtherThan(db: Db, userId: number): Promise<number> {
  // Lock the owner rows so two owners cannot demote each other at the same moment.
  const rows = await db
    .selectFrom("users")
    .where("role", "=", "owner")
    .where("disabled_at", "is", null)
    .where("id", "!=", userId)
    .select("id")
    .forUpdate()
    .execute();
  return rows.length;
}

export async function changeRole(db: Db, userId: number, role: Role) {
  await inTransaction(db, async (trx) => {
    const user = await trx
      .selectFrom("users")
      .where("id", "=", userId)
      .selectAll()
      .forUpdate()
      .executeTakeFirst();
    if (!user) throw new StaffRuleError("That account no longer exists.");
    if (
      user.role === "owner" &&
      role !== "owner" &&
      !user.disabled_at &&
      (await activeOwnersOtherThan(trx, userId)) === 0
    ) {
      throw new StaffRuleError(LAST_OWNER);
    }
    await trx
      .updateTable("users")
      .set({ role, updated_at: sql`now()` })
      .where("id", "=", userId)
      .execute();
  });
}

export async function setDisabled(db: Db, userId: number, disabled: boolean) {
  await inTransaction(db, async (trx) => {
    const user = await trx
      .selectFrom("users")
      .where("id", "=", userId)
      .selectAll()
      .forUpdate()
      .executeTakeFirst();
    if (!user) throw new StaffRuleError("That account no longer exists.");
    if (
      disabled &&
      user.role === "owner" &&
      !user.disabled_at &&
      (await activeOwnersOtherThan(trx, userId)) === 0
    ) {
      throw new StaffRuleError(LAST_OWNER);
    }
    await trx
      .updateTable("users")
      .set({ disabled_at: disabled ? new Date() : null, updated_at: sql`now()` })
      .where("id", "=", userId)
      .execute();
    if (disabled) await destroyUserSessions(trx, userId);
  });
}

export async function revokeInvite(db: Db, tokenId: number) {
  await db
    .updateTable("auth_tokens")
    .set({ revoked_at: new Date() })
    .where("id", "=", tokenId)
    .where("kind", "=", "invite")
    .where("used_at", "is", null)
    .execute();
}
