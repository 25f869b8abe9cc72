import type { Plan, Problem } from "./types";

/** The objective of a plan, in the order of the format page. */
export interface Score {
  placedVolume: number;
  /** Cost of the blocks used minus the pro-rated value of the offcuts returned. */
  consumed: number;
  blocksUsed: number;
  offcutCount: number;
  /** Sum of squared offcut volumes: larger when the same leftover comes in fewer, bigger pieces. */
  offcutSquares: number;
}

export interface ScoreInput {
  placedVolume: number;
  usedBlocks: Iterable<number>;
  offcuts: Iterable<{ block: number; volume: number }>;
}

/** Scores a solution described by block indices (the solver's internal view). */
export function scoreOf(problem: Problem, s: ScoreInput): Score {
  const used = new Set(s.usedBlocks);
  let consumed = 0;
  for (const b of used) consumed += problem.blocks[b]!.cost;
  let offcutCount = 0;
  let offcutSquares = 0;
  for (const oc of s.offcuts) {
    const b = problem.blocks[oc.block]!;
    consumed -= (b.cost * oc.volume) / (b.size[0] * b.size[1] * b.size[2]);
    offcutCount++;
    offcutSquares += (oc.volume / 1e9) ** 2;
  }
  return { placedVolume: s.placedVolume, consumed, blocksUsed: used.size, offcutCount, offcutSquares };
}

/**
 * Scores a plan by the format page's order.
 * @example scorePlan(problem, plan).blocksUsed // → 2
 */
export function scorePlan(problem: Problem, plan: Plan): Score {
  const blockIndex = new Map(problem.blocks.map((b, i) => [b.id, i]));
  const partVol = new Map(problem.parts.map((p) => [p.id, p.size[0] * p.size[1] * p.size[2]]));
  let placedVolume = 0;
  for (const pl of plan.placements)
    placedVolume += pl.slab ? pl.slab.size[0] * pl.slab.size[1] * pl.slab.size[2] : (partVol.get(pl.part) ?? 0);
  return scoreOf(problem, {
    placedVolume,
    usedBlocks: plan.placements.map((p) => blockIndex.get(p.block)!),
    offcuts: plan.offcuts.map((o) => ({ block: blockIndex.get(o.block)!, volume: o.size[0] * o.size[1] * o.size[2] })),
  });
}

/**
 * Negative when `a` is the better plan: more part volume placed, then less stock consumed, then
 * fewer blocks, then fewer and larger offcuts.
 * @example compareScores(scorePlan(p, a), scorePlan(p, b)) < 0 // a is better
 */
export function compareScores(a: Score, b: Score): number {
  const rel = (x: number, y: number): number =>
    Math.abs(x - y) <= 1e-9 * Math.max(1, Math.abs(x), Math.abs(y)) ? 0 : x - y;
  return (
    rel(b.placedVolume, a.placedVolume) ||
    rel(a.consumed, b.consumed) ||
    a.blocksUsed - b.blocksUsed ||
    a.offcutCount - b.offcutCount ||
    rel(b.offcutSquares, a.offcutSquares)
  );
}

/**
 * Compares two plans for the same problem; negative when `a` is better.
 * @example comparePlans(problem, planA, planB) // → -1.5
 */
export function comparePlans(problem: Problem, a: Plan, b: Plan): number {
  return compareScores(scorePlan(problem, a), scorePlan(problem, b));
}
