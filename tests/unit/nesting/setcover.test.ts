import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { denseDisjoint, type Column } from "@/lib/nesting/solver/setcover";

/** A remembered filling of block 0 holding `counts` (type → pieces) at the given density. */
function column(counts: Record<number, number>, density: number): Column {
  const items = Object.entries(counts).flatMap(([t, n]) =>
    Array.from({ length: n }, () => ({
      type: Number(t),
      origin: [0, 0, 0] as [number, number, number],
      dims: [1, 1, 1] as [number, number, number],
    })),
  );
  return {
    classKey: "k",
    counts: new Map(Object.entries(counts).map(([t, n]) => [Number(t), n])),
    fill: { block: 0, items, leftovers: [], packedVolume: items.length },
    density,
  };
}

const noJitter = () => 0.5;

describe("denseDisjoint: the fillings a pass starts from", () => {
  it("takes the densest fillings first and skips any that would take a piece twice", () => {
    const remaining = [1, 1, 1, 1];
    const cols = [
      column({ 0: 1, 1: 1 }, 0.7),
      column({ 1: 1, 2: 1 }, 0.95),
      column({ 3: 1 }, 0.5),
      column({ 0: 1 }, 0.6),
    ];
    const picked = denseDisjoint(cols, remaining, 10, noJitter);
    // 0.95 {1,2} first; 0.7 {0,1} clashes on piece 1; then 0.6 {0} and 0.5 {3}.
    expect(picked.map((c) => c.density)).toEqual([0.95, 0.6, 0.5]);
    expect(remaining).toEqual([0, 0, 0, 0]);
  });

  it("stops at the number asked for and leaves the other pieces for the pass", () => {
    const remaining = [2, 2];
    const picked = denseDisjoint(
      [column({ 0: 1 }, 0.9), column({ 1: 1 }, 0.8), column({ 0: 1, 1: 1 }, 0.7)],
      remaining,
      1,
      noJitter,
    );
    expect(picked).toHaveLength(1);
    expect(remaining).toEqual([1, 2]);
  });

  it("never takes more pieces of a type than are left, whatever the columns (property)", () => {
    const counts = fc.dictionary(fc.integer({ min: 0, max: 5 }).map(String), fc.integer({ min: 1, max: 3 }), {
      minKeys: 1,
      maxKeys: 4,
    });
    fc.assert(
      fc.property(
        fc.array(fc.tuple(counts, fc.double({ min: 0.1, max: 1, noNaN: true })), { maxLength: 30 }),
        fc.array(fc.integer({ min: 0, max: 4 }), { minLength: 6, maxLength: 6 }),
        fc.nat(10),
        fc.integer(),
        (cs, left, want, seed) => {
          const cols = cs.map(([c, d]) =>
            column(Object.fromEntries(Object.entries(c).map(([t, n]) => [Number(t), n])), d),
          );
          const remaining = [...left];
          let x = seed;
          const rng = () => ((x = (x * 1103515245 + 12345) % 2 ** 31) < 0 ? -x : x) / 2 ** 31;
          const picked = denseDisjoint(cols, remaining, want, rng);
          expect(picked.length).toBeLessThanOrEqual(want);
          const taken = left.map(() => 0);
          for (const c of picked) for (const [t, n] of c.counts) taken[t]! += n;
          taken.forEach((n, t) => {
            expect(n).toBeLessThanOrEqual(left[t]!);
            expect(remaining[t]).toBe(left[t]! - n);
          });
        },
      ),
    );
  });
});
