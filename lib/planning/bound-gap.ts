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
  // By the placed boxes: a part's box turned, or a true-shape slab's box (its key "slab-N", one of a kind).
  const count = new Map<string, { n: number; each: number }>();
  for (const p of plan.placements) count.set(p.part, { n: (count.get(p.part)?.n ?? 0) + 1, each: vol(p.size) });
  const partVolume = [...count.values()].reduce((s, c) => s + c.each * c.n, 0);
  const largest = [...count]
    .sort((a, b) => b[1].each - a[1].each)
    .slice(0, 3)
    .map(([part, c]) => ({ part, count: c.n, share: c.each / biggest }));
  return {
    used,
    bound,
    partBlocks: partVolume / biggest,
    largest,
    defects: blocks.reduce((n, b) => n + b.defects.length, 0),
    blocksWithDefects: blocks.filter((b) => b.defects.length > 0).length,
  };
}
