import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Plan } from "@/lib/nesting";
import { pagePlan, planBlockOrder } from "@/lib/planning/plan-page";

const plan = (counts: number[]): Plan => ({
  version: 1,
  placements: counts.flatMap((n, b) =>
    Array.from({ length: n }, (_, i) => ({ part: "p", block: `B${b}`, origin: [i, 0, 0], size: [1, 1, 1] })),
  ),
  unplaced: [{ part: "q", count: 2, reason: "no block left" }],
  offcuts: counts.map((_, b) => ({ block: `B${b}`, origin: [500, 0, 0], size: [10, 10, 10] })),
  cuts: Object.fromEntries(counts.map((_, b) => [`B${b}`, [{ axis: "x", at: 499 }]])),
  stats: {
    blocksUsed: counts.length,
    partVolume: 1,
    stockVolume: 1,
    offcutVolume: 0,
    yield: 1,
    elapsedMs: 0,
    lowerBoundBlocks: counts.length,
  },
});

describe("plan pages", () => {
  it("keeps whole blocks together and stops before the piece limit (by hand: 3+1, 4+1, 2+1 pieces with a limit of 6)", () => {
    const p = plan([3, 4, 2]);
    const a = pagePlan(p, { maxPieces: 6 });
    expect(a.page.blocks).toEqual(["B0"]); // B0 has 4 pieces; with B1's 5 it would be 9
    expect(a.page.nextOffset).toBe(1);
    const b = pagePlan(p, { offset: 1, maxPieces: 6 });
    expect(b.page.blocks).toEqual(["B1"]);
    const c = pagePlan(p, { offset: 2, maxPieces: 6 });
    expect(c.page).toMatchObject({ blocks: ["B2"], nextOffset: null, totalBlocks: 3, totalPieces: 12 });
    expect(c.plan.unplaced).toEqual(p.unplaced);
    expect(c.plan.stats).toEqual(p.stats);
  });

  it("gives one block even when it alone is over the limit, and nothing past the end", () => {
    expect(pagePlan(plan([10]), { maxPieces: 3 }).page.blocks).toEqual(["B0"]);
    expect(pagePlan(plan([1, 1]), { offset: 9 }).page).toMatchObject({ blocks: [], nextOffset: null });
  });

  it("walking the pages gives back every piece exactly once, in any paging", () => {
    fc.assert(
      fc.property(
        fc.array(fc.nat(20), { minLength: 1, maxLength: 12 }),
        fc.integer({ min: 1, max: 5 }),
        fc.integer({ min: 1, max: 40 }),
        (counts, limit, maxPieces) => {
          const p = plan(counts);
          const seen: Plan["placements"] = [];
          const offcuts: Plan["offcuts"] = [];
          let offset: number | null = 0;
          let pages = 0;
          while (offset !== null) {
            const r = pagePlan(p, { offset, limit, maxPieces });
            expect(r.page.blocks.length).toBeGreaterThan(0);
            expect(r.page.blocks.length).toBeLessThanOrEqual(limit);
            seen.push(...r.plan.placements);
            offcuts.push(...r.plan.offcuts);
            expect(Object.keys(r.plan.cuts)).toEqual(r.page.blocks);
            offset = r.page.nextOffset;
            pages++;
          }
          // Pages follow the plan's block order (blocks with placements first), so compare as sets.
          const key = (x: { block: string; origin: number[] }) => `${x.block}@${x.origin.join(",")}`;
          expect(seen.map(key).sort()).toEqual(p.placements.map(key).sort());
          expect(offcuts.map(key).sort()).toEqual(p.offcuts.map(key).sort());
          expect(pages).toBeLessThanOrEqual(planBlockOrder(p).length);
        },
      ),
    );
  });
});
