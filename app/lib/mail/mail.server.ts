// Outgoing mail. Callers queue a message (one row per idempotency key, and a job);
// the queue's worker delivers it over SMTP, retrying with backoff while the mail
// server is away. A message is delivered at most once, however often its job runs.
import { createHash } from "node:crypto";
import { CompiledQuery } from "kysely";
import nodemailer, { type Transporter } from "nodemailer";
import type { Db } from "../db.server";
import { env } from "../env.server";
import { getBoss, QUEUES } from "./jobs.server";

export type OutgoingMail = {
  key: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
};

/**
 * Records the message and enqueues its delivery in the caller's transaction, so the
 * mail exists exactly when the change that caused it does. A repeated key queues nothing.
 */
export async function queueMail(
  db: Db,
  mail: OutgoingMail,
): Promise<{ id: number; queued: boolean }> {
  const inserted = await db
    .insertInto("mail_messages")
    .values({
      idempotency_key: mail.key,
      to_address: mail.to,
      subject: mail.subject,
      text_body: mail.text,
      html_body: mail.html ?? null,
    })
    .onConflict((oc) => oc.column("idempotency_key").doNothing())
    .returning("id")
    .executeTakeFirst();
  if (!inserted) {
    const existing = await db
      .selectFrom("mail_messages")
      .where("idempotency_key", "=", mail.key)
      .select("id")
      .executeTakeFirstOrThrow();
    return { id: existing.id, queued: false };
  }
  const boss = await getBoss();
  await boss.send(
    QUEUES.mail,
    { messageId: inserted.id },
    {
      singletonKey: mail.key,
      db: {
        executeSql: async (text: string, values: unknown[]) => {
          const res = await db.executeQuery(CompiledQuery.raw(text, values));
          return { rows: res.rows as unknown[] };
        },
      },
    },
  );
  return { id: inserted.id, queued: true };
}

let transport: Transporter | undefined;

function getTransport(): Transporter {
  if (!transport) {
    const url = new URL(env().SMTP_URL);
    const loopback = ["127.0.0.1", "localhost", "[::1]"].includes(url.hostname);
    transport = nodemailer.createTransport({
      host: url.hostname,
      port: Number(url.port || (url.protocol === "smtps:" ? 465 : 587)),
      secure: url.protocol === "smtps:",
      auth: url.username
        ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) }
        : undefined,
      // the local catcher speaks plain SMTP; every other server must offer TLS
      ignoreTLS: loopback,
      requireTLS: !loopback && url.protocol !== "smtps:",
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 20_000,
    });
  }
  return transport;
}

/** Delivers one queued message unless it already went out. Throws so the job is retried. */
export async function deliverMessage(
  db: Db,
  id: number,
): Promise<"sent" | "already-sent" | "missing"> {
  let failure: unknown;
  const outcome = await db.transaction().execute(async (trx) => {
    // The row lock keeps two workers from sending the same message at once.
    const msg = await trx
      .selectFrom("mail_messages")
      .where("id", "=", id)
      .selectAll()
      .forUpdate()
      .executeTakeFirst();
    if (!msg) return "missing" as const;
    if (msg.status === "sent") return "already-sent" as const;
    try {
      await getTransport().sendMail({
        from: env().MAIL_FROM,
        to: msg.to_address,
        subject: msg.subject,
        text: msg.text_body,
        html: msg.html_body ?? undefined,
        messageId: `<${createHash("sha256").update(msg.idempotency_key).digest("hex").slice(0, 32)}@torquewright.invalid>`,
      });
    } catch (e) {
      failure = e;
      const reason = e instanceof Error ? e.message : String(e);
      await trx
        .updateTable("mail_messages")
        .set((eb) => ({ attempts: eb("attempts", "+", 1), last_error: reason.slice(0, 500) }))
        .where("id", "=", id)
        .execute();
      return "failed" as const;
    }
    await trx
      .updateTable("mail_messages")
      .set((eb) => ({
        status: "sent",
        sent_at: new Date(),
        attempts: eb("attempts", "+", 1),
        last_error: null,
      }))
      .where("id", "=", id)
      .execute();
    return "sent" as const;
  });
  // Thrown after the commit, so the attempt is on record and the queue retries.
  if (outcome === "failed") throw failure;
  return outcome;
}
