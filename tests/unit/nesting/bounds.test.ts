import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  dffLarge,
  dffRound,
  largeItemBound,
  lowerBoundBlocks,
  scaleBound,
  volumeBound,
  type BoundItem,
  type Dff,
  type Rotate,
  type Vec3,
} from "@/lib/nesting";
import { problem } from "./helpers";

describe("lower bounds", () => {
  it("volume bound L0 rounds the volume ratio up", () => {
    expect(volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 3 }])).toBe(2);
    expect(volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 2 }])).toBe(1);
    // Kerf inflates both sides: two 5-wide parts and a 1 mm kerf no longer fit one 10-wide bin.
    expect(volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 2 }], 1)).toBe(2);
  });

  it("large-item bound counts parts that exceed half the bin on every axis", () => {
    // Three 6-cubes: volume says 1 bin, but no two share a 10-cube.
    expect(volumeBound([10, 10, 10], [{ size: [6, 6, 6], rotate: "any", count: 3 }])).toBe(1);
    expect(largeItemBound([10, 10, 10], [{ size: [6, 6, 6], rotate: "any", count: 3 }])).toBe(3);
    // A 6x6x4 part can lie flat beside another only if rotated; with rotate "none" it is
    // still small on z, so it is not a large item.
    expect(largeItemBound([10, 10, 10], [{ size: [6, 6, 4], rotate: "none", count: 3 }])).toBe(1);
  });

  it("is rotation-aware: a part that may turn is large only if large in every orientation", () => {
    // 12 x 6 x 6 in a 20 x 8 x 8 bin: fixed, it exceeds half on every axis (one per bin);
    // rotated it would not fit other ways anyway, but a 12 x 6 x 3 may stand 3 wide.
    expect(largeItemBound([20, 8, 8], [{ size: [12, 6, 6], rotate: "none", count: 4 }])).toBe(4);
    expect(largeItemBound([20, 8, 8], [{ size: [12, 6, 3], rotate: "any", count: 4 }])).toBeLessThan(4);
  });

  it("uses the trimmed usable box and sums over grades", () => {
    const p = problem({
      settings: { kerf: 0, trim: 5 },
      blocks: [
        { id: "A", size: [110, 110, 110], grade: "g1" },
        { id: "B", size: [110, 110, 110], grade: "g1" },
        { id: "C", size: [110, 110, 110], grade: "g2" },
      ],
      parts: [
        { id: "p", size: [60, 60, 60], quantity: 2, grade: "g1" },
        { id: "q", size: [10, 10, 10], quantity: 1, grade: "g2" },
      ],
    });
    expect(lowerBoundBlocks(p)).toBe(3);
  });
});

/** The most a function gives to whole sizes s / C whose sum is at most C (unbounded knapsack). */
function maxSum(f: Dff, C: number): number {
  const best = new Float64Array(C + 1);
  for (let c = 1; c <= C; c++) {
    let b = best[c - 1]!;
    for (let s = 1; s <= c; s++) b = Math.max(b, best[c - s]! + f(s / C));
    best[c] = b;
  }
  return best[C]!;
}

/** Cuts a box by through cuts (each removes `kerf`) at the given picks: the pieces fit back exactly. */
function cutInto(size: Vec3, kerf: number, cuts: readonly [number, number, number][]): Vec3[] {
  const boxes: Vec3[] = [size];
  for (const [pick, axis, frac] of cuts) {
    const i = pick % boxes.length;
    const b = boxes[i]!;
    if (b[axis]! < 2 + kerf) continue;
    const at = 1 + Math.floor(frac * (b[axis]! - 1 - kerf));
    const left = [...b] as Vec3;
    const right = [...b] as Vec3;
    left[axis] = at;
    right[axis] = b[axis]! - at - kerf;
    if (right[axis]! < 1) continue;
    boxes.splice(i, 1, left, right);
  }
  return boxes;
}

describe("conservative scales (dual feasible functions, Fekete & Schepers — from memory: Math. Methods OR 2004)", () => {
  it("u^(k) and U^(ε), and u^(k) after U^(ε), never let sizes that fit one bin sum past it (exact check on whole sizes)", () => {
    // The defining property of a dual feasible function, checked exhaustively on each grid.
    for (const C of [10, 12, 40, 100]) {
      for (let k = 1; k <= 20; k++) expect(maxSum(dffRound(k), C), `u${k}, C=${C}`).toBeLessThanOrEqual(1 + 1e-9);
      for (let j = 1; j <= C / 2; j++)
        for (const e of [j / C, (j + 0.5) / C]) {
          if (e > 0.5) continue;
          const U = dffLarge(e);
          expect(maxSum(U, C), `U${e}, C=${C}`).toBeLessThanOrEqual(1 + 1e-9);
          for (let k = 1; k <= 10; k++) {
            const u = dffRound(k);
            expect(
              maxSum((x) => u(U(x)), C),
              `u${k}∘U${e}, C=${C}`,
            ).toBeLessThanOrEqual(1 + 1e-9);
          }
        }
    }
  });

  it("the exact check catches functions that are not dual feasible", () => {
    expect(maxSum((x) => Math.min(1, 1.1 * x), 10)).toBeGreaterThan(1);
    // Counting sizes of exactly 1 − ε as the whole bin: 0.7 + 0.3 would give 1.3.
    expect(maxSum((x) => (x >= 0.7 ? 1 : x < 0.3 ? 0 : x), 10)).toBeGreaterThan(1);
  });

  it("nine 4-cubes need two 10-cubes, which the volume and large-item bounds miss", () => {
    // Worked example (common practice, no source): at most two 4-cubes fit along each 10 side.
    const nine: BoundItem[] = [{ size: [4, 4, 4], rotate: "any", count: 9 }];
    expect(volumeBound([10, 10, 10], nine)).toBe(1);
    expect(largeItemBound([10, 10, 10], nine)).toBe(1);
    expect(scaleBound([10, 10, 10], nine)).toBe(2);
    expect(scaleBound([10, 10, 10], [{ size: [4, 4, 4], rotate: "any", count: 8 }])).toBe(1);
    const p = problem({
      blocks: [
        { id: "A", size: [10, 10, 10] },
        { id: "B", size: [10, 10, 10] },
      ],
      parts: [{ id: "c", size: [4, 4, 4], quantity: 9 }],
    });
    expect(lowerBoundBlocks(p)).toBe(2);
  });

  it("a part that may turn counts with its least value over the orientations that fit", () => {
    // 6 × 6 × 12 in a 10 × 10 × 20 bin exceeds half the bin on every axis and fits only standing:
    // one per bin, turning or not (lying down it would count less, but it cannot lie down).
    expect(scaleBound([10, 10, 20], [{ size: [6, 6, 12], rotate: "none", count: 4 }])).toBe(4);
    expect(scaleBound([10, 10, 20], [{ size: [6, 6, 12], rotate: "any", count: 4 }])).toBe(4);
  });

  it("never exceeds the blocks of a known packing (fast-check: blocks cut into pieces by through cuts with kerf)", () => {
    const cuts = fc.array(
      fc.tuple(fc.nat(), fc.integer({ min: 0, max: 2 }), fc.double({ min: 0, max: 0.999, noNaN: true })),
      { maxLength: 14 },
    );
    fc.assert(
      fc.property(
        fc.tuple(fc.integer({ min: 6, max: 60 }), fc.integer({ min: 6, max: 60 }), fc.integer({ min: 6, max: 60 })),
        fc.integer({ min: 0, max: 2 }),
        fc.array(cuts, { minLength: 1, maxLength: 3 }),
        fc.constantFrom<Rotate>("any", "z", "none"),
        (size, kerf, perBlock, rotate) => {
          const pieces = perBlock.flatMap((c) => cutInto(size as Vec3, kerf, c));
          const items = pieces.map((s) => ({ size: s, rotate, count: 1 }));
          expect(scaleBound(size as Vec3, items, kerf)).toBeLessThanOrEqual(perBlock.length);
        },
      ),
      { numRuns: 300 },
    );
  });
});
