// The scheduled clean-up: expired sessions, old sign-in attempts, spent tokens.
import type { Db } from "../db.server";
import { deleteExpiredSessions } from "./session.server";
import { deleteOldAttempts } from "./throttle.server";

export async function runCleanup(db: Db, now = new Date()) {
  const sessions = await deleteExpiredSessions(db, now);
  const attempts = await deleteOldAttempts(db, now);
  const monthAgo = new Date(now.getTime() - 30 * 24 * 60 * 60 * 1000);
  const tokens = await db
    .deleteFrom("auth_tokens")
    .where("expires_at", "<", monthAgo)
    .executeTakeFirst();
  return { sessions, attempts, tokens: Number(tokens.numDeletedRows) };
}
