// Password resets by e-mail. The answer to a request never depends on whether the
// address belongs to an account.
import { sql } from "kysely";
import type { Db } from "../db.server";
import { queueMail } from "../mail/mail.server";
import { destroyUserSessions } from "./session.server";
import { checkToken, createToken, linkFor, markTokenUsed, TOKEN_PROBLEMS } from "./tokens.server";

export const MAX_RESETS_PER_HOUR = 3;

export async function requestPasswordReset(db: Db, email: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const user = await trx
      .selectFrom("users")
      .where((eb) => eb(eb.fn("lower", ["email"]), "=", email.trim().toLowerCase()))
      .where("disabled_at", "is", null)
      .select(["id", "email", "name"])
      .forUpdate()
      .executeTakeFirst();
    if (!user) return;
    const recent = await trx
      .selectFrom("auth_tokens")
      .where("kind", "=", "reset")
      .where("user_id", "=", user.id)
      .where("created_at", ">", new Date(Date.now() - 3600 * 1000))
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirstOrThrow();
    if (Number(recent.n) >= MAX_RESETS_PER_HOUR) return;
    const { token, row } = await createToken(trx, {
      kind: "reset",
      email: user.email,
      userId: user.id,
    });
    await queueMail(trx, {
      key: `reset:${row.id}`,
      to: user.email,
      subject: "Choose a new Torquewright password",
      text: [
        `Hello ${user.name},`,
        "",
        "Someone (hopefully you) asked to choose a new password for your Torquewright account.",
        "Open this link to do it:",
        linkFor(`/reset/${token}`),
        "",
        "The link works once and expires in one hour. If you did not ask, ignore this e-mail: your password stays as it is.",
      ].join("\n"),
    });
  });
}

export async function resetPassword(
  db: Db,
  token: string,
  passwordHash: string,
): Promise<{ ok: true; userId: number } | { ok: false; error: string }> {
  return db.transaction().execute(async (trx) => {
    const check = await checkToken(trx, "reset", token, { lock: true });
    if (!check.ok) return { ok: false as const, error: TOKEN_PROBLEMS.reset[check.reason] };
    const user = await trx
      .selectFrom("users")
      .where("id", "=", check.row.user_id!)
      .where("disabled_at", "is", null)
      .select("id")
      .executeTakeFirst();
    if (!user) return { ok: false as const, error: TOKEN_PROBLEMS.reset.invalid };
    await trx
      .updateTable("users")
      .set({ password_hash: passwordHash, updated_at: sql`now()` })
      .where("id", "=", user.id)
      .execute();
    await markTokenUsed(trx, check.row.id);
    // Every other link and every open session of the account ends with the old password.
    await trx
      .updateTable("auth_tokens")
      .set({ revoked_at: new Date() })
      .where("kind", "=", "reset")
      .where("user_id", "=", user.id)
      .where("used_at", "is", null)
      .execute();
    await destroyUserSessions(trx, user.id);
    return { ok: true as const, userId: user.id };
  });
}
