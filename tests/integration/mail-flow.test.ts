// Invite and reset end to end through the local SMTP catcher (the same module npm start
// runs), with the job queue's worker running in this process.
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startMailCatcher, type MailCatcher } from "../../scripts/services/mail-catcher";
import { form, createTestUser, requestAs, signedOutRequest } from "../support/auth";
import { asFromPage } from "../support/honeypot";
import { linkIn, listCaught, mailFor, waitFor } from "../support/mail";

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
    expect(mail.subject).toMatch(/invited/);
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
    expect(again.problem).toMatch(/already been used/);
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
    expect(reuse.data.result.error[""]).toEqual([expect.stringMatching(/already been used/)]);
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
    expect((await invite.loader(args(signedOutRequest("/"), { token: altered }))).problem).toMatch(
      /not valid/,
    );

    await getDb()
      .updateTable("auth_tokens")
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where("email", "=", email)
      .execute();
    expect((await invite.loader(args(signedOutRequest("/"), { token }))).problem).toMatch(
      /expired/,
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
    expect(reused.data.result.error[""]![0]).toMatch(/already been used/);
  });

  it("answers the same for an unknown address, and sends nothing", async () => {
    const email = unique("nobody");
    const answer = await resetRequest.action(
      args(signedOutRequest("/reset", { method: "POST", body: form(asFromPage({ email })) })),
    );
    expect(answer).toMatchObject({ sent: true });
    await new Promise((r) => setTimeout(r, 1500));
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
    expect(failed.last_error).toBeTruthy();

    catcher = await startMailCatcher({ smtpPort, apiPort, quiet: true });
    await mailFor(catcher.apiUrl, email, 20_000);
    await new Promise((r) => setTimeout(r, 2500));
    expect((await listCaught(catcher.apiUrl)).filter((m) => m.to.includes(email))).toHaveLength(1);
    const sent = await getDb()
      .selectFrom("mail_messages")
      .where("to_address", "=", email)
      .selectAll()
      .executeTakeFirstOrThrow();
    expect(sent.status).toBe("sent");
  });

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
    await new Promise((r) => setTimeout(r, 1000));
    expect((await listCaught(catcher.apiUrl)).filter((m) => m.to.includes(to))).toHaveLength(1);
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
    expect(row.subject).toMatch(/invited/);
    const one = await outboxMessage.loader(
      args(await requestAs(owner, `/dev/outbox/${row.id}`), { id: row.id }),
    );
    expect(one.message.text).toMatch(/\/invite\//);
  });
});
