/**
 * The shop case of true-shape nesting (issue 20): `npm run bench:profiles -- --shop [--budget 60 --seed 1]`.
 * 60 sign letters in two faces and heights plus 8 tapered wing cores into 3 blocks (one with a
 * defect zone; scripts/lib-bench/shop-case.ts), planned twice with the same budget and seed: with
 * `settings.trueShape` (slabs of outlines) and as boxes (what Blockyard did before). Prints the
 * foam each takes from stock, the blocks, the slabs against the parts' boxes, and the checks:
 * `validatePlan` (containment, kerf, defects, through-cut separability: cuttable), the slabs again
 * with polygon-clipping, every lead-in corridor. Writes bench-results/shop.json; exit code 1 when a
 * plan is invalid or a corridor blocked.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { nestSync, parseProblem, type Plan, type Problem, validatePlan } from "@/lib/nesting";
import { signedArea } from "@/lib/nesting/irregular/geometry";
import { occupiedOutline } from "@/lib/nesting/slab";
import { type Machine, slabMaxFor } from "@/lib/planning/machine";
import { profileProgram } from "@/lib/profiles/program";
import { slabProgramInput } from "@/lib/profiles/slab-program";
import { checkSlabsIndependently, foamUsedM3, shopCase } from "./lib-bench/shop-case";

/** An invented 4-axis profile cutter large enough for a block's face (the demo shop's figures are not assumed). */
const CUTTER: Machine = {
  name: "Bench 4-axis profile cutter",
  kind: "profile",
  wire: "horizontal",
  wireLength: 1300,
  travel: [1400, 1400],
  maxPiece: [1300, 1400, 1400],
  turntable: false,
  rapid: 1500,
  heatUpS: 10,
  handlingS: 60,
  fourAxis: true,
  dialect: {
    unitWords: "G20/G21",
    inch: false,
    heatOn: "M3",
    heatOff: "M5",
    axes: ["X", "Y"],
    towerAxes: ["U", "V"],
    lineNumbers: false,
  },
};

const boxVolumeM3 = (problem: Problem, profileOnly: boolean) =>
  problem.parts
    .filter((p) => !profileOnly || p.outline)
    .reduce((s, p) => s + p.size[0] * p.size[1] * p.size[2] * p.quantity, 0) / 1e9;

/**
 * Runs the shop case and prints its figures (synchronous: the clock bounds both plans).
 * @example runShopBench(["--budget", "30"]) // prints the table, sets process.exitCode on a failure
 */
export function runShopBench(args: string[]): void {
  const opt = (name: string) => {
    const i = args.indexOf(name);
    return i >= 0 ? args[i + 1] : undefined;
  };
  const budgetS = Number(opt("--budget") ?? 60);
  const seed = Number(opt("--seed") ?? 1);
  if (!(budgetS > 0) || !Number.isInteger(seed)) {
    console.error("usage: npm run bench:profiles -- --shop [--budget SECONDS>0] [--seed N]");
    process.exitCode = 2;
    return;
  }
  const c = shopCase();
  // Slabs sized for the bench's cutter, as a run in the app sizes them for the shop's.
  const json = {
    ...c.json,
    settings: { ...(c.json.settings as object), timeLimitMs: budgetS * 1000, slabMax: slabMaxFor(CUTTER) },
  };
  const parsed = parseProblem(json);
  if (!parsed.ok) throw new Error(parsed.errors.join("\n"));
  const trueP = parsed.problem;
  const boxP: Problem = { ...trueP, settings: { ...trueP.settings, trueShape: false } };
  console.log(
    `Shop case: ${c.letters} letters (2 faces of Inter, 300 and 180 mm) + ${c.wings} tapered wing cores (NACA 2412), ` +
      `${trueP.parts.length} part lines, ${trueP.blocks.length} blocks ${trueP.blocks.map((b) => `${b.id} ${b.size.join("×")}${b.defects.length ? " (defect)" : ""}`).join(", ")}; ` +
      `budget ${budgetS} s per plan, seed ${seed}; ${os.cpus().length} cores, load ${os.loadavg()[0]!.toFixed(1)} at start, node ${process.version}`,
  );
  const run = (p: Problem): { plan: Plan; ms: number } => {
    const t = performance.now();
    const plan = nestSync(p, { seed, now: () => performance.now() });
    return { plan, ms: performance.now() - t };
  };
  const ts = run(trueP);
  const bx = run(boxP);
  const tsErr = validatePlan(trueP, ts.plan);
  const bxErr = validatePlan(boxP, bx.plan);
  const indep = checkSlabsIndependently(trueP, ts.plan);
  const foamTs = foamUsedM3(trueP, ts.plan);
  const foamBx = foamUsedM3(boxP, bx.plan);
  const less = (1 - foamTs / foamBx) * 100;
  const slabs = ts.plan.placements.filter((p) => p.slab);
  const slabVol = slabs.reduce((s, p) => s + p.slab!.size[0] * p.slab!.size[1] * p.slab!.size[2], 0) / 1e9;
  const profileBoxes = boxVolumeM3(trueP, true);
  // Cuttable on the profile cutter: one program per slab, each member entered at its corridor.
  const partsById = new Map(trueP.parts.map((p) => [p.id, p]));
  // Profile copies whose slab would not have been smaller than their boxes are planned as boxes.
  const asBoxes = ts.plan.placements.filter((p) => !p.slab && partsById.get(p.part)?.outline);
  const asBoxesVol = asBoxes.reduce((s, p) => s + p.size[0] * p.size[1] * p.size[2], 0) / 1e9;
  const profileTs = slabVol + asBoxesVol;
  const programErrors: string[] = [];
  let feedMm = 0;
  for (const s of slabs)
    try {
      const prog = profileProgram(
        slabProgramInput(s.part, s.slab!, partsById, (id, k) => `${id} ${k + 1}`, {
          kerf: trueP.settings.kerf,
          feed: 250,
        }),
        CUTTER,
      );
      feedMm += prog.feedMm;
    } catch (e) {
      programErrors.push(`${s.part}: ${e instanceof Error ? e.message : String(e)}`);
    }
  const unplaced = (p: Plan) => p.unplaced.reduce((n, u) => n + u.count, 0);
  const rows = [
    ["", "true-shape", "boxes"],
    ["foam used (blocks − offcuts kept), m³", foamTs.toFixed(4), foamBx.toFixed(4)],
    ["blocks used", String(ts.plan.stats.blocksUsed), String(bx.plan.stats.blocksUsed)],
    [
      "profile parts cut out as, m³",
      `${profileTs.toFixed(4)} (${slabs.length} slabs, ${asBoxes.length} boxes)`,
      `${profileBoxes.toFixed(4)} (boxes)`,
    ],
    [
      "true profile volume ÷ foam used",
      `${((c.trueVolumeM3 / foamTs) * 100).toFixed(1)} %`,
      `${((c.trueVolumeM3 / foamBx) * 100).toFixed(1)} %`,
    ],
    ["pieces unplaced", String(unplaced(ts.plan)), String(unplaced(bx.plan))],
    [
      "validatePlan",
      tsErr.length ? `${tsErr.length} errors` : "valid",
      bxErr.length ? `${bxErr.length} errors` : "valid",
    ],
    ["time", `${(ts.ms / 1000).toFixed(1)} s`, `${(bx.ms / 1000).toFixed(1)} s`],
  ];
  for (const r of rows) console.log(`${r[0]!.padEnd(40)} | ${r[1]!.padStart(22)} | ${r[2]!.padStart(16)}`);
  // The share of a slab's face its members' occupied outlines fill.
  const fill = (slab: NonNullable<Plan["placements"][number]["slab"]>) =>
    slab.members.reduce((a, m) => a + Math.abs(signedArea(occupiedOutline(partsById.get(m.part)!.outline!))), 0) /
    (slab.size[1] * slab.size[2]);
  for (const s of slabs)
    console.log(
      `  ${s.part}: ${s.slab!.size.map((v) => v.toFixed(0)).join(" × ")} mm, ${s.slab!.members.length} parts, fill ${(fill(s.slab!) * 100).toFixed(1)} %, in ${s.block}` +
        ` (faces of the lead-ins: ${["top", "right", "left"].map((f) => `${f} ${s.slab!.members.filter((m) => m.leadIn.face === f && m.leadIn.via === undefined).length}`).join(", ")}; chained through another's kerf ${s.slab!.members.filter((m) => m.leadIn.via !== undefined).length})`,
    );
  console.log(
    `true-shape uses ${less.toFixed(1)} % less foam than box nesting (target ≥ 20 %: ${less >= 20 ? "met" : "NOT met"}); ` +
      `profile parts take ${((1 - profileTs / profileBoxes) * 100).toFixed(1)} % less than their boxes (slabs ${slabVol.toFixed(4)} m³ + boxes ${asBoxesVol.toFixed(4)} m³); ` +
      `lead-in corridors: ${indep.corridors} checked, ${indep.errors.filter((e) => e.includes("lead-in")).length} blocked; ` +
      `independent check (polygon-clipping): ${indep.errors.length ? `${indep.errors.length} errors` : "ok"}; ` +
      `plans valid and cuttable (validatePlan, guillotine): ${!tsErr.length && !bxErr.length ? "yes" : "NO"}; ` +
      `slab programs on a 4-axis cutter: ${slabs.length - programErrors.length} of ${slabs.length} made (${(feedMm / 1000).toFixed(1)} m of wire in foam)`,
  );
  for (const e of [...tsErr, ...indep.errors, ...programErrors].slice(0, 10)) console.log(`  ${e}`);
  mkdirSync("bench-results", { recursive: true });
  writeFileSync(
    path.join("bench-results", "shop.json"),
    JSON.stringify(
      {
        budgetS,
        seed,
        foamTrueShapeM3: foamTs,
        foamBoxesM3: foamBx,
        lessPct: less,
        slabVolumeM3: slabVol,
        profileAsBoxesM3: asBoxesVol,
        profileBoxesM3: profileBoxes,
        errors: [...tsErr, ...bxErr, ...indep.errors],
      },
      null,
      2,
    ),
  );
  if (tsErr.length || bxErr.length || indep.errors.length || programErrors.length) process.exitCode = 1;
}
