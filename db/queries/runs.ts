import "server-only";
import { db } from "@/db";
import type { Plan, Problem } from "@/lib/nesting";
import { partIdFromKey } from "@/lib/planning/problem";
import { planFigures, stuckBlocks, type PlanFigures, type RunFigures } from "@/lib/planning/plan-figures";
import type { RunSettings } from "@/lib/validations/runs";
import type { LeftOut } from "@/lib/planning/usable";
import { zoneChangesSince, type ZoneChangeAfterPlan } from "./defects";

/**
 * Nesting runs as lists and pages read them. The rest of a run's life is in its own modules:
 * planning one (run-plan.ts), the worker's claim and progress (run-worker.ts), approval, release
 * and re-planning (run-approval.ts), recording cuts (cuts.ts).
 */

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
  /** The profile parts' slab programs on the shop's profile cutter, when worked out at finish. */
  profiles: PlanFigures["profiles"] | null;
  /** A true-shape run: foam used by its plan and by box nesting of the same parts, when worked out at finish. */
  shapes: PlanFigures["shapes"] | null;
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
    profiles: figures?.profiles ?? null,
    shapes: figures?.shapes ?? null,
    // Figures stored before plans could be uncuttable lack it: ask the plan when it is at hand.
    stuckBlocks: figures?.stuckBlocks ?? (r.plan && r.problem ? stuckBlocks(r.problem, r.plan) : []),
    leftOut: r.left_out ?? [],
  };
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
  // A computed column: Knex's typings cannot name it, so the row is typed here.
  const row = (await db()("nesting_runs").where({ id }).first(db().raw("plan IS NOT NULL AS has_plan"))) as
    | { has_plan: boolean }
    | undefined;
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
    parts: parts.map((p) => ({ id: p.id, name: p.name, jobId: p.job_id, trueVolumeMm3: p.true_volume_mm3 })),
    zoneChanges,
  };
}
