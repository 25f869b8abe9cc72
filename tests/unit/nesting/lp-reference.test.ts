import fc from "fast-check";
import solver from "javascript-lp-solver";
import { describe, expect, it } from "vitest";
import { solveCover } from "@/lib/nesting/solver/lp";

// The set cover's linear programs are solved by our own bounded simplex (lib/nesting/solver/lp.ts)
// because javascript-lp-solver 1.0.3 cycled without end on one of them. Here the library is the
// reference: on small random covering programs (where it terminates) both give the same optimum.
// Source of the reference: javascript-lp-solver (general-purpose LP/MILP solver on npm).
describe("solveCover against javascript-lp-solver (reference library)", () => {
  it("finds the same optimal cost on random covering programs", () => {
    const program = fc
      .record({
        rows: fc.integer({ min: 1, max: 5 }),
        cols: fc.integer({ min: 1, max: 8 }),
        groups: fc.integer({ min: 1, max: 3 }),
      })
      .chain(({ rows, cols, groups }) =>
        fc.record({
          cover: fc.array(
            fc.array(fc.tuple(fc.integer({ min: 0, max: rows - 1 }), fc.integer({ min: 1, max: 4 })), {
              minLength: 1,
              maxLength: rows,
            }),
            { minLength: cols, maxLength: cols },
          ),
          group: fc.array(fc.integer({ min: 0, max: groups - 1 }), { minLength: cols, maxLength: cols }),
          cost: fc.array(fc.integer({ min: 1, max: 20 }), { minLength: cols, maxLength: cols }),
          demand: fc.array(fc.integer({ min: 0, max: 10 }), { minLength: rows, maxLength: rows }),
          cap: fc.array(fc.integer({ min: 1, max: 12 }), { minLength: groups, maxLength: groups }),
        }),
      );
    fc.assert(
      fc.property(program, ({ cover, group, cost, demand, cap }) => {
        // One entry per row in each column (sum duplicates), as the set cover builds them.
        const cols = cover.map((c) => {
          const m = new Map<number, number>();
          for (const [r, a] of c) m.set(r, (m.get(r) ?? 0) + a);
          return [...m] as [number, number][];
        });
        const ours = solveCover(cols, group, cost, demand, cap);
        const constraints: Record<string, { min?: number; max?: number }> = {};
        demand.forEach((d, i) => (constraints[`r${i}`] = { min: d }));
        cap.forEach((c, g) => (constraints[`g${g}`] = { max: c }));
        const variables: Record<string, Record<string, number>> = {};
        cols.forEach((c, j) => {
          const v: Record<string, number> = { cost: cost[j]!, [`g${group[j]}`]: 1 };
          for (const [r, a] of c) v[`r${r}`] = a;
          variables[`x${j}`] = v;
        });
        const ref = solver.Solve({ optimize: "cost", opType: "min", constraints, variables } as never) as unknown as {
          feasible: boolean;
          result: number;
        };
        if (!ref.feasible) expect(ours.status).toBe("infeasible");
        else {
          expect(ours.status).toBe("optimal");
          if (ours.status === "optimal") expect(ours.cost).toBeCloseTo(ref.result, 6);
        }
      }),
      { numRuns: 300, seed: 7 },
    );
  });
});
