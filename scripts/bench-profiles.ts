/**
 * True-shape nesting benchmark: `npm run bench:profiles [-- --budget 60 --only albano,fu --seed 1 --data DIR]`
 * (`-- --shop`: the shop case instead, scripts/bench-shop.ts).
 * Runs the irregular engine on the 12 instances of ../shared/benchmarks/2d-irregular-strip (or
 * BENCH_DATA / --data) and prints, per instance, the length, length ÷ record, density and time,
 * beside the length of the bounding-box packing (every piece replaced by its box, packed by
 * maxrects-packer in a strip of the same width: what Blockyard did before). Every layout is
 * checked by the engine's validator and independently with polygon-clipping; an invalid layout is
 * a failure (exit code 1). Writes bench-results/profiles.json.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { nestIrregular, validateIrregular, type IrregularSolution } from "@/lib/nesting/irregular";
import {
  boxStripLength,
  checkIndependently,
  irregularDataDir,
  loadStripInstances,
  STRIP_SET,
} from "./lib-bench/irregular";
import { runShopBench } from "./bench-shop";

const args = process.argv.slice(2);
if (args.includes("--shop")) {
  // The shop case of issue 20 (slabs of letters and wing cores against box nesting), not the published instances.
  runShopBench(args);
  process.exit();
}
const opt = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const budgetS = Number(opt("--budget") ?? 60);
const seed = Number(opt("--seed") ?? 1);
const only = opt("--only")?.split(",").filter(Boolean);
if (!(budgetS > 0) || !Number.isInteger(seed)) {
  console.error("usage: npm run bench:profiles -- [--budget SECONDS>0] [--only name,name] [--seed N] [--data DIR]");
  process.exit(2);
}

const dataArg = opt("--data");
const dir = irregularDataDir(dataArg);
if (!dir) {
  const where = dataArg
    ? `--data ${dataArg}`
    : process.env.BENCH_DATA
      ? `BENCH_DATA=${process.env.BENCH_DATA}`
      : "../shared/benchmarks";
  console.error(`The benchmark data is ABSENT: no ${STRIP_SET}/records.csv under ${where}. Nothing was measured.`);
  process.exit(1);
}
const instances = loadStripInstances(dir).filter((i) => !only || only.includes(i.name));
if (only) {
  const unknown = only.filter((n) => !instances.some((i) => i.name === n));
  if (unknown.length > 0) {
    console.error(`--only: unknown instance(s) ${unknown.join(", ")}`);
    process.exit(2);
  }
}

interface Row {
  name: string;
  pieces: number;
  length: number;
  ratio: number;
  density: number;
  ms: number;
  firstRatio: number;
  box: number;
  shorterPct: number;
  valid: boolean;
  note: string;
}

const cores = os.cpus().length;
const load = os.loadavg()[0]!.toFixed(1);
console.log(
  `True-shape nesting on ${STRIP_SET} (${instances.length} instances), budget ${budgetS} s per instance, seed ${seed}; ` +
    `${cores} cores, load ${load} at start, node ${process.version}`,
);
const header = [
  "instance".padEnd(9),
  "pcs".padStart(4),
  "length".padStart(11),
  "÷ record".padStart(8),
  "density".padStart(8),
  "time".padStart(7),
  "first".padStart(6),
  "box length".padStart(11),
  "÷ record".padStart(8),
  "shorter".padStart(8),
  "check",
].join(" | ");
console.log(header);

async function main(): Promise<void> {
  const rows: Row[] = [];
  const tty = process.stderr.isTTY;
  for (const inst of instances) {
    const pieces = inst.problem.items.reduce((s, it) => s + it.quantity, 0);
    const t0 = performance.now();
    let lastLine = 0;
    const sol: IrregularSolution = await nestIrregular(inst.problem, {
      seed,
      now: () => performance.now(),
      timeLimitMs: budgetS * 1000,
      onProgress: (p) => {
        const t = performance.now();
        if (t - lastLine < (tty ? 250 : 10_000)) return;
        lastLine = t;
        const line = `  ${inst.name}: ${((t - t0) / 1000).toFixed(0)} s of ${budgetS}, ${p.phase}, best ${(p.bestLength / inst.record).toFixed(3)} × record, trying ${(p.targetLength / inst.record).toFixed(3)}`;
        if (tty) process.stderr.write(`\r${line.padEnd(100)}`);
        else process.stderr.write(`${line}\n`);
      },
    });
    const ms = performance.now() - t0;
    if (tty) process.stderr.write(`\r${" ".repeat(100)}\r`);
    const own = validateIrregular(inst.problem, sol);
    const ind = checkIndependently(inst.problem, sol);
    const complete = sol.unplaced.length === 0;
    const valid = own.length === 0 && ind.errors.length === 0 && complete;
    const box = boxStripLength(inst.problem);
    const notes = [
      ...own.slice(0, 2).map((e) => `validator: ${e}`),
      ...ind.errors.slice(0, 2).map((e) => `polygon-clipping: ${e}`),
      ...(complete ? [] : ["not every piece placed"]),
    ];
    const row: Row = {
      name: inst.name,
      pieces,
      length: sol.length,
      ratio: sol.length / inst.record,
      density: sol.density,
      ms,
      firstRatio: sol.stats.firstLength / inst.record,
      box,
      shorterPct: (1 - sol.length / box) * 100,
      valid,
      note: valid ? `ok (worst overlap ${ind.worstOverlap.toExponential(0)})` : `INVALID: ${notes.join("; ")}`,
    };
    rows.push(row);
    console.log(
      [
        row.name.padEnd(9),
        String(pieces).padStart(4),
        fmtLen(row.length).padStart(11),
        row.ratio.toFixed(3).padStart(8),
        `${(row.density * 100).toFixed(1)} %`.padStart(8),
        `${(ms / 1000).toFixed(1)} s`.padStart(7),
        row.firstRatio.toFixed(3).padStart(6),
        fmtLen(box).padStart(11),
        (box / inst.record).toFixed(3).padStart(8),
        `${row.shorterPct.toFixed(1)} %`.padStart(8),
        row.note,
      ].join(" | "),
    );
  }

  const valid = rows.filter((r) => r.valid);
  const failures = rows.length - valid.length;
  // An invalid layout counts as a failure: it enters no mean.
  const mean = valid.length > 0 ? valid.reduce((s, r) => s + r.ratio, 0) / valid.length : NaN;
  const worst = valid.reduce((m, r) => Math.max(m, r.ratio), 0);
  const longerThanBox = rows.filter((r) => r.length > r.box + 1e-9);
  const meanShorter = rows.length > 0 ? rows.reduce((s, r) => s + r.shorterPct, 0) / rows.length : NaN;
  console.log(
    `mean length ÷ record ${mean.toFixed(3)} over ${valid.length} valid (target ≤ 1.10, stretch ≤ 1.05: ${mean <= 1.1 ? "met" : "NOT met"}); ` +
      `worst ${worst.toFixed(3)} (target ≤ 1.20: ${worst <= 1.2 ? "met" : "NOT met"}); ` +
      `longer than the box packing: ${longerThanBox.length} (${longerThanBox.map((r) => r.name).join(", ") || "none"}); ` +
      `on average ${meanShorter.toFixed(1)} % shorter than the box packing; invalid layouts (failures): ${failures}; ` +
      `longest run ${(Math.max(...rows.map((r) => r.ms)) / 1000).toFixed(1)} s on a ${budgetS} s budget`,
  );
  mkdirSync("bench-results", { recursive: true });
  writeFileSync(
    path.join("bench-results", "profiles.json"),
    JSON.stringify({ budgetS, seed, cores, loadAtStart: Number(load), rows, mean, worst, failures }, null, 2),
  );
  if (failures > 0) process.exitCode = 1;
}

function fmtLen(v: number): string {
  return v >= 1000 ? v.toFixed(1) : v >= 100 ? v.toFixed(2) : v.toFixed(3);
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
