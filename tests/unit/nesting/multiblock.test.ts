/**
 * Orders that fill several blocks exactly (issue 21): k = 2–5 blocks of 2400 × 1200 × 600 cut by
 * random guillotine through cuts (kerf 1.5) into 8–40 pieces each, mixed, k + 2 blocks offered
 * (`perfectMultiBlock`, the generator of the benchmark's multi-block perfect set). The optimum is k
 * blocks. Runs go by passes, not the clock, so they are deterministic for a seed.
 */
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { nestSync, parseProblem, validatePlan, type Plan, type Problem } from "@/lib/nesting";
import { packAllIntoBlocks } from "@/lib/nesting/solver/exact";
import { assemblePlan } from "@/lib/nesting/solver/assemble";
import { buildModel, type BlockFill } from "@/lib/nesting/solver/model";
import { multiBlockCount, perfectMultiBlock, type MultiBlockVariant } from "@/scripts/lib-bench/generate";

/** Seeds of the benchmark's generator (k = 2 + seed mod 4), 16–153 pieces; all at the optimum. */
const SEEDS = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20] as const;

/** Passes per run: the first is the plain greedy plan, the exact fills over blocks come after it. */
const PASSES = 4;

function instance(
  seed: number,
  variant: MultiBlockVariant = {},
  blocks = multiBlockCount(seed),
): { problem: Problem; k: number } {
  const parsed = parseProblem(perfectMultiBlock(seed, blocks, 2000, variant));
  if (!parsed.ok) throw new Error(parsed.errors.join("; "));
  return { problem: parsed.problem, k: blocks };
}

/**
 * Orders whose exact split into k blocks is not found within the pass budget (a side of two
 * blocks matches by chance, so the glue search mixes their pieces): the k + 1 fallback keeps the
 * blocks that were filled exactly and packs the rest whole into one block more than its volume.
 * Seed 87 (k = 5, 121 pieces) ended at k + 2 = 7 blocks before the fallback, also under a 2 s clock.
 */
const FALLBACK_SEEDS = [87] as const;

/**
 * Further orders that missed k in the wide check (`scripts/check-multiblock.ts`, 2 s clock,
 * 2026-12-04) and ended at k + 1 there (274 and 229 at k + 2 before the fallback): seed, k, variant.
 */
const WIDE_MISSES: [number, number, MultiBlockVariant][] = [
  [274, 4, {}],
  [229, 5, {}],
  // k + 2 = 7 blocks before the fallback (2 s clock).
  [248, 5, {}],
  [20, 2, { block: [3000, 1500, 1000] }],
  [13, 3, { kerf: 0, block: [2440, 1220, 610], layout: "layers" }],
];

const run = (problem: Problem, seed = 1): Plan => nestSync(problem, { seed, iterations: PASSES });

/** The 77-piece, three-block order of the budget overrun report (see budget.test.ts). */
const reproFile = [
  process.env.NEST_REPRO,
  path.resolve(__dirname, "../../../../shared/repro/nest-budget-overrun.json"),
  path.resolve(process.cwd(), "../shared/repro/nest-budget-overrun.json"),
].find((f): f is string => !!f && existsSync(f));

describe("exact fills over several blocks (multi-block perfect packings)", () => {
  it("property: on the listed seeds the plan is valid, places every part in the optimum k blocks, and is deterministic", () => {
    const seen = new Set<number>();
    fc.assert(
      fc.property(fc.constantFrom(...SEEDS), (seed) => {
        seen.add(seed);
        const { problem, k } = instance(seed);
        const plan = run(problem);
        expect(validatePlan(problem, plan), `seed ${seed}`).toEqual([]);
        expect(plan.unplaced, `seed ${seed}`).toEqual([]);
        expect(plan.stats.blocksUsed, `seed ${seed}: ${problem.parts.length} parts`).toBe(k);
        expect(plan.stats.lowerBoundBlocks).toBe(k);
        // Deterministic for a seed: the same plan again, placement for placement.
        expect(JSON.stringify(run(problem)), `seed ${seed}`).toBe(JSON.stringify(plan));
      }),
      // Every listed seed once (the examples count towards numRuns), then two drawn again from the list.
      { examples: SEEDS.map((s) => [s] as [number]), numRuns: SEEDS.length + 2, seed: 21 },
    );
    expect([...seen].sort((a, b) => a - b)).toEqual([...SEEDS]);
  }, 240_000);

  it("property: on fresh seeds, kerfs, block sizes and layout rules the plan is valid, at most one block above k, and deterministic", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1000, max: 1_000_000 }),
        fc.integer({ min: 2, max: 4 }),
        fc.constantFrom(0, 1.5, 3),
        fc.constantFrom<[number, number, number]>([2400, 1200, 600], [2000, 1000, 500], [3000, 1500, 1000]),
        fc.constantFrom("guillotine" as const, "layers" as const),
        (seed, k, kerf, block, layout) => {
          const { problem } = instance(seed, { kerf, block, layout }, k);
          const label = `seed ${seed}, k ${k}, kerf ${kerf}, ${block.join("×")}, ${layout}`;
          const plan = run(problem);
          expect(validatePlan(problem, plan), label).toEqual([]);
          expect(plan.unplaced, label).toEqual([]);
          expect(plan.stats.blocksUsed, label).toBeLessThanOrEqual(k + 1);
          expect(plan.stats.blocksUsed, label).toBeGreaterThanOrEqual(k);
          expect(JSON.stringify(run(problem)), label).toBe(JSON.stringify(plan));
        },
      ),
      { numRuns: 12, seed: 21 },
    );
  }, 240_000);

  it.each(FALLBACK_SEEDS)(
    "regression: seed %i, whose exact split is not found, ends at most one block above k",
    (seed) => {
      const { problem, k } = instance(seed);
      const plan = run(problem);
      expect(validatePlan(problem, plan)).toEqual([]);
      expect(plan.unplaced).toEqual([]);
      expect(plan.stats.blocksUsed, `${problem.parts.length} parts, k ${k}`).toBeLessThanOrEqual(k + 1);
      expect(JSON.stringify(run(problem))).toBe(JSON.stringify(plan));
    },
    120_000,
  );

  it.each(WIDE_MISSES)(
    "regression: seed %i, k %i %o (a miss of the wide check) ends valid and at most one block above k",
    (seed, k, variant) => {
      const { problem } = instance(seed, variant, k);
      const plan = run(problem);
      expect(validatePlan(problem, plan)).toEqual([]);
      expect(plan.unplaced).toEqual([]);
      expect(plan.stats.blocksUsed, `${problem.parts.length} parts`).toBeLessThanOrEqual(k + 1);
    },
    120_000,
  );

  it("packAllIntoBlocks, when it fails, hands back the blocks it filled exactly and the rest packed whole in k - j + 1 blocks", () => {
    const { problem, k } = instance(87);
    const m = buildModel(problem);
    const counts = m.types.map((t) => t.count);
    const partial: { fills: BlockFill[]; rest?: BlockFill[] } = { fills: [] };
    expect(
      packAllIntoBlocks(m.blocks[0]!, m.types, counts, k, 2000, undefined, undefined, undefined, partial),
    ).toBeUndefined();
    const usable = m.blocks[0]!.usable;
    const cap = usable.size[0] * usable.size[1] * usable.size[2];
    // The exact blocks are full (grown by the kerf); with the rest, every piece is placed once.
    expect(partial.fills.length).toBeGreaterThan(0);
    for (const f of partial.fills) {
      const v = f.items.reduce((s, it) => s + it.dims[0] * it.dims[1] * it.dims[2], 0);
      expect(Math.abs(v - cap) / cap).toBeLessThan(1e-9);
    }
    expect(partial.rest).toBeDefined();
    expect(partial.fills.length + partial.rest!.length).toBeLessThanOrEqual(k + 1);
    const placed = new Array<number>(m.types.length).fill(0);
    for (const f of [...partial.fills, ...partial.rest!]) for (const it of f.items) placed[it.type]!++;
    expect(placed).toEqual(counts);
    // As a plan (blocks 1..n), the result passes the project's validator.
    const fills = [...partial.fills, ...partial.rest!].map((f, i) => ({ ...f, block: i }));
    expect(validatePlan(problem, assemblePlan(m, fills, 0, k))).toEqual([]);
  });

  it.skipIf(!reproFile)(
    "the overrun repro (77 pieces, one 1,200 mm side by chance) fills its optimum of 3 blocks",
    () => {
      const parsed = parseProblem(JSON.parse(readFileSync(reproFile!, "utf8")));
      if (!parsed.ok) throw new Error(parsed.errors.join("; "));
      const plan = run(parsed.problem);
      expect(validatePlan(parsed.problem, plan)).toEqual([]);
      expect(plan.unplaced).toEqual([]);
      expect(plan.stats.blocksUsed).toBe(3);
    },
  );

  it("packAllIntoBlocks partitions the pieces into k exact fills, each piece once, inside the usable box", () => {
    const { problem, k } = instance(3);
    const m = buildModel(problem);
    const counts = m.types.map((t) => t.count);
    const fills = packAllIntoBlocks(m.blocks[0]!, m.types, counts, k, 200_000);
    expect(fills).toHaveLength(k);
    const placed = new Array<number>(m.types.length).fill(0);
    const usable = m.blocks[0]!.usable;
    for (const f of fills!) {
      let v = 0;
      for (const it of f.items) {
        placed[it.type]!++;
        v += it.dims[0] * it.dims[1] * it.dims[2];
        for (let a = 0; a < 3; a++) {
          expect(it.origin[a]!).toBeGreaterThanOrEqual(usable.origin[a]! - 1e-6);
          expect(it.origin[a]! + it.dims[a]!).toBeLessThanOrEqual(usable.origin[a]! + usable.size[a]! + 1e-6);
        }
      }
      // Each block is filled exactly (grown by the kerf).
      const cap = usable.size[0] * usable.size[1] * usable.size[2];
      expect(Math.abs(v - cap) / cap).toBeLessThan(1e-9);
    }
    expect(placed).toEqual(counts);
  });

  it("packAllIntoBlocks declines when the volume is not a whole number of blocks, or too few nodes", () => {
    const { problem, k } = instance(5);
    const m = buildModel(problem);
    const counts = m.types.map((t) => t.count);
    expect(packAllIntoBlocks(m.blocks[0]!, m.types, counts, k + 1, 100_000)).toBeUndefined();
    const fewer = [...counts];
    fewer[0] = 0;
    expect(packAllIntoBlocks(m.blocks[0]!, m.types, fewer, k, 100_000)).toBeUndefined();
    expect(packAllIntoBlocks(m.blocks[0]!, m.types, counts, k, 3)).toBeUndefined();
  });
});
