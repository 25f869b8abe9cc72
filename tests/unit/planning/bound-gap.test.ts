import { describe, expect, it } from "vitest";
import type { Plan, Problem } from "@/lib/nesting";
import { boundGap } from "@/lib/planning/bound-gap";

// Two 1000 mm cubes (no trim), three 600 mm cubes: each is 21.6 % of a block, and no two fit in
// one block, so the plan takes 3 blocks although their volume (0.648 of a block) gives a bound of 1.
const problem: Problem = {
  version: 1,
  settings: { kerf: 0, trim: 0, defectMargin: 0, minOffcut: [100, 100, 25], layout: "guillotine", timeLimitMs: 1000 },
  blocks: ["A", "B", "C"].map((id) => ({
    id,
    size: [1000, 1000, 1000],
    cost: 1,
    offcut: false,
    trim: 0,
    defects: id === "B" ? [{ min: [0, 0, 0], max: [10, 10, 10] }] : [],
  })),
  parts: [{ id: "cube", size: [600, 600, 600], quantity: 3, rotate: "any" }],
};
const plan = (used: number, bound: number): Plan => ({
  version: 1,
  placements: ["A", "B", "C"].map((block) => ({ part: "cube", block, origin: [0, 0, 0], size: [600, 600, 600] })),
  unplaced: [],
  offcuts: [],
  cuts: {},
  stats: {
    blocksUsed: used,
    partVolume: 0,
    stockVolume: 0,
    offcutVolume: 0,
    yield: 0,
    elapsedMs: 0,
    lowerBoundBlocks: bound,
  },
});

describe("why a plan stops above the bound", () => {
  it("gives the parts' volume in blocks, the largest parts' share, and the defect zones (by hand)", () => {
    const g = boundGap(problem, plan(3, 1))!;
    expect(g.used).toBe(3);
    expect(g.bound).toBe(1);
    expect(g.partBlocks).toBeCloseTo(0.648, 9); // 3 × 0.216 m³ over 1 m³
    expect(g.largest).toEqual([{ part: "cube", count: 3, share: expect.closeTo(0.216, 9) }]);
    expect(g.defects).toBe(1);
    expect(g.blocksWithDefects).toBe(1);
  });

  it("says nothing when the plan is at its bound", () => {
    expect(boundGap(problem, plan(3, 3))).toBeUndefined();
  });
});
