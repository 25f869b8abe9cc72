/**
 * The lower bound against published instances: it must never exceed a packing someone found (a
 * published best total, or a valid plan of this solver), and never be weaker than the simple
 * bounds computed beside the data. Data: ../shared/benchmarks or BENCH_DATA; CI always has it.
 */
import path from "node:path";
import { describe, expect, it } from "vitest";
import { lowerBoundBlocks, nestSync, validatePlan, type Vec3 } from "@/lib/nesting";
import { benchDataDir, load2DClass, loadMpv, problemOf, readCsv } from "@/scripts/lib-bench/loaders";

const dir = benchDataDir();

if (!dir) {
  describe("lower bounds on published instances: benchmark data is ABSENT (set BENCH_DATA or provide ../shared/benchmarks) — reference checks skipped", () => {
    it.skip("needs the benchmark data", () => {});
  });
}

describe.skipIf(!dir)(
  "Berkey & Wang (1987); Martello & Vigo (1998): 2D class set with rotation — bound per group between the computed simple bound and the best published total",
  () => {
    // best_published_total_rotation: best known totals per group of ten instances (summary_by_group.csv,
    // from the papers listed in its SOURCES.md); sum_LB_rotation: L0/L2 computed for the data.
    const all = dir ? load2DClass(dir) : [];
    const rows = dir ? readCsv(path.join(dir, "2d-bpp-class/summary_by_group.csv")) : [];
    it("holds for all 50 groups, and is stronger than the simple bound somewhere", () => {
      let ours = 0;
      let simple = 0;
      let groups = 0;
      for (const row of rows) {
        const insts = all.filter((i) => i.group === row.group);
        if (insts.length === 0) continue;
        groups++;
        let total = 0;
        for (const inst of insts) {
          const problem = problemOf({
            bins: inst.items.map(() => [inst.W, inst.H, 1] as Vec3),
            parts: inst.items.map(([w, h]) => ({ size: [w, h, 1] as Vec3, rotate: "z" as const })),
            layout: "layers",
            timeLimitMs: 100,
          });
          total += lowerBoundBlocks(problem);
        }
        expect(total, `${row.group}: bound ≤ best published`).toBeLessThanOrEqual(
          Number(row.best_published_total_rotation),
        );
        expect(total, `${row.group}: bound ≥ computed L0/L2`).toBeGreaterThanOrEqual(Number(row.sum_LB_rotation));
        ours += total;
        simple += Number(row.sum_LB_rotation);
      }
      expect(groups).toBe(50);
      expect(ours).toBeGreaterThan(simple);
    });
  },
);

describe.skipIf(!dir)(
  "Martello, Pisinger & Vigo (2000), Oper. Res. 48(2): 3D classes with rotation — bound between the computed simple bound and a found packing",
  () => {
    const insts = dir ? loadMpv(dir, [1, 4, 5, 6, 7, 8]).filter((i) => i.n === 50) : [];
    it("holds on the 60 instances with 50 boxes, and is stronger than the simple bound somewhere", () => {
      let ours = 0;
      let simple = 0;
      for (const inst of insts) {
        const problem = problemOf({
          bins: inst.items.map(() => inst.bin),
          parts: inst.items.map((s) => ({ size: s, rotate: "any" as const })),
          layout: "free",
          timeLimitMs: 100,
        });
        const bound = lowerBoundBlocks(problem);
        const plan = nestSync(problem, { seed: 1, iterations: 2 });
        expect(validatePlan(problem, plan)).toEqual([]);
        expect(plan.unplaced).toEqual([]);
        const name = `${inst.cls}_${inst.n}/${inst.no}`;
        expect(bound, `${name}: bound ≤ blocks of a valid plan`).toBeLessThanOrEqual(plan.stats.blocksUsed);
        expect(bound, `${name}: bound ≥ LB_rotation_allowed of lower_bounds_computed.csv`).toBeGreaterThanOrEqual(
          inst.lb,
        );
        expect(plan.stats.lowerBoundBlocks).toBe(bound);
        ours += bound;
        simple += inst.lb;
      }
      expect(insts).toHaveLength(60);
      expect(ours).toBeGreaterThan(simple);
    });
  },
);
