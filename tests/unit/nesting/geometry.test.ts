import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  atLeastSorted,
  grow,
  isLayer,
  orientations,
  overlappingPairs,
  overlaps,
  separate,
  type Box,
} from "@/lib/nesting/geometry";
import type { Vec3 } from "@/lib/nesting/types";

describe("geometry", () => {
  it("lists the orientations each rotate rule allows", () => {
    expect(orientations([1, 2, 3], "none")).toEqual([[1, 2, 3]]);
    expect(orientations([1, 2, 3], "z")).toEqual([
      [1, 2, 3],
      [2, 1, 3],
    ]);
    expect(orientations([1, 2, 3], "any")).toHaveLength(6);
    expect(orientations([2, 2, 2], "any")).toHaveLength(1);
    expect(orientations([1, 1, 3], "any")).toHaveLength(3);
  });

  it("treats touching boxes as not overlapping and a sliver of overlap as overlapping", () => {
    const a = { origin: [0, 0, 0] as [number, number, number], size: [10, 10, 10] as [number, number, number] };
    expect(overlaps(a, { origin: [10, 0, 0], size: [5, 5, 5] })).toBe(false);
    expect(overlaps(a, { origin: [9.9, 0, 0], size: [5, 5, 5] })).toBe(true);
    expect(grow(a, 1)).toEqual({ origin: [-1, -1, -1], size: [12, 12, 12] });
  });

  it("compares offcut sizes sorted, smallest to smallest", () => {
    expect(atLeastSorted([25, 300, 150], [150, 150, 25])).toBe(true);
    expect(atLeastSorted([24, 300, 150], [150, 150, 25])).toBe(false);
    expect(atLeastSorted([100, 100, 100], [150, 150, 25])).toBe(false);
  });

  it("finds through cuts between pieces a kerf apart and refuses a pinwheel", () => {
    const b = (o: [number, number, number], s: [number, number, number]) => ({ origin: o, size: s });
    const two = [b([0, 0, 0], [10, 10, 10]), b([11, 0, 0], [10, 10, 10])];
    expect(separate(two, 1, "guillotine")).toEqual({ cuts: [{ axis: "x", at: 10 }], stuck: [] });
    expect(separate(two, 2, "guillotine").stuck).toHaveLength(1);
    // Four boards around a hole: no through cut separates them.
    const pinwheel = [
      b([0, 0, 0], [20, 10, 5]),
      b([20, 0, 0], [10, 20, 5]),
      b([10, 20, 0], [20, 10, 5]),
      b([0, 10, 0], [10, 20, 5]),
    ];
    expect(separate(pinwheel, 0, "guillotine").stuck).toHaveLength(1);
    // The same boards all span z = [0, 5]: one layer, fine for "layers".
    expect(isLayer(pinwheel, [0, 1, 2, 3])).toBe(true);
    expect(separate(pinwheel, 0, "layers").stuck).toHaveLength(0);
  });

  it("finds exactly the overlapping pairs every-pair comparison finds, through the grid too (fast-check)", () => {
    const every = (boxes: Box[]): [number, number][] => {
      const out: [number, number][] = [];
      for (let i = 0; i < boxes.length; i++)
        for (let j = i + 1; j < boxes.length; j++) if (overlaps(boxes[i]!, boxes[j]!)) out.push([i, j]);
      return out;
    };
    // Boxes on a coarse lattice so faces touch and coincide often; a few span most of the space.
    const side = fc.oneof(
      { weight: 6, arbitrary: fc.integer({ min: 1, max: 6 }) },
      { weight: 1, arbitrary: fc.integer({ min: 20, max: 60 }) },
      { weight: 1, arbitrary: fc.constant(0) },
    );
    const box = fc.record({
      origin: fc.tuple(
        fc.integer({ min: 0, max: 60 }),
        fc.integer({ min: 0, max: 60 }),
        fc.integer({ min: 0, max: 60 }),
      ),
      size: fc.tuple(side, side, side),
    });
    fc.assert(
      fc.property(
        fc.oneof(fc.array(box, { maxLength: 64 }), fc.array(box, { minLength: 65, maxLength: 400, size: "max" })),
        fc.constantFrom(0, 0.5),
        (raw, shift) => {
          const boxes: Box[] = raw.map((b) => ({
            origin: b.origin.map((v) => v * shift + v) as Vec3,
            size: b.size.map((v) => v + v * shift) as Vec3,
          }));
          expect(overlappingPairs(boxes)).toEqual(every(boxes));
        },
      ),
      { numRuns: 200 },
    );
  });

  it("keeps the grid coarse enough when large boxes lie among many small ones, and still finds every pair", () => {
    // 400 small cubes and 200 thin sheets spanning the whole space: the sheets would each sit in
    // every cell of a fine grid.
    const boxes: Box[] = [];
    for (let i = 0; i < 400; i++)
      boxes.push({ origin: [(i % 20) * 10, Math.floor(i / 20) * 10, 0], size: [10, 10, 10] });
    for (let i = 0; i < 200; i++) boxes.push({ origin: [0, 0, 5 + i * 0.5], size: [200, 200, i % 7 === 0 ? 1 : 0.25] });
    const every: [number, number][] = [];
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) if (overlaps(boxes[i]!, boxes[j]!)) every.push([i, j]);
    expect(every.length).toBeGreaterThan(4000);
    expect(overlappingPairs(boxes)).toEqual(every);
  });

  it("separates pieces that only touch and catches one overlap among 20,000 cubes", () => {
    const cubes: Box[] = [];
    for (let x = 0; x < 40; x++)
      for (let y = 0; y < 25; y++)
        for (let z = 0; z < 20; z++) cubes.push({ origin: [x * 10, y * 10, z * 10], size: [10, 10, 10] });
    expect(cubes).toHaveLength(20_000);
    expect(overlappingPairs(cubes)).toEqual([]);
    // Nudge one cube 0.1 mm into its neighbour along y: exactly that pair, lower index first.
    const k = 1 * 25 * 20 + 3 * 20 + 7;
    cubes[k] = { origin: [10, 30.1 - 0.2, 70], size: [10, 10, 10] };
    expect(overlappingPairs(cubes)).toEqual([[k - 20, k]]);
  });
});
