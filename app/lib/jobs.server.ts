// The job queue (pg-boss, in PostgreSQL). Every app server process works the queue;
// pg-boss hands each job to one of them, so several servers can run side by side.
import PgBoss from "pg-boss";
import { getDb } from "./db.server";
import { env } from "./env.server";

export const QUEUES = { mail: "mail-send", cleanup: "auth-cleanup" } as const;

type JobsState = { boss?: Promise<PgBoss>; workers?: Promise<void> };
const g = globalThis as unknown as { __twJobs?: JobsState };
const state: JobsState = (g.__twJobs ??= {});

/** The started queue client, with our queues created (pg-boss 10 needs them before send). */
export function getBoss(): Promise<PgBoss> {
  if (!state.boss) {
    state.boss = (async () => {
      const boss = new PgBoss({ connectionString: env().DATABASE_URL, max: 3, schema: "pgboss" });
      // Connection hiccups are reported and retried by pg-boss itself.
      boss.on("error", (e) => console.warn(`jobs: ${e instanceof Error ? e.message : String(e)}`));
      await boss.start();
      const retryDelay = env().MAIL_RETRY_DELAY_SECONDS;
      await boss.createQueue(QUEUES.mail, {
        name: QUEUES.mail,
        retryLimit: 25,
        retryDelay,
        retryBackoff: true,
        expireInSeconds: 120,
        retentionDays: 7,
      });
      await boss.createQueue(QUEUES.cleanup, { name: QUEUES.cleanup, policy: "singleton", retryLimit: 1 });
      return boss;
    })();
    state.boss.catch(() => {
      state.boss = undefined;
    });
  }
  return state.boss;
}

/** Registers this process's workers and the schedule; safe to call on every request. */
export function startJobWorkers(): Promise<void> {
  if (!state.workers) {
    state.workers = (async () => {
      const boss = await getBoss();
      const { deliverMessage } = await import("./mail.server");
      const { runCleanup } = await import("./cleanup.server");
      await boss.work<{ messageId: number }>(QUEUES.mail, { batchSize: 5, pollingIntervalSeconds: 1 }, async (jobs) => {
        for (const job of jobs) await deliverMessage(getDb(), job.data.messageId);
      });
      await boss.work(QUEUES.cleanup, async () => {
        await runCleanup(getDb());
      });
      await boss.schedule(QUEUES.cleanup, "*/15 * * * *");
    })();
    state.workers.catch((e) => {
      console.warn(`jobs: workers did not start: ${e instanceof Error ? e.message : String(e)}`);
      state.workers = undefined;
    });
  }
  return state.workers;
}

/**
 * Called from the root loader: the first request a server answers starts its workers.
 * Test runs start them explicitly where a test needs them.
 */
export function ensureJobWorkers(): void {
  if (env().JOBS_WORKER !== "1" || env().NODE_ENV === "test") return;
  void startJobWorkers().catch(() => {});
}

export async function stopJobs(): Promise<void> {
  const boss = state.boss;
  state.boss = undefined;
  state.workers = undefined;
  if (boss) await (await boss).stop({ graceful: true, wait: true, timeout: 5000 });
}
