import "server-only";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";
import type { Plan } from "@/lib/nesting";
import { anyBlockCutter, blockProcedure } from "@/lib/planning/block-steps";
import type { Machine } from "@/lib/planning/machine";
import type { Procedure } from "@/lib/planning/procedure";
import { cutTime, type CutTime } from "@/lib/planning/wire-path";
import { countByPart, slabIndex, type SlabIndex } from "@/lib/planning/slabs";
import { stuckPieces } from "@/lib/planning/cut-regions";
import { getMachine, kerfAndFeed, listMachines, type StoredMachine } from "./machines";
import { offcutCodesOf } from "./offcut-codes";
import type { RunDetail } from "./runs";
import { getShopSettings } from "./settings";

/**
 * The machine a plan's steps are made for: the one it was planned for, else the shop's first
 * active block cutter, else a cutter large enough for every block (`chosen` says which).
 */
export async function machineForRun(
  run: Pick<RunDetail, "machineId" | "problem">,
): Promise<{ machine: Machine & { id?: number; grades?: StoredMachine["grades"] }; chosen: "plan" | "shop" | "any" }> {
  if (run.machineId) {
    const m = await getMachine(run.machineId);
    if (m) return { machine: m, chosen: "plan" };
  }
  const first = (await listMachines({ activeOnly: true })).find((m) => m.kind === "block");
  if (first) return { machine: first, chosen: "shop" };
  return { machine: anyBlockCutter(run.problem.blocks.map((b) => b.size)), chosen: "any" };
}

/** Feed of a block's grade on a machine: calibrated, else the shop's default. */
async function feedFor(machine: { grades?: StoredMachine["grades"] }, gradeCode: string | undefined): Promise<number> {
  const settings = await getShopSettings();
  if (!gradeCode || !machine.grades?.length) return settings.feedMmPerMin;
  const g = (await db()("grades").where({ code: gradeCode }).first("id")) as { id: number } | undefined;
  return kerfAndFeed({ grades: machine.grades }, g ? [g.id] : [], { kerf: settings.kerf, feed: settings.feedMmPerMin })
    .feedByGrade.values()
    .next().value!;
}

export interface BlockSteps {
  blockId: number;
  code: string;
  grade: string | null;
  status: "reserved" | "cut" | "released" | null;
  machine: Machine & { id?: number };
  chosen: "plan" | "shop" | "any";
  procedure: Procedure;
  feed: number;
  time: CutTime | null;
  /** Offcut codes by the offcut's index in this block (fixed at approval; empty before). */
  offcutCodes: string[];
  /** The slabs of a true-shape plan in this block: slab key → its members' part keys (empty otherwise). */
  slabs: SlabIndex;
  done: {
    step: number;
    by: string | null;
    at: string;
    rejects: { jobPartId: number; count: number; reason: string }[];
  }[];
}

/** One block of a plan as the cutter works through it: the procedure, the steps checked off, the offcut codes. */
export async function blockSteps(run: RunDetail, blockId: number): Promise<BlockSteps> {
  const b = run.blocks.find((x) => x.id === blockId);
  if (!b || !run.plan) throw new HttpError(404, "That block is not in this plan.");
  const pb = run.problem.blocks.find((x) => x.id === b.code);
  if (!pb) throw new HttpError(404, "That block is not in this plan.");
  const { machine, chosen } = await machineForRun(run);
  const proc = blockProcedure(run.problem, run.plan as Plan, b.code, machine, run.settings.kerf)!;
  const feed = await feedFor(machine, pb.grade);
  const done = (await db()("plan_block_steps as s")
    .leftJoin("users as u", "u.id", "s.done_by")
    .where({ "s.run_id": run.id, "s.block_id": blockId })
    .orderBy("s.step")
    .select("s.step", "u.name as by", "s.done_at as at", "s.rejects")) as {
    step: number;
    by: string | null;
    at: Date;
    rejects: { jobPartId: number; count: number; reason: string }[];
  }[];
  return {
    blockId,
    code: b.code,
    grade: pb.grade ?? null,
    status: b.planStatus,
    machine,
    chosen,
    procedure: proc,
    feed,
    time: proc.ok ? cutTime(proc, machine, feed, run.settings.kerf) : null,
    offcutCodes: (await offcutCodesOf(run.id)).get(blockId) ?? [],
    slabs: slabIndex({ placements: (run.plan as Plan).placements.filter((p) => p.block === b.code) }),
    done: done.map((d) => ({ step: d.step, by: d.by, at: d.at.toISOString(), rejects: d.rejects })),
  };
}

/**
 * Checks a step off (or on again) at the machine. Only while the plan is approved and the block
 * is still to be cut; the step must exist in the block's procedure.
 */
export async function setStepDone(
  run: RunDetail,
  blockId: number,
  step: number,
  done: boolean,
  actorId: string,
  rejects: { jobPartId: number; count: number; reason: string }[] = [],
  requestId?: string,
): Promise<void> {
  if (run.status !== "approved") throw new HttpError(409, "Only the steps of an approved plan are checked off.");
  const steps = await blockSteps(run, blockId);
  if (steps.status !== "reserved")
    throw new HttpError(
      409,
      steps.status === "cut"
        ? `${steps.code} is already recorded as cut.`
        : `${steps.code} was released from this plan.`,
    );
  const count = steps.procedure.ok ? steps.procedure.steps.length : 0;
  if (step > count)
    throw new HttpError(404, `${steps.code} has ${count} step${count === 1 ? "" : "s"}; there is no step ${step}.`);
  // Rejects belong to the step where the part came off: only parts this step frees, at most as many.
  const st = steps.procedure.ok ? steps.procedure.steps[step - 1]! : undefined;
  // A slab (true-shape plan) comes off whole: its members are the parts it frees.
  const freed = countByPart(
    (st?.next ?? []).flatMap((n) => (n.what.kind === "part" ? [n.what.part] : [])),
    slabIndex(run.plan),
  );
  await db().transaction(async (trx) => {
    // One check at a time per block (a double tap, two tablets, a recording): the stored rejects count.
    const pb = await trx("plan_blocks").where({ run_id: run.id, block_id: blockId }).forUpdate().first("status");
    if (pb?.status !== "reserved")
      throw new HttpError(
        409,
        pb?.status === "cut"
          ? `${steps.code} is already recorded as cut.`
          : `${steps.code} was released from this plan.`,
      );
    const stored = done
      ? ((await trx("plan_block_steps")
          .where({ run_id: run.id, block_id: blockId, step })
          .first("rejects", "request_ids")) as
          | { rejects: { jobPartId: number; count: number }[]; request_ids: string[] }
          | undefined)
      : undefined;
    // The same check sent again (its answer was lost on the way back): already stored, nothing to add.
    if (requestId && stored?.request_ids.includes(requestId)) return;
    const fields: Record<string, string> = {};
    const kept = new Map<number, number>();
    for (const r of stored?.rejects ?? []) kept.set(r.jobPartId, (kept.get(r.jobPartId) ?? 0) + r.count);
    const sum = new Map(kept);
    rejects.forEach((r, i) => {
      sum.set(r.jobPartId, (sum.get(r.jobPartId) ?? 0) + r.count);
      const n = freed.get(r.jobPartId) ?? 0;
      const already = kept.get(r.jobPartId) ?? 0;
      if (!n) fields[`rejects.${i}.jobPartId`] = `That part does not come off in step ${step}.`;
      else if (sum.get(r.jobPartId)! > n)
        fields[`rejects.${i}.count`] = already
          ? `Only ${n} of that part come off in step ${step}, and ${already} ${already === 1 ? "is" : "are"} already recorded as rejected there.`
          : `Only ${n} of that part come off in step ${step}.`;
    });
    if (Object.keys(fields).length) throw new HttpError(400, "Some rejects need attention.", fields);
    if (done) {
      const insert = trx("plan_block_steps")
        .insert({
          run_id: run.id,
          block_id: blockId,
          step,
          done_by: actorId,
          rejects: JSON.stringify(rejects),
          request_ids: requestId ? [requestId] : [],
        })
        .onConflict(["run_id", "block_id", "step"]);
      // Checked again: the first check stands; rejects sent with it are added to the step's (once
      // per request id).
      await (rejects.length
        ? insert.merge({
            rejects: trx.raw("plan_block_steps.rejects || excluded.rejects"),
            request_ids: trx.raw("plan_block_steps.request_ids || excluded.request_ids"),
          })
        : insert.ignore());
    } else await trx("plan_block_steps").where({ run_id: run.id, block_id: blockId, step }).delete();
  });
}

/** Past this many pieces in one block, steps and wire paths are not worked out on page loads (seconds each). */
export const STEPS_PIECE_LIMIT = 400;

export interface BlockPlanSteps {
  code: string;
  pieces: number;
  /** Undefined past STEPS_PIECE_LIMIT pieces. */
  procedure?: Procedure;
  time?: CutTime;
}

/**
 * Every used block of a plan on the plan's machine: its procedure and cut time (feed of its grade
 * on that machine, rapids, heat-up and handling per placement), for the plan page and approval.
 */
export async function planSteps(
  run: Pick<RunDetail, "machineId" | "problem" | "plan" | "settings">,
): Promise<{ machine: Machine; chosen: "plan" | "shop" | "any"; blocks: BlockPlanSteps[] }> {
  const { machine, chosen } = await machineForRun(run);
  const plan = run.plan;
  if (!plan) return { machine, chosen, blocks: [] };
  const codes = [...new Set(plan.placements.map((p) => p.block))];
  const blocks: BlockPlanSteps[] = [];
  for (const code of codes) {
    const pieces =
      plan.placements.filter((p) => p.block === code).length + plan.offcuts.filter((o) => o.block === code).length;
    // Past the limit, or with pieces no through cut frees (free layout, said elsewhere): no steps.
    if (pieces > STEPS_PIECE_LIMIT || stuckPieces(plan, code, run.settings.kerf) > 0) {
      blocks.push({ code, pieces });
      continue;
    }
    const proc = blockProcedure(run.problem, plan, code, machine, run.settings.kerf)!;
    const feed = await feedFor(machine, run.problem.blocks.find((b) => b.id === code)?.grade);
    blocks.push({
      code,
      pieces,
      procedure: proc,
      time: proc.ok ? cutTime(proc, machine, feed, run.settings.kerf) : undefined,
    });
  }
  return { machine, chosen, blocks };
}

/** "HF-1001, piece B (2440 × 1220 × 50 mm): the wire spans 1300 mm" for each block the machine cannot cut. */
export function stepProblems(blocks: readonly BlockPlanSteps[]): string[] {
  return blocks.flatMap((b) =>
    b.procedure && !b.procedure.ok
      ? b.procedure.problems.map(
          (p) =>
            `${b.code}, piece ${p.piece} (${p.size.map((v) => Math.round(v * 10) / 10).join(" × ")} mm): ${p.limit}`,
        )
      : [],
  );
}
