import os from "node:os";
import { performance } from "node:perf_hooks";
import { nest, type Progress, usesTrueShape } from "@/lib/nesting";
import { boxProblem, compareShapes } from "@/lib/planning/slabs";
import { QUEUES } from "@/lib/jobs/queues";
import type { JobDefinition } from "@/lib/jobs/registry";
import { claimRun, failRun, failStaleRuns, finishRun, saveProgress } from "@/db/queries/run-worker";

/** This worker's name on the runs it holds: NESTING_WORKER_NAME, or host:pid. */
export const workerName = (): string => process.env.NESTING_WORKER_NAME || `${os.hostname()}:${process.pid}`;
const STALE_SECONDS = Number(process.env.RUN_STALE_SECONDS ?? 90);
/**
 * Share of a true-shape run's time budget spent nesting the same parts as boxes, for the comparison
 * on the plan page (decided: a quarter; box nesting of a few slabs' worth of parts settles fast).
 */
export const BOX_SHARE = 0.25;

/**
 * Runs one nesting run: claims it, searches within its time budget while writing progress and the
 * best plan's figures a few times a second (the page draws its bar from them), stops early when the
 * planner cancels, and stores the plan. A crash marks the run failed rather than leaving it running.
 * A true-shape run (`settings.trueShape` with profile parts) also nests the same parts as boxes in
 * the last BOX_SHARE of its budget and stores both plans' foam with its figures (`summary.shapes`).
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
    // A true-shape run spends BOX_SHARE of its budget nesting the same parts as boxes, to compare.
    const shaped = usesTrueShape(problem);
    const budget = problem.settings.timeLimitMs;
    const mainShare = shaped ? 1 - BOX_SHARE : 1;
    let best: Progress["best"] | null = null;
    const progress = (fraction: number) => {
      const t = performance.now();
      if (t - lastWrite < 250 || !best) return;
      lastWrite = t;
      writing = saveProgress(runId, me, Math.min(0.99, fraction), best).then((status) => {
        // Cancelled, or no longer ours (taken for dead and claimed by another worker): stop.
        if (status !== "running") abort.abort();
      });
    };
    try {
      const main = shaped
        ? { ...problem, settings: { ...problem.settings, timeLimitMs: Math.round(budget * mainShare) } }
        : problem;
      const plan = await nest(main, {
        seed: runId,
        now: () => performance.now(),
        signal: abort.signal,
        onProgress: (p) => {
          best = p.best;
          progress(p.fraction * mainShare);
        },
      });
      let extra = {};
      if (shaped && !abort.signal.aborted) {
        // The bar keeps the true-shape plan's figures; only its fraction moves on. The comparison is
        // a figure, not the plan: if it fails, the plan is stored without it.
        try {
          const box = await nest(boxProblem(problem, Math.max(250, Math.round(budget * BOX_SHARE))), {
            seed: runId,
            now: () => performance.now(),
            signal: abort.signal,
            onProgress: (p) => progress(mainShare + p.fraction * BOX_SHARE),
          });
          // Stopped half-way (cancelled), the box plan is no fair comparison: none is stored.
          if (!abort.signal.aborted) extra = { shapes: compareShapes(plan, box) };
        } catch (e) {
          console.warn(`[nesting] run ${runId}: box comparison failed: ${e instanceof Error ? e.message : e}`);
        }
      }
      await writing;
      await finishRun(runId, me, problem, plan, extra);
    } catch (e) {
      await failRun(runId, e instanceof Error ? e.message : String(e), me);
    }
  },
};
