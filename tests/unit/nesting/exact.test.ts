/**
 * The zero-waste finishing search (lib/nesting/solver/exact.ts `packAllByMerging`): parts cut from
 * one block by through cuts go back into one block. The optimum is known by construction (the
 * parts were made by cutting that block, kerf included), so these checks need no outside source.
 */
import { describe, expect, it } from "vitest";
import { validatePlan, type Vec3 } from "@/lib/nesting";
import { assemblePlan } from "@/lib/nesting/solver/assemble";
import { packAllByMerging, packAllByTable } from "@/lib/nesting/solver/exact";
import { buildModel } from "@/lib/nesting/solver/model";
import { perfectPacking } from "@/scripts/lib-bench/generate";
import { pinwheel, problem, solveValid } from "./helpers";

const mergeFill = (p: ReturnType<typeof problem>, nodeLimit = 5000) => {
  const m = buildModel(p);
  return packAllByMerging(
    m.blocks[0]!,
    m.types,
    m.types.map((t) => t.count),
    nodeLimit,
  );
};

/** The table search on a one-block problem; with the plan it makes, checked by the validator. */
const tableFill = (p: ReturnType<typeof problem>, pairLimit = 5_000_000) => {
  const m = buildModel(p);
  const fill = packAllByTable(
    m.blocks[0]!,
    m.types,
    m.types.map((t) => t.count),
    pairLimit,
  );
  return { fill, errors: fill ? validatePlan(p, assemblePlan(m, [fill], 0, 1)) : undefined };
};

describe("perfect packings: parts cut from one block by random through cuts (kerf 2) go back into one block", () => {
  for (let seed = 101; seed <= 130; seed++) {
    const parts = 8 + (seed % 5) * 6;
    it(`seed ${seed}, ${parts} parts, shuffled orientations: one block, every rule of the format holds`, () => {
      const p = perfectPacking(seed, [1200, 800, 600], parts, 2);
      const plan = solveValid(p, 40, seed);
      expect(plan.unplaced).toEqual([]);
      expect(plan.stats.blocksUsed).toBe(1);
      expect(plan.placements).toHaveLength(parts);
    });
  }
});

describe("the glue search keeps each part's rotate rule", () => {
  /** Two like pieces and one block they can fill exactly, no kerf or trim. */
  const twoIn = (block: Vec3, id: string, size: Vec3, rotate: "none" | "z" | "any") =>
    problem({
      settings: { kerf: 0, trim: 0, layout: "guillotine" },
      blocks: [{ id: "B", size: block }],
      parts: [{ id, size, quantity: 2, rotate }],
    });
  // Two 60 x 50 x 10 plates fill a 100 x 60 x 10 block only when each is turned a quarter about z.
  const plates = (rotate: "none" | "z") => twoIn([100, 60, 10], "plate", [60, 50, 10], rotate);

  it('rotate "z": the quarter turn is allowed, so the two plates fill the block', () => {
    const fill = mergeFill(plates("z"));
    expect(fill?.items).toHaveLength(2);
    for (const it of fill!.items) expect(it.dims).toEqual([50, 60, 10]);
  });

  it('rotate "none": no tiling exists without turning, and none is returned', () => {
    expect(mergeFill(plates("none"))).toBeUndefined();
  });

  // Two 100 x 100 x 10 sheets fill a 20 x 100 x 100 block only standing on edge.
  const sheets = (rotate: "any" | "z") => twoIn([20, 100, 100], "sheet", [100, 100, 10], rotate);

  it('rotate "any": the sheets stand on edge side by side', () => {
    const fill = mergeFill(sheets("any"));
    expect(fill?.items.map((i) => i.dims)).toEqual([[10, 100, 100] as Vec3, [10, 100, 100] as Vec3]);
    expect(fill!.items.map((i) => i.origin[0]).sort((a, b) => a - b)).toEqual([0, 10]);
  });

  it('rotate "z": the height must stay vertical, so the sheets cannot stand on edge', () => {
    expect(mergeFill(sheets("z"))).toBeUndefined();
  });
});

describe("the glue search only answers when it applies", () => {
  it("parts with room to spare (not zero waste) are left to the other searches", () => {
    const p = problem({
      settings: { kerf: 0, trim: 0 },
      blocks: [{ id: "B", size: [100, 100, 100] }],
      parts: [{ id: "c", size: [50, 50, 50], quantity: 7 }],
    });
    expect(mergeFill(p)).toBeUndefined();
    expect(solveValid(p).placements).toHaveLength(7);
  });

  it("a block with a defect zone is left to the searches that cut defects away", () => {
    const p = problem({
      settings: { kerf: 0, trim: 0, defectMargin: 0 },
      blocks: [{ id: "B", size: [100, 100, 100], defects: [{ id: "v", min: [10, 10, 10], max: [20, 20, 20] }] }],
      parts: [{ id: "c", size: [50, 50, 50], quantity: 8 }],
    });
    expect(mergeFill(p)).toBeUndefined();
  });

  it("with kerf and trim: eight cubes cut from a trimmed block come back, a kerf apart", () => {
    // Block 210 mm, trim 4 each side → 202 usable; two 100 mm pieces + 2 mm kerf per axis.
    const p = problem({
      settings: { kerf: 2, trim: 4 },
      blocks: [{ id: "B", size: [210, 210, 210] }],
      parts: [{ id: "c", size: [100, 100, 100], quantity: 8 }],
    });
    const fill = mergeFill(p);
    expect(fill?.items).toHaveLength(8);
    const xs = [...new Set(fill!.items.map((i) => i.origin[0]))].sort((a, b) => a - b);
    expect(xs).toEqual([4, 106]);
    expect(solveValid(p).stats.blocksUsed).toBe(1);
  });
});

describe("the table search over sets of pieces (packAllByTable): complete for cut trees", () => {
  for (let seed = 101; seed <= 130; seed++) {
    const parts = 8 + (seed % 5) * 6;
    if (parts > 20) continue;
    it(`finds the cut tree of a generated perfect packing (seed ${seed}, ${parts} parts, kerf 2), valid under the guillotine rule`, () => {
      const { fill, errors } = tableFill(perfectPacking(seed, [1200, 800, 600], parts, 2));
      expect(fill?.items).toHaveLength(parts);
      expect(errors).toEqual([]);
    });
  }

  it("proves that the pinwheel has no cut tree (null), where the glue search can only give up", () => {
    expect(tableFill(pinwheel("guillotine")).fill).toBeNull();
    expect(mergeFill(pinwheel("guillotine"))).toBeUndefined();
  });

  it("keeps each part's rotate rule: the plates fill the block only turned about z, the sheets only on edge", () => {
    const plates = (rotate: "none" | "z") =>
      problem({
        settings: { kerf: 0, trim: 0, layout: "guillotine" },
        blocks: [{ id: "B", size: [100, 60, 10] }],
        parts: [{ id: "plate", size: [60, 50, 10], quantity: 2, rotate }],
      });
    const turned = tableFill(plates("z"));
    expect(turned.errors).toEqual([]);
    for (const it of turned.fill!.items) expect(it.dims).toEqual([50, 60, 10]);
    expect(tableFill(plates("none")).fill).toBeNull();
    const sheets = (rotate: "any" | "z") =>
      problem({
        settings: { kerf: 0, trim: 0, layout: "guillotine" },
        blocks: [{ id: "B", size: [20, 100, 100] }],
        parts: [{ id: "sheet", size: [100, 100, 10], quantity: 2, rotate }],
      });
    expect(tableFill(sheets("any")).fill?.items.map((i) => i.dims)).toEqual([
      [10, 100, 100] as Vec3,
      [10, 100, 100] as Vec3,
    ]);
    expect(tableFill(sheets("z")).fill).toBeNull();
  });

  it("counts alike pieces instead of telling them apart: 25 pieces of two lines (176 sets, not 2^25)", () => {
    // 15 plates 20 × 10 and 10 squares 10 × 10 fill a 100 × 40 × 10 block exactly.
    const p = problem({
      settings: { kerf: 0, trim: 0, layout: "guillotine" },
      blocks: [{ id: "B", size: [100, 40, 10] }],
      parts: [
        { id: "plate", size: [20, 10, 10], quantity: 15, rotate: "z" },
        { id: "square", size: [10, 10, 10], quantity: 10, rotate: "z" },
      ],
    });
    const { fill, errors } = tableFill(p, 200_000);
    expect(fill?.items).toHaveLength(25);
    expect(errors).toEqual([]);
  });

  it("says it does not know (undefined), not that none exists, when it runs out of pairs, and leaves other cases alone", () => {
    expect(tableFill(perfectPacking(103, [1200, 800, 600], 20, 2), 10).fill).toBeUndefined();
    const spare = problem({
      settings: { kerf: 0, trim: 0 },
      blocks: [{ id: "B", size: [100, 100, 100] }],
      parts: [{ id: "c", size: [50, 50, 50], quantity: 7 }],
    });
    expect(tableFill(spare).fill).toBeUndefined();
    const defect = problem({
      settings: { kerf: 0, trim: 0, defectMargin: 0 },
      blocks: [{ id: "B", size: [100, 100, 100], defects: [{ id: "v", min: [10, 10, 10], max: [20, 20, 20] }] }],
      parts: [{ id: "c", size: [50, 50, 50], quantity: 8 }],
    });
    expect(tableFill(defect).fill).toBeUndefined();
  });
});
