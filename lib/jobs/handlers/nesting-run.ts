import os from "node:os";
import { performance } from "node:perf_hooks";
import { nest } from "@/lib/nesting";
import { QUEUES } from "@/lib/jobs/queues";
import type { JobDefinition } from "@/lib/jobs/registry";
import { claimRun, failRun, failStaleRuns, finishRun, saveProgress } from "@/db/queries/run-worker";

/** This worker's name on the runs it holds: NESTING_WORKER_NAME, or host:pid. */
export const workerName = (): string => process.env.NESTING_WORKER_NAME || `${os.hostname()}:${process.pid}`;
const STALE_SECONDS = Number(process.env.RUN_STALE_SECONDS ?? 90);

/**
 * Runs one nesting run: claims it, searches within its time budget while writing progress and the
 * best plan's figures a few times a second (the page draws its bar from them), stops early when the
 * planner cancels, and stores the plan. A crash marks the run failed rather than leaving it running.
 */
export const nestingRunJob: JobDefinition<{ runId: number }> = {
  queue: QUEUES.nestingRun,
  options: { retryLimit: 1, retryDelay: 2, expireInSeconds: 15 * 60 },
  async handle({ runId }) {
    await failStaleRuns(STALE_SECONDS);
    const me = workerName();
    const problem = await claimRun(runId, me, STALE_SECONDS);
    if (!problem) return; // cancelled before it started, or another worker has it
    const abort = new AbortController();
    let lastWrite = 0;
    let writing: Promise<unknown> = Promise.resolve();
    try {
      const plan = await nest(problem, {
        seed: runId,
        now: () => performance.now(),
        signal: abort.signal,
        onProgress: (p) => {
          const t = performance.now();
          if (t - lastWrite < 250) return;
          lastWrite = t;
          writing = saveProgress(runId, me, Math.min(0.99, p.fraction), p.best).then((status) => {
            // Cancelled, or no longer ours (taken for dead and claimed by another worker): stop.
            if (status !== "running") abort.abort();
          });
        },
      });
      await writing;
      await finishRun(runId, me, problem, plan);
    } catch (e) {
      await failRun(runId, e instanceof Error ? e.message : String(e), me);
    }
  },
};
