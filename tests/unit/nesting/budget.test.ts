/**
 * The time budget holds whatever the input: `nest()` with a real clock returns a valid plan within
 * `settings.timeLimitMs` + 1 s. The searches run in a child process so that one that never
 * returns (as the set-cover linear program once did on a 77-piece order) fails the test after a
 * hard timeout instead of hanging the test run. NEST_UNDER_TEST=/path/to/lib/nesting/index.ts runs
 * the children on another copy of the core (e.g. an older commit's, to see these tests fail there).
 */
import { spawn } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Problem } from "@/lib/nesting";
import { solveCover } from "@/lib/nesting/solver/lp";
import { perfectMultiBlock as perfectBlocks } from "@/scripts/lib-bench/generate";

const repoRoot = path.resolve(__dirname, "../../..");
const reproFile = [
  process.env.NEST_REPRO,
  path.resolve(repoRoot, "../shared/repro/nest-budget-overrun.json"),
  path.resolve(process.cwd(), "../shared/repro/nest-budget-overrun.json"),
].find((f): f is string => !!f && existsSync(f));

interface Outcome {
  name: string;
  ms: number;
  errors: string[];
  blocksUsed: number;
  unplaced: number;
}

/**
 * Nests each problem in a child process (seed 1; a real clock, or `iterations` passes without one);
 * one JSON line per problem.
 */
const CHILD = `
const mod = await import(process.env.NEST_INDEX);
const { nest, nestSync, parseProblem, validatePlan } = mod.default ?? mod;
const { performance } = await import("node:perf_hooks");
let text = "";
for await (const chunk of process.stdin) text += chunk;
for (const { name, problem, iterations } of JSON.parse(text)) {
  const parsed = parseProblem(problem);
  if (!parsed.ok) throw new Error(name + ": " + parsed.errors.join("; "));
  const t0 = performance.now();
  const plan = iterations
    ? nestSync(parsed.problem, { seed: 1, iterations })
    : await nest(parsed.problem, { seed: 1, now: () => performance.now() });
  const ms = performance.now() - t0;
  const errors = validatePlan(parsed.problem, plan);
  const unplaced = plan.unplaced.reduce((s, u) => s + u.count, 0);
  process.stdout.write(JSON.stringify({ name, ms, errors, blocksUsed: plan.stats.blocksUsed, unplaced }) + "\\n");
}
`;

/** Runs the problems in a child process, killed after `killAfterMs`; the outcomes that came back. */
function nestInChild(
  problems: { name: string; problem: Problem | unknown; iterations?: number }[],
  killAfterMs: number,
): Promise<{ outcomes: Outcome[]; killed: boolean; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["--import", "tsx", "--input-type=module", "-e", CHILD], {
      cwd: repoRoot,
      env: { ...process.env, NEST_INDEX: process.env.NEST_UNDER_TEST ?? path.join(repoRoot, "lib/nesting/index.ts") },
      stdio: ["pipe", "pipe", "pipe"],
    });
    let out = "";
    let err = "";
    let killed = false;
    const timer = setTimeout(() => {
      killed = true;
      child.kill("SIGKILL");
    }, killAfterMs);
    child.stdout.on("data", (d: Buffer) => {
      out += d.toString();
    });
    child.stderr.on("data", (d: Buffer) => {
      err += d.toString();
    });
    child.on("error", reject);
    child.on("close", () => {
      clearTimeout(timer);
      const outcomes = out
        .split("\n")
        .filter((l) => l.trim().startsWith("{"))
        .map((l) => JSON.parse(l) as Outcome);
      resolve({ outcomes, killed, stderr: err });
    });
    child.stdin.end(JSON.stringify(problems));
  });
}

if (!reproFile) {
  describe("nest budget: the repro ../shared/repro/nest-budget-overrun.json is ABSENT (set NEST_REPRO) — that check skipped", () => {
    it.skip("needs the repro file", () => {});
  });
}

describe("nest() honours its time budget within a second (real clock)", () => {
  it.skipIf(!reproFile)(
    "the 77-piece, three-block order of the overrun report returns a valid plan within 3 s at a 2 s budget",
    async () => {
      const problem = JSON.parse(readFileSync(reproFile!, "utf8")) as Problem;
      expect(problem.settings.timeLimitMs).toBe(2000);
      const { outcomes, killed, stderr } = await nestInChild([{ name: "repro", problem }], 20_000);
      expect(killed, "nest() did not return within 20 s").toBe(false);
      expect(outcomes, stderr).toHaveLength(1);
      const o = outcomes[0]!;
      expect(o.errors).toEqual([]);
      expect(o.unplaced).toBe(0);
      expect(o.ms).toBeLessThan(3000);
    },
    40_000,
  );

  it("with a pass budget and no clock (deterministic), the orders whose set cover hung return valid plans", async () => {
    // The linear program that never returned comes at pass 270 of the reported order (seed 1) and
    // before pass 200 of generated seed 26.
    const cases = [
      ...(reproFile
        ? [
            {
              name: "repro, 300 passes",
              problem: JSON.parse(readFileSync(reproFile, "utf8")) as Problem,
              iterations: 300,
            },
          ]
        : []),
      { name: "seed 26, 4 blocks, 200 passes", problem: perfectBlocks(26, 4, 1000), iterations: 200 },
    ];
    const { outcomes, killed, stderr } = await nestInChild(cases, 40_000);
    const late = cases.slice(outcomes.length).map((c) => c.name);
    expect(killed ? late : [], `did not return within 40 s: ${stderr}`).toEqual([]);
    expect(outcomes).toHaveLength(cases.length);
    for (const o of outcomes) {
      expect(o.errors, o.name).toEqual([]);
      expect(o.unplaced, o.name).toBe(0);
    }
  }, 60_000);

  it("generated multi-block perfect packings (2–4 blocks cut into 8–40 pieces each) return within 1 s + 1 s", async () => {
    // Seeds 4 and 26 ran past 60 s in a standalone run before the set cover's simplex was replaced.
    const cases = [1, 4, 19, 26, 33, 39].map((seed) => {
      const k = 2 + (seed % 3);
      return { name: `seed ${seed}, ${k} blocks`, problem: perfectBlocks(seed, k, 1000) };
    });
    const { outcomes, killed, stderr } = await nestInChild(cases, 30_000);
    const late = cases.slice(outcomes.length).map((c) => c.name);
    expect(killed ? late : [], `did not return within 30 s in all: ${stderr}`).toEqual([]);
    expect(outcomes).toHaveLength(cases.length);
    for (const o of outcomes) {
      expect(o.errors, o.name).toEqual([]);
      expect(o.unplaced, o.name).toBe(0);
      expect(o.ms, o.name).toBeLessThan(2000);
    }
  }, 60_000);

  it("orders of 5 blocks whose exact split can fail (seed 87: a side of two blocks matches by chance) keep the 2 s budget + 1 s and end at most one block above k", async () => {
    const cases = [87, 3].map((seed) => ({ name: `seed ${seed}, 5 blocks`, problem: perfectBlocks(seed, 5, 2000) }));
    const { outcomes, killed, stderr } = await nestInChild(cases, 30_000);
    expect(
      killed ? cases.slice(outcomes.length).map((c) => c.name) : [],
      `did not return within 30 s: ${stderr}`,
    ).toEqual([]);
    expect(outcomes).toHaveLength(cases.length);
    for (const o of outcomes) {
      expect(o.errors, o.name).toEqual([]);
      expect(o.unplaced, o.name).toBe(0);
      expect(o.ms, o.name).toBeLessThan(3000);
      expect(o.blocksUsed, o.name).toBeLessThanOrEqual(6);
    }
  }, 60_000);

  it("true-shape orders keep the budget too: 300 and 120 triangles of one profile into one block, 2 s and 4 s (+ 1 s)", async () => {
    // Found by a test of the app's true-shape runs: the slabs' strips started after the slabs' share of the
    // budget was spent (each taking at least 100 ms): 3.9 s on a 2 s budget for the first case here.
    const triangles = (timeLimitMs: number, quantity: number, size: number[]) => ({
      version: 1,
      settings: {
        kerf: 1.5,
        trim: 6,
        layout: "guillotine",
        minOffcut: [150, 150, 25],
        trueShape: true,
        timeLimitMs,
        defectMargin: 10,
      },
      blocks: [{ id: "B1", cost: 100, size, grade: "EPS-II" }],
      parts: [
        {
          id: "tri",
          size: [80, 90, 60],
          grade: "EPS-II",
          rotate: "any",
          quantity,
          outline: {
            outer: [
              [0, 0],
              [90, 0],
              [0, 60],
            ],
          },
        },
      ],
    });
    const cases = [
      { name: "300 triangles, 2 s", problem: triangles(2000, 300, [600, 400, 400]) },
      { name: "120 triangles, 4 s", problem: triangles(4000, 120, [400, 300, 300]) },
    ];
    const { outcomes, killed, stderr } = await nestInChild(cases, 30_000);
    expect(killed, `did not return within 30 s: ${stderr}`).toBe(false);
    expect(outcomes).toHaveLength(cases.length);
    for (const [k, o] of outcomes.entries()) {
      expect(o.errors, o.name).toEqual([]);
      expect(o.ms, o.name).toBeLessThan(cases[k]!.problem.settings.timeLimitMs + 1000);
    }
  }, 60_000);
});

describe("solveCover: the set cover's linear program", () => {
  it("finds the cheapest fractional cover", () => {
    // Column 0 covers row 0 twice for 1, column 1 once for 1: two of column 0.
    expect(solveCover([[[0, 2]], [[0, 1]]], [0, 0], [1, 1], [4], [10])).toEqual({
      status: "optimal",
      x: [2, 0],
      cost: 2,
    });
    // Two rows, a column covering both at 3 and one per row at 2 each: the shared column wins.
    const r = solveCover(
      [
        [
          [0, 1],
          [1, 1],
        ],
        [[0, 1]],
        [[1, 1]],
      ],
      [0, 0, 0],
      [3, 2, 2],
      [2, 2],
      [10],
    );
    expect(r.status).toBe("optimal");
    if (r.status === "optimal") expect(r.cost).toBeCloseTo(6, 9);
  });

  it("reports a demand no cover meets within the group limits as infeasible", () => {
    // At most one block of the only group, and one block holds 2 of the 3 pieces.
    expect(solveCover([[[0, 2]]], [0], [1], [3], [1])).toEqual({ status: "infeasible" });
    // A row no column covers.
    expect(solveCover([[[0, 1]]], [0], [1], [1, 1], [5])).toEqual({ status: "infeasible" });
  });

  it("stops when asked and at its pivot limit", () => {
    const cover = Array.from({ length: 40 }, (_, j) => [
      [j % 7, 1 + (j % 3)],
      [(j * 3) % 7, 1],
    ]) as [number, number][][];
    const args = [
      cover,
      cover.map(() => 0),
      cover.map((_, j) => 10 + (j % 5)),
      [5, 6, 7, 8, 9, 10, 11],
      [100],
    ] as const;
    expect(solveCover(...args).status).toBe("optimal");
    expect(solveCover(...args, { maxPivots: 1 })).toEqual({ status: "stopped" });
    expect(solveCover(...args, { stop: () => true })).toEqual({ status: "stopped" });
  });

  it("returns a cover that meets every row and group limit and costs no more than a greedy whole cover (property)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }),
        fc.array(
          fc.tuple(
            fc.array(fc.tuple(fc.nat(5), fc.integer({ min: 1, max: 4 })), { minLength: 1, maxLength: 4 }),
            fc.integer({ min: 1, max: 50 }),
            fc.nat(1),
          ),
          { minLength: 1, maxLength: 30 },
        ),
        fc.array(fc.integer({ min: 1, max: 6 }), { minLength: 6, maxLength: 6 }),
        (rows, cols, demandAll) => {
          const cover = cols.map(([c]) => {
            const m = new Map<number, number>();
            for (const [i, a] of c) if (i < rows) m.set(i, (m.get(i) ?? 0) + a);
            return [...m];
          });
          const group = cols.map(([, , g]) => g);
          const cost = cols.map(([, c]) => c);
          const demand = demandAll.slice(0, rows);
          const cap = [1000, 1000];
          const r = solveCover(cover, group, cost, demand, cap);
          // Whole copies of columns, cheapest per piece still needed first: a whole cover if any.
          const short = [...demand];
          let greedy = 0;
          for (let guard = 0; short.some((v) => v > 0) && guard < 1000; guard++) {
            let best = -1;
            let bestRate = 0;
            cover.forEach((c, j) => {
              const gain = c.reduce((s, [i, a]) => s + Math.min(a, Math.max(0, short[i]!)), 0);
              if (gain / cost[j]! > bestRate) {
                bestRate = gain / cost[j]!;
                best = j;
              }
            });
            if (best < 0) break;
            greedy += cost[best]!;
            for (const [i, a] of cover[best]!) short[i]! -= a;
          }
          const coverable = short.every((v) => v <= 0);
          if (!coverable) {
            expect(r.status).toBe("infeasible");
            return;
          }
          expect(r.status).toBe("optimal");
          if (r.status !== "optimal") return;
          const got = demand.map(() => 0);
          r.x.forEach((x, j) => {
            expect(x).toBeGreaterThanOrEqual(0);
            for (const [i, a] of cover[j]!) got[i]! += a * x;
          });
          got.forEach((v, i) => expect(v).toBeGreaterThanOrEqual(demand[i]! - 1e-6));
          expect(r.cost).toBeLessThanOrEqual(greedy + 1e-6);
        },
      ),
      { numRuns: 300 },
    );
  });
});
