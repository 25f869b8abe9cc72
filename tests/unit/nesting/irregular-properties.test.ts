/**
 * Property tests of true-shape nesting over random outlines (star-shaped loops, some with a square
 * hole), quantities, rotation lists and kerfs. Every layout is checked independently of the engine:
 * overlaps with polygon-clipping (scripts/lib-bench/irregular.ts), kerf spacing with the plain
 * segment distances below, containment and rotations from the problem itself.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  type IrregularProblem,
  type IrregularSolution,
  nestIrregularSync,
  parseIrregular,
  type Pt,
  validateIrregular,
} from "@/lib/nesting/irregular";
import { NfpCache, penetration } from "@/lib/nesting/irregular/nfp";
import { prepare } from "@/lib/nesting/irregular/shapes";
import { checkIndependently } from "@/scripts/lib-bench/irregular";
import polygonClipping from "polygon-clipping";
import { outlineGap } from "../../support/plane";

/** A star-shaped loop around the origin; angular gaps stay under 120°, so a square of half-side r·0.25 fits inside. */
const starArb = fc
  .record({
    k: fc.integer({ min: 5, max: 9 }),
    size: fc.double({ min: 1, max: 8, noNaN: true }),
    jitter: fc.array(fc.double({ min: 0, max: 0.5, noNaN: true }), { minLength: 9, maxLength: 9 }),
    radii: fc.array(fc.double({ min: 0.35, max: 1, noNaN: true }), { minLength: 9, maxLength: 9 }),
    hole: fc.boolean(),
    dx: fc.double({ min: -5, max: 5, noNaN: true }),
  })
  .map(({ k, size, jitter, radii, hole, dx }) => {
    const outer: Pt[] = [];
    for (let i = 0; i < k; i++) {
      const a = ((i + jitter[i]!) / k) * 2 * Math.PI;
      const r = radii[i]! * size;
      outer.push([r * Math.cos(a) + dx, r * Math.sin(a)]);
    }
    const h = 0.35 * 0.25 * size;
    const holes: Pt[][] = hole
      ? [
          [
            [dx - h, -h],
            [dx + h, -h],
            [dx + h, h],
            [dx - h, h],
          ],
        ]
      : [];
    return { outer, holes, size };
  });

const rotationsArb = fc.oneof(
  fc.subarray([0, 90, 180, 270], { minLength: 1 }),
  fc.constantFrom([0], [0, 180], [30], [0, 45, 135]),
);

const problemArb = fc
  .record({
    shapes: fc.array(fc.record({ shape: starArb, quantity: fc.integer({ min: 1, max: 3 }), rotations: rotationsArb }), {
      minLength: 1,
      maxLength: 5,
    }),
    kerf: fc.oneof(fc.constant(0), fc.double({ min: 0.05, max: 0.6, noNaN: true })),
    widthFactor: fc.double({ min: 1.05, max: 3, noNaN: true }),
  })
  .map(({ shapes, kerf, widthFactor }) => {
    // Wider than any piece's diameter, so every rotation fits across.
    const width = 2 * Math.max(...shapes.map((s) => s.shape.size)) * widthFactor;
    const r = parseIrregular({
      width,
      kerf,
      items: shapes.map((s, i) => ({
        id: `p${i}`,
        outer: s.shape.outer,
        holes: s.shape.holes,
        quantity: s.quantity,
        rotations: s.rotations,
      })),
    });
    if (!r.ok) throw new Error(`generator made a bad problem: ${r.errors.join("; ")}`);
    return r.problem;
  });

/** Placed loops of every copy, computed here from the problem (rotation about the item's origin, then the move). */
function placed(problem: IrregularProblem, sol: IrregularSolution): { label: string; loops: Pt[][] }[] {
  return sol.placements.map((p) => {
    const it = problem.items.find((i) => i.id === p.item)!;
    const a = (p.rotation * Math.PI) / 180;
    const c = Math.cos(a);
    const s = Math.sin(a);
    const loops = [it.outer, ...it.holes].map((l) =>
      l.map(([x, y]) => [c * x - s * y + p.x, s * x + c * y + p.y] as Pt),
    );
    return { label: `${p.item}#${p.copy}`, loops };
  });
}

describe("true-shape nesting over random outlines", () => {
  it("never overlaps, stays in the strip, turns only as listed and keeps the kerf (holes only where the part fits with kerf)", () => {
    fc.assert(
      fc.property(problemArb, fc.integer({ min: 1, max: 1000 }), (problem, seed) => {
        const sol = nestIrregularSync(problem, { seed, maxMoves: 150 });
        expect(sol.unplaced).toEqual([]);
        expect(validateIrregular(problem, sol)).toEqual([]);
        // Independent: polygon-clipping intersections, strip containment, allowed rotations, counts.
        expect(checkIndependently(problem, sol).errors).toEqual([]);
        for (const p of sol.placements) {
          const allowed = problem.items.find((i) => i.id === p.item)!.rotations;
          expect(allowed).toContain(p.rotation);
        }
        if (problem.kerf > 0) {
          const outs = placed(problem, sol);
          for (let i = 0; i < outs.length; i++)
            for (let j = i + 1; j < outs.length; j++) {
              const gap = outlineGap(outs[i]!.loops, outs[j]!.loops);
              expect(gap, `${outs[i]!.label} to ${outs[j]!.label}`).toBeGreaterThanOrEqual(problem.kerf * (1 - 1e-6));
            }
        }
      }),
      { numRuns: 30 },
    );
  });

  it("gives the same layout for the same seed and move budget", () => {
    fc.assert(
      fc.property(problemArb, fc.integer({ min: 1, max: 1000 }), (problem, seed) => {
        const a = nestIrregularSync(problem, { seed, maxMoves: 120 });
        const b = nestIrregularSync(problem, { seed, maxMoves: 120 });
        expect(b.placements).toEqual(a.placements);
        expect(b.length).toBe(a.length);
      }),
      { numRuns: 8 },
    );
  });

  it("is never longer than its first (bottom-left) layout and never shorter than the area bound", () => {
    fc.assert(
      fc.property(problemArb, (problem) => {
        const sol = nestIrregularSync(problem, { seed: 3, maxMoves: 150 });
        expect(sol.length).toBeLessThanOrEqual(sol.stats.firstLength + 1e-9);
        expect(sol.density).toBeLessThanOrEqual(1 + 1e-9);
      }),
      { numRuns: 10 },
    );
  });
});

describe("no-fit polygons", () => {
  /** Area of a polygon-clipping result (outer rings minus holes). */
  const mpArea = (m: [number, number][][][]): number => {
    let a = 0;
    for (const poly of m)
      poly.forEach((ring, k) => {
        let t = 0;
        for (let i = 0, j = ring.length - 1; i < ring.length; j = i++)
          t += ring[j]![0] * ring[i]![1] - ring[i]![0] * ring[j]![1];
        a += (k === 0 ? 1 : -1) * Math.abs(t / 2);
      });
    return a;
  };

  it("say two pieces overlap exactly when polygon-clipping finds an intersection (random outlines with holes, random offsets)", () => {
    fc.assert(
      fc.property(
        problemArb,
        fc.array(
          fc.tuple(
            fc.nat(),
            fc.nat(),
            fc.double({ min: 0, max: 1, noNaN: true }),
            fc.double({ min: 0, max: 1, noNaN: true }),
          ),
          { minLength: 20, maxLength: 20 },
        ),
        (problem, offsets) => {
          const prep = prepare({ ...problem, kerf: 0 });
          const nfps = new NfpCache(prep.variants, prep.typeShape);
          const S = prep.scale;
          const loopsAt = (vi: number, x: number, y: number): [number, number][][] =>
            prep.variants[vi]!.shape.map((l) => l.map((p) => [(p.x + x) / S, (p.y + y) / S] as [number, number]));
          for (const [ai, bi, fx, fy] of offsets) {
            const a = ai % prep.variants.length;
            const b = bi % prep.variants.length;
            const nfp = nfps.get(a, b);
            const A = prep.variants[a]!;
            const B = prep.variants[b]!;
            // Half the offsets put the boxes' centres together (give or take 10 %), where a small piece
            // lies inside a large one or in its hole; the others anywhere in the NFP's box.
            const centred = (ai + bi) % 2 === 0;
            const qx = Math.round(
              centred
                ? (A.sMinX + A.sMaxX - B.sMinX - B.sMaxX) / 2 + (fx - 0.5) * 0.2 * (A.sMaxX - A.sMinX)
                : nfp.minX + fx * (nfp.maxX - nfp.minX),
            );
            const qy = Math.round(
              centred
                ? (A.sMinY + A.sMaxY - B.sMinY - B.sMaxY) / 2 + (fy - 0.5) * 0.2 * (A.sMaxY - A.sMinY)
                : nfp.minY + fy * (nfp.maxY - nfp.minY),
            );
            const depth = penetration(nfp, qx, qy);
            const inter = mpArea(
              polygonClipping.intersection(loopsAt(a, 0, 0), loopsAt(b, qx, qy)) as [number, number][][][],
            );
            // A depth of a few scaled units is a touch (a sliver of area ~ depth × edge length).
            if (depth > 8)
              expect(inter, `offset ${qx}, ${qy} of variants ${a}, ${b}: depth ${depth}`).toBeGreaterThan(0);
            if (depth === 0)
              expect(inter * S * S, `offset ${qx}, ${qy} of variants ${a}, ${b}`).toBeLessThan(
                1e-3 * Math.max(1, prep.variants[a]!.w * S),
              );
          }
        },
      ),
      { numRuns: 15 },
    );
  });
});
