import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { BlocksInsert, DefectZonesRow } from "@/db/tables";
import { HttpError } from "@/lib/errors";
import type { Plan, Problem, Vec3 } from "@/lib/nesting";
import type { Box } from "@/lib/nesting/geometry";
import { blockProcedure } from "@/lib/planning/block-steps";
import { lossBreakdown } from "@/lib/planning/losses";
import {
  clipZone,
  countParts,
  cutState,
  partLine,
  rejectedSizes,
  shareValue,
  tallyRejects,
  volumeBasis,
} from "@/lib/planning/recording";
import { memberPieces, slabIndex } from "@/lib/planning/slabs";
import type { RecordCutInput, RunSettings } from "@/lib/validations/runs";
import { machineForRun } from "./at-the-machine";
import { appendLedger } from "./ledger";
import { offcutCodesOf, offcutSuffix } from "./offcut-codes";
import { owedParts } from "./owed";

/** How long a recording can be undone, minutes. Long enough to notice a wrong tap, short enough that nobody has used its offcuts. */
export const UNDO_MINUTES = 30;

export interface CutResult {
  offcutCodes: string[];
  /** Pieces of a part-cut block that went back to stock, with their codes. */
  remainderCodes: string[];
  losses: ReturnType<typeof lossBreakdown>;
  partial: boolean;
}

/**
 * Records a block at the machine, whole or part-cut (`input.partial`: only the steps checked off),
 * in one transaction:
 * - the block leaves stock (ledger "consumed");
 * - the parts that came off count as cut, less the rejects (from the form and from the steps);
 *   parts it did not give are owed again (`not_cut_count`);
 * - the offcuts that came off enter stock under the codes fixed at approval, and a part-cut
 *   block's uncut pieces return to stock with their true sizes, each with the block's lot, grade
 *   and the defect zones inside it, and a share of its value by volume;
 * - the loss breakdown is kept (block = parts + rejects + stock returned + trim + kerf + defects + unusable).
 */
export async function recordCut(
  runId: number,
  blockId: number,
  input: RecordCutInput,
  actorId: string,
): Promise<CutResult> {
  return db().transaction(async (trx) => {
    const run = await trx("nesting_runs").where({ id: runId }).forUpdate().first();
    if (!run) throw new HttpError(404, "That plan was not found.");
    if (run.status !== "approved") throw new HttpError(409, "Only an approved plan is cut.");
    const pb = await trx("plan_blocks").where({ run_id: runId, block_id: blockId }).forUpdate().first();
    if (!pb) throw new HttpError(404, "That block is not in this plan.");
    if (pb.status !== "reserved")
      throw new HttpError(
        409,
        pb.status === "cut" ? "That block is already marked cut." : "That block was released from this plan.",
      );
    const block = await trx("blocks").where({ id: blockId }).forUpdate().first();
    if (!block) throw new HttpError(404, "That block was not found.");
    const plan = run.plan as Plan;
    const problem = run.problem as Problem;
    const settings = run.settings as RunSettings;
    const planOffcuts = plan.offcuts.filter((o) => o.block === block.code);

    // What came off: everything, or what the steps checked off freed.
    let parts: { part: string; box: Box }[];
    let offcuts: { index: number; box: Box }[];
    let remainders: { piece: string; step: number; box: Box }[] = [];
    let cuts = plan.cuts[block.code] ?? [];
    const stepRows = (await trx("plan_block_steps").where({ run_id: runId, block_id: blockId })) as {
      step: number;
      rejects: { jobPartId: number; count: number; reason: string }[];
    }[];
    let countedSteps = new Set(stepRows.map((r) => r.step));
    if (input.partial) {
      const { machine } = await machineForRun({ machineId: run.machine_id ?? null, problem });
      const proc = blockProcedure(problem, plan, block.code, machine, settings.kerf);
      if (!proc?.ok) throw new HttpError(409, `${block.code} has no cutting steps on ${machine.name}.`);
      const state = cutState(proc, countedSteps);
      if (!state.counted.length)
        throw new HttpError(
          409,
          `No step of ${block.code} is checked off yet: check off the steps done, or finish the whole block.`,
        );
      if (!state.remainders.length)
        throw new HttpError(409, `Every step of ${block.code} is done: finish the whole block instead.`);
      ({ parts, offcuts, remainders, cuts } = state);
      countedSteps = new Set(state.counted);
    } else {
      parts = plan.placements
        .filter((p) => p.block === block.code)
        .map((p) => ({ part: p.part, box: { origin: p.origin, size: p.size } }));
      offcuts = planOffcuts.map((o, index) => ({ index, box: { origin: o.origin, size: o.size } }));
    }

    // Rejects: those of the steps counted, then the form's; never more than came off.
    // A slab (true-shape plan) counts as its members: each is good or rejected on its own.
    const slabs = slabIndex(plan);
    const placedAll = countParts(
      plan.placements.filter((x) => x.block === block.code).map((p) => p.part),
      slabs,
    );
    const cutCount = countParts(
      parts.map((p) => p.part),
      slabs,
    );
    const { rejects: rejectCount, fields } = tallyRejects(
      [
        ...stepRows
          .filter((r) => countedSteps.has(r.step))
          .flatMap((s) => s.rejects.map((reject, i) => ({ reject, field: `steps.${s.step}.rejects.${i}` }))),
        ...input.rejects.map((reject, i) => ({ reject, field: `rejects.${i}` })),
      ],
      cutCount,
      placedAll,
    );
    if (Object.keys(fields).length) throw new HttpError(400, "Some rejects need attention.", fields);

    const size: Vec3 = [Number(block.size_x), Number(block.size_y), Number(block.size_z)];
    const problemBlock = problem.blocks.find((b) => b.id === block.code);
    const trim = problemBlock?.trim ?? (block.parent_id ? 0 : settings.trim);
    const defects = await trx("defect_zones").where({ block_id: blockId }).whereNull("removed_at").orderBy("id");
    const zone = (d: DefectZonesRow, grow = 0) => ({
      min: [d.min_x - grow, d.min_y - grow, d.min_z - grow] as Vec3,
      max: [d.max_x + grow, d.max_y + grow, d.max_z + grow] as Vec3,
    });
    const returned = [...offcuts.map((o) => o.box), ...remainders.map((r) => r.box)];
    const losses = lossBreakdown({
      size,
      trim: input.partial ? 0 : trim, // a part-cut block's unmade trims stay on its remainders
      kerf: settings.kerf,
      cuts,
      blanks: parts.map((p) => p.box.size),
      rejected: rejectedSizes(
        memberPieces(parts, slabs, (k) => problem.parts.find((x) => x.id === k)?.size),
        rejectCount,
      ),
      offcuts: returned.map((b) => ({ origin: b.origin, size: b.size })),
      defects: defects.map((d) => zone(d, settings.defectMargin)),
    });

    // The block leaves stock.
    const blockValue = Number(block.cost);
    await trx("blocks").where({ id: blockId }).update({ status: "cut", updated_at: trx.fn.now() });
    await appendLedger(trx, [
      {
        blockId,
        kind: "consumed",
        volumeM3: Number(block.volume_m3),
        value: blockValue,
        userId: actorId,
        reason: `Cut to plan #${runId}${input.partial ? " (part-cut)" : ""}`,
        ref: `run:${runId}`,
      },
    ]);

    // Offcuts under their fixed codes, remainders under the next free numbers.
    const fixed = (await offcutCodesOf(runId, trx)).get(blockId) ?? [];
    let last = await lastOffcutNumber(trx, block.code, blockId);
    const offcutCodes = offcuts.map((o) => fixed[o.index] ?? `${block.code}.${++last}`);
    const remainderCodes = remainders.map(() => `${block.code}.${++last}`);
    const values = shareValue(
      blockValue,
      losses.block,
      returned.map((b) => b.size as Vec3),
    );
    const into = [
      ...offcuts.map((o, i) => ({
        box: o.box,
        code: offcutCodes[i]!,
        note: `Offcut of ${block.code}, plan #${runId}`,
      })),
      ...remainders.map((r, i) => ({
        box: r.box,
        code: remainderCodes[i]!,
        note: `Uncut piece ${r.piece} of ${block.code} (plan #${runId}, step ${r.step} not done)`,
      })),
    ];
    for (const [i, piece] of into.entries()) {
      const o = piece.box;
      const row: BlocksInsert = {
        code: piece.code,
        grade_id: block.grade_id,
        lot: block.lot,
        delivery_id: block.delivery_id,
        parent_id: blockId,
        origin_in_parent: trx.raw("?::numeric[]", [`{${o.origin.join(",")}}`]),
        nominal_x: o.size[0],
        nominal_y: o.size[1],
        nominal_z: o.size[2],
        size_x: o.size[0],
        size_y: o.size[1],
        size_z: o.size[2],
        weight_kg: null,
        cost: values[i]!,
        location: block.location,
        moulded_on: block.moulded_on,
        cut_not_before: block.cut_not_before,
        status: "in_stock",
        notes: piece.note,
        updated_at: trx.fn.now(),
      };
      // A code given back by an undone recording is taken up again by the same block.
      const undone = await trx("blocks")
        .where({ code: piece.code, parent_id: blockId, status: "written_off" })
        .first("id");
      const [child] = undone
        ? await trx("blocks").where({ id: undone.id }).update(row).returning(["id", "volume_m3"])
        : await trx("blocks").insert(row).returning(["id", "volume_m3"]);
      if (!child) throw new Error(`Offcut ${piece.code} was not saved.`);
      await appendLedger(trx, [
        {
          blockId: child.id,
          kind: "offcut_created",
          volumeM3: Number(child.volume_m3),
          value: values[i]!,
          userId: actorId,
          reason: i < offcuts.length ? `Offcut of ${block.code}` : `Uncut piece of ${block.code}`,
          ref: `run:${runId}`,
        },
      ]);
      const inherited = new Set(
        (
          (await trx("defect_zones").where({ block_id: child.id }).select("inherited_from")) as {
            inherited_from: number | null;
          }[]
        ).map((z) => z.inherited_from),
      );
      for (const d of defects) {
        const clipped = clipZone(zone(d), o);
        if (!clipped || inherited.has(d.id)) continue;
        await trx("defect_zones").insert({
          block_id: child.id,
          kind: d.kind,
          min_x: clipped.min[0],
          min_y: clipped.min[1],
          min_z: clipped.min[2],
          max_x: clipped.max[0],
          max_y: clipped.max[1],
          max_z: clipped.max[2],
          found_by: d.found_by,
          found_at: d.found_at,
          note: d.note,
          inherited_from: d.id,
        });
      }
    }

    // What was cut, part by part; yield counts the true volume where a profile exists.
    const partRows = await trx("job_parts")
      .whereIn("id", [...placedAll.keys()])
      .select("id", "size_x", "size_y", "size_z", "true_volume_mm3");
    let partVolume = 0;
    const bases: string[] = [];
    for (const p of partRows) {
      const line = partLine(
        { size: [p.size_x, p.size_y, p.size_z], trueVolumeMm3: p.true_volume_mm3 },
        {
          placed: placedAll.get(p.id) ?? 0,
          came: cutCount.get(p.id) ?? 0,
          rejected: rejectCount.get(p.id)?.count ?? 0,
        },
      );
      bases.push(line.basis);
      partVolume += line.volumeM3;
      await trx("cut_parts").insert({
        run_id: runId,
        block_id: blockId,
        job_part_id: p.id,
        good_count: line.good,
        rejected_count: line.rejected,
        not_cut_count: line.notCut,
        reject_reason: rejectCount.get(p.id)?.reasons.join("; ") ?? null,
        part_volume_m3: line.volumeM3,
        volume_basis: line.basis,
        recorded_by: actorId,
      });
    }
    await trx("plan_blocks")
      .where({ id: pb.id })
      .update({
        status: "cut",
        partial: !!input.partial,
        cut_at: trx.fn.now(),
        cut_by: actorId,
        block_volume_m3: losses.block,
        part_volume_m3: partVolume,
        offcut_volume_m3: losses.offcuts,
        loss_trim_m3: losses.trim,
        loss_kerf_m3: losses.kerf,
        loss_defect_m3: losses.defect,
        loss_unusable_m3: losses.unusable,
        loss_reject_m3: losses.rejects,
        volume_basis: volumeBasis(bases),
      });
    if (input.note)
      await trx("audit_log").insert({
        actor_id: actorId,
        action: "run.cut_note",
        subject: `block:${blockId}`,
        detail: { note: input.note },
      });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: input.partial ? "run.cut_partial" : "run.cut",
      subject: `block:${blockId}`,
      detail: { runId, offcutCodes, remainderCodes, steps: [...countedSteps] },
    });
    await settleRunAndJobs(trx, runId, run.job_ids as number[]);
    return { offcutCodes, remainderCodes, losses, partial: !!input.partial };
  });
}

/** The highest number `CODE.n` used by the block's offcuts: in stock, written off, or held by any plan. */
async function lastOffcutNumber(trx: Knex.Transaction, code: string, blockId: number): Promise<number> {
  const like = `${code.replace(/[\\%_]/g, (c) => `\\${c}`)}.%`;
  const used = [
    ...((await trx("blocks").where("code", "like", like).select("code")) as { code: string }[]),
    ...((await trx("plan_offcut_codes").where({ block_id: blockId }).select("code")) as { code: string }[]),
  ];
  return used.reduce((m, r) => Math.max(m, offcutSuffix(code, r.code) ?? 0), 0);
}

/** The plan closes when its last block is recorded (and opens again on an undo); a job is done when nothing is owed. */
async function settleRunAndJobs(trx: Knex.Transaction, runId: number, jobIds: number[]): Promise<void> {
  const open = await trx("plan_blocks")
    .where({ run_id: runId, status: "reserved" })
    .count<{ n: number }[]>({ n: "*" })
    .first();
  await trx("nesting_runs")
    .where({ id: runId })
    .whereIn("status", ["approved", "closed"])
    .update({ status: Number(open?.n) === 0 ? "closed" : "approved" });
  for (const jobId of jobIds) {
    const owed = (await owedParts(trx, [jobId])).reduce((s, p) => s + p.quantity, 0);
    const cut = await trx("cut_parts as c")
      .join("job_parts as p", "p.id", "c.job_part_id")
      .where("p.job_id", jobId)
      .sum<{ n: string | number | null }[]>({ n: "c.good_count" })
      .first();
    await trx("jobs")
      .where({ id: jobId })
      .whereNotIn("status", ["cancelled"])
      .update({ status: owed === 0 ? "done" : Number(cut?.n ?? 0) > 0 ? "cutting" : "planned" });
  }
}

/**
 * Undoes a recording within UNDO_MINUTES by reversing it, never by deleting: the block's "consumed"
 * and each offcut's "offcut_created" entries get "reversed" entries, the cut parts get rows with
 * the opposite counts, the offcuts are written off (their codes come back if the block is
 * recorded again), and the block is earmarked for the plan again. Refused once an offcut of it
 * has been earmarked or cut.
 */
export async function undoCut(
  runId: number,
  blockId: number,
  actorId: string,
  now = new Date(),
): Promise<{ restored: string; writtenOff: string[] }> {
  return db().transaction(async (trx) => {
    const run = await trx("nesting_runs").where({ id: runId }).forUpdate().first();
    if (!run) throw new HttpError(404, "That plan was not found.");
    const pb = await trx("plan_blocks").where({ run_id: runId, block_id: blockId }).forUpdate().first();
    if (!pb) throw new HttpError(404, "That block is not in this plan.");
    const block = await trx("blocks").where({ id: blockId }).forUpdate().first();
    if (!block) throw new HttpError(404, "That block was not found.");
    if (pb.status !== "cut") throw new HttpError(409, `${block.code} is not recorded as cut in this plan.`);
    const age = (now.getTime() - (pb.cut_at?.getTime() ?? 0)) / 60_000;
    if (age > UNDO_MINUTES)
      throw new HttpError(
        409,
        `${block.code} was recorded ${Math.floor(age)} minutes ago; a recording can be undone for ${UNDO_MINUTES} minutes. Ask the buyer to adjust stock instead.`,
      );
    // The pieces this recording put into stock: the block's children that this run's recording
    // entered (ledger), not written off by an earlier undo; reversed at their stock value.
    const made = (await trx("blocks as b")
      .where({ "b.parent_id": blockId })
      .where("b.status", "<>", "written_off")
      .whereExists(function () {
        this.select(trx.raw("1"))
          .from("stock_ledger as l")
          .whereRaw("l.block_id = b.id")
          .where({ "l.ref": `run:${runId}`, "l.kind": "offcut_created" });
      })
      .forUpdate()
      .select("b.id", "b.code", "b.status", "b.volume_m3", "b.cost as value")) as {
      id: number;
      code: string;
      status: string;
      volume_m3: number;
      value: number;
    }[];
    const busy = made.filter((m) => m.status !== "in_stock");
    if (busy.length)
      throw new HttpError(
        409,
        busy.every((b) => b.status === "on_hold")
          ? `${busy.map((b) => b.code).join(", ")} ${busy.length === 1 ? "is" : "are"} on hold: release ${busy.length === 1 ? "it" : "them"} first to undo the recording of ${block.code}.`
          : `${busy.map((b) => b.code).join(", ")} ${busy.length === 1 ? "is" : "are"} already ${busy[0]!.status === "earmarked" ? "earmarked for another plan" : "used"}: the recording of ${block.code} can no longer be undone.`,
      );
    const reason = `Recording of ${block.code} in plan #${runId} undone`;
    for (const m of made) {
      await trx("blocks")
        .where({ id: m.id })
        .update({ status: "written_off", notes: `${reason}; code kept for this block`, updated_at: trx.fn.now() });
    }
    await appendLedger(trx, [
      ...made.map((m) => ({
        blockId: m.id,
        kind: "reversed" as const,
        volumeM3: -Number(m.volume_m3),
        value: -Number(m.value),
        userId: actorId,
        reason,
        ref: `run:${runId}`,
      })),
      {
        blockId,
        kind: "reversed" as const,
        volumeM3: Number(block.volume_m3),
        value: Number(block.cost),
        userId: actorId,
        reason,
        ref: `run:${runId}`,
      },
    ]);
    await trx("blocks").where({ id: blockId }).update({ status: "earmarked", updated_at: trx.fn.now() });
    // Opposite rows for what was recorded (sums over cut_parts come back to where they were).
    const sums = (await trx("cut_parts")
      .where({ run_id: runId, block_id: blockId })
      .groupBy("job_part_id", "volume_basis")
      .select(
        "job_part_id",
        "volume_basis",
        trx.raw("sum(good_count)::int AS good"),
        trx.raw("sum(rejected_count)::int AS rejected"),
        trx.raw("sum(not_cut_count)::int AS not_cut"),
        trx.raw("sum(part_volume_m3) AS volume"),
      )) as {
      job_part_id: number;
      volume_basis: string;
      good: number;
      rejected: number;
      not_cut: number;
      volume: number;
    }[];
    const live = sums.filter((s) => s.good || s.rejected || s.not_cut);
    if (live.length)
      await trx("cut_parts").insert(
        live.map((s) => ({
          run_id: runId,
          block_id: blockId,
          job_part_id: s.job_part_id,
          good_count: -s.good,
          rejected_count: -s.rejected,
          not_cut_count: -s.not_cut,
          reject_reason: "recording undone",
          part_volume_m3: -Number(s.volume),
          volume_basis: s.volume_basis,
          recorded_by: actorId,
        })),
      );
    await trx("plan_blocks")
      .where({ id: pb.id })
      .update({
        status: "reserved",
        partial: false,
        cut_at: null,
        cut_by: null,
        block_volume_m3: null,
        part_volume_m3: null,
        offcut_volume_m3: null,
        loss_trim_m3: null,
        loss_kerf_m3: null,
        loss_defect_m3: null,
        loss_unusable_m3: null,
        loss_reject_m3: null,
        volume_basis: null,
        undone_count: trx.raw("undone_count + 1"),
      });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "run.cut_undone",
      subject: `block:${blockId}`,
      detail: { runId, writtenOff: made.map((m) => m.code) },
    });
    await settleRunAndJobs(trx, runId, run.job_ids as number[]);
    return { restored: block.code, writtenOff: made.map((m) => m.code) };
  });
}
