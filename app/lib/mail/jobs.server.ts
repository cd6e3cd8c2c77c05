// The job queue (pg-boss, in PostgreSQL). Every app server process works the queue;
// pg-boss hands each job to one of them, so several servers can run side by side.
import PgBoss from "pg-boss";
import { env } from "../env.server";

export const QUEUES = { mail: "mail-send", cleanup: "auth-cleanup" } as const;

export type JobsState = { boss?: Promise<PgBoss>; workers?: Promise<void> };
const g = globalThis as unknown as { __twJobs?: JobsState };
/** Shared with workers.server.ts: one queue client and one set of workers per process. */
export const jobsState: JobsState = (g.__twJobs ??= {});
const state = jobsState;

/** The started queue client, with our queues created (pg-boss 10 needs them before send). */
export function getBoss(): Promise<PgBoss> {
  if (!state.boss) {
    state.boss = (async () => {
      const boss = new PgBoss({ connectionString: env().DATABASE_URL, max: 3, schema: "pgboss" });
      // A database restart or a network break is reported here (every worker's poll
      // fails until it is back); pg-boss keeps polling and its pool opens new
      // connections, so the workers resume by themselves. One line per outage, not per poll.
      let lastWarned = 0;
      boss.on("error", (e) => {
        if (Date.now() - lastWarned < 30_000) return;
        lastWarned = Date.now();
        console.warn(`jobs: ${e instanceof Error ? e.message : String(e)} (retrying)`);
      });
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
      await boss.createQueue(QUEUES.cleanup, {
        name: QUEUES.cleanup,
        policy: "singleton",
        retryLimit: 1,
      });
      return boss;
    })();
    state.boss.catch(() => {
      state.boss = undefined;
    });
  }
  return state.boss;
}

export async function stopJobs(): Promise<void> {
  const boss = state.boss;
  state.boss = undefined;
  state.workers = undefined;
  if (boss) await (await boss).stop({ graceful: true, wait: true, timeout: 5000 });
}
