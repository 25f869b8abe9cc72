/**
 * Wide check of orders that fill several blocks exactly (issue 21), beyond the benchmark's seed list:
 * `npx tsx scripts/check-multiblock.ts --seeds 1-300 [--k 2,3,4,5 | --k seed] [--kerf 1.5]
 * [--block 2400x1200x600] [--layout guillotine] [--ms 2000]`. Each seed is run for every k listed
 * (`--k seed`: k = 2 + seed mod 4, the benchmark's rule) through `nestSync` with a real clock; every
 * plan is checked with `validatePlan`, and its wall time against the budget + 1 s. Prints the share
 * at the optimum (k blocks), the counts at k + 1 and at k + 2 or more, the overruns, and the seeds
 * that missed; one JSON line per run goes to bench-results/multiblock-check.jsonl (appended).
 * @example npx tsx scripts/check-multiblock.ts --seeds 1-100 --k 2,3 --kerf 0 --layout layers
 */
import { appendFileSync, mkdirSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { nestSync, parseProblem, validatePlan, type Vec3 } from "@/lib/nesting";
import { multiBlockCount, perfectMultiBlock } from "./lib-bench/generate";

const args = process.argv.slice(2);
const opt = (name: string, fallback: string): string => {
  const i = args.indexOf(name);
  return i >= 0 && args[i + 1] !== undefined ? args[i + 1]! : fallback;
};
const [from, to] = opt("--seeds", "1-20").split("-").map(Number) as [number, number];
const kArg = opt("--k", "seed");
const kerf = Number(opt("--kerf", "1.5"));
const block = opt("--block", "2400x1200x600").split("x").map(Number) as Vec3;
const layout = opt("--layout", "guillotine") as "guillotine" | "layers" | "free";
const ms = Number(opt("--ms", "2000"));
const variant = `kerf ${kerf}, ${block.join("×")}, ${layout}, ${ms} ms`;

mkdirSync("bench-results", { recursive: true });
const out = { runs: 0, optimum: 0, plusOne: 0, worse: 0, overruns: 0, invalid: 0, times: [] as number[] };
const missed: string[] = [];
for (let seed = from; seed <= (to ?? from); seed++) {
  const ks = kArg === "seed" ? [multiBlockCount(seed)] : kArg.split(",").map(Number);
  for (const k of ks) {
    const parsed = parseProblem(perfectMultiBlock(seed, k, ms, { kerf, block, layout }));
    if (!parsed.ok) throw new Error(`seed ${seed}, k ${k}: ${parsed.errors.join("; ")}`);
    const t0 = performance.now();
    const plan = nestSync(parsed.problem, { seed: 1, now: () => performance.now() });
    const took = performance.now() - t0;
    const errors = validatePlan(parsed.problem, plan);
    const used = plan.unplaced.length > 0 ? Number.POSITIVE_INFINITY : plan.stats.blocksUsed;
    out.runs++;
    out.times.push(took);
    if (errors.length > 0) out.invalid++;
    const over = took > ms + 1000;
    if (over) out.overruns++;
    if (used <= k && !over) out.optimum++;
    else if (used === k + 1) out.plusOne++;
    else if (used > k + 1) out.worse++;
    if (used > k || over || errors.length > 0)
      missed.push(
        `${seed}/k${k}: ${used} blocks, ${took.toFixed(0)} ms${errors.length ? `, INVALID ${errors[0]}` : ""}`,
      );
    appendFileSync(
      "bench-results/multiblock-check.jsonl",
      `${JSON.stringify({ variant, seed, k, pieces: parsed.problem.parts.length, blocks: used, ms: Math.round(took), errors: errors.length })}\n`,
    );
  }
}
const sorted = [...out.times].sort((a, b) => a - b);
const median = sorted[Math.floor(sorted.length / 2)] ?? 0;
console.log(
  `${variant}; seeds ${from}-${to ?? from}, k ${kArg}: ${out.runs} runs, at optimum ${out.optimum} (${((100 * out.optimum) / out.runs).toFixed(1)}%), ` +
    `k + 1: ${out.plusOne}, k + 2 or more: ${out.worse}, over budget + 1 s: ${out.overruns}, invalid: ${out.invalid}; ` +
    `time median ${median.toFixed(0)} ms, max ${(sorted.at(-1) ?? 0).toFixed(0)} ms`,
);
if (missed.length > 0) console.log(`  missed: ${missed.join("; ")}`);
