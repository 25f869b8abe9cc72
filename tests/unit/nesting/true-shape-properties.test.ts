/**
 * Property tests of slab nesting (settings.trueShape) over random profile parts: star-shaped
 * outlines, some with a hole, two thicknesses, rotate rules, quantities and kerfs, into one or two
 * blocks. Every plan is checked by the project's validator and again independently of the planner:
 * overlaps, containment and lead-in slots with polygon-clipping (scripts/lib-bench/shop-case.ts),
 * kerf spacing with the plain distances below, rotations against the rule written out here.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { type FacePoint, nestSync, parseProblem, type Problem, validatePlan } from "@/lib/nesting";
import { checkSlabsIndependently } from "@/scripts/lib-bench/shop-case";
import { outlineGap } from "../../support/plane";

const starArb = fc
  .record({
    k: fc.integer({ min: 5, max: 9 }),
    size: fc.double({ min: 15, max: 70, noNaN: true }),
    jitter: fc.array(fc.double({ min: 0, max: 0.5, noNaN: true }), { minLength: 9, maxLength: 9 }),
    radii: fc.array(fc.double({ min: 0.35, max: 1, noNaN: true }), { minLength: 9, maxLength: 9 }),
    hole: fc.boolean(),
  })
  .map(({ k, size, jitter, radii, hole }) => {
    const pts: FacePoint[] = [];
    for (let i = 0; i < k; i++) {
      const a = ((i + jitter[i]!) / k) * 2 * Math.PI;
      pts.push([radii[i]! * size * Math.cos(a), radii[i]! * size * Math.sin(a)]);
    }
    const x0 = Math.min(...pts.map((p) => p[0]));
    const y0 = Math.min(...pts.map((p) => p[1]));
    const outer = pts.map(([x, y]) => [x - x0, y - y0] as FacePoint);
    const h = 0.35 * 0.25 * size;
    const holes: FacePoint[][] = hole
      ? [
          [
            [-x0 - h, -y0 - h],
            [-x0 + h, -y0 - h],
            [-x0 + h, -y0 + h],
            [-x0 - h, -y0 + h],
          ],
        ]
      : [];
    const w = Math.ceil(Math.max(...outer.map((p) => p[0])) * 100) / 100;
    const d = Math.ceil(Math.max(...outer.map((p) => p[1])) * 100) / 100;
    return { outer, holes, w, d };
  });

const problemArb = fc
  .record({
    parts: fc.array(
      fc.record({
        star: starArb,
        thick: fc.constantFrom(30, 50),
        quantity: fc.integer({ min: 1, max: 3 }),
        rotate: fc.constantFrom("any", "z", "none"),
      }),
      { minLength: 1, maxLength: 5 },
    ),
    kerf: fc.oneof(fc.constant(0), fc.double({ min: 0.5, max: 3, noNaN: true })),
    blocks: fc.array(
      fc.tuple(
        fc.integer({ min: 160, max: 400 }),
        fc.integer({ min: 160, max: 400 }),
        fc.integer({ min: 160, max: 400 }),
      ),
      {
        minLength: 1,
        maxLength: 2,
      },
    ),
    box: fc.boolean(),
  })
  .map(({ parts, kerf, blocks, box }): Problem => {
    const r = parseProblem({
      settings: { kerf, trueShape: true, timeLimitMs: 500 },
      blocks: blocks.map((size, i) => ({ id: `B${i}`, size })),
      parts: [
        ...parts.map((p, i) => ({
          id: `p${i}`,
          size: [p.thick, p.star.w, p.star.d],
          quantity: p.quantity,
          rotate: p.rotate,
          outline: { outer: p.star.outer, ...(p.star.holes.length ? { holes: p.star.holes } : {}) },
        })),
        ...(box ? [{ id: "plain", size: [60, 40, 30], quantity: 2 }] : []),
      ],
    });
    if (!r.ok) throw new Error(`generator made a bad problem: ${r.errors.join("; ")}`);
    return r.problem;
  });

/** A loop turned by a quarter-turn multiple, then moved (written out here, not the planner's). */
function place(l: FacePoint[], deg: number, at: FacePoint): FacePoint[] {
  const q = ((deg % 360) + 360) % 360;
  return l.map(([x, y]) => {
    const [u, v] = q === 90 ? [-y, x] : q === 180 ? [-x, -y] : q === 270 ? [y, -x] : [x, y];
    return [u + at[0], v + at[1]];
  });
}

describe("slab nesting over random profile parts", () => {
  it("plans valid slabs: members inside, apart by the kerf, turned only as allowed, lead-ins clear, holes never filled", () => {
    fc.assert(
      fc.property(problemArb, fc.integer({ min: 1, max: 1000 }), (problem, seed) => {
        const plan = nestSync(problem, { seed, iterations: 20 });
        expect(validatePlan(problem, plan)).toEqual([]);
        // Independent: polygon-clipping overlaps (outer loops: nothing inside a hole), containment, slots.
        expect(checkSlabsIndependently(problem, plan).errors).toEqual([]);
        const parts = new Map(problem.parts.map((p) => [p.id, p]));
        let copies = 0;
        for (const pl of plan.placements) {
          if (!pl.slab) {
            if (parts.get(pl.part)?.outline) copies++;
            continue;
          }
          const loops = pl.slab.members.map((m) => {
            const part = parts.get(m.part)!;
            expect(part.rotate === "any" ? [0, 90, 180, 270] : [0]).toContain(m.rotation);
            expect(["left", "right", "top"]).toContain(m.leadIn.face);
            copies++;
            return place(part.outline!.outer, m.rotation, m.at);
          });
          if (problem.settings.kerf > 0)
            for (let i = 0; i < loops.length; i++)
              for (let j = i + 1; j < loops.length; j++)
                expect(outlineGap([loops[i]!], [loops[j]!])).toBeGreaterThanOrEqual(problem.settings.kerf * (1 - 1e-6));
        }
        const unplaced = plan.unplaced.filter((u) => parts.get(u.part)?.outline).reduce((n, u) => n + u.count, 0);
        expect(copies + unplaced).toBe(problem.parts.filter((p) => p.outline).reduce((n, p) => n + p.quantity, 0));
      }),
      { numRuns: 25 },
    );
  });

  it("is deterministic for a seed", () => {
    fc.assert(
      fc.property(problemArb, fc.integer({ min: 1, max: 1000 }), (problem, seed) => {
        const a = nestSync(problem, { seed, iterations: 10 });
        const b = nestSync(problem, { seed, iterations: 10 });
        expect(JSON.stringify(b.placements)).toBe(JSON.stringify(a.placements));
      }),
      { numRuns: 5 },
    );
  });
});
