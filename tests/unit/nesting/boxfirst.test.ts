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
import { split } from "@/lib/nesting/solver/split";
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
  return problem({
    settings: { kerf: 0, trim: 0, layout: "free" },
    blocks: [{ id: "B", size: [587, 233, 220] }],
    parts,
  });
}

function fill(seed: number, lookahead: number, stop?: () => boolean) {
  const m = buildModel(order(seed));
  const remaining = m.types.map((t) => t.count);
  const ord = m.types.map((t) => t.index).sort((a, b) => m.types[b]!.volume - m.types[a]!.volume);
  return fillBoxFirst([m.blocks[0]!.usable], m.types, remaining, ord, {
    grid: true,
    split: "biggest",
    lookahead,
    rng: rng(1),
    ...(stop ? { stop } : {}),
  });
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

describe("split rule 'column' (common practice, no source: stack like slabs, cross-stack the strips)", () => {
  it("keeps the piece's footprint beyond its thin side and lets the strips beside it run the whole box", () => {
    const box = { origin: [0, 0, 0] as [number, number, number], size: [100, 100, 100] as [number, number, number] };
    const slab: [number, number, number] = [20, 75, 80]; // thin along x
    const parts = split(box, slab, "column", rng(1));
    const column = parts.find((b) => b.origin[0] === 20);
    expect(column).toEqual({ origin: [20, 0, 0], size: [80, 75, 80] });
    // The other two boxes span the full 100 along x.
    const strips = parts.filter((b) => b !== column);
    expect(strips).toHaveLength(2);
    for (const s of strips) expect(s.size[0]).toBe(100);
    // Together they fill the box exactly.
    const vol = (s: [number, number, number]) => s[0] * s[1] * s[2];
    expect(vol(slab) + parts.reduce((t, b) => t + vol(b.size), 0)).toBe(100 ** 3);
    // 'biggest' instead keeps the long box beyond the slab whole.
    expect(
      split(box, slab, "biggest", rng(1)).some((b) => b.size[0] === 80 && b.size[1] === 100 && b.size[2] === 100),
    ).toBe(true);
  });
});
