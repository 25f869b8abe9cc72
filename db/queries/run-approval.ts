import "server-only";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";
import type { Plan, Problem } from "@/lib/nesting";
import { placedByPart } from "@/lib/planning/slabs";
import { blocksInPlan, stuckBlocks } from "@/lib/planning/plan-figures";
import { runSettingsSchema, type RunSettings } from "@/lib/validations/runs";
import { leftOutLine } from "@/lib/planning/usable";
import { appendLedger } from "./ledger";
import { allocateOffcutCodes } from "./offcut-codes";
import { owedByRun, owedParts } from "./owed";
import { planSteps, stepProblems } from "./at-the-machine";
import { getShopSettings } from "./settings";
import { candidateStock, createRun, heldByApprovedPlans, plansNamed } from "./run-plan";

/** A planner's decisions on a run: stopping it, approving its plan (reserving the stock), releasing it, planning again. */

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
      // A slab (true-shape plan) reserves its members: each counts against what its part still owes.
      const placed = placedByPart(plan.placements);
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
        blocks.map((b) => ({
          blockId: b.id,
          kind: "reserved" as const,
          volumeM3: Number(b.volume_m3),
          value: b.cost,
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

/**
 * Releases an approved plan's blocks that are not cut yet; the plan is then cancelled. Refused
 * while a block has steps checked off at the machine (it is no longer whole).
 */
export async function releaseRun(id: number, actorId: string): Promise<void> {
  await db().transaction(async (trx) => {
    const run = await trx("nesting_runs").where({ id }).forUpdate().first();
    if (!run) throw new HttpError(404, "That plan was not found.");
    if (run.status !== "approved") throw new HttpError(409, "Only an approved plan can be released.");
    const held = await trx("plan_blocks as pb")
      .join("blocks as b", "b.id", "pb.block_id")
      .where({ "pb.run_id": id, "pb.status": "reserved" })
      .select("b.id", "b.code", "b.volume_m3", "b.cost");
    // A block with steps checked off is already in pieces: back in stock whole, the register would lie.
    const started = (await trx("plan_block_steps")
      .whereIn(
        "block_id",
        held.map((b: { id: number }) => b.id),
      )
      .where({ run_id: id })
      .groupBy("block_id")
      .select("block_id", trx.raw("count(*)::int AS n"))) as { block_id: number; n: number }[];
    if (started.length) {
      const code = new Map(held.map((b: { id: number; code: string }) => [b.id, b.code]));
      const named = started.map((s) => `${code.get(s.block_id)} (${s.n} step${s.n === 1 ? "" : "s"} done)`);
      throw new HttpError(
        409,
        `Cutting has started on ${named.join(", ")}: record ${started.length === 1 ? "it" : "them"} part-cut at the machine (or uncheck the steps that were not cut) before releasing this plan. Nothing was released.`,
      );
    }
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
