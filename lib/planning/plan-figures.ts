import type { Plan, Problem } from "@/lib/nesting";
import { piecesOf, stuckPieces } from "./cut-regions";
import type { ShapeComparison } from "./slabs";
import { cutEstimate } from "./wire-travel";

/**
 * The figures stored with a finished plan (`nesting_runs.summary` and `best`): what lists show
 * without reading the plan. Pure, so the worker and the demo seed store the same figures.
 */

/** What lists show of a finished plan, stored with it (`nesting_runs.summary`). */
export interface PlanFigures {
  stats: Plan["stats"];
  cost: number | null;
  cutLengthMm: number | null;
  /** Absent in summaries stored before plans could be uncuttable (all of them were cut trees). */
  stuckBlocks?: string[];
  /** The cutting steps on the run's machine (absent before machines, or past the steps' piece limit). */
  steps?: { machine: string; placements: number; turns: number; minutes: number };
  /** The profile parts' slab programs on the shop's profile cutter (their minutes are in `steps.minutes` too). */
  profiles?: { machine: string; slabs: number; lengthMm: number; minutes: number };
  /** A true-shape run (`settings.trueShape`): its foam against box nesting of the same parts (./slabs). */
  shapes?: ShapeComparison;
}

/** A run's best-plan figures (`nesting_runs.best`), as progress reports give them. */
export interface RunFigures {
  placedVolume: number;
  blocksUsed: number;
  yield: number;
  unplacedCount: number;
  lowerBoundBlocks: number;
}

/** The codes of the blocks a plan places parts in. */
export function blocksInPlan(plan: Plan): string[] {
  return [...new Set(plan.placements.map((p) => p.block))];
}

/** The cost of the blocks a plan uses. */
export function planCost(problem: Problem, plan: Plan | null): number | null {
  if (!plan || !problem.blocks) return null;
  const used = new Set(Object.keys(plan.cuts).concat(plan.placements.map((p) => p.block)));
  return problem.blocks.filter((b) => used.has(b.id)).reduce((s, b) => s + b.cost, 0);
}

/** Wire travel of all the plan's through cuts (mm). */
export function planCutLength(problem: Problem, plan: Plan | null): number | null {
  if (!plan || !problem.blocks) return null;
  return problem.blocks.reduce((sum, b) => {
    const cuts = plan.cuts[b.id];
    if (!cuts?.length) return sum;
    return (
      sum +
      cutEstimate(b.size, cuts, 1, 10, { trim: b.trim, kerf: problem.settings.kerf, pieces: piecesOf(plan, b.id) })
        .lengthMm
    );
  }, 0);
}

/** Blocks of a plan holding pieces that no through cut frees nor a profile cutter in one layer. */
export function stuckBlocks(problem: Problem, plan: Plan): string[] {
  return blocksInPlan(plan).filter((b) => stuckPieces(plan, b, problem.settings.kerf) > 0);
}

/** The figures of a plan (without the machine's steps, which need the machines). */
export function planFigures(problem: Problem, plan: Plan): PlanFigures {
  return {
    stats: plan.stats,
    cost: planCost(problem, plan),
    cutLengthMm: planCutLength(problem, plan),
    stuckBlocks: stuckBlocks(problem, plan),
  };
}

/** The best-plan figures of a finished plan. */
export function bestFigures(plan: Plan): RunFigures {
  return {
    placedVolume: plan.stats.partVolume,
    blocksUsed: plan.stats.blocksUsed,
    yield: plan.stats.yield,
    unplacedCount: plan.unplaced.reduce((s, u) => s + u.count, 0),
    lowerBoundBlocks: plan.stats.lowerBoundBlocks,
  };
}
