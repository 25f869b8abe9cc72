/**
 * Nesting benchmark: `npm run bench:nesting [-- --data DIR --quick --only SET]`.
 * Runs Blockyard beside maxrects-packer (2D) and binpackingjs (3D) on the public sets in
 * ../shared/benchmarks (or BENCH_DATA / --data) and on generated instances; prints a table and
 * writes bench-results/nesting.json. Every Blockyard plan is checked with validatePlan.
 */
import { appendFileSync, mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { MaxRectsPacker } from "maxrects-packer";
import { pack3D, RotationType } from "binpackingjs/3d";
import { nest, nestSync, validatePlan, type Plan, type Problem, type Vec3 } from "@/lib/nesting";
import {
  benchDataDir,
  brPart,
  load2DClass,
  loadBr,
  loadMpv,
  loadZeroWaste,
  problemOf,
  readCsv,
} from "./lib-bench/loaders";
import { multiBlockCount, perfectMultiBlock, perfectPacking, shopCase } from "./lib-bench/generate";
import { cutRegions, piecesOf } from "@/lib/planning/cut-regions";

const args = process.argv.slice(2);
const flag = (name: string): boolean => args.includes(name);
const opt = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const quick = flag("--quick");
/** `--seed N` (default 1): the search's seed, to tell a change from run-to-run noise. */
const SEED = Number(opt("--seed") ?? 1);
const only = opt("--only")?.split(",");
const want = (set: string): boolean => !only || only.includes(set);

let invalid = 0;
const invalidNotes: string[] = [];
/** Runs whose wall time passed their budget (settings.timeLimitMs) by more than a second: failures. */
let overruns = 0;
const overrunNotes: string[] = [];
/** The most a run may take beyond its budget. */
const OVERRUN_MS = 1000;
mkdirSync("bench-results", { recursive: true });
const LOG = "bench-results/nesting-log.txt";
writeFileSync(LOG, "");
/** One line per instance in bench-results/nesting-log.txt, so a long run can be followed. */
function log(line: string): void {
  appendFileSync(LOG, `${line}\n`);
}
function solve(problem: Problem, label: string): { plan: Plan; ms: number } {
  const t0 = performance.now();
  const plan = nestSync(problem, { seed: SEED, now: () => performance.now() });
  const ms = performance.now() - t0;
  log(`${label}: ${plan.stats.blocksUsed} blocks, ${plan.unplaced.length} unplaced lines, ${ms.toFixed(0)} ms`);
  check(problem, plan, label);
  if (ms > problem.settings.timeLimitMs + OVERRUN_MS) {
    overruns++;
    overrunNotes.push(`${label}: ${ms.toFixed(0)} ms on a ${problem.settings.timeLimitMs} ms budget`);
  }
  return { plan, ms };
}

/** Validates a plan, and that it does not beat its own lower bound; counts and notes one that fails. Returns the ms spent. */
function check(problem: Problem, plan: Plan, label: string): number {
  const t0 = performance.now();
  const errs = validatePlan(problem, plan);
  const ms = performance.now() - t0;
  // A plan with everything placed in fewer blocks than the lower bound would prove the bound wrong.
  if (plan.unplaced.length === 0 && plan.stats.blocksUsed < plan.stats.lowerBoundBlocks)
    errs.push(`${plan.stats.blocksUsed} blocks, below the lower bound ${plan.stats.lowerBoundBlocks}`);
  if (errs.length > 0) {
    invalid++;
    invalidNotes.push(`${label}: ${errs.slice(0, 3).join("; ")}`);
  }
  return ms;
}

interface Row {
  set: string;
  instances: number;
  blockyard: string;
  ratio: string;
  peer: string;
  peerRatio: string;
  msPerInstance: number;
  note: string;
}
const rows: Row[] = [];
const results: Record<string, unknown> = {};

function printRow(r: Row): void {
  console.log(
    [
      r.set.padEnd(34),
      String(r.instances).padStart(4),
      r.blockyard.padStart(14),
      r.ratio.padStart(16),
      r.peer.padStart(22),
      r.peerRatio.padStart(10),
      `${r.msPerInstance.toFixed(0)} ms`.padStart(9),
      r.note,
    ].join(" | "),
  );
}

function maxrectsBins(
  W: number,
  H: number,
  items: [number, number][],
  padding = 0,
): { bins: number; placedArea: number[] } {
  const packer = new MaxRectsPacker(W, H, padding, {
    smart: false,
    pot: false,
    square: false,
    allowRotation: true,
    border: 0,
  });
  packer.addArray(items.map(([w, h]) => ({ width: w, height: h })) as never);
  return {
    bins: packer.bins.length,
    placedArea: packer.bins.map((b) => b.rects.reduce((s, r) => s + r.width * r.height, 0)),
  };
}

function binpackingjs3D(
  bin: Vec3,
  items: { dims: Vec3; allowed?: RotationType[] }[],
  bins: number,
): { used: number; packedVolume: number; unfit: number } {
  const res = pack3D({
    bins: Array.from({ length: bins }, (_, i) => ({
      name: `b${i}`,
      width: bin[0],
      height: bin[1],
      depth: bin[2],
      maxWeight: 1e12,
    })),
    items: items.map((it, i) => ({
      name: `i${i}`,
      width: it.dims[0],
      height: it.dims[1],
      depth: it.dims[2],
      weight: 0,
      ...(it.allowed ? { allowedRotations: it.allowed } : {}),
    })),
  });
  const used = res.packedBins.filter((b) => b.items.length > 0);
  const packedVolume = used.reduce(
    (s, b) => s + b.items.reduce((t, it) => t + it.sourceItem.width * it.sourceItem.height * it.sourceItem.depth, 0),
    0,
  );
  return { used: used.length, packedVolume, unfit: res.unfitItems.length };
}

function bench2D(dir: string): void {
  const all = load2DClass(dir);
  const lbs = new Map(
    readCsv(path.join(dir, "2d-bpp-class/lower_bounds_computed.csv")).map((r) => [
      r.instance!,
      Number(r.LB_rotation_allowed),
    ]),
  );
  const summary = readCsv(path.join(dir, "2d-bpp-class/summary_by_group.csv"));
  const best = new Map(summary.map((r) => [r.group!, Number(r.best_published_total_rotation)]));
  const insts = quick ? all.filter((x) => x.name.endsWith("_01")) : all;
  const perClass = new Map<
    number,
    { ours: number; peer: number; lb: number; bound: number; best: number; ms: number; n: number }
  >();
  for (const inst of insts) {
    const problem = problemOf({
      bins: inst.items.map(() => [inst.W, inst.H, 1] as Vec3),
      parts: inst.items.map(([w, h]) => ({ size: [w, h, 1] as Vec3, rotate: "z" as const })),
      layout: "layers",
      timeLimitMs: quick ? 100 : 250,
    });
    const { plan, ms } = solve(problem, inst.name);
    const peer = maxrectsBins(inst.W, inst.H, inst.items);
    const c = perClass.get(inst.cls) ?? { ours: 0, peer: 0, lb: 0, bound: 0, best: 0, ms: 0, n: 0 };
    c.ours += plan.stats.blocksUsed + (plan.unplaced.length > 0 ? 1000 : 0);
    c.peer += peer.bins;
    c.lb += lbs.get(inst.name) ?? plan.stats.lowerBoundBlocks;
    c.bound += plan.stats.lowerBoundBlocks;
    c.ms += ms;
    c.n++;
    perClass.set(inst.cls, c);
  }
  // Published best is per group of 10; in quick mode scale by the share run.
  const groupsRun = new Set(insts.map((i) => i.group));
  for (const [cls, c] of [...perClass].sort((a, b) => a[0] - b[0])) {
    let bestSum = 0;
    for (const g of groupsRun) if (Number(g.slice(5, 7)) === cls) bestSum += (best.get(g) ?? 0) * (quick ? 0.1 : 1);
    c.best = bestSum;
  }
  const tot = [...perClass.values()].reduce(
    (s, c) => ({
      ours: s.ours + c.ours,
      peer: s.peer + c.peer,
      lb: s.lb + c.lb,
      bound: s.bound + c.bound,
      best: s.best + c.best,
      ms: s.ms + c.ms,
      n: s.n + c.n,
    }),
    { ours: 0, peer: 0, lb: 0, bound: 0, best: 0, ms: 0, n: 0 },
  );
  for (const [cls, c] of [...perClass].sort((a, b) => a[0] - b[0]))
    printRow({
      set: `2D class ${cls} (rot, layers)`,
      instances: c.n,
      blockyard: `${c.ours} bins`,
      ratio: `${(c.ours / c.best).toFixed(3)}× best`,
      peer: `maxrects ${c.peer}`,
      peerRatio: `${(c.peer / c.best).toFixed(3)}×`,
      msPerInstance: c.ms / c.n,
      note: `LB ${c.lb}, bound* ${c.bound}, best ${+c.best.toFixed(1)}`,
    });
  const row: Row = {
    set: "2D class set, all (rotation)",
    instances: tot.n,
    blockyard: `${tot.ours} bins`,
    ratio: `${(tot.ours / tot.best).toFixed(3)}× best`,
    peer: `maxrects ${tot.peer}`,
    peerRatio: `${(tot.peer / tot.best).toFixed(3)}×`,
    msPerInstance: tot.ms / tot.n,
    note: `LB ${tot.lb}, bound* ${tot.bound} (${(tot.ours / tot.bound).toFixed(3)}×), best ${+tot.best.toFixed(1)}; target ≤ 1.03×`,
  };
  rows.push(row);
  printRow(row);
  results["2d-class"] = { perClass: Object.fromEntries(perClass), total: tot };
}

function benchZeroWaste(dir: string): void {
  const all = loadZeroWaste(dir);
  const insts = quick ? all.filter((_, i) => i % 6 === 0) : all;
  let solved = 0;
  let peerSolved = 0;
  let fill = 0;
  let peerFill = 0;
  let ms = 0;
  const unsolved: string[] = [];
  for (const inst of insts) {
    const problem = problemOf({
      bins: [[inst.W, inst.H, 1]],
      parts: inst.items.map(([w, h]) => ({ size: [w, h, 1] as Vec3, rotate: "z" as const })),
      layout: "layers",
      timeLimitMs: quick ? 150 : 400,
    });
    const r = solve(problem, inst.name);
    ms += r.ms;
    const f = r.plan.stats.partVolume / (inst.W * inst.H);
    fill += f;
    if (r.plan.unplaced.length === 0) solved++;
    else unsolved.push(inst.name);
    const peer = maxrectsBins(inst.W, inst.H, inst.items);
    peerFill += (peer.placedArea[0] ?? 0) / (inst.W * inst.H);
    if (peer.bins === 1) peerSolved++;
  }
  const row: Row = {
    set: "2D zero-waste (Hopper), 1 bin",
    instances: insts.length,
    blockyard: `${solved} at 100%`,
    ratio: `fill ${((100 * fill) / insts.length).toFixed(1)}%`,
    peer: `maxrects ${peerSolved} at 100%`,
    peerRatio: `${((100 * peerFill) / insts.length).toFixed(1)}%`,
    msPerInstance: ms / insts.length,
    note: "C7-3 cannot reach 100%",
  };
  rows.push(row);
  printRow(row);
  results["2d-zero-waste"] = {
    solved,
    peerSolved,
    meanFill: fill / insts.length,
    peerMeanFill: peerFill / insts.length,
    unsolved,
  };
}

type MpvLayout = "guillotine" | "free";

/**
 * MPV 3D classes with rotation, under the cuttable layout (guillotine) and under the free layout
 * the classic box-packing results use (`--mpv-layout guillotine,free`, both by default).
 */
function benchMpv(dir: string): void {
  const layouts = (opt("--mpv-layout") ?? "guillotine,free").split(",") as MpvLayout[];
  const classes = [1, 4, 5, 6, 7, 8];
  const all = loadMpv(dir, classes);
  // --mpv-sizes 50,100 keeps a subset of the item counts (the full set takes the longest).
  const sizes = opt("--mpv-sizes")?.split(",").map(Number);
  const insts = quick
    ? all.filter((x) => x.no === 1 && x.n <= 100)
    : sizes
      ? all.filter((x) => sizes.includes(x.n))
      : all;
  type Sums = { ours: number; peer: number; lb: number; bound: number; ms: number; n: number };
  const per = new Map<MpvLayout, Map<number, Sums>>(layouts.map((l) => [l, new Map()]));
  for (const inst of insts) {
    // Enough bins for the peer without making its first-fit scan needlessly long.
    let peer = binpackingjs3D(
      inst.bin,
      inst.items.map((d) => ({ dims: d })),
      Math.ceil(inst.lb * 1.3) + 2,
    );
    if (peer.unfit > 0)
      peer = binpackingjs3D(
        inst.bin,
        inst.items.map((d) => ({ dims: d })),
        inst.lb * 2 + 5,
      );
    for (const layout of layouts) {
      const problem = problemOf({
        bins: inst.items.map(() => inst.bin),
        parts: inst.items.map((s) => ({ size: s, rotate: "any" as const })),
        layout,
        timeLimitMs: quick ? 300 : Number(opt("--mpv-ms") ?? 900),
      });
      const { plan, ms } = solve(problem, `MPV ${inst.cls}_${inst.n}/${inst.no} ${layout}`);
      const byClass = per.get(layout)!;
      const c = byClass.get(inst.cls) ?? { ours: 0, peer: 0, lb: 0, bound: 0, ms: 0, n: 0 };
      c.ours += plan.stats.blocksUsed + (plan.unplaced.length > 0 ? 1000 : 0);
      c.peer += peer.used;
      c.lb += inst.lb;
      c.bound += plan.stats.lowerBoundBlocks;
      c.ms += ms;
      c.n++;
      byClass.set(inst.cls, c);
    }
  }
  const out: Record<string, unknown> = {};
  for (const layout of layouts) {
    let tot: Sums = { ours: 0, peer: 0, lb: 0, bound: 0, ms: 0, n: 0 };
    for (const [cls, c] of per.get(layout)!) {
      printRow({
        set: `MPV class ${cls} (rot, ${layout})`,
        instances: c.n,
        blockyard: `${c.ours} bins`,
        ratio: `${(c.ours / c.lb).toFixed(3)}× LB`,
        peer: `binpackingjs ${c.peer}`,
        peerRatio: `${(c.peer / c.lb).toFixed(3)}×`,
        msPerInstance: c.ms / c.n,
        note: `LB ${c.lb}, bound* ${c.bound} (${(c.ours / c.bound).toFixed(3)}×)${c.ours > c.peer ? " (MORE than peer)" : ""}`,
      });
      tot = {
        ours: tot.ours + c.ours,
        peer: tot.peer + c.peer,
        lb: tot.lb + c.lb,
        bound: tot.bound + c.bound,
        ms: tot.ms + c.ms,
        n: tot.n + c.n,
      };
    }
    const row: Row = {
      set: `MPV 3D classes 1,4,5,6,7,8 (${layout})`,
      instances: tot.n,
      blockyard: `${tot.ours} bins`,
      ratio: `${(tot.ours / tot.lb).toFixed(3)}× LB`,
      peer: `binpackingjs ${tot.peer}`,
      peerRatio: `${(tot.peer / tot.lb).toFixed(3)}×`,
      msPerInstance: tot.ms / tot.n,
      note: `LB ${tot.lb}, bound* ${tot.bound} (${(tot.ours / tot.bound).toFixed(3)}×); target ≤ 1.05× LB`,
    };
    rows.push(row);
    printRow(row);
    out[layout] = { perClass: Object.fromEntries(per.get(layout)!), total: tot };
  }
  results.mpv = out;
}

function brAllowed(flags: Vec3): RotationType[] {
  // binpackingjs: width = l, height (vertical) = h, depth = w; a rotation's 2nd letter is vertical.
  const may: Record<string, number> = { W: flags[0], H: flags[2], D: flags[1] };
  const names = ["WHD", "HWD", "HDW", "DHW", "DWH", "WDH"];
  return [
    RotationType.WHD,
    RotationType.HWD,
    RotationType.HDW,
    RotationType.DHW,
    RotationType.DWH,
    RotationType.WDH,
  ].filter((r) => may[names[r]![1]!] === 1);
}

function benchBr(dir: string): void {
  const perSet = quick ? 3 : 15;
  let sum = 0;
  let peerSum = 0;
  let ceil = 0;
  let n = 0;
  let ms = 0;
  const perClass: Record<string, number> = {};
  for (let k = 1; k <= 7; k++) {
    const insts = loadBr(dir, k).slice(0, perSet);
    let cls = 0;
    for (const inst of insts) {
      const cv = inst.container[0] * inst.container[1] * inst.container[2];
      const problem = problemOf({
        bins: [inst.container],
        parts: inst.boxes.map((b) => ({ ...brPart(b), quantity: b.count })),
        layout: "free",
        timeLimitMs: quick ? 300 : 700,
      });
      const r = solve(problem, `${inst.set}/${inst.no}`);
      ms += r.ms;
      const f = r.plan.stats.partVolume / cv;
      sum += f;
      cls += f;
      const cargo = inst.boxes.reduce((s, b) => s + b.dims[0] * b.dims[1] * b.dims[2] * b.count, 0);
      ceil += Math.min(1, cargo / cv);
      const items = inst.boxes.flatMap((b) =>
        Array.from({ length: b.count }, () => ({
          dims: [b.dims[0], b.dims[2], b.dims[1]] as Vec3,
          allowed: brAllowed(b.flags),
        })),
      );
      peerSum += binpackingjs3D([inst.container[0], inst.container[2], inst.container[1]], items, 1).packedVolume / cv;
      n++;
    }
    perClass[`BR${k}`] = cls / insts.length;
  }
  const row: Row = {
    set: "BR1–BR7 container (free, flags)",
    instances: n,
    blockyard: `fill ${((100 * sum) / n).toFixed(1)}%`,
    ratio: `ceiling ${((100 * ceil) / n).toFixed(1)}%`,
    peer: `binpackingjs ${((100 * peerSum) / n).toFixed(1)}%`,
    peerRatio: "",
    msPerInstance: ms / n,
    note: `${perSet}/class; target ≥ 90%`,
  };
  rows.push(row);
  printRow(row);
  console.log(
    `  per class: ${Object.entries(perClass)
      .map(([k, v]) => `${k} ${(100 * v).toFixed(1)}%`)
      .join(", ")}`,
  );
  results.br = { meanFill: sum / n, peerMeanFill: peerSum / n, ceiling: ceil / n, perClass, instancesPerClass: perSet };
}

function benchPerfect(): void {
  const count = quick ? 10 : 50;
  let opt = 0;
  let peerOpt = 0;
  let ms = 0;
  for (let s = 1; s <= count; s++) {
    const kerf = 2;
    const problem = perfectPacking(s, [1200, 800, 600], 8 + (s % 5) * 6, kerf);
    problem.settings.timeLimitMs = quick ? 200 : 500;
    const r = solve(problem, `perfect #${s}`);
    ms += r.ms;
    if (r.plan.stats.blocksUsed === 1 && r.plan.unplaced.length === 0) opt++;
    const peer = binpackingjs3D(
      [1200 + kerf, 800 + kerf, 600 + kerf],
      problem.parts.map((p) => ({ dims: p.size.map((v) => v + kerf) as Vec3 })),
      2,
    );
    if (peer.used === 1) peerOpt++;
  }
  const row: Row = {
    set: "3D perfect packings (guillotine)",
    instances: count,
    blockyard: `${opt} at optimum`,
    ratio: `${((100 * opt) / count).toFixed(0)}%`,
    peer: `binpackingjs ${peerOpt}`,
    peerRatio: `${((100 * peerOpt) / count).toFixed(0)}%`,
    msPerInstance: ms / count,
    note: "8–32 parts, kerf 2; target ≥ 90%",
  };
  rows.push(row);
  printRow(row);
  results.perfect = { optimum: opt, peerOptimum: peerOpt, count };
}

/**
 * Multi-block perfect packings (`perfectMultiBlock`): k = 2–5 blocks of 2400 × 1200 × 600 cut into
 * 8–40 pieces each (kerf 1.5), mixed, k + 2 blocks offered, 2 s budget; seeds 1–50 (1–10 quick).
 * An instance counts at the optimum when it uses k blocks, places everything, is valid and returns
 * within its budget + 1 s (a later return counts as a failure whatever the plan).
 */
function benchPerfectMulti(): void {
  const count = quick ? 10 : 50;
  const budget = 2000;
  let opt = 0;
  let above1 = 0;
  let worse = 0;
  let late = 0;
  let peerOpt = 0;
  const times: number[] = [];
  for (let s = 1; s <= count; s++) {
    const k = multiBlockCount(s);
    const problem = perfectMultiBlock(s, k, budget);
    const invalidBefore = invalid;
    const r = solve(problem, `perfect-multi #${s} (k ${k}, ${problem.parts.length} parts)`);
    times.push(r.ms);
    const over = r.ms > budget + OVERRUN_MS;
    if (over) late++;
    const used = r.plan.unplaced.length === 0 ? r.plan.stats.blocksUsed : Number.POSITIVE_INFINITY;
    if (used === k && !over && invalid === invalidBefore) opt++;
    else if (used === k + 1) above1++;
    else if (used > k + 1) worse++;
    const kerf = problem.settings.kerf;
    const peer = binpackingjs3D(
      problem.blocks[0]!.size.map((v) => v + kerf) as Vec3,
      problem.parts.map((p) => ({ dims: p.size.map((v) => v + kerf) as Vec3 })),
      problem.blocks.length,
    );
    if (peer.used === k && peer.unfit === 0) peerOpt++;
  }
  const sorted = [...times].sort((a, b) => a - b);
  const mean = times.reduce((a, b) => a + b, 0) / count;
  const median = sorted[Math.floor(count / 2)]!;
  const max = sorted[count - 1]!;
  const row: Row = {
    set: "3D perfect, k = 2–5 blocks (guil.)",
    instances: count,
    blockyard: `${opt} at optimum`,
    ratio: `${((100 * opt) / count).toFixed(0)}%`,
    peer: `binpackingjs ${peerOpt}`,
    peerRatio: `${((100 * peerOpt) / count).toFixed(0)}%`,
    msPerInstance: mean,
    note:
      `k + 1: ${above1}, worse: ${worse}, over budget + 1 s: ${late}; time median ${median.toFixed(0)} ms, ` +
      `max ${max.toFixed(0)} ms (budget 2000); 16–200 parts, kerf 1.5; target ≥ 95%, none above k + 1`,
  };
  rows.push(row);
  printRow(row);
  results.perfectMulti = { optimum: opt, kPlus1: above1, worse, overBudget: late, peerOptimum: peerOpt, count, times };
}

async function benchShop(): Promise<void> {
  const problem = shopCase(42, 3000);
  const t0 = performance.now();
  const first = nestSync(problem, { seed: SEED, iterations: 1, now: () => performance.now() });
  const firstMs = performance.now() - t0;
  check(problem, first, "shop case, first plan");
  let firstReport: number | undefined;
  const t1 = performance.now();
  const plan = await nest(problem, {
    seed: SEED,
    now: () => performance.now(),
    onProgress: () => (firstReport ??= performance.now() - t1),
  });
  const ms = performance.now() - t1;
  check(problem, plan, "shop case");
  const rss = process.resourceUsage().maxRSS / 1024;
  const placed = plan.placements.length;
  const row: Row = {
    set: "Shop: 1,000 parts, 100 mixed blocks",
    instances: 1,
    blockyard: `${plan.stats.blocksUsed} blocks`,
    ratio: `yield ${(100 * plan.stats.yield).toFixed(1)}%`,
    peer: `first plan ${firstMs.toFixed(0)} ms`,
    peerRatio: `LB ${plan.stats.lowerBoundBlocks}`,
    msPerInstance: ms,
    note: `${placed}/1000 placed (first plan ${first.stats.blocksUsed} blocks); peak RSS ${rss.toFixed(0)} MB`,
  };
  rows.push(row);
  printRow(row);
  results.shop = {
    firstPlanMs: firstMs,
    firstProgressMs: firstReport,
    bestMs: ms,
    blocksUsed: plan.stats.blocksUsed,
    firstBlocks: first.stats.blocksUsed,
    yield: plan.stats.yield,
    firstYield: first.stats.yield,
    placed,
    peakRssMB: rss,
    lowerBound: plan.stats.lowerBoundBlocks,
  };
}

/**
 * A large order: 20,000 small inserts and 2,000 corner blocks into ten 1200 × 600 × 500 blocks
 * (kerf 1.5, trim 5). Times the search, the validator (kerf between every pair of close pieces)
 * and the cut regions the plan page, cut sheet and run summary draw on — each grows with the
 * number of pieces, so these stay in the minutes unless the work stays near n log n.
 */
async function benchLarge(): Promise<void> {
  const problem: Problem = {
    version: 1,
    settings: {
      kerf: 1.5,
      trim: 5,
      defectMargin: 10,
      minOffcut: [100, 100, 20],
      layout: "guillotine",
      timeLimitMs: 3000,
    },
    blocks: Array.from({ length: 10 }, (_, i) => ({
      id: `L${i + 1}`,
      size: [1200, 600, 500] as Vec3,
      cost: 90,
      offcut: false,
      trim: 5,
      defects: [],
    })),
    parts: [
      { id: "insert", size: [40, 25, 12], quantity: 20_000, rotate: "any" },
      { id: "corner", size: [30, 30, 30], quantity: 2_000, rotate: "any" },
    ],
  };
  const t0 = performance.now();
  const plan = await nest(problem, { seed: SEED, now: () => performance.now() });
  const nestMs = performance.now() - t0;
  const validateMs = check(problem, plan, "large order");
  const t2 = performance.now();
  let cuts = 0;
  for (const b of problem.blocks) {
    const c = plan.cuts[b.id];
    if (!c?.length) continue;
    cuts += cutRegions(b.size, c, b.trim, problem.settings.kerf, piecesOf(plan, b.id)).length;
  }
  const regionsMs = performance.now() - t2;
  const rss = process.resourceUsage().maxRSS / 1024;
  const row: Row = {
    set: "Large order: 22,000 parts, 10 blocks",
    instances: 1,
    blockyard: `${plan.stats.blocksUsed} blocks`,
    ratio: `yield ${(100 * plan.stats.yield).toFixed(1)}%`,
    peer: `validate ${validateMs.toFixed(0)} ms`,
    peerRatio: `LB ${plan.stats.lowerBoundBlocks}`,
    msPerInstance: nestMs,
    note: `${plan.placements.length}/22000 placed; ${cuts} cuts, their regions ${regionsMs.toFixed(0)} ms; peak RSS ${rss.toFixed(0)} MB (whole process)`,
  };
  rows.push(row);
  printRow(row);
  results.large = {
    nestMs,
    validateMs,
    regionsMs,
    cuts,
    blocksUsed: plan.stats.blocksUsed,
    placed: plan.placements.length,
    peakRssMB: rss,
  };
}

async function main(): Promise<void> {
  const dir = benchDataDir(opt("--data"));
  const t0 = performance.now();
  console.log(`Blockyard nesting benchmark${quick ? " (quick subset)" : ""}`);
  console.log(
    [
      "set".padEnd(34),
      "inst".padStart(4),
      "Blockyard".padStart(14),
      "vs bound/best".padStart(16),
      "peer".padStart(22),
      "peer ratio".padStart(10),
      "time/inst".padStart(9),
      "note",
    ].join(" | "),
  );
  if (!dir)
    console.log(
      "Benchmark data is absent (looked in --data, BENCH_DATA and ../shared/benchmarks): public sets skipped.",
    );
  else {
    if (want("2d")) bench2D(dir);
    if (want("zero")) benchZeroWaste(dir);
    if (want("mpv")) benchMpv(dir);
    if (want("br")) benchBr(dir);
  }
  if (want("perfect")) benchPerfect();
  if (want("perfect-multi")) benchPerfectMulti();
  if (want("shop")) await benchShop();
  if (want("large")) await benchLarge();
  console.log(
    "LB: the simple bound computed beside the data; bound*: Blockyard's own (volume, large-item and conservative-scale bounds, lib/nesting/bounds.ts) — no packing can use fewer blocks",
  );
  console.log(
    `invalid plans (or below the bound): ${invalid}${invalidNotes.length ? `\n  ${invalidNotes.slice(0, 10).join("\n  ")}` : ""}`,
  );
  console.log(
    `runs over their budget + 1 s (failures): ${overruns}${overrunNotes.length ? `\n  ${overrunNotes.slice(0, 10).join("\n  ")}` : ""}`,
  );
  console.log(`total time ${((performance.now() - t0) / 1000).toFixed(0)} s`);
  mkdirSync("bench-results", { recursive: true });
  writeFileSync(
    "bench-results/nesting.json",
    `${JSON.stringify({ quick, rows, results, invalid, invalidNotes, overruns, overrunNotes }, null, 2)}\n`,
  );
  if (!dir) return;
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
