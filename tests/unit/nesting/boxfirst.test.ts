/**
 * Box-first fills judged by greedy completions (a pilot method): more moves judged never makes a
 * single-block fill emptier here, and when the time is up the rest of the fill is plain greedy.
 * Instance data is generated (common practice, no source); published instances are in
 * tests/reference/nesting.
 */
import { describe, expect, it } from "vitest";
import { nestSync, validatePlan } from "@/lib/nesting";
import { buildModel } from "@/lib/nesting/solver/model";
import { fillBoxFirst } from "@/lib/nesting/solver/boxfirst";
import { rng } from "@/lib/nesting/rng";
import { problem } from "./helpers";

/** A container-loading order: 8 box kinds, more cargo than the block holds. */
function order(seed: number) {
  const r = rng(seed);
  const parts = Array.from({ length: 8 }, (_, i) => ({
    id: `box-${i}`,
    size: [30 + Math.floor(r() * 90), 25 + Math.floor(r() * 70), 20 + Math.floor(r() * 60)],
    quantity: 10 + Math.floor(r() * 20),
    rotate: "z",
  }));
  return problem({ settings: { kerf: 0, trim: 0, layout: "free" }, blocks: [{ id: "B", size: [587, 233, 220] }], parts });
}

function fill(seed: number, lookahead: number, stop?: () => boolean) {
  const m = buildModel(order(seed));
  const remaining = m.types.map((t) => t.count);
  const ord = m.types.map((t) => t.index).sort((a, b) => m.types[b]!.volume - m.types[a]!.volume);
  return fillBoxFirst([m.blocks[0]!.usable], m.types, remaining, ord, { grid: true, split: "biggest", lookahead, rng: rng(1), ...(stop ? { stop } : {}) });
}

describe("box-first fill with lookahead", () => {
  it("fills a block fuller with moves judged by greedy completions than plain greedy, on average", () => {
    let plain = 0;
    let judged = 0;
    for (let s = 1; s <= 6; s++) {
      plain += fill(s, 0).packedVolume;
      judged += fill(s, 48).packedVolume;
    }
    expect(judged).toBeGreaterThan(plain);
  });

  it("turns plain greedy when told the time is up", () => {
    for (let s = 1; s <= 3; s++) {
      const greedy = fill(s, 0);
      const stopped = fill(s, 96, () => true);
      expect(stopped.items).toEqual(greedy.items);
    }
  });

  it("a one-block order through nest() gives a valid plan filling most of what can be filled", () => {
    const p = order(7);
    const plan = nestSync(p, { seed: 1, iterations: 6 });
    expect(validatePlan(p, plan)).toEqual([]);
    const cargo = p.parts.reduce((s, x) => s + x.size[0] * x.size[1] * x.size[2] * x.quantity, 0);
    expect(plan.stats.partVolume / Math.min(cargo, 587 * 233 * 220)).toBeGreaterThan(0.85);
  });
});
