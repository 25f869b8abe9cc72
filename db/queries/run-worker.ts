import "server-only";
import { db } from "@/db";
import type { Plan, Problem } from "@/lib/nesting";
import { bestFigures, planFigures, type PlanFigures, type RunFigures } from "@/lib/planning/plan-figures";
import type { RunSettings } from "@/lib/validations/runs";
import { planSteps } from "./at-the-machine";
import { planProfileTime } from "./profile-programs";
import type { RunStatus } from "./runs";

/** The nesting worker's side of a run: claiming it, its progress and heartbeat, its plan or failure. */

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
 * Stores a run's plan with the figures lists show (and `extra` ones: a true-shape run's comparison
 * with box nesting); `problem` is the one `worker` claimed. Nothing is written when another worker
 * holds the run now (this one was taken for dead).
 */
export async function finishRun(
  id: number,
  worker: string,
  problem: Problem,
  plan: Plan,
  extra: Pick<PlanFigures, "shapes"> = {},
): Promise<void> {
  const figures: PlanFigures = { ...planFigures(problem, plan), ...extra };
  // The cutting steps on the run's machine, for comparing plans by placements and time.
  try {
    const row = await db()("nesting_runs").where({ id }).first("machine_id", "settings");
    // Runs of the demo history kept no settings: planSteps then throws, and the catch below keeps the figures.
    const settings = row?.settings as RunSettings;
    const s = await planSteps({ machineId: row?.machine_id ?? null, problem, plan, settings });
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
  // Profile parts: their slab programs on the shop's profile cutter add to the cut time.
  try {
    const prof = await planProfileTime(id, { problem, plan });
    if (prof) {
      figures.profiles = { machine: prof.machine, slabs: prof.slabs, lengthMm: prof.lengthMm, minutes: prof.minutes };
      if (figures.steps) figures.steps.minutes += prof.minutes;
    }
  } catch {
    /* figures without the profile cuts: the plan page works them out */
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
