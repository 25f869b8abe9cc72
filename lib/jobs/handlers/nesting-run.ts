import { performance } from "node:perf_hooks";
import { nest } from "@/lib/nesting";
import { QUEUES } from "@/lib/jobs/queues";
import type { JobDefinition } from "@/lib/jobs/registry";
import { claimRun, failRun, failStaleRuns, finishRun, saveProgress } from "@/db/queries/runs";

/**
 * Runs one nesting run: claims it, searches within its time budget while writing progress and the
 * best plan's figures a few times a second (the page draws its bar from them), stops early when the
 * planner cancels, and stores the plan. A crash marks the run failed rather than leaving it running.
 */
export const nestingRunJob: JobDefinition<{ runId: number }> = {
  queue: QUEUES.nestingRun,
  options: { retryLimit: 1, retryDelay: 2, expireInSeconds: 15 * 60 },
  async handle({ runId }) {
    await failStaleRuns();
    const problem = await claimRun(runId);
    if (!problem) return; // cancelled before it started
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
          writing = saveProgress(runId, Math.min(0.99, p.fraction), p.best).then((status) => {
            if (status === "cancelled") abort.abort();
          });
        },
      });
      await writing;
      await finishRun(runId, problem, plan);
    } catch (e) {
      await failRun(runId, e instanceof Error ? e.message : String(e));
    }
  },
};
