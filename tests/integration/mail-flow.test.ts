// Invite and reset end to end through the local SMTP catcher (the same module npm start
// runs), with the job queue's worker running in this process.
import { randomBytes } from "node:crypto";
import { sql } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startMailCatcher, type MailCatcher } from "../../scripts/services/mail-catcher";
import { form, createTestUser, requestAs, signedOutRequest } from "../support/auth";
import { asFromPage } from "../support/honeypot";
import { linkIn, listCaught, mailFor, waitFor } from "../support/mail";
import { TOKEN_PROBLEMS } from "~/lib/auth/tokens.server";

let catcher: MailCatcher = await startMailCatcher({ quiet: true });
process.env.SMTP_URL = catcher.smtpUrl;
process.env.LOCAL_MAIL_API_URL = catcher.apiUrl;
process.env.MAIL_RETRY_DELAY_SECONDS = "1";

const { getDb } = await import("~/lib/db.server");
const { stopJobs } = await import("~/lib/mail/jobs.server");
const { startJobWorkers } = await import("~/lib/mail/workers.server");
const staff = await import("~/routes/staff");
const invite = await import("~/routes/invite.$token");
const login = await import("~/routes/login");
const resetRequest = await import("~/routes/reset");
const resetToken = await import("~/routes/reset.$token");
const outbox = await import("~/routes/dev.outbox");
const outboxMessage = await import("~/routes/dev.outbox.$id");

const args = (request: Request, params: Record<string, string> = {}) =>
  ({ request, params, context: {} }) as never;
const unique = (p: string) => `${p}-${randomBytes(4).toString("hex")}@crew.test`;

/** The queue's jobs for one message (pg-boss keeps them in its own schema). */
async function jobsFor(messageId: number) {
  const { rows } = await sql<{ state: string; retry_count: number; singleton_key: string | null }>`
    select state, retry_count, singleton_key from pgboss.job
    where name = 'mail-send' and (data->>'messageId')::int = ${messageId}`.execute(getDb());
  return rows;
}

/** Every message row and job for an address: what could ever be sent to it. */
async function queuedFor(to: string) {
  const rows = await getDb()
    .selectFrom("mail_messages")
    .where("to_address", "=", to)
    .select(["id", "status"])
    .execute();
  const jobs = (await Promise.all(rows.map((r) => jobsFor(r.id)))).flat();
  return { rows, jobs };
}

/** Waits until the queue is done with the message: its job completed (no retry pending). */
async function settled(messageId: number) {
  return waitFor(
    async () => {
      const jobs = await jobsFor(messageId);
      return jobs.length > 0 && jobs.every((j) => j.state === "completed") ? jobs : null;
    },
    20_000,
    `the job of message ${messageId} to complete`,
  );
}

beforeAll(async () => {
  await startJobWorkers();
});

afterAll(async () => {
  await stopJobs();
  await catcher.stop();
});

async function signIn(email: string, password: string) {
  return (await login.action(
    args(
      signedOutRequest("/login", { method: "POST", body: form(asFromPage({ email, password })) }),
    ),
  )) as Response;
}

describe("invite by e-mail", () => {
  it("the owner invites; the person follows the link, sets name and password, and can sign in", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const email = unique("new-builder");
    const res = await staff.action(
      args(
        await requestAs(owner, "/staff", {
          method: "POST",
          body: form({ intent: "invite", email, role: "builder" }),
        }),
      ),
    );
    expect((res as { done: string }).done).toBe(`Invite sent to ${email}.`);

    const mail = await mailFor(catcher.apiUrl, email);
    expect(mail.subject).toBe("You are invited to the shop's Torquewright");
    const link = linkIn(mail.text, "/invite/");
    const token = link.pathname.split("/")[2]!;

    const page = await invite.loader(args(signedOutRequest(link.pathname), { token }));
    expect(page.invite).toEqual({ email, role: "builder" });

    const accept = (await invite.action(
      args(
        signedOutRequest(link.pathname, {
          method: "POST",
          body: form(
            asFromPage({
              name: "Oren Vashti",
              password: "long-enough-pass",
              confirm: "long-enough-pass",
            }),
          ),
        }),
        { token },
      ),
    )) as Response;
    expect(accept.status).toBe(302);
    expect(accept.headers.get("Set-Cookie")).toMatch(/^tw_session=/);

    const user = await getDb()
      .selectFrom("users")
      .where("email", "=", email)
      .selectAll()
      .executeTakeFirstOrThrow();
    expect(user).toMatchObject({ name: "Oren Vashti", role: "builder", disabled_at: null });

    const signedIn = await signIn(email, "long-enough-pass");
    expect(signedIn.status).toBe(302);
    expect(signedIn.headers.get("Location")).toBe("/");

    // the link works once
    const again = await invite.loader(args(signedOutRequest(link.pathname), { token }));
    expect(again.problem).toBe(TOKEN_PROBLEMS.invite.used);
    const reuse = (await invite.action(
      args(
        signedOutRequest(link.pathname, {
          method: "POST",
          body: form(
            asFromPage({
              name: "Someone Else",
              password: "another-pass-9",
              confirm: "another-pass-9",
            }),
          ),
        }),
        { token },
      ),
    )) as { init: { status: number }; data: { result: { error: Record<string, string[]> } } };
    expect(reuse.init.status).toBe(410);
    expect(reuse.data.result.error[""]).toEqual([TOKEN_PROBLEMS.invite.used]);
  });

  it("refuses an expired or altered invite link with a clear message", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const email = unique("late");
    await staff.action(
      args(
        await requestAs(owner, "/staff", {
          method: "POST",
          body: form({ intent: "invite", email, role: "apprentice" }),
        }),
      ),
    );
    const token = linkIn((await mailFor(catcher.apiUrl, email)).text, "/invite/").pathname.split(
      "/",
    )[2]!;

    const altered = `${token.slice(0, -2)}${token.endsWith("AA") ? "BB" : "AA"}`;
    expect((await invite.loader(args(signedOutRequest("/"), { token: altered }))).problem).toBe(
      TOKEN_PROBLEMS.invite.invalid,
    );

    await getDb()
      .updateTable("auth_tokens")
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where("email", "=", email)
      .execute();
    expect((await invite.loader(args(signedOutRequest("/"), { token }))).problem).toBe(
      TOKEN_PROBLEMS.invite.expired,
    );
  });

  it("keeps the typed values and says why when the form is incomplete", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const res = (await staff.action(
      args(
        await requestAs(owner, "/staff", {
          method: "POST",
          body: form({ intent: "invite", email: "not-an-address", role: "builder" }),
        }),
      ),
    )) as {
      init: { status: number };
      data: { result: { error: Record<string, string[]>; initialValue: Record<string, string> } };
    };
    expect(res.init.status).toBe(400);
    expect(res.data.result.error.email).toEqual(["Enter the person's e-mail address."]);
    expect(res.data.result.initialValue.role).toBe("builder");
  });
});

describe("password reset by e-mail", () => {
  it("sends a single-use link; the new password works, the old one and old sessions do not", async () => {
    const user = await createTestUser(getDb(), "service_writer");
    const { cookieFor } = await import("../support/auth");
    const oldCookie = await cookieFor(user);

    const answer = await resetRequest.action(
      args(
        signedOutRequest("/reset", {
          method: "POST",
          body: form(asFromPage({ email: user.email.toUpperCase() })),
        }),
      ),
    );
    expect((answer as { sent: boolean }).sent).toBe(true);
    const link = linkIn((await mailFor(catcher.apiUrl, user.email)).text, "/reset/");
    const token = link.pathname.split("/")[2]!;

    expect((await resetToken.loader(args(signedOutRequest(link.pathname), { token }))).email).toBe(
      user.email,
    );
    const done = (await resetToken.action(
      args(
        signedOutRequest(link.pathname, {
          method: "POST",
          body: form(asFromPage({ password: "fresh-password-77", confirm: "fresh-password-77" })),
        }),
        { token },
      ),
    )) as Response;
    expect(done.status).toBe(302);

    expect((await signIn(user.email, "fresh-password-77")).status).toBe(302);
    expect((await signIn(user.email, user.password)) instanceof Response).toBe(false);
    const { getUser } = await import("~/lib/auth/auth.server");
    expect(await getUser(signedOutRequest("/", { headers: { Cookie: oldCookie } }))).toBeNull();

    const reused = (await resetToken.action(
      args(
        signedOutRequest(link.pathname, {
          method: "POST",
          body: form(asFromPage({ password: "third-password-88", confirm: "third-password-88" })),
        }),
        { token },
      ),
    )) as { init: { status: number }; data: { result: { error: Record<string, string[]> } } };
    expect(reused.init.status).toBe(410);
    expect(reused.data.result.error[""]).toEqual([TOKEN_PROBLEMS.reset.used]);
  });

  it("answers the same for an unknown address, and sends nothing", async () => {
    const email = unique("nobody");
    const answer = await resetRequest.action(
      args(signedOutRequest("/reset", { method: "POST", body: form(asFromPage({ email })) })),
    );
    expect(answer).toMatchObject({ sent: true });
    // mail is queued in the transaction of the change: with no message row and no job for
    // the address, nothing can ever be sent to it
    expect(await queuedFor(email)).toEqual({ rows: [], jobs: [] });
    expect((await listCaught(catcher.apiUrl)).some((m) => m.to.includes(email))).toBe(false);
  });
});

describe("the mail queue", () => {
  it("holds an invite while the mail server is down and delivers it once when it is back", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const email = unique("while-down");
    const { smtpPort, apiPort } = catcher;
    await catcher.stop();

    await staff.action(
      args(
        await requestAs(owner, "/staff", {
          method: "POST",
          body: form({ intent: "invite", email, role: "apprentice" }),
        }),
      ),
    );
    const failed = await waitFor(
      async () => {
        const row = await getDb()
          .selectFrom("mail_messages")
          .where("to_address", "=", email)
          .selectAll()
          .executeTakeFirst();
        return row && row.attempts >= 1 ? row : null;
      },
      15_000,
      "a failed delivery attempt",
    );
    expect(failed.status).toBe("queued");
    expect(failed.last_error).toMatch(/ECONNREFUSED/);

    catcher = await startMailCatcher({ smtpPort, apiPort, quiet: true });
    // the retry backoff doubles from MAIL_RETRY_DELAY_SECONDS, so the next attempt after
    // the server is back can take several of them
    await mailFor(catcher.apiUrl, email, 45_000);
    // once its job has completed, no retry is left that could send it again
    await settled(failed.id);
    expect((await listCaught(catcher.apiUrl)).filter((m) => m.to.includes(email))).toHaveLength(1);
    const sent = await getDb()
      .selectFrom("mail_messages")
      .where("to_address", "=", email)
      .selectAll()
      .executeTakeFirstOrThrow();
    expect(sent.status).toBe("sent");
    // its own bounded waits (a failed attempt ≤ 15 s, the retry ≤ 45 s, the job's completion
    // ≤ 20 s) are longer than the default test timeout; the retry backoff is real time
  }, 90_000);

  it("queues one message per idempotency key", async () => {
    const { queueMail, deliverMessage } = await import("~/lib/mail/mail.server");
    const key = `test:${randomBytes(4).toString("hex")}`;
    const to = unique("once");
    const first = await queueMail(getDb(), { key, to, subject: "Once", text: "only once" });
    const second = await queueMail(getDb(), { key, to, subject: "Once", text: "only once" });
    expect(first.queued).toBe(true);
    expect(second).toEqual({ id: first.id, queued: false });
    await mailFor(catcher.apiUrl, to);
    expect(await deliverMessage(getDb(), first.id)).toBe("already-sent");
    // one job for the key, and it is done
    expect((await settled(first.id)).map((j) => j.singleton_key)).toEqual([key]);
    expect((await listCaught(catcher.apiUrl)).filter((m) => m.to.includes(to))).toHaveLength(1);
  });

  it("a rolled-back change leaves neither a message nor a job", async () => {
    const { queueMail } = await import("~/lib/mail/mail.server");
    const to = unique("rolled-back");
    const key = `test:${randomBytes(4).toString("hex")}`;
    let queuedId = 0;
    await expect(
      getDb()
        .transaction()
        .execute(async (trx) => {
          queuedId = (await queueMail(trx, { key, to, subject: "Never", text: "never sent" })).id;
          throw new Error("the change failed");
        }),
    ).rejects.toThrow("the change failed");
    expect(queuedId).toBeGreaterThan(0);
    expect(await queuedFor(to)).toEqual({ rows: [], jobs: [] });
    expect(await jobsFor(queuedId)).toEqual([]);
    const { rows } = await sql<{ n: string }>`
      select count(*)::text as n from pgboss.job where singleton_key = ${key}`.execute(getDb());
    expect(rows[0]!.n).toBe("0");
  });

  it("two workers racing for one message send it once", async () => {
    const { deliverMessage } = await import("~/lib/mail/mail.server");
    const to = unique("race");
    // a message with no job, so only the two calls below deliver it
    const { id } = await getDb()
      .insertInto("mail_messages")
      .values({
        idempotency_key: `test:${randomBytes(4).toString("hex")}`,
        to_address: to,
        subject: "Race",
        text_body: "once",
        html_body: null,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const outcomes = await Promise.all([deliverMessage(getDb(), id), deliverMessage(getDb(), id)]);
    expect(outcomes.sort()).toEqual(["already-sent", "sent"]);
    await mailFor(catcher.apiUrl, to);
    expect((await listCaught(catcher.apiUrl)).filter((m) => m.to.includes(to))).toHaveLength(1);
    const row = await getDb()
      .selectFrom("mail_messages")
      .where("id", "=", id)
      .select(["status", "attempts"])
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ status: "sent", attempts: 1 });
  });

  it("after the last retry the job is failed and the message stays queued with its last error", async () => {
    const { getBoss, QUEUES } = await import("~/lib/mail/jobs.server");
    const to = unique("last-retry");
    const { smtpPort, apiPort } = catcher;
    await catcher.stop();
    try {
      const { id } = await getDb()
        .insertInto("mail_messages")
        .values({
          idempotency_key: `test:${randomBytes(4).toString("hex")}`,
          to_address: to,
          subject: "Retries",
          text_body: "the server is away",
          html_body: null,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      // a job with one retry (the queue's own allow 25, hours apart)
      await (
        await getBoss()
      ).send(QUEUES.mail, { messageId: id }, { retryLimit: 1, retryDelay: 1, retryBackoff: false });
      const [job] = await waitFor(
        async () => {
          const jobs = await jobsFor(id);
          return jobs[0]?.state === "failed" ? jobs : null;
        },
        20_000,
        "the job to fail for good",
      );
      expect(job!.retry_count).toBe(1);
      const row = await getDb()
        .selectFrom("mail_messages")
        .where("id", "=", id)
        .select(["status", "attempts", "last_error", "sent_at"])
        .executeTakeFirstOrThrow();
      expect(row.status).toBe("queued");
      expect(row.attempts).toBe(2);
      expect(row.sent_at).toBeNull();
      expect(row.last_error).toMatch(/ECONNREFUSED/);
    } finally {
      catcher = await startMailCatcher({ smtpPort, apiPort, quiet: true });
    }
    expect((await listCaught(catcher.apiUrl)).some((m) => m.to.includes(to))).toBe(false);
  });

  it("a send that succeeds but whose commit fails is sent again, with the same Message-ID", async () => {
    // SMTP cannot take part in our transaction: if the commit after a successful send
    // fails, the message is still queued and its retry sends it once more. The
    // Message-ID comes from the idempotency key, so the copies are one message to a
    // receiving server.
    const { deliverMessage } = await import("~/lib/mail/mail.server");
    const to = unique("commit-fails");
    const { id } = await getDb()
      .insertInto("mail_messages")
      .values({
        idempotency_key: `test:${randomBytes(4).toString("hex")}`,
        to_address: to,
        subject: "Commit",
        text_body: "sent, then the commit failed",
        html_body: null,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const fn = `tw_test_fail_commit_${id}`;
    // a deferred check: it runs at COMMIT, after the send, and refuses this one row's update
    await sql
      .raw(
        `create function ${fn}() returns trigger language plpgsql as $$ begin
           if new.id = ${id} and new.status = 'sent' then raise exception 'commit refused'; end if;
           return new; end $$;
         create constraint trigger ${fn} after update on mail_messages
           deferrable initially deferred for each row execute function ${fn}();`,
      )
      .execute(getDb());
    try {
      await expect(deliverMessage(getDb(), id)).rejects.toThrow(/commit refused/);
    } finally {
      await sql.raw(`drop trigger ${fn} on mail_messages; drop function ${fn}();`).execute(getDb());
    }
    const first = await mailFor(catcher.apiUrl, to);
    const row = await getDb()
      .selectFrom("mail_messages")
      .where("id", "=", id)
      .select(["status", "attempts"])
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ status: "queued", attempts: 0 });
    expect(await deliverMessage(getDb(), id)).toBe("sent");
    const copies = await waitFor(
      async () => {
        const list = (await listCaught(catcher.apiUrl)).filter((m) => m.to.includes(to));
        return list.length === 2 ? list : null;
      },
      15_000,
      "the second copy",
    );
    const bodies = await Promise.all(
      copies.map(
        async (c) =>
          (await (await fetch(`${catcher.apiUrl}/messages/${c.id}`)).json()) as {
            messageId: string;
          },
      ),
    );
    expect(bodies.map((b) => b.messageId)).toEqual([first.messageId, first.messageId]);
    expect(first.messageId).toMatch(/^<[0-9a-f]{32}@torquewright\.invalid>$/);
  });
});

describe("scheduled clean-up", () => {
  it("is scheduled every 15 minutes and removes expired sessions", async () => {
    const { getBoss, QUEUES } = await import("~/lib/mail/jobs.server");
    const schedules = await (await getBoss()).getSchedules();
    expect(schedules.find((s) => s.name === QUEUES.cleanup)?.cron).toBe("*/15 * * * *");

    const { runCleanup } = await import("~/lib/auth/cleanup.server");
    const { cookieFor } = await import("../support/auth");
    const user = await createTestUser(getDb(), "apprentice");
    await cookieFor(user);
    await getDb()
      .updateTable("sessions")
      .set({ expires_at: new Date(Date.now() - 60_000) })
      .where("user_id", "=", user.id)
      .execute();
    const result = await runCleanup(getDb());
    expect(result.sessions).toBeGreaterThanOrEqual(1);
    expect(
      await getDb().selectFrom("sessions").where("user_id", "=", user.id).selectAll().execute(),
    ).toHaveLength(0);
  });
});

describe("/dev/outbox", () => {
  it("lists caught mail for the owner and shows one message with its links", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const email = unique("outbox");
    await staff.action(
      args(
        await requestAs(owner, "/staff", {
          method: "POST",
          body: form({ intent: "invite", email, role: "builder" }),
        }),
      ),
    );
    await mailFor(catcher.apiUrl, email);
    const list = await outbox.loader(args(await requestAs(owner, "/dev/outbox")));
    const row = list.messages.find((m) => m.to.includes(email))!;
    expect(row.subject).toBe("You are invited to the shop's Torquewright");
    const one = await outboxMessage.loader(
      args(await requestAs(owner, `/dev/outbox/${row.id}`), { id: row.id }),
    );
    expect(one.message.text).toMatch(/\/invite\//);
  });
});
