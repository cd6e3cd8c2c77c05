// This process's queue workers: mail delivery and the scheduled clean-up. Kept apart
// from the queue client (jobs.server.ts) so that queueing mail never imports its worker.
import { runCleanup } from "../auth/cleanup.server";
import { getDb } from "../db.server";
import { env } from "../env.server";
import { getBoss, jobsState as state, QUEUES } from "./jobs.server";
import { deliverMessage } from "./mail.server";

/** Registers this process's workers and the schedule; safe to call on every request. */
export function startJobWorkers(): Promise<void> {
  if (!state.workers) {
    state.workers = (async () => {
      const boss = await getBoss();
      await boss.work<{ messageId: number }>(
        QUEUES.mail,
        { batchSize: 5, pollingIntervalSeconds: 1 },
        async (jobs) => {
          for (const job of jobs) await deliverMessage(getDb(), job.data.messageId);
        },
      );
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
