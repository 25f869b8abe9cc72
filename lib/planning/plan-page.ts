/**
 * A plan fetched in pages of whole blocks, so a run of 25,000 pieces never comes back as one 50 MB
 * answer. A page holds the placements, offcuts and cuts of consecutive used blocks (in the order the
 * plan first names them), as many as fit in `maxPieces` pieces and at most `limit` blocks, but
 * always at least one block. Unplaced parts and the stats come with every page. Pure.
 */
import type { Plan } from "@/lib/nesting";

/** Past this many pieces (placements + offcuts) a plan asked for without paging comes in pages. */
export const PLAN_PAGE_PIECES = 5_000;

export interface PlanPage {
  /** Index of the first block of this page among the plan's used blocks. */
  offset: number;
  /** Codes of the blocks on this page, in plan order. */
  blocks: string[];
  totalBlocks: number;
  totalPieces: number;
  /** Offset of the next page, or null on the last. */
  nextOffset: number | null;
}

/** The blocks a plan uses, in the order it first names them (placements, then offcuts, then cuts). */
export function planBlockOrder(plan: Plan): string[] {
  const seen = new Set<string>();
  for (const p of plan.placements) seen.add(p.block);
  for (const o of plan.offcuts) seen.add(o.block);
  for (const b of Object.keys(plan.cuts)) seen.add(b);
  return [...seen];
}

/**
 * One page of a plan: the pieces of blocks `offset`… until `maxPieces` or `limit` blocks.
 *
 *   pagePlan(plan, { offset: 0, limit: 2 }) // { plan: { …pieces of the first two blocks }, page: { blocks: ["B-1", "B-2"], nextOffset: 2, … } }
 */
export function pagePlan(
  plan: Plan,
  opts: { offset?: number; limit?: number; maxPieces?: number } = {},
): { plan: Plan; page: PlanPage } {
  const order = planBlockOrder(plan);
  const count = new Map<string, number>();
  for (const p of plan.placements) count.set(p.block, (count.get(p.block) ?? 0) + 1);
  for (const o of plan.offcuts) count.set(o.block, (count.get(o.block) ?? 0) + 1);
  const offset = Math.min(Math.max(0, opts.offset ?? 0), order.length);
  const limit = Math.max(1, opts.limit ?? order.length);
  const maxPieces = opts.maxPieces ?? Number.POSITIVE_INFINITY;
  const chosen: string[] = [];
  let pieces = 0;
  for (let i = offset; i < order.length && chosen.length < limit; i++) {
    const n = count.get(order[i]!) ?? 0;
    if (chosen.length > 0 && pieces + n > maxPieces) break;
    chosen.push(order[i]!);
    pieces += n;
  }
  const on = new Set(chosen);
  const next = offset + chosen.length;
  return {
    plan: {
      ...plan,
      placements: plan.placements.filter((p) => on.has(p.block)),
      offcuts: plan.offcuts.filter((o) => on.has(o.block)),
      cuts: Object.fromEntries(chosen.filter((b) => b in plan.cuts).map((b) => [b, plan.cuts[b]!])),
    },
    page: {
      offset,
      blocks: chosen,
      totalBlocks: order.length,
      totalPieces: plan.placements.length + plan.offcuts.length,
      nextOffset: next < order.length ? next : null,
    },
  };
}
