import { testDb, makeBlock } from "./db";
import type { Client } from "./http";
import { nestSync, parseProblem, type Plan, type Problem } from "@/lib/nesting";
import { buildProblem } from "@/lib/planning/problem";
import type { RunSettings } from "@/lib/validations/runs";

export const SETTINGS: RunSettings = {
  kerf: 1.5,
  trim: 6,
  defectMargin: 10,
  minOffcut: [150, 150, 25],
  layout: "guillotine",
  timeLimitMs: 800,
};

/** A job with parts (grade by code; none: any grade). */
export async function makeJobWithParts(
  parts: {
    name: string;
    quantity: number;
    size: [number, number, number];
    gradeCode?: string;
    trueVolumeMm3?: number;
  }[],
) {
  const k = testDb();
  const [job] = await k("jobs")
    .insert({ name: `Test job ${Date.now().toString(36)}`, customer: "Test" })
    .returning("id");
  const partIds: number[] = [];
  for (const p of parts) {
    const grade = p.gradeCode ? await k("grades").where({ code: p.gradeCode }).first("id") : null;
    const [row] = await k("job_parts")
      .insert({
        job_id: job!.id,
        name: p.name,
        quantity: p.quantity,
        size_x: p.size[0],
        size_y: p.size[1],
        size_z: p.size[2],
        grade_id: grade?.id ?? null,
        rotate: "any",
        true_volume_mm3: p.trueVolumeMm3 ?? null,
      })
      .returning("id");
    partIds.push(row!.id);
  }
  return { jobId: job!.id as number, partIds };
}

/** A finished run (status done) whose plan is computed here with the real solver. */
export async function makeDoneRun(
  jobId: number,
  blocks: { id: number; code: string }[],
  settings = SETTINGS,
): Promise<{ runId: number; plan: Plan; problem: Problem }> {
  const k = testDb();
  const parts = await k("job_parts as p")
    .leftJoin("grades as g", "g.id", "p.grade_id")
    .where("p.job_id", jobId)
    .select("p.*", "g.code as grade_code");
  const stock = await k("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .whereIn(
      "b.id",
      blocks.map((b) => b.id),
    )
    .select("b.*", "g.code as grade_code")
    .orderBy("b.id");
  const problem = buildProblem(
    parts.map((p: Record<string, unknown>) => ({
      id: p.id as number,
      name: p.name as string,
      quantity: p.quantity as number,
      size: [Number(p.size_x), Number(p.size_y), Number(p.size_z)],
      gradeCode: (p.grade_code as string) ?? null,
      rotate: p.rotate as "any",
    })),
    stock.map((b: Record<string, unknown>) => ({
      id: b.id as number,
      code: b.code as string,
      size: [Number(b.size_x), Number(b.size_y), Number(b.size_z)],
      gradeCode: b.grade_code as string,
      cost: Number(b.cost),
      isOffcut: b.parent_id !== null,
      defects: [],
    })),
    settings,
  );
  const parsed = parseProblem(problem);
  if (!parsed.ok) throw new Error(parsed.errors.join("; "));
  const plan = nestSync(parsed.problem, { seed: 1, iterations: 30 });
  const [run] = await k("nesting_runs")
    .insert({
      status: "done",
      job_ids: [jobId],
      block_ids: stock.map((b: { id: number }) => b.id),
      settings,
      problem: JSON.stringify(parsed.problem),
      plan: JSON.stringify(plan),
      progress: 1,
      finished_at: k.fn.now(),
    })
    .returning("id");
  return { runId: run!.id as number, plan, problem: parsed.problem };
}

/** A job of one part and a fresh block, planned: the smallest thing that can be approved and cut. */
export async function makePlannedBlock(size: [number, number, number] = [2000, 1000, 600]) {
  const block = await makeBlock({ size });
  const { jobId, partIds } = await makeJobWithParts([
    { name: "Test panel", quantity: 2, size: [900, 400, 200], gradeCode: "EPS-II" },
  ]);
  const run = await makeDoneRun(jobId, [block]);
  return { block, jobId, partIds, ...run };
}

/** The same, approved straight in the database (reserved, earmarked, with its ledger rows). */
export async function makeApprovedRun() {
  const made = await makePlannedBlock();
  const k = testDb();
  await k("plan_blocks").insert({ run_id: made.runId, block_id: made.block.id, status: "reserved" });
  await k("blocks").where({ id: made.block.id }).update({ status: "earmarked" });
  const b = await k("blocks").where({ id: made.block.id }).first("volume_m3", "cost");
  await k("stock_ledger").insert({
    block_id: made.block.id,
    kind: "reserved",
    volume_m3: b!.volume_m3!,
    delta_m3: 0,
    value: b!.cost,
    delta_value: 0,
    reason: "test fixture",
  });
  await k("nesting_runs").where({ id: made.runId }).update({ status: "approved", approved_at: k.fn.now() });
  return made;
}

/**
 * A finished free-layout plan whose one block holds a pinwheel — four oblong pieces turning around
 * a lower middle one (the textbook non-guillotine pattern; common knowledge, no source) — so no
 * through cut frees any piece and they are not one layer.
 */
export async function makePinwheelRun() {
  const block = await makeBlock({ size: [2000, 1000, 600] });
  const { jobId } = await makeJobWithParts([
    { name: "Pinwheel piece", quantity: 5, size: [100, 100, 100], gradeCode: "EPS-II" },
  ]);
  const { runId, plan } = await makeDoneRun(jobId, [block], { ...SETTINGS, layout: "free" });
  const key = plan.placements[0]!.part;
  const at = (origin: [number, number, number], size: [number, number, number]) => ({
    part: key,
    block: block.code,
    origin,
    size,
  });
  const placements = [
    at([10, 10, 10], [200, 100, 100]),
    at([210, 10, 10], [100, 200, 100]),
    at([110, 210, 10], [200, 100, 100]),
    at([10, 110, 10], [100, 200, 100]),
    at([110, 110, 10], [100, 100, 50]),
  ];
  await testDb()("nesting_runs")
    .where({ id: runId })
    .update({ plan: JSON.stringify({ ...plan, offcuts: [], cuts: { [block.code]: [] }, placements }) });
  return { runId, block, jobId };
}

/**
 * Polls a run as `who` until its status is one of `statuses`: the run and the progress figures seen
 * on the way. Any answer but 200 throws (a poll must never fail), as does a run still elsewhere after `ms`.
 */
export async function waitForRun(who: Client, runId: number, statuses: string[], ms = 90_000) {
  const end = Date.now() + ms;
  const seen: number[] = [];
  for (;;) {
    const res = await who.get(`/api/runs/${runId}`);
    if (res.status !== 200)
      throw new Error(`GET /api/runs/${runId} answered ${res.status}: ${JSON.stringify(res.body)}`);
    seen.push(res.body.run.progress);
    if (statuses.includes(res.body.run.status)) return { run: res.body.run, seen };
    if (Date.now() > end) throw new Error(`run ${runId} still ${res.body.run.status}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}
