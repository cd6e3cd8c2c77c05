// PostgreSQL stopped and started again under a running app server (scripts/pg.sh stop,
// then start, as an operator or a failover would): the server stays up, says what is
// wrong while the database is away, and works again once it is back — pages, bench
// saves and the mail queue — without being restarted.
import { chromium } from "@playwright/test";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { createDb } from "../../db/connect";
import type { Database } from "../../db/schema";
import { startMailCatcher, type MailCatcher } from "../../scripts/services/mail-catcher";
import { createSession } from "~/lib/auth/session.server";
import { DB_UNREACHABLE_SAVE_MESSAGE } from "~/lib/db.server";
import { asFromPage } from "../support/honeypot";
import { mailFor, waitFor } from "../support/mail";
import { decodeData, freshDatabase, startApp, type App, type Cluster } from "./support";

let cluster: Cluster;
let db: Kysely<Database>;
let catcher: MailCatcher;
let app: App;
let cookie = "";
let builder: { id: number; email: string };
let packageId = 0;
let cylinders: number[] = [];

beforeAll(async () => {
  cluster = await freshDatabase(inject("faultCluster"), "torquewright_faults_restart");
  db = createDb(cluster.url, 2);
  catcher = await startMailCatcher({ quiet: true });
  app = await startApp(cluster.url, {
    SMTP_URL: catcher.smtpUrl,
    MAIL_RETRY_DELAY_SECONDS: "1",
    JOBS_WORKER: "1",
  });
  builder = await db
    .selectFrom("users")
    .select(["id", "email"])
    .where("role", "=", "builder")
    .where("disabled_at", "is", null)
    .orderBy("id")
    .executeTakeFirstOrThrow();
  packageId = (
    await db
      .selectFrom("packages")
      .select("id")
      .where("is_template", "=", false)
      .where("status", "=", "draft")
      .orderBy("id")
      .executeTakeFirstOrThrow()
  ).id;
  cylinders = (
    await db
      .selectFrom("parts")
      .select("id")
      .where("category", "=", "cylinders")
      .where("archived_at", "is", null)
      .orderBy("id")
      .limit(2)
      .execute()
  ).map((r) => r.id);
  cookie = (await createSession(db, builder.id)).split(";")[0]!;
});

afterAll(async () => {
  await app?.kill("SIGTERM");
  await catcher?.stop();
  await db?.destroy();
  await cluster?.drop();
});

const page = (path: string) => fetch(`${app.url}${path}`, { headers: { Cookie: cookie } });

async function benchSave(expectedRevision: number, partId: number) {
  const res = await fetch(`${app.url}/packages/${packageId}/bench.data`, {
    method: "POST",
    headers: {
      Cookie: cookie,
      Origin: app.url,
      "Content-Type": "application/x-www-form-urlencoded",
    },
    body: new URLSearchParams({
      intent: "set-part",
      slot: "cylinder",
      partId: String(partId),
      expectedRevision: String(expectedRevision),
    }),
  });
  return { status: res.status, body: (await decodeData(res)) as { data?: any } };
}

async function health() {
  const res = await fetch(`${app.url}/healthz`);
  return { status: res.status, body: (await res.json()) as { ok: boolean; reason?: string } };
}

const revisionNow = async () =>
  (
    await db
      .selectFrom("packages")
      .select("current_revision")
      .where("id", "=", packageId)
      .executeTakeFirstOrThrow()
  ).current_revision;

describe("a PostgreSQL restart under a running app server", () => {
  it("answers 503 with the reason while the database is away, and works again after", async () => {
    expect(cylinders).toHaveLength(2);
    // before: the page, a save (the server's pool and its queue workers hold connections)
    expect((await page(`/packages/${packageId}/bench`)).status).toBe(200);
    const before = await revisionNow();
    const first = await benchSave(before, cylinders[0]!);
    expect(first.status).toBe(200);
    expect(first.body.data?.ok).toBe(true);
    const saved = before + 1;

    await cluster.stop();

    const away = await health();
    expect(away.status).toBe(503);
    expect(away.body.ok).toBe(false);
    expect(away.body.reason).toMatch(/^database unreachable: ./);

    const during = await page(`/packages/${packageId}/bench`);
    expect(during.status).toBe(503);
    const html = await during.text();
    expect(html).toContain("The database is not reachable");
    expect(html).toContain("nothing you sent was saved");

    const refused = await benchSave(saved, cylinders[1]!);
    expect(refused.status).toBe(503);
    expect(refused.body.data).toEqual({
      ok: false,
      errors: { form: [DB_UNREACHABLE_SAVE_MESSAGE] },
      retry: true,
    });
    expect(app.exited()).toBe(false);

    await cluster.start();

    const back = await waitFor(
      async () => {
        const h = await health();
        return h.status === 200 ? h : null;
      },
      30_000,
      "/healthz to answer ok again",
    );
    expect(back.body).toEqual({ ok: true });
    expect(app.exited()).toBe(false);

    // the same edit, sent again on the same revision: nothing was saved during the outage
    expect(await revisionNow()).toBe(saved);
    const retried = await benchSave(saved, cylinders[1]!);
    expect(retried.status).toBe(200);
    expect(retried.body.data?.ok).toBe(true);
    expect(await revisionNow()).toBe(saved + 1);
    expect((await page(`/packages/${packageId}/bench`)).status).toBe(200);

    // the queue's workers came back too: a mail queued now is delivered
    const reset = await fetch(`${app.url}/reset`, {
      method: "POST",
      headers: { Origin: app.url, "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams(asFromPage({ email: builder.email })),
    });
    expect(reset.status).toBe(200);
    const mail = await mailFor(catcher.apiUrl, builder.email, 30_000);
    expect(mail.text).toContain("/reset/");
    expect(app.exited()).toBe(false);
  });

  it("keeps a bench edit made while the database is away, and saves it on Try again", async () => {
    const browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking"],
    });
    try {
      const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
      const [name, value] = cookie.split(/=(.*)/s) as [string, string];
      await context.addCookies([{ name, value, url: app.url }]);
      const tab = await context.newPage();
      await tab.goto(`${app.url}/packages/${packageId}/bench`);
      const revLimit = tab.getByLabel("Rev limit");
      await revLimit.waitFor();
      const revision = await revisionNow();

      await cluster.stop();
      await revLimit.fill("5850");
      await revLimit.press("Enter");
      const alert = tab.getByRole("alert").filter({ hasText: "The database is not reachable" });
      await alert.waitFor();
      expect(await alert.textContent()).toContain(DB_UNREACHABLE_SAVE_MESSAGE);
      // the edit stays on screen, marked as not saved
      expect(await revLimit.inputValue()).toBe("5850");
      await tab.getByText("not saved", { exact: true }).waitFor();
      if (process.env.TW_FAULT_SCREENSHOTS)
        await tab.screenshot({ path: `${process.env.TW_FAULT_SCREENSHOTS}/bench-db-away.png` });

      // a page opened meanwhile says what is wrong, in the product's look
      const other = await context.newPage();
      const answer = await other.goto(`${app.url}/packages`);
      expect(answer?.status()).toBe(503);
      expect(await other.getByRole("heading", { level: 1 }).textContent()).toBe(
        "The database is not reachable",
      );
      if (process.env.TW_FAULT_SCREENSHOTS)
        await other.screenshot({ path: `${process.env.TW_FAULT_SCREENSHOTS}/page-db-away.png` });
      await other.close();

      await cluster.start();
      await waitFor(async () => (await health()).status === 200, 30_000, "/healthz ok");
      await tab.getByRole("button", { name: "Try again" }).click();
      await tab
        .getByTestId("revision")
        .filter({ hasText: `revision ${revision + 1}` })
        .waitFor();
      expect(await alert.count()).toBe(0);
      const row = await db
        .selectFrom("packages")
        .select(["rev_limit_rpm", "current_revision"])
        .where("id", "=", packageId)
        .executeTakeFirstOrThrow();
      expect(row).toEqual({ rev_limit_rpm: 5850, current_revision: revision + 1 });
    } finally {
      await browser.close();
    }
  });
});
