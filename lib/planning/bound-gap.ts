import type { Plan, Problem } from "@/lib/nesting";

export interface BoundGap {
  used: number;
  bound: number;
  /** The parts' volume in blocks of the plan's largest used block (a rough "how full"). */
  partBlocks: number;
  /** The largest parts by volume: key, count, share of the largest used block's volume. */
  largest: { part: string; count: number; share: number }[];
  /** Defect zones in the blocks the plan uses. */
  defects: number;
  blocksWithDefects: number;
}

/**
 * Why a plan stops above the lower bound on blocks, in figures a planner can judge: how many
 * blocks the parts fill by volume, the largest parts (each a big share of a block leaves room
 * that smaller parts rarely fill exactly), and the defect zones to keep clear. Undefined when the
 * plan uses no more blocks than the bound.
 *
 *   boundGap(problem, plan)?.largest[0]  // → { part: "jp-12", count: 3, share: 0.18 }
 */
export function boundGap(problem: Problem, plan: Plan): BoundGap | undefined {
  const used = plan.stats.blocksUsed;
  const bound = plan.stats.lowerBoundBlocks;
  if (!(used > bound) || !plan.placements.length) return undefined;
  const vol = (s: readonly number[]) => s[0]! * s[1]! * s[2]!;
  const codes = new Set(plan.placements.map((p) => p.block));
  const blocks = problem.blocks.filter((b) => codes.has(b.id));
  const biggest = Math.max(...blocks.map((b) => vol(b.size.map((v) => v - 2 * b.trim))));
  const count = new Map<string, number>();
  for (const p of plan.placements) count.set(p.part, (count.get(p.part) ?? 0) + 1);
  const partVolume = problem.parts.reduce((s, p) => s + vol(p.size) * (count.get(p.id) ?? 0), 0);
  const largest = problem.parts
    .filter((p) => count.has(p.id))
    .sort((a, b) => vol(b.size) - vol(a.size))
    .slice(0, 3)
    .map((p) => ({ part: p.id, count: count.get(p.id)!, share: vol(p.size) / biggest }));
  return {
    used,
    bound,
    partBlocks: partVolume / biggest,
    largest,
    defects: blocks.reduce((n, b) => n + b.defects.length, 0),
    blocksWithDefects: blocks.filter((b) => b.defects.length > 0).length,
  };
}
