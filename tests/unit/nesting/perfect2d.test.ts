/**
 * The perfect-layer search (lib/nesting/solver/perfect2d.ts). Instances are made up for the check
 * or generated (common practice, no source); the pinwheel is common knowledge, no source.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { validatePlan } from "@/lib/nesting";
import { buildModel } from "@/lib/nesting/solver/model";
import { packLayerPerfect } from "@/lib/nesting/solver/perfect2d";
import { packAllByMerging } from "@/lib/nesting/solver/exact";
import { pinwheel, problem, solveValid } from "./helpers";

/** The same five pieces, all lying the long way and not to be turned: no packing exists. */
const unturned = problem({
  settings: { kerf: 0, trim: 0, layout: "layers", minOffcut: [1, 1, 1] },
  blocks: [{ id: "B", size: [30, 30, 10] }],
  parts: [
    { id: "L", size: [20, 10, 10], quantity: 4, rotate: "none" },
    { id: "C", size: [10, 10, 10], quantity: 1, rotate: "none" },
  ],
});

/** Cells covered by the fill's pieces, each at most once; undefined on an overlap or overhang. */
function cover(W: number, H: number, items: { origin: number[]; dims: number[] }[]): number | undefined {
  const grid = new Uint8Array(W * H);
  let n = 0;
  for (const it of items)
    for (let y = it.origin[1]!; y < it.origin[1]! + it.dims[1]!; y++)
      for (let x = it.origin[0]!; x < it.origin[0]! + it.dims[0]!; x++) {
        if (x >= W || y >= H || grid[y * W + x]) return undefined;
        grid[y * W + x] = 1;
        n++;
      }
  return n;
}

describe("perfect layer search", () => {
  it("packs the pinwheel, which the glue search (through cuts only) cannot", () => {
    const m = buildModel(pinwheel("layers"));
    const counts = m.types.map((t) => t.count);
    const fill = packLayerPerfect(m.blocks[0]!, m.types, counts, 10_000);
    expect(fill?.items).toHaveLength(5);
    expect(cover(30, 30, fill!.items)).toBe(900);
    expect(packAllByMerging(m.blocks[0]!, m.types, counts, 100_000)).toBeUndefined();
    // Through the whole solver: layers places all five, guillotine must leave one out.
    expect(solveValid(pinwheel("layers")).unplaced).toEqual([]);
    expect(solveValid(pinwheel("guillotine")).unplaced.reduce((n, u) => n + u.count, 0)).toBe(1);
  });

  it("keeps the rotate rule: without turning, 20×10 pieces and a 10×10 one cannot fill 30×30", () => {
    const m = buildModel(unturned);
    expect(
      packLayerPerfect(
        m.blocks[0]!,
        m.types,
        m.types.map((t) => t.count),
        100_000,
      ),
    ).toBeUndefined();
  });

  it("declines parts that do not fill the layer exactly, or stand lower than the block", () => {
    const short = buildModel(pinwheel("layers"));
    expect(packLayerPerfect(short.blocks[0]!, short.types, [2, 2, 0], 10_000)).toBeUndefined();
    const thin = buildModel(
      problem({
        settings: { kerf: 0, trim: 0, layout: "layers" },
        blocks: [{ id: "B", size: [20, 10, 10] }],
        parts: [{ id: "P", size: [10, 10, 5], quantity: 4, rotate: "none" }],
      }),
    );
    expect(packLayerPerfect(thin.blocks[0]!, thin.types, [4], 10_000)).toBeUndefined();
  });

  it("finds a packing of any rectangle cut into pieces, valid and edge to edge (property)", () => {
    // A rectangle cut recursively by random straight cuts (a known perfect packing), pieces shuffled.
    const cut = (w: number, h: number, draws: number[], out: [number, number][]): void => {
      const d = draws.pop();
      if (d === undefined || (w < 2 && h < 2) || out.length > 10) return void out.push([w, h]);
      if ((d % 2 === 0 && w >= 2) || h < 2) {
        const x = 1 + (d % (w - 1));
        cut(x, h, draws, out);
        cut(w - x, h, draws, out);
      } else {
        const y = 1 + (d % (h - 1));
        cut(w, y, draws, out);
        cut(w, h - y, draws, out);
      }
    };
    fc.assert(
      fc.property(
        fc.integer({ min: 4, max: 30 }),
        fc.integer({ min: 4, max: 30 }),
        fc.array(fc.nat(1000), { minLength: 1, maxLength: 9 }),
        (W, H, draws) => {
          const pieces: [number, number][] = [];
          cut(W, H, [...draws], pieces);
          const p = problem({
            settings: { kerf: 0, trim: 0, layout: "layers", minOffcut: [1, 1, 1] },
            blocks: [{ id: "B", size: [W, H, 5] }],
            parts: pieces.map(([w, h], i) => ({ id: `P${i}`, size: [h, w, 5], quantity: 1, rotate: "z" })),
          });
          const m = buildModel(p);
          const fill = packLayerPerfect(
            m.blocks[0]!,
            m.types,
            m.types.map((t) => t.count),
            200_000,
          );
          expect(fill?.items.length).toBe(pieces.length);
          expect(cover(W, H, fill!.items)).toBe(W * H);
          // And as a plan of the solver, checked by the validator.
          const plan = solveValid(p, 20);
          expect(plan.unplaced).toEqual([]);
          expect(validatePlan(p, plan)).toEqual([]);
        },
      ),
      { numRuns: 40 },
    );
  });
});
