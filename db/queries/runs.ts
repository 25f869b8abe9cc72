import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { appendLedger } from "./ledger";
import { allocateOffcutCodes } from "./offcut-codes";
import { owedByRun, owedParts } from "./owed";
import { getMachine, kerfAndFeed } from "./machines";
import { planSteps, stepProblems } from "./at-the-machine";
import { HttpError } from "@/lib/errors";
import { isoDate } from "@/lib/stock";
import { parseProblem, type Plan, type Problem } from "@/lib/nesting";
import { MAX_PIECES } from "@/lib/nesting/parse";
import { buildProblem, partIdFromKey, partKey, type StockForPlan } from "@/lib/planning/problem";
import {
  bestFigures,
  blocksInPlan,
  planFigures,
  stuckBlocks,
  type PlanFigures,
  type RunFigures,
} from "@/lib/planning/plan-figures";
import { runSettingsSchema, type RunSettings } from "@/lib/validations/runs";
import { leftOutLine, whyUnusable, type LeftOut } from "@/lib/planning/usable";
import { getShopSettings } from "./settings";
import { zoneChangesSince, type ZoneChangeAfterPlan } from "./defects";

export type RunStatus = "queued" | "running" | "done" | "failed" | "cancelled" | "approved" | "closed";

export type { RunFigures };

export interface RunSummary {
  id: number;
  status: RunStatus;
  jobIds: number[];
  jobNames: string[];
  blockIds: number[];
  settings: RunSettings;
  progress: number;
  best: RunFigures | null;
  error: string | null;
  createdAt: string;
  createdBy: string | null;
  finishedAt: string | null;
  approvedAt: string | null;
  parentRunId: number | null;
  stats: Plan["stats"] | null;
  cost: number | null;
  /** Wire travel of all the plan's through cuts (mm); divide by the feed for the cut time. */
  cutLengthMm: number | null;
  /** Placements, turns and cut time of the plan's steps on its machine, when worked out at finish. */
  steps: PlanFigures["steps"] | null;
  /** Blocks holding pieces no cut can free (free layout only); such a plan cannot be approved. */
  stuckBlocks: string[];
  /** Chosen blocks the run left out of its problem, each with the reason. */
  leftOut: LeftOut[];
}

export interface RunDetail extends RunSummary {
  /** The block cutter the plan was made for (null: made with the shop's kerf, for no machine in particular). */
  machineId: number | null;
  problem: Problem;
  plan: Plan | null;
  blocks: {
    id: number;
    code: string;
    planStatus: "reserved" | "cut" | "released" | null;
    /** When it was recorded cut (ISO), and whether part-cut. */
    cutAt: string | null;
    partial: boolean;
  }[];
  parts: { id: number; name: string; jobId: number; trueVolumeMm3: number | null }[];
  /**
   * Defect zones of the plan's blocks (not yet cut under it) flagged, changed or removed after the
   * plan was made: the plan kept clear of the zones as they were then.
   */
  zoneChanges: ZoneChangeAfterPlan[];
}

interface RunRow {
  id: number;
  status: RunStatus;
  job_ids: number[];
  block_ids: number[];
  settings: RunSettings;
  /** Absent when a list read only the light columns. */
  problem?: Problem;
  plan?: Plan | null;
  summary?: PlanFigures | null;
  has_plan?: boolean;
  best: RunFigures | null;
  progress: number;
  error: string | null;
  created_at: Date;
  finished_at: Date | null;
  approved_at: Date | null;
  parent_run_id: number | null;
  created_by_name?: string | null;
  left_out?: LeftOut[] | null;
}

export async function jobNames(ids: number[]): Promise<Map<number, string>> {
  if (!ids.length) return new Map();
  const rows = await db()("jobs").whereIn("id", ids).select("id", "name");
  return new Map(rows.map((r: { id: number; name: string }) => [r.id, r.name]));
}

function toSummary(r: RunRow, names: Map<number, string>): RunSummary {
  const figures = r.summary ?? (r.plan && r.problem ? planFigures(r.problem, r.plan) : null);
  return {
    id: r.id,
    status: r.status,
    jobIds: r.job_ids,
    jobNames: r.job_ids.map((id) => names.get(id) ?? `#${id}`),
    blockIds: r.block_ids,
    settings: r.settings,
    progress: r.progress,
    best: r.best,
    error: r.error,
    createdAt: r.created_at.toISOString(),
    createdBy: r.created_by_name ?? null,
    finishedAt: r.finished_at?.toISOString() ?? null,
    approvedAt: r.approved_at?.toISOString() ?? null,
    parentRunId: r.parent_run_id,
    stats: figures?.stats ?? null,
    cost: figures?.cost ?? null,
    cutLengthMm: figures?.cutLengthMm ?? null,
    steps: figures?.steps ?? null,
    // Figures stored before plans could be uncuttable lack it: ask the plan when it is at hand.
    stuckBlocks: figures?.stuckBlocks ?? (r.plan && r.problem ? stuckBlocks(r.problem, r.plan) : []),
    leftOut: r.left_out ?? [],
  };
}

/**
 * Parts that approved plans already hold: placed in blocks they have reserved and not yet cut,
 * per job part (and which plans), optionally leaving one plan out.
 */
async function heldByApprovedPlans(
  trx: Knex | Knex.Transaction,
  partIds: number[],
  exceptRunId?: number,
): Promise<Map<number, { count: number; runs: number[] }>> {
  const held = new Map<number, { count: number; runs: number[] }>();
  if (!partIds.length) return held;
  const { rows } = await trx.raw(
    `SELECT pl->>'part' AS part, r.id AS run_id, count(*)::int AS n
       FROM plan_blocks pb
       JOIN nesting_runs r ON r.id = pb.run_id
       JOIN blocks b ON b.id = pb.block_id
       CROSS JOIN LATERAL jsonb_array_elements(r.plan->'placements') AS pl
      WHERE pb.status = 'reserved' AND r.status = 'approved' AND r.id <> ? AND pl->>'block' = b.code AND pl->>'part' = ANY(?)
      GROUP BY 1, 2
      ORDER BY 2`,
    [exceptRunId ?? -1, partIds.map(partKey)],
  );
  for (const r of rows as { part: string; run_id: number; n: number }[]) {
    const id = partIdFromKey(r.part);
    const h = held.get(id) ?? { count: 0, runs: [] };
    h.count += r.n;
    h.runs.push(r.run_id);
    held.set(id, h);
  }
  return held;
}

/** "plan #3" or "plans #3, #5", for messages. */
const plansNamed = (runs: number[]): string =>
  `${runs.length === 1 ? "plan" : "plans"} ${runs.map((r) => `#${r}`).join(", ")}`;

async function stockForPlan(
  trx: Knex | Knex.Transaction,
  blockIds: number[],
): Promise<(StockForPlan & { status: string; cutNotBefore: string; neverHotWire: boolean })[]> {
  const rows = await trx("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .whereIn("b.id", blockIds)
    .select("b.*", "g.code as grade_code", "g.never_hot_wire")
    .orderBy("b.id");
  const defects = await trx("defect_zones").whereIn("block_id", blockIds).whereNull("removed_at").orderBy("id");
  return rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    code: r.code as string,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as [number, number, number],
    gradeCode: r.grade_code as string,
    cost: Number(r.cost),
    isOffcut: r.parent_id !== null,
    status: r.status as string,
    neverHotWire: Boolean(r.never_hot_wire),
    cutNotBefore: isoDate(r.cut_not_before as Date),
    defects: defects
      .filter((d: { block_id: number }) => d.block_id === r.id)
      .map((d: Record<string, string | number>) => ({
        id: d.id as number,
        min: [Number(d.min_x), Number(d.min_y), Number(d.min_z)] as [number, number, number],
        max: [Number(d.max_x), Number(d.max_y), Number(d.max_z)] as [number, number, number],
      })),
  }));
}

export interface Candidate {
  id: number;
  code: string;
  gradeCode: string;
  size: [number, number, number];
  volumeM3: number;
  cost: number;
  isOffcut: boolean;
  location: string;
  defectCount: number;
  since: string;
}

/**
 * Stock a run may use for these jobs: ready (cut-not-before passed), in stock, of the grades the
 * parts need (any hot-wireable grade for parts without one), never a no-hot-wire grade; oldest first.
 * Only blocks that can hold some part still owed (after the face trim, in a way the part may be
 * turned) are offered; the others are listed in `leftOut`, each with the reason.
 */
export async function candidateStock(
  jobIds: number[],
  opts: { today?: string; trim?: number } = {},
): Promise<{ items: Candidate[]; leftOut: LeftOut[] }> {
  const today = opts.today ?? isoDate();
  const [owed, trim] = await Promise.all([owedParts(db(), jobIds), opts.trim ?? getShopSettings().then((s) => s.trim)]);
  const grades = await db()("job_parts").whereIn("job_id", jobIds).distinct("grade_id").pluck("grade_id");
  const anyGrade = grades.includes(null);
  const q = db()("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .where("b.status", "in_stock")
    .where("b.cut_not_before", "<=", today)
    .where("g.never_hot_wire", false)
    .select(
      "b.id",
      "b.code",
      "b.size_x",
      "b.size_y",
      "b.size_z",
      "b.volume_m3",
      "b.cost",
      "b.parent_id",
      "b.location",
      "g.code as grade_code",
      db().raw("coalesce(b.moulded_on, b.created_at::date) AS since"),
      db().raw(
        "(SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id AND z.removed_at IS NULL) AS defect_count",
      ),
    )
    .orderByRaw("coalesce(b.moulded_on, b.created_at::date), b.id")
    .limit(500);
  if (!anyGrade)
    q.whereIn(
      "b.grade_id",
      grades.filter((g): g is number => g !== null),
    );
  const rows = await q;
  const all: Candidate[] = rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    code: r.code as string,
    gradeCode: r.grade_code as string,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as [number, number, number],
    volumeM3: Number(r.volume_m3),
    cost: Number(r.cost),
    isOffcut: r.parent_id !== null,
    location: r.location as string,
    defectCount: Number(r.defect_count),
    since: isoDate(r.since as Date),
  }));
  const items: Candidate[] = [];
  const leftOut: LeftOut[] = [];
  for (const c of all) {
    const reason = whyUnusable(c, owed, trim);
    if (reason) leftOut.push({ id: c.id, code: c.code, reason });
    else items.push(c);
  }
  return { items, leftOut };
}

/**
 * Creates a queued run for the jobs' owed parts (or the given part quantities) in the chosen stock.
 * One block never stops a run: blocks that cannot be used (not free, settling, no-hot-wire, too
 * small for any part after trim, or refused by the problem's checks) are left out with the reason,
 * kept with the run and returned; only when nothing usable is left is the run refused.
 */
export async function createRun(
  input: {
    jobIds: number[];
    blockIds: number[];
    settings: RunSettings;
    quantities?: Map<number, number>;
    parentRunId?: number;
    machineId?: number | null;
  },
  actorId: string,
): Promise<{ id: number; leftOut: LeftOut[] }> {
  return db().transaction(async (trx) => {
    const jobs = await trx("jobs").whereIn("id", input.jobIds).select("id", "status");
    if (jobs.length !== new Set(input.jobIds).size)
      throw new HttpError(400, "Some fields need attention.", { jobIds: "One of those jobs does not exist." });
    let parts = await owedParts(trx, input.jobIds);
    let heldRuns: number[] = [];
    if (input.quantities) parts = parts.map((p) => ({ ...p, quantity: input.quantities!.get(p.id) ?? 0 }));
    else {
      // Parts an approved plan already holds in reserved blocks are on their way: not planned twice.
      const held = await heldByApprovedPlans(
        trx,
        parts.map((p) => p.id),
      );
      heldRuns = [...new Set([...held.values()].flatMap((h) => h.runs))];
      parts = parts.map((p) => ({ ...p, quantity: Math.max(0, p.quantity - (held.get(p.id)?.count ?? 0)) }));
    }
    parts = parts.filter((p) => p.quantity > 0);
    const pieces = parts.reduce((n, p) => n + p.quantity, 0);
    if (pieces > MAX_PIECES)
      throw new HttpError(
        400,
        `These jobs owe ${pieces.toLocaleString("en")} pieces; one plan nests at most ${MAX_PIECES.toLocaleString("en")}. Plan fewer jobs at a time, or split the part list into smaller jobs.`,
        { jobIds: `At most ${MAX_PIECES.toLocaleString("en")} pieces in one plan.` },
      );
    if (!parts.length)
      throw new HttpError(
        409,
        heldRuns.length
          ? `Nothing is left to plan: every part still owed is in approved ${plansNamed(heldRuns)}, waiting to be cut. Release a plan first to plan those parts again.`
          : "Nothing is owed on these jobs: every part has been cut.",
      );
    const chosen = await stockForPlan(trx, input.blockIds);
    if (chosen.length !== new Set(input.blockIds).size)
      throw new HttpError(400, "Some fields need attention.", { blockIds: "Some of that stock does not exist." });
    const today = isoDate();
    const leftOut: LeftOut[] = [];
    const leave = (b: { id: number; code: string }, reason: string) => leftOut.push({ id: b.id, code: b.code, reason });
    let stock = chosen.filter((b) => {
      const reason = b.neverHotWire
        ? "a no-hot-wire grade (polyurethane): it cannot go into a hot-wire plan"
        : b.status !== "in_stock"
          ? `not free (${b.status === "earmarked" ? "earmarked for another plan" : b.status === "on_hold" ? "on hold until the buyer releases it" : "no longer in stock"})`
          : b.cutNotBefore > today
            ? `still settling until ${b.cutNotBefore}`
            : whyUnusable(b, parts, input.settings.trim);
      if (reason) leave(b, reason);
      return !reason;
    });
    const refuseAll = () => {
      const lines = leftOut.map(leftOutLine);
      const shown = lines.slice(0, 5).join("; ") + (lines.length > 5 ? `; and ${lines.length - 5} more` : "");
      return new HttpError(409, `None of the chosen stock can be used for these parts: ${shown}.`, {
        blockIds: `${lines[0] ?? "No stock chosen"}.`,
      });
    };
    if (!stock.length) throw refuseAll();
    // Made for one block cutter: its calibrated kerf for the grades involved (the widest of them).
    let settings = input.settings;
    if (input.machineId) {
      const machine = await getMachine(input.machineId, trx);
      if (!machine) throw new HttpError(400, "Some fields need attention.", { machineId: "No such machine." });
      if (machine.kind !== "block" || !machine.active)
        throw new HttpError(400, "Some fields need attention.", {
          machineId: `${machine.name} is ${machine.active ? "a profile cutter" : "retired"}: choose a block cutter.`,
        });
      const gradeCodes = [...new Set(stock.map((b) => b.gradeCode).filter((c): c is string => !!c))];
      const gradeIds = gradeCodes.length
        ? ((await trx("grades").whereIn("code", gradeCodes).select("id")) as { id: number }[]).map((g) => g.id)
        : [];
      const { kerf } = kerfAndFeed(machine, gradeIds, { kerf: input.settings.kerf, feed: 0 });
      settings = { ...input.settings, kerf };
    }
    let parsed = parseProblem(buildProblem(parts, stock, settings));
    // A block the problem's checks refuse (its record disagrees with itself, such as a zone left
    // outside it by a re-measure) is left out with the check's words, not the whole run refused.
    for (let round = 0; !parsed.ok && round < 2; round++) {
      const bad = new Map<number, string>();
      for (const e of parsed.errors) {
        const m = /^blocks\[(\d+)\][^:]*: (.*)$/.exec(e);
        const i = m ? Number(m[1]) : -1;
        if (m && stock[i] && !bad.has(i)) bad.set(i, `its record cannot be planned: ${m[2]}`);
      }
      if (!bad.size) break;
      for (const [i, reason] of bad) leave(stock[i]!, reason);
      stock = stock.filter((_, i) => !bad.has(i));
      if (!stock.length) throw refuseAll();
      parsed = parseProblem(buildProblem(parts, stock, settings));
    }
    if (!parsed.ok)
      throw new HttpError(400, `The nesting problem is not valid: ${parsed.errors.slice(0, 3).join("; ")}`);
    const [run] = await trx("nesting_runs")
      .insert({
        status: "queued",
        job_ids: input.jobIds,
        block_ids: stock.map((b) => b.id),
        settings,
        machine_id: input.machineId ?? null,
        problem: JSON.stringify(parsed.problem),
        parent_run_id: input.parentRunId ?? null,
        created_by: actorId,
        left_out: JSON.stringify(leftOut),
      })
      .returning("id");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "run.create",
      subject: `run:${run.id}`,
      detail: { jobIds: input.jobIds, blocks: stock.length, leftOut },
    });
    return { id: run.id as number, leftOut };
  });
}

/** Runs with the name of who started them. */
const runsWithAuthor = () => db()("nesting_runs as r").leftJoin("users as u", "u.id", "r.created_by");
const runSelect = () => runsWithAuthor().select("r.*", "u.name as created_by_name");

/** Every column but the (large) problem and plan. */
const LIGHT_COLUMNS = [
  "id",
  "status",
  "job_ids",
  "block_ids",
  "settings",
  "best",
  "progress",
  "error",
  "created_at",
  "finished_at",
  "approved_at",
  "parent_run_id",
  "summary",
  "left_out",
].map((c) => `r.${c}`);

/** Newest first; `beforeId` pages back through older runs (keyset: `id < beforeId`). */
export async function listRuns(
  opts: { jobId?: number; statuses?: RunStatus[]; limit?: number; beforeId?: number; id?: number } = {},
): Promise<RunSummary[]> {
  const q = runsWithAuthor()
    .select(...LIGHT_COLUMNS, "u.name as created_by_name", db().raw("r.plan IS NOT NULL AS has_plan"))
    .orderBy("r.id", "desc")
    .limit(opts.limit ?? 50);
  if (opts.jobId) q.whereRaw("? = ANY(r.job_ids)", [opts.jobId]);
  if (opts.statuses) q.whereIn("r.status", opts.statuses);
  if (opts.beforeId) q.where("r.id", "<", opts.beforeId);
  if (opts.id) q.where("r.id", opts.id);
  const rows = (await q) as RunRow[];
  await fillMissingFigures(rows.filter((r) => r.has_plan && !r.summary));
  const names = await jobNames([...new Set(rows.flatMap((r) => r.job_ids))]);
  return rows.map((r) => toSummary(r, names));
}

/** One run's status, progress and figures without its problem and plan (what a progress bar polls). */
export async function getRunSummary(id: number): Promise<(RunSummary & { hasPlan: boolean }) | undefined> {
  const [run] = await listRuns({ id, limit: 1 });
  if (!run) return undefined;
  const row = await db()("nesting_runs").where({ id }).first(db().raw("plan IS NOT NULL AS has_plan"));
  return { ...run, hasPlan: !!row?.has_plan };
}

/** Runs planned before figures were stored with the plan: work them out once and keep them. */
async function fillMissingFigures(rows: RunRow[]): Promise<void> {
  if (!rows.length) return;
  const full = (await db()("nesting_runs")
    .whereIn(
      "id",
      rows.map((r) => r.id),
    )
    .select("id", "problem", "plan")) as { id: number; problem: Problem; plan: Plan }[];
  for (const f of full) {
    const row = rows.find((r) => r.id === f.id)!;
    row.summary = planFigures(f.problem, f.plan);
    await db()("nesting_runs")
      .where({ id: f.id })
      .whereNull("summary")
      .update({ summary: JSON.stringify(row.summary) });
  }
}

export async function getRun(id: number): Promise<RunDetail | undefined> {
  const r = (await runSelect().where("r.id", id).first()) as
    | (RunRow & { problem: Problem; plan: Plan | null })
    | undefined;
  if (!r) return undefined;
  const names = await jobNames(r.job_ids);
  const blocks = await db()("blocks as b")
    .leftJoin("plan_blocks as pb", function () {
      this.on("pb.block_id", "b.id").andOn("pb.run_id", db().raw("?", [id]));
    })
    .whereIn("b.id", r.block_ids)
    .select("b.id", "b.code", "pb.status as plan_status", "pb.cut_at", "pb.partial")
    .orderBy("b.id");
  // Runs recorded before planning moved into Blockyard (demo history) carry no problem or plan.
  r.problem.parts ??= [];
  r.problem.blocks ??= [];
  const partIds = r.problem.parts.map((p) => partIdFromKey(p.id));
  const parts = partIds.length
    ? await db()("job_parts").whereIn("id", partIds).select("id", "name", "job_id", "true_volume_mm3")
    : [];
  // Only a plan still to be cut relies on its zones; a block already cut under it no longer does.
  const relying = ["queued", "running", "done", "approved"].includes(r.status)
    ? (blocks as { id: number; plan_status: string | null }[]).filter((b) => b.plan_status !== "cut").map((b) => b.id)
    : [];
  const zoneChanges = await zoneChangesSince(relying, r.created_at);
  return {
    ...toSummary(r, names),
    machineId: (r as { machine_id?: number | null }).machine_id ?? null,
    problem: r.problem,
    plan: r.plan,
    blocks: blocks.map(
      (b: {
        id: number;
        code: string;
        plan_status: "reserved" | "cut" | "released" | null;
        cut_at: Date | null;
        partial: boolean | null;
      }) => ({
        id: b.id,
        code: b.code,
        planStatus: b.plan_status,
        cutAt: b.cut_at ? b.cut_at.toISOString() : null,
        partial: !!b.partial,
      }),
    ),
    parts: parts.map((p: { id: number; name: string; job_id: number; true_volume_mm3: string | null }) => ({
      id: p.id,
      name: p.name,
      jobId: p.job_id,
      trueVolumeMm3: p.true_volume_mm3 === null ? null : Number(p.true_volume_mm3),
    })),
    zoneChanges,
  };
}

// ---- worker side ----

/**
 * Claims a run for `worker`: a queued one, or one whose worker stopped (no heartbeat for
 * `staleSeconds`) and that the sweep has not reached yet. A run another live worker holds is
 * never taken, so no run is done twice. Null if it was cancelled, finished or is held.
 */
export async function claimRun(id: number, worker: string, staleSeconds = 90): Promise<Problem | null> {
  const stale = Math.max(5, Math.floor(staleSeconds));
  const [row] = await db()("nesting_runs")
    .where({ id })
    .where((q) =>
      q
        .where("status", "queued")
        .orWhere((r) =>
          r
            .where("status", "running")
            .where("heartbeat_at", "<", db().raw("now() - make_interval(secs => ?)", [stale])),
        ),
    )
    .update({
      status: "running",
      worker,
      started_at: db().fn.now(),
      heartbeat_at: db().fn.now(),
      attempts: db().raw("attempts + 1"),
      progress: 0,
    })
    .returning(["problem"]);
  return row ? (row.problem as Problem) : null;
}

/**
 * Writes progress and the heartbeat, only while `worker` still holds the run; the status it
 * answers tells the worker to stop (cancelled, or undefined when another worker has it now).
 */
export async function saveProgress(
  id: number,
  worker: string,
  progress: number,
  best: RunFigures,
): Promise<RunStatus | undefined> {
  const [row] = await db()("nesting_runs")
    .where({ id, worker })
    .update({ progress, best, heartbeat_at: db().fn.now() })
    .returning("status");
  return row?.status;
}

/**
 * Stores a run's plan with the figures lists show; `problem` is the one `worker` claimed. Nothing is
 * written when another worker holds the run now (this one was taken for dead).
 */
export async function finishRun(id: number, worker: string, problem: Problem, plan: Plan): Promise<void> {
  const figures = planFigures(problem, plan);
  // The cutting steps on the run's machine, for comparing plans by placements and time.
  try {
    const row = await db()("nesting_runs").where({ id }).first("machine_id", "settings");
    const s = await planSteps({ machineId: row?.machine_id ?? null, problem, plan, settings: row?.settings });
    const timed = s.blocks.filter((b) => b.time);
    if (timed.length && timed.length === s.blocks.length)
      figures.steps = {
        machine: s.machine.name,
        placements: timed.reduce((n, b) => n + b.time!.placements, 0),
        turns: timed.reduce((n, b) => n + b.time!.turns, 0),
        minutes: timed.reduce((n, b) => n + b.time!.totalMin, 0),
      };
  } catch {
    /* figures without steps: the plan page works them out */
  }
  await db()("nesting_runs")
    .where({ id, worker })
    .whereIn("status", ["running", "cancelled"])
    .update({
      // A cancelled run keeps its best plan so far, but stays cancelled.
      status: db().raw("CASE WHEN status = 'cancelled' THEN 'cancelled' ELSE 'done' END"),
      plan: JSON.stringify(plan),
      summary: JSON.stringify(figures),
      progress: 1,
      finished_at: db().fn.now(),
      best: bestFigures(plan),
    });
}

/** Marks a run failed; with `worker`, only while that worker still holds it. */
export async function failRun(id: number, message: string, worker?: string): Promise<void> {
  await db()("nesting_runs")
    .where({ id, ...(worker ? { worker } : {}) })
    .whereIn("status", ["queued", "running"])
    .update({ status: "failed", error: message.slice(0, 500), finished_at: db().fn.now() });
}

/** Runs whose worker died (no heartbeat for `staleSeconds`): marked failed so nobody waits for ever. */
export async function failStaleRuns(staleSeconds = 90): Promise<number> {
  return db()("nesting_runs")
    .where("status", "running")
    .where("heartbeat_at", "<", db().raw("now() - make_interval(secs => ?)", [Math.max(5, Math.floor(staleSeconds))]))
    .update({
      status: "failed",
      error: "The worker stopped while planning. Start the run again.",
      finished_at: db().fn.now(),
    });
}

export async function cancelRun(id: number, actorId: string): Promise<void> {
  const n = await db()("nesting_runs")
    .where({ id })
    .whereIn("status", ["queued", "running"])
    .update({ status: "cancelled", finished_at: db().fn.now() });
  if (!n) {
    if (!(await db()("nesting_runs").where({ id }).first("id"))) throw new HttpError(404, "That plan was not found.");
    throw new HttpError(409, "Only a queued or running plan can be stopped.");
  }
  await db()("audit_log").insert({ actor_id: actorId, action: "run.cancel", subject: `run:${id}` });
}

// ---- approval and release ----

/**
 * Approves a finished plan: reserves every block it uses in one transaction. A block can be held
 * by one approved plan only; a second approval touching it fails with a clear message.
 */
export async function approveRun(id: number, actorId: string): Promise<void> {
  // The plan must be cuttable on its machine (every piece within the wire, travel and table).
  // Worked out before the transaction: it reads only the run and the machines, and takes a while.
  let cannot: string[] = [];
  let machineName = "";
  const before = await db()("nesting_runs").where({ id }).first("machine_id", "problem", "plan", "settings");
  if (before?.plan) {
    const steps = await planSteps({
      machineId: before.machine_id ?? null,
      problem: before.problem as Problem,
      plan: before.plan as Plan,
      settings: before.settings as RunSettings,
    });
    cannot = stepProblems(steps.blocks);
    machineName = steps.machine.name;
  }
  try {
    await db().transaction(async (trx) => {
      const run = await trx("nesting_runs").where({ id }).forUpdate().first();
      if (!run) throw new HttpError(404, "That plan was not found.");
      if (run.status !== "done")
        throw new HttpError(
          409,
          run.status === "approved" ? "This plan is already approved." : "Only a finished plan can be approved.",
        );
      const plan = run.plan as Plan;
      const codes = blocksInPlan(plan);
      if (!codes.length) throw new HttpError(409, "This plan places nothing: there is nothing to reserve.");
      // A free-layout plan may hold pieces no cutter can free: never reserve stock for it.
      const stuck = stuckBlocks(run.problem as Problem, plan);
      if (stuck.length)
        throw new HttpError(
          409,
          `${stuck.length === 1 ? "Block" : "Blocks"} ${stuck.join(", ")}: some pieces cannot be freed by through cuts nor cut out of one layer (free layout, for comparison only). Plan again with the guillotine or layers rule.`,
        );
      if (cannot.length)
        throw new HttpError(
          409,
          `This plan cannot be cut on ${machineName}: ${cannot.slice(0, 3).join("; ")}${cannot.length > 3 ? `; and ${cannot.length - 3} more` : ""}. Plan again for another machine, or with smaller blocks.`,
        );
      const blocks = await trx("blocks")
        .whereIn("code", codes)
        .forUpdate()
        .select("id", "code", "status", "volume_m3", "cost");
      for (const b of blocks) {
        if (b.status !== "in_stock") {
          const other = await trx("plan_blocks").where({ block_id: b.id, status: "reserved" }).first("run_id");
          throw new HttpError(
            409,
            other
              ? `Block ${b.code} is already earmarked by plan #${other.run_id}. Re-plan without it, or release that plan first.`
              : b.status === "on_hold"
                ? `Block ${b.code} was put on hold since this plan was made. Re-plan without it, or have the buyer release it first.`
                : `Block ${b.code} is no longer in stock.`,
          );
        }
      }
      // One approval per job at a time, so two plans cannot both claim the same owed parts.
      await trx("jobs").whereIn("id", run.job_ids).orderBy("id").forUpdate().select("id");
      const placed = new Map<number, number>();
      for (const pl of plan.placements) {
        const partId = partIdFromKey(pl.part);
        placed.set(partId, (placed.get(partId) ?? 0) + 1);
      }
      const owed = new Map((await owedParts(trx, run.job_ids)).map((p) => [p.id, p]));
      const held = await heldByApprovedPlans(trx, [...placed.keys()], id);
      for (const [partId, n] of placed) {
        const part = owed.get(partId);
        const h = held.get(partId);
        const free = Math.max(0, (part?.quantity ?? 0) - (h?.count ?? 0));
        if (n > free)
          throw new HttpError(
            409,
            `"${part?.name ?? "A part"}": this plan cuts ${n}, but only ${free} ${free === 1 ? "is" : "are"} still owed${h ? ` once approved ${plansNamed(h.runs)} ${h.runs.length === 1 ? "is" : "are"} counted` : ""}. Release that plan first, or plan again.`,
          );
      }
      await trx("plan_blocks").insert(
        blocks.map((b: { id: number }) => ({ run_id: id, block_id: b.id, status: "reserved" })),
      );
      await allocateOffcutCodes(trx, id, blocks, plan);
      await trx("blocks")
        .whereIn(
          "id",
          blocks.map((b: { id: number }) => b.id),
        )
        .update({ status: "earmarked", updated_at: trx.fn.now() });
      await appendLedger(
        trx,
        blocks.map((b: { id: number; volume_m3: string; cost: string }) => ({
          blockId: b.id,
          kind: "reserved" as const,
          volumeM3: Number(b.volume_m3),
          value: Number(b.cost),
          userId: actorId,
          reason: `Plan #${id}`,
          ref: `run:${id}`,
        })),
      );
      await trx("nesting_runs")
        .where({ id })
        .update({ status: "approved", approved_by: actorId, approved_at: trx.fn.now() });
      await trx("jobs").whereIn("id", run.job_ids).where("status", "open").update({ status: "planned" });
      await trx("audit_log").insert({
        actor_id: actorId,
        action: "run.approve",
        subject: `run:${id}`,
        detail: { blocks: codes },
      });
    });
  } catch (e) {
    // Two approvals racing for one block: the unique reservation index refuses the second.
    if ((e as { code?: string }).code === "23505")
      throw new HttpError(409, "Another plan earmarked one of these blocks a moment ago. Re-plan without it.");
    throw e;
  }
}

/** Releases an approved plan's blocks that are not cut yet; the plan is then cancelled. */
export async function releaseRun(id: number, actorId: string): Promise<void> {
  await db().transaction(async (trx) => {
    const run = await trx("nesting_runs").where({ id }).forUpdate().first();
    if (!run) throw new HttpError(404, "That plan was not found.");
    if (run.status !== "approved") throw new HttpError(409, "Only an approved plan can be released.");
    const held = await trx("plan_blocks as pb")
      .join("blocks as b", "b.id", "pb.block_id")
      .where({ "pb.run_id": id, "pb.status": "reserved" })
      .select("b.id", "b.volume_m3", "b.cost");
    await trx("plan_blocks").where({ run_id: id, status: "reserved" }).update({ status: "released" });
    if (held.length) {
      await trx("blocks")
        .whereIn(
          "id",
          held.map((b: { id: number }) => b.id),
        )
        .update({ status: "in_stock", updated_at: trx.fn.now() });
      await appendLedger(
        trx,
        held.map((b: { id: number; volume_m3: string; cost: string }) => ({
          blockId: b.id,
          kind: "released" as const,
          volumeM3: Number(b.volume_m3),
          value: Number(b.cost),
          userId: actorId,
          reason: `Plan #${id} released`,
          ref: `run:${id}`,
        })),
      );
    }
    await trx("nesting_runs").where({ id }).update({ status: "cancelled" });
    await trx("audit_log").insert({ actor_id: actorId, action: "run.release", subject: `run:${id}` });
  });
}

/** One step: a new run for what this run still owes, in today's candidate stock. */
export async function replanRun(runId: number, actorId: string): Promise<number> {
  const run = await db()("nesting_runs").where({ id: runId }).first();
  if (!run) throw new HttpError(404, "That plan was not found.");
  const owed = await owedByRun(runId);
  if (![...owed.values()].some((n) => n > 0))
    throw new HttpError(409, "This plan owes no parts: nothing was rejected or left unplaced.");
  // Runs recorded before planning moved into Blockyard (demo history) kept no settings: re-plan
  // those with the shop's current ones rather than fail.
  const own = runSettingsSchema.safeParse(run.settings);
  let settings: RunSettings;
  if (own.success) settings = own.data;
  else {
    const shop = await getShopSettings();
    settings = {
      kerf: shop.kerf,
      trim: shop.trim,
      defectMargin: shop.defectMargin,
      minOffcut: shop.minOffcut,
      layout: shop.layout,
      timeLimitMs: shop.nestingTimeLimitMs,
    };
  }
  const { items: stock, leftOut } = await candidateStock(run.job_ids, { trim: settings.trim });
  if (!stock.length)
    throw new HttpError(
      409,
      `No ready stock of the needed grades is free to plan into${leftOut.length ? ` (${leftOut.slice(0, 3).map(leftOutLine).join("; ")})` : ""}.`,
    );
  const made = await createRun(
    { jobIds: run.job_ids, blockIds: stock.map((s) => s.id), settings, quantities: owed, parentRunId: runId },
    actorId,
  );
  return made.id;
}
