/**
 * Reference tests against published instances with known optima. Data: ../shared/benchmarks
 * (from the repo root) or BENCH_DATA. CI always has it; without it these tests say so and skip.
 */
import path from "node:path";
import { describe, expect, it } from "vitest";
import { nestSync, validatePlan, type Vec3 } from "@/lib/nesting";
import { buildModel } from "@/lib/nesting/solver/model";
import { packAllByTable } from "@/lib/nesting/solver/exact";
import { fillBlockFree } from "@/lib/nesting/solver/freefill";
import { fillBlockGuillotine } from "@/lib/nesting/solver/guillotine3d";
import { rng } from "@/lib/nesting/rng";
import {
  benchDataDir,
  brPart,
  load2DClass,
  loadBr,
  loadZeroWaste,
  problemOf,
  readCsv,
} from "@/scripts/lib-bench/loaders";

const dir = benchDataDir();

if (!dir) {
  describe("published nesting benchmarks: benchmark data is ABSENT (set BENCH_DATA or provide ../shared/benchmarks) — reference checks skipped", () => {
    it.skip("needs the benchmark data", () => {});
  });
}

describe.skipIf(!dir)("Hopper & Turton (2001), EJOR 128:34–57 / Hopper (2000) PhD thesis: zero-waste 2D sets", () => {
  // Pieces cut from one W x H_opt rectangle: the optimum is that one bin at 100 % fill.
  // Sample: instances this solver packs completely within its budget. It does NOT reach 100 % on
  // most of the 91 (see lib/nesting/README.md for the measured share and mean fill). N1 and T1
  // (Hopper 2000, 17 pieces each) are packed by the perfect-layer search, with parts no through
  // cut frees — allowed inside one layer.
  const sample = (
    process.env.ZERO_WASTE_SAMPLE ?? "C1-1,C1-3,C2-1,C2-2,C2-3,C3-1,C6-3,N1A,N1B,N1C,N1D,N1E,T1A,T1B,T1C,T1D,T1E"
  ).split(",");
  const all = dir ? loadZeroWaste(dir) : [];
  for (const name of sample) {
    it(`${name} packs into one bin at 100 % fill`, () => {
      const inst = all.find((i) => i.name === name || i.name === `${name[0]}${name.slice(1)}`);
      expect(inst, `instance ${name} in the data`).toBeDefined();
      const problem = problemOf({
        bins: [[inst!.W, inst!.H, 1]],
        parts: inst!.items.map(([w, h]) => ({ size: [w, h, 1] as Vec3, rotate: "z" as const })),
        layout: "layers",
        timeLimitMs: 1000,
      });
      const plan = nestSync(problem, { seed: 1, iterations: 300 });
      expect(validatePlan(problem, plan)).toEqual([]);
      expect(plan.unplaced).toEqual([]);
      expect(plan.stats.partVolume).toBe(inst!.W * inst!.H);
      if (/^[NT]1/.test(name))
        expect(
          validatePlan({ ...problem, settings: { ...problem.settings, layout: "guillotine" } }, plan),
          "a packing through cuts could not free",
        ).not.toEqual([]);
    });
  }
});

describe.skipIf(!dir)(
  "Hopper & Turton (2001) / Hopper (2000): zero-waste sets under the guillotine rule — cut trees found or proved absent",
  () => {
    const all = dir ? loadZeroWaste(dir) : [];
    const oneBin = (name: string, layout: "guillotine" | "layers") => {
      const inst = all.find((i) => i.name === name);
      expect(inst, `instance ${name} in the data`).toBeDefined();
      return problemOf({
        bins: [[inst!.W, inst!.H, 1]],
        parts: inst!.items.map(([w, h]) => ({ size: [w, h, 1] as Vec3, rotate: "z" as const })),
        layout,
        timeLimitMs: 1000,
      });
    };
    it("C1-1, C1-2 and C1-3 pack into one bin at 100 % by through cuts alone (C1-2: the glue search misses its cut tree, the table search finds it)", () => {
      for (const name of ["C1-1", "C1-2", "C1-3"]) {
        const problem = oneBin(name, "guillotine");
        const plan = nestSync(problem, { seed: 1, iterations: 20 });
        expect(validatePlan(problem, plan), name).toEqual([]);
        expect(plan.unplaced, name).toEqual([]);
        expect(plan.stats.blocksUsed, name).toBe(1);
      }
    });
    it("N1A–E and T1A–E have no cut tree: the table search proves it (their packings need a layer)", () => {
      for (const name of ["N1A", "N1B", "N1C", "N1D", "N1E", "T1A", "T1B", "T1C", "T1D", "T1E"]) {
        const m = buildModel(oneBin(name, "guillotine"));
        expect(
          packAllByTable(
            m.blocks[0]!,
            m.types,
            m.types.map((t) => t.count),
            50_000_000,
          ),
          name,
        ).toBeNull();
      }
    });
  },
);

describe.skipIf(!dir)(
  "Berkey & Wang (1987); Martello & Vigo (1998): 2D class set with rotation, at or within one bin of the best published group total",
  () => {
    const groups = [
      "CLASS01_020",
      "CLASS02_020",
      "CLASS03_020",
      "CLASS04_020",
      "CLASS05_020",
      "CLASS06_020",
      "CLASS07_020",
      "CLASS08_020",
      "CLASS09_020",
      "CLASS10_020",
      "CLASS02_040",
      "CLASS04_040",
    ];
    const all = dir ? load2DClass(dir) : [];
    const best = dir
      ? new Map(
          readCsv(path.join(dir, "2d-bpp-class/summary_by_group.csv")).map((r) => [
            r.group!,
            Number(r.best_published_total_rotation),
          ]),
        )
      : new Map<string, number>();
    for (const group of groups) {
      it(`${group}: total bins ≤ best published (${best.get(group)}) + 1`, () => {
        let total = 0;
        for (const inst of all.filter((i) => i.group === group)) {
          const problem = problemOf({
            bins: inst.items.map(() => [inst.W, inst.H, 1] as Vec3),
            parts: inst.items.map(([w, h]) => ({ size: [w, h, 1] as Vec3, rotate: "z" as const })),
            layout: "layers",
            timeLimitMs: 1000,
          });
          const plan = nestSync(problem, { seed: 1, iterations: 60 });
          expect(validatePlan(problem, plan)).toEqual([]);
          expect(plan.unplaced).toEqual([]);
          total += plan.stats.blocksUsed;
        }
        expect(total).toBeLessThanOrEqual(best.get(group)! + 1);
      });
    }
  },
);

describe.skipIf(!dir)(
  "Bischoff & Ratcliff (1995), Omega 23(4):377–390: BR container loading, one container, free layout",
  () => {
    // Published heuristics reach about 94–96 % mean fill on BR1–BR7 [memory, see the benchmarks
    // README]; simple one-pass greedy packers about 85–90 % [memory]. Boxes whose flags allow two
    // of their sides vertical are held to one of them here (the format's rotate rules cannot say
    // "these two"), a stricter rule than the benchmark's. Sample: instances this solver fills to 90 %
    // within 8 passes (BR7 instance 1 stays at 89.7 %); class means are in lib/nesting/README.md.
    const cases = [
      [1, 1],
      [1, 2],
      [4, 1],
      [5, 1],
      [7, 2],
    ] as const;
    for (const [set, no] of cases) {
      it(`BR${set} instance ${no}: at least 90 % of the container filled, every box as its flags allow`, () => {
        const inst = loadBr(dir!, set).find((i) => i.no === no);
        expect(inst, `BR${set} instance ${no} in the data`).toBeDefined();
        const problem = problemOf({
          bins: [inst!.container],
          parts: inst!.boxes.map((b) => ({ ...brPart(b), quantity: b.count })),
          layout: "free",
          timeLimitMs: 1000,
        });
        const plan = nestSync(problem, { seed: 1, iterations: 8 });
        expect(validatePlan(problem, plan)).toEqual([]);
        const cv = inst!.container[0] * inst!.container[1] * inst!.container[2];
        expect(plan.stats.partVolume / cv).toBeGreaterThanOrEqual(0.9);
      });
    }

    it("free layout: maximal empty boxes fill the containers fuller than a cut tree (instance 1 of BR1–BR7, same moves judged)", () => {
      // The same box-first fill with 24 moves judged per step, once in disjoint cut-tree boxes and
      // once in overlapping maximal empty boxes from the nearest corner (measured: 89.4 % and 90.3 %).
      let cut = 0;
      let free = 0;
      for (let set = 1; set <= 7; set++) {
        const inst = loadBr(dir!, set).find((i) => i.no === 1)!;
        const problem = problemOf({
          bins: [inst.container],
          parts: inst.boxes.map((b) => ({ ...brPart(b), quantity: b.count })),
          layout: "free",
          timeLimitMs: 1000,
        });
        const m = buildModel(problem);
        const order = m.types.map((t) => t.index).sort((a, b) => m.types[b]!.volume - m.types[a]!.volume);
        const cv = inst.container[0] * inst.container[1] * inst.container[2];
        cut +=
          fillBlockGuillotine(
            m.blocks[0]!,
            m.types,
            m.types.map((t) => t.count),
            { order, grid: true, split: "biggest", thinSlabs: true, boxFirst: true, lookahead: 24, rng: rng(1) },
          ).packedVolume /
          cv /
          7;
        free +=
          fillBlockFree(
            m.blocks[0]!,
            m.types,
            m.types.map((t) => t.count),
            { order, grid: true, lookahead: 24, corners: true },
          ).packedVolume /
          cv /
          7;
      }
      expect(free).toBeGreaterThan(cut + 0.005);
    });
  },
);
