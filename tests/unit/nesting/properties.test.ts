import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { comparePlans, nestSync, parseProblem, validatePlan, type Problem } from "@/lib/nesting";

const vec = (lo: number, hi: number) =>
  fc.tuple(fc.integer({ min: lo, max: hi }), fc.integer({ min: lo, max: hi }), fc.integer({ min: lo, max: hi }));

const defectIn = (size: [number, number, number]) =>
  fc
    .tuple(
      fc.double({ min: 0, max: 0.8, noNaN: true }),
      fc.double({ min: 0, max: 0.8, noNaN: true }),
      fc.double({ min: 0, max: 0.8, noNaN: true }),
      fc.integer({ min: 1, max: 30 }),
    )
    .map(([a, b, c, w]) => {
      const min = [a, b, c].map((f, i) => Math.floor(f * size[i]!)) as [number, number, number];
      return { id: "d", min, max: min.map((v, i) => Math.min(size[i]!, v + w)) as [number, number, number] };
    });

const blockArb = vec(60, 400).chain((size) =>
  fc.record({
    size: fc.constant(size),
    grade: fc.constantFrom("A", "B"),
    offcut: fc.boolean(),
    defects: fc.array(defectIn(size), { maxLength: 2 }),
  }),
);

const problemArb = fc
  .record({
    kerf: fc.constantFrom(0, 1, 1.5, 3),
    trim: fc.constantFrom(0, 2, 5),
    defectMargin: fc.constantFrom(0, 3),
    layout: fc.constantFrom("guillotine", "layers", "free"),
    blocks: fc.array(blockArb, { minLength: 1, maxLength: 3 }),
    parts: fc.array(
      fc.record({
        size: vec(8, 180),
        quantity: fc.integer({ min: 1, max: 4 }),
        grade: fc.constantFrom("A", "B", undefined),
        rotate: fc.constantFrom("any", "z", "none"),
      }),
      { minLength: 1, maxLength: 4 },
    ),
  })
  .map((r) => {
    const parsed = parseProblem({
      version: 1,
      settings: { kerf: r.kerf, trim: r.trim, defectMargin: r.defectMargin, minOffcut: [30, 30, 10], layout: r.layout },
      blocks: r.blocks.map((b, i) => ({ id: `B${i}`, ...b })),
      parts: r.parts.map((p, i) => ({ id: `P${i}`, ...p, ...(p.grade === undefined ? { grade: undefined } : {}) })),
    });
    if (!parsed.ok) throw new Error(parsed.errors.join("; "));
    return parsed.problem;
  });

const solve = (p: Problem, seed: number) => nestSync(p, { seed, iterations: 6 });

describe("solver properties on random small problems", () => {
  it("every plan is valid and accounts for every part: placed + unplaced = demand", () => {
    fc.assert(
      fc.property(problemArb, fc.integer({ min: 1, max: 1000 }), (p, seed) => {
        const plan = solve(p, seed);
        expect(validatePlan(p, plan)).toEqual([]);
        for (const part of p.parts) {
          const placed = plan.placements.filter((pl) => pl.part === part.id).length;
          const unplaced = plan.unplaced.filter((u) => u.part === part.id).reduce((s, u) => s + u.count, 0);
          expect(placed + unplaced).toBe(part.quantity);
        }
      }),
      { numRuns: 60 },
    );
  });

  it("a defect never lies inside a placed part", () => {
    fc.assert(
      fc.property(problemArb, (p) => {
        const plan = solve(p, 1);
        for (const pl of plan.placements) {
          const block = p.blocks.find((b) => b.id === pl.block)!;
          for (const d of block.defects) {
            const inside = [0, 1, 2].every((a) => pl.origin[a]! < d.max[a]! && d.min[a]! < pl.origin[a]! + pl.size[a]!);
            expect(inside).toBe(false);
          }
        }
      }),
      { numRuns: 60 },
    );
  });

  it("adding a block never makes the plan worse (the search starts from the previous plan)", () => {
    fc.assert(
      fc.property(problemArb, blockArb, (p, extra) => {
        const before = solve(p, 3);
        const bigger: Problem = {
          ...p,
          blocks: [
            ...p.blocks,
            {
              id: "extra",
              size: extra.size,
              grade: extra.grade,
              cost: (extra.size[0] * extra.size[1] * extra.size[2]) / 1e9,
              offcut: extra.offcut,
              trim: extra.offcut ? 0 : p.settings.trim,
              defects: extra.defects,
            },
          ],
        };
        if (bigger.blocks.at(-1)!.size.some((v) => 2 * bigger.blocks.at(-1)!.trim >= v)) return;
        const after = nestSync(bigger, { seed: 3, iterations: 6, warmStart: before });
        expect(validatePlan(bigger, after)).toEqual([]);
        expect(comparePlans(bigger, after, before)).toBeLessThanOrEqual(0);
        expect(after.stats.partVolume).toBeGreaterThanOrEqual(before.stats.partVolume);
      }),
      { numRuns: 40 },
    );
  });
});
