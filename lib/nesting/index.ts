/**
 * Blockyard nesting core: cuttable, defect-avoiding 3D nesting of parts into foam blocks.
 * Pure: no I/O, no clock or randomness that is not handed in.
 */
import { parseProblem, parseProblemText, type ParseResult } from "./parse";
import { runAnytime } from "./anytime";
import { Search } from "./solver/search";
import { nestTrueShape, nestTrueShapeSync, usesTrueShape } from "./true-shape";
import type { NestOptions, Plan, Problem } from "./types";

export type * from "./types";
export { parseProblem, parseProblemText, type ParseResult };
export { validatePlan } from "./validate";
export {
  lowerBoundBlocks,
  volumeBound,
  largeItemBound,
  scaleBound,
  dffRound,
  dffLarge,
  type BoundItem,
  type Dff,
} from "./bounds";
export { comparePlans, compareScores, scorePlan, type Score } from "./objective";
export { usesTrueShape } from "./true-shape";

const DEFAULT_ITERATIONS = 200;

function makeSearch(problem: Problem, options: NestOptions): Search {
  return new Search(problem, {
    seed: options.seed ?? 1,
    ...(options.now ? { now: options.now } : {}),
    iterations: options.iterations ?? (options.now ? Number.POSITIVE_INFINITY : DEFAULT_ITERATIONS),
    timeLimitMs: problem.settings.timeLimitMs,
    ...(options.warmStart ? { warmStart: options.warmStart } : {}),
  });
}

function report(search: Search, options: NestOptions): void {
  options.onProgress?.({
    fraction: search.fraction(),
    best: { ...search.bestSummary(), lowerBoundBlocks: search.lowerBound },
  });
}

/**
 * Nests the parts of a parsed problem into its blocks and resolves with the best plan found when
 * the budget (settings.timeLimitMs with a clock, else `iterations`) ends, the signal aborts, or the
 * plan meets the lower bound. It yields to the event loop between passes so an abort or progress
 * reporting can happen while it runs. Deterministic for a given seed and iteration budget.
 * @example
 * const plan = await nest(problem, { seed: 1, now: () => performance.now(), onProgress: (p) => bar(p.fraction) });
 */
export async function nest(problem: Problem, options: NestOptions = {}): Promise<Plan> {
  // settings.trueShape: slabs of profile parts first (README, "Slabs of true-shape nested profiles").
  if (usesTrueShape(problem)) return nestTrueShape(problem, options, nestBoxes);
  return nestBoxes(problem, options);
}

async function nestBoxes(problem: Problem, options: NestOptions): Promise<Plan> {
  const search = makeSearch(problem, options);
  await runAnytime(search, options, () => report(search, options));
  return search.result();
}

/**
 * The same search as `nest`, run to the end without yielding (the signal is still checked
 * between passes). Handy in tests and scripts.
 * @example const plan = nestSync(problem, { seed: 3, iterations: 50 });
 */
export function nestSync(problem: Problem, options: NestOptions = {}): Plan {
  if (usesTrueShape(problem)) return nestTrueShapeSync(problem, options, nestBoxesSync);
  return nestBoxesSync(problem, options);
}

function nestBoxesSync(problem: Problem, options: NestOptions): Plan {
  const search = makeSearch(problem, options);
  while (!search.done(options.signal)) {
    search.step();
    if (options.onProgress) report(search, options);
  }
  return search.result();
}
