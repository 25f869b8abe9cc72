import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { BlocksInsert, BlocksRow } from "@/db/tables";
import { appendLedger } from "./ledger";
import { nextBlockCodes } from "./blocks";
import { HttpError } from "@/lib/errors";
import { receivedCodeProblem } from "@/lib/block-code";
import { HOLD_LABELS, OVER_DENSITY_FACTOR, addDays, densityHold, type HoldReason } from "@/lib/stock";
import type { DeliveryInput } from "@/lib/validations/stock";

export interface DeliverySummary {
  id: number;
  supplierId: number;
  supplier: string;
  receivedOn: string;
  poRef: string | null;
  lot: string;
  receivedBy: string | null;
  notes: string | null;
  blocks: number;
  volumeM3: number;
  cost: number;
}

export interface ReceiveResult {
  deliveryId: number;
  codes: string[];
  warnings: { index: number; message: string }[];
  /** Blocks put on hold on receipt (density outside their grade), with the reason. */
  held: { index: number; code: string; reason: HoldReason }[];
}

interface GradeFacts {
  id: number;
  code: string;
  cure_days: number;
  min_density_kg_m3: number | null;
}

/**
 * Receives one delivery of blocks in the caller's transaction: codes (given or generated), the
 * cut-not-before date from the grade's cure days, and a "received" ledger row per block.
 * A block weighed below its grade's minimum density, or above OVER_DENSITY_FACTOR × that minimum
 * (a wet core, a denser grade under the wrong label), is received on hold — not on hand, not free
 * to plan — with a "held" ledger row, until the buyer releases it.
 * Field errors name the block row: `blocks.3.code`.
 */
export async function receiveDelivery(
  trx: Knex.Transaction,
  input: DeliveryInput,
  actorId: string,
  ref?: string,
): Promise<ReceiveResult> {
  const supplier = await trx("suppliers").where({ id: input.supplierId }).first("id");
  if (!supplier)
    throw new HttpError(400, "Some fields need attention.", { supplierId: "That supplier does not exist." });

  const gradeIds = [...new Set(input.blocks.map((b) => b.gradeId))];
  const grades = new Map<number, GradeFacts>(
    (
      (await trx("grades")
        .whereIn("id", gradeIds)
        .select("id", "code", "cure_days", "min_density_kg_m3")) as GradeFacts[]
    ).map((g) => [g.id, g]),
  );
  const fields: Record<string, string> = {};
  input.blocks.forEach((b, i) => {
    if (!grades.has(b.gradeId)) fields[`blocks.${i}.gradeId`] = "That grade does not exist.";
  });

  const given = input.blocks.map((b) => b.code).filter((c): c is string => Boolean(c));
  const seen = new Map<string, number>();
  input.blocks.forEach((b, i) => {
    if (!b.code) return;
    // Every caller's codes, not only the form's: a "." would later clash with the block's offcuts.
    const problem = receivedCodeProblem(b.code);
    if (problem) fields[`blocks.${i}.code`] = problem;
    else if (seen.has(b.code)) fields[`blocks.${i}.code`] = `Code ${b.code} appears twice in this delivery.`;
    seen.set(b.code, i);
  });
  if (given.length) {
    const taken = (await trx("blocks").whereRaw("upper(code) = ANY(?)", [given]).pluck("code")) as string[];
    for (const code of taken)
      fields[`blocks.${seen.get(code.toUpperCase())}.code`] = `Code ${code} is already in stock.`;
  }
  if (Object.keys(fields).length) throw new HttpError(400, "Some blocks need attention.", fields);

  const [delivery] = await trx("deliveries")
    .insert({
      supplier_id: input.supplierId,
      received_on: input.receivedOn,
      po_ref: input.poRef ?? null,
      lot: input.lot,
      received_by: actorId,
      notes: input.notes ?? null,
    })
    .returning("id");
  if (!delivery) throw new Error("The delivery was not saved.");
  const generated = await nextBlockCodes(trx, input.blocks.filter((b) => !b.code).length);
  const warnings: ReceiveResult["warnings"] = [];
  const holds = new Map<number, { reason: HoldReason; note: string }>();
  const rows = input.blocks.map((b, i): BlocksInsert => {
    const grade = grades.get(b.gradeId)!;
    const nominal = b.nominalSize ?? b.size;
    const volume = (b.size[0] * b.size[1] * b.size[2]) / 1e9;
    const min = grade.min_density_kg_m3 === null ? null : Number(grade.min_density_kg_m3);
    const density = b.weightKg ? b.weightKg / volume : null;
    const hold = densityHold(density, min);
    if (hold) {
      const note =
        hold === "under_density"
          ? `Density ${density!.toFixed(1)} kg/m³ is below the ${grade.code} minimum of ${min} kg/m³.`
          : `Density ${density!.toFixed(1)} kg/m³ is more than ${OVER_DENSITY_FACTOR} × the ${grade.code} minimum of ${min} kg/m³: a wet core or another grade?`;
      holds.set(i, { reason: hold, note });
      warnings.push({ index: i, message: `${note} Put on hold (${HOLD_LABELS[hold]}) until the buyer releases it.` });
    }
    const held = holds.get(i);
    return {
      code: b.code ?? generated.shift()!,
      grade_id: b.gradeId,
      lot: input.lot,
      delivery_id: delivery.id,
      nominal_x: nominal[0],
      nominal_y: nominal[1],
      nominal_z: nominal[2],
      size_x: b.size[0],
      size_y: b.size[1],
      size_z: b.size[2],
      weight_kg: b.weightKg ?? null,
      cost: b.cost,
      location: b.location,
      moulded_on: b.mouldedOn ?? null,
      cut_not_before: addDays(b.mouldedOn ?? input.receivedOn, grade.cure_days),
      status: held ? "on_hold" : "in_stock",
      hold_reason: held?.reason ?? null,
      hold_note: held?.note ?? null,
      held_at: held ? trx.fn.now() : null,
      held_by: held ? actorId : null,
    };
  });
  const inserted: Pick<BlocksRow, "id" | "code" | "volume_m3" | "cost">[] = [];
  for (let i = 0; i < rows.length; i += 1000) {
    inserted.push(
      ...(await trx("blocks")
        .insert(rows.slice(i, i + 1000))
        .returning(["id", "code", "volume_m3", "cost"])),
    );
  }
  await appendLedger(
    trx,
    inserted.map((b) => ({
      blockId: b.id,
      kind: "received" as const,
      volumeM3: Number(b.volume_m3),
      value: Number(b.cost),
      userId: actorId,
      reason: `Delivery ${delivery.id}, lot ${input.lot}`,
      ref: ref ?? `delivery:${delivery.id}`,
    })),
  );
  const held: ReceiveResult["held"] = [];
  await appendLedger(
    trx,
    inserted.flatMap((b, i) => {
      const h = holds.get(i);
      if (!h) return [];
      held.push({ index: i, code: b.code, reason: h.reason });
      return [
        {
          blockId: b.id,
          kind: "held" as const,
          volumeM3: Number(b.volume_m3),
          value: Number(b.cost),
          userId: actorId,
          reason: `On hold on receipt: ${HOLD_LABELS[h.reason]} · ${h.note}`,
          ref: ref ?? `delivery:${delivery.id}`,
        },
      ];
    }),
  );
  if (held.length)
    await trx("audit_log").insert(
      held.map((h) => ({
        actor_id: actorId,
        action: "block.hold",
        subject: `block:${inserted[h.index]!.id}`,
        detail: { reason: h.reason, note: holds.get(h.index)!.note, onReceipt: true },
      })),
    );
  return { deliveryId: delivery.id, codes: inserted.map((b) => b.code), warnings, held };
}

export async function createDelivery(input: DeliveryInput, actorId: string): Promise<ReceiveResult> {
  return db().transaction((trx) => receiveDelivery(trx, input, actorId));
}

function deliveriesQuery() {
  const k = db();
  return k("deliveries as d")
    .join("suppliers as s", "s.id", "d.supplier_id")
    .leftJoin("users as u", "u.id", "d.received_by")
    .leftJoin("blocks as b", "b.delivery_id", "d.id")
    .groupBy("d.id", "s.name", "u.name")
    .select(
      "d.*",
      "s.name as supplier_name",
      "u.name as received_by_name",
      k.raw("count(b.id) AS n"),
      k.raw("coalesce(sum(b.volume_m3),0) AS v"),
      k.raw("coalesce(sum(b.cost),0) AS c"),
    );
}

type DeliveryRow = {
  id: number;
  supplier_id: number;
  supplier_name: string;
  received_on: string;
  po_ref: string | null;
  lot: string;
  received_by_name: string | null;
  notes: string | null;
  n: number;
  v: number;
  c: number;
};

const toDelivery = (r: DeliveryRow): DeliverySummary => ({
  id: r.id,
  supplierId: r.supplier_id,
  supplier: r.supplier_name,
  receivedOn: r.received_on, // DATE: its 'YYYY-MM-DD' text (db/types.ts)
  poRef: r.po_ref,
  lot: r.lot,
  receivedBy: r.received_by_name,
  notes: r.notes,
  blocks: Number(r.n),
  volumeM3: Number(r.v),
  cost: Number(r.c),
});

export async function listDeliveries(
  opts: { page?: number; pageSize?: number; supplierId?: number } = {},
): Promise<{ items: DeliverySummary[]; total: number }> {
  const pageSize = opts.pageSize ?? 50;
  const q = deliveriesQuery().orderBy([
    { column: "d.received_on", order: "desc" },
    { column: "d.id", order: "desc" },
  ]);
  const c = db()("deliveries");
  if (opts.supplierId) {
    q.where("d.supplier_id", opts.supplierId);
    c.where("supplier_id", opts.supplierId);
  }
  const [rows, count] = await Promise.all([
    q.limit(pageSize).offset(((opts.page ?? 1) - 1) * pageSize),
    c.count<{ n: number }[]>({ n: "*" }).first(),
  ]);
  return { items: (rows as DeliveryRow[]).map(toDelivery), total: Number(count?.n ?? 0) };
}

export async function getDelivery(id: number): Promise<DeliverySummary | undefined> {
  const r = await deliveriesQuery().where("d.id", id).first();
  return r ? toDelivery(r as DeliveryRow) : undefined;
}
