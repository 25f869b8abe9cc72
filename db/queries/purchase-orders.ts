import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { receiveDelivery, type ReceiveResult } from "./deliveries";
import { listReorder } from "./reorder";
import { HttpError, notFound } from "@/lib/errors";
import {
  poActionRefusal,
  type PoAction,
  type PoLine,
  type PoStatus,
  type PurchaseOrder,
} from "@/lib/purchasing/orders";
import { priceFor, type PriceUnit } from "@/lib/purchasing/pricing";
import { receivingCheck } from "@/lib/purchasing/reorder";
import { addDays, isoDate } from "@/lib/stock";
import type { PurchaseOrderInput, ReceivePoInput } from "@/lib/validations/purchasing";
import type { DeliveryInput } from "@/lib/validations/stock";
import type { Vec3 } from "@/lib/nesting";

type Db = Knex | Knex.Transaction;

interface PoRow {
  id: number;
  number: string;
  supplier_id: number;
  supplier_name: string;
  supplier_email: string | null;
  status: PoStatus;
  expected_on: string | null;
  notes: string | null;
  created_by_name: string | null;
  created_at: Date;
  sent_at: Date | null;
  closed_at: Date | null;
  cancel_reason: string | null;
}
interface LineRow {
  id: number;
  purchase_order_id: number;
  grade_id: number;
  grade_code: string;
  grade_system: string;
  grade: string;
  size_x: number;
  size_y: number;
  size_z: number;
  quantity: number;
  price: number;
  price_unit: PriceUnit;
  volume_m3: number;
  note: string | null;
  got_blocks: string | null;
  got_m3: number | null;
  over: boolean | null;
}

function toOrder(r: PoRow, lines: LineRow[]): PurchaseOrder {
  const ls: PoLine[] = lines.map((l) => {
    const volume = Number(l.volume_m3);
    return {
      id: l.id,
      gradeId: l.grade_id,
      gradeCode: l.grade_code,
      gradeLabel: `${l.grade_system} ${l.grade}`,
      size: [Number(l.size_x), Number(l.size_y), Number(l.size_z)],
      quantity: l.quantity,
      price: Number(l.price),
      priceUnit: l.price_unit,
      volumeM3: volume,
      value: priceFor(volume, Number(l.price), l.price_unit),
      note: l.note,
      receivedBlocks: Number(l.got_blocks ?? 0),
      receivedM3: Number(l.got_m3 ?? 0),
      overTolerance: Boolean(l.over),
    };
  });
  return {
    id: r.id,
    number: r.number,
    supplierId: r.supplier_id,
    supplier: r.supplier_name,
    supplierEmail: r.supplier_email,
    status: r.status,
    expectedOn: r.expected_on, // DATE: its 'YYYY-MM-DD' text (db/types.ts)
    notes: r.notes,
    createdBy: r.created_by_name,
    createdAt: r.created_at.toISOString(),
    sentAt: r.sent_at?.toISOString() ?? null,
    closedAt: r.closed_at?.toISOString() ?? null,
    cancelReason: r.cancel_reason,
    lines: ls,
    volumeM3: ls.reduce((s, l) => s + l.volumeM3, 0),
    value: Math.round(ls.reduce((s, l) => s + l.value, 0) * 100) / 100,
    receivedM3: ls.reduce((s, l) => s + l.receivedM3, 0),
  };
}

function ordersQuery(k: Db) {
  return k("purchase_orders as p")
    .join("suppliers as s", "s.id", "p.supplier_id")
    .leftJoin("users as u", "u.id", "p.created_by")
    .select("p.*", "s.name as supplier_name", "s.email as supplier_email", "u.name as created_by_name");
}

async function linesFor(k: Db, ids: number[]): Promise<LineRow[]> {
  if (!ids.length) return [];
  return (await k("purchase_order_lines as l")
    .join("grades as g", "g.id", "l.grade_id")
    .leftJoin(
      k("purchase_order_receipts")
        .groupBy("line_id")
        .select(
          "line_id",
          k.raw("sum(blocks) AS got_blocks"),
          k.raw("sum(volume_m3) AS got_m3"),
          k.raw("bool_or(over_tolerance) AS over"),
        )
        .as("r"),
      "r.line_id",
      "l.id",
    )
    .whereIn("l.purchase_order_id", ids)
    .orderBy("l.id")
    .select(
      "l.*",
      "g.code as grade_code",
      "g.grade_system",
      "g.grade",
      "r.got_blocks",
      "r.got_m3",
      "r.over",
    )) as LineRow[];
}

export async function listPurchaseOrders(
  opts: { status?: PoStatus | "open"; page?: number; pageSize?: number } = {},
): Promise<{ items: PurchaseOrder[]; total: number }> {
  const k = db();
  const pageSize = opts.pageSize ?? 50;
  const filter = (q: Knex.QueryBuilder) => {
    if (opts.status === "open") q.whereIn("p.status", ["draft", "sent", "part_received"]);
    else if (opts.status) q.where("p.status", opts.status);
    return q;
  };
  const [rows, count] = await Promise.all([
    filter(ordersQuery(k))
      .orderBy([
        { column: "p.created_at", order: "desc" },
        { column: "p.id", order: "desc" },
      ])
      .limit(pageSize)
      .offset(((opts.page ?? 1) - 1) * pageSize),
    filter(k("purchase_orders as p")).count<{ n: number }[]>({ n: "*" }).first(),
  ]);
  const lines = await linesFor(
    k,
    (rows as PoRow[]).map((r) => r.id),
  );
  return {
    items: (rows as PoRow[]).map((r) =>
      toOrder(
        r,
        lines.filter((l) => l.purchase_order_id === r.id),
      ),
    ),
    total: Number(count?.n ?? 0),
  };
}

export async function getPurchaseOrder(id: number, k: Db = db()): Promise<PurchaseOrder | undefined> {
  const r = (await ordersQuery(k).where("p.id", id).first()) as PoRow | undefined;
  return r ? toOrder(r, await linesFor(k, [id])) : undefined;
}

/** Open orders at a glance, for the buyer's home page. */
export async function countOpenOrders(): Promise<{
  draft: number;
  sent: number;
  partReceived: number;
  overdue: number;
}> {
  const rows = (await db()("purchase_orders")
    .whereIn("status", ["draft", "sent", "part_received"])
    .groupBy("status")
    .select(
      "status",
      db().raw("count(*) AS n"),
      db().raw("count(*) FILTER (WHERE expected_on < current_date) AS late"),
    )) as { status: PoStatus; n: string; late: string }[];
  const get = (s: PoStatus) => rows.find((r) => r.status === s);
  return {
    draft: Number(get("draft")?.n ?? 0),
    sent: Number(get("sent")?.n ?? 0),
    partReceived: Number(get("part_received")?.n ?? 0),
    overdue: rows.filter((r) => r.status !== "draft").reduce((s, r) => s + Number(r.late), 0),
  };
}

async function lockOrder(
  trx: Knex.Transaction,
  id: number,
  action: PoAction,
): Promise<{ id: number; status: PoStatus; supplier_id: number; number: string }> {
  const po = await trx("purchase_orders").where({ id }).forUpdate().first("id", "status", "supplier_id", "number");
  if (!po) throw notFound("That purchase order");
  const refusal = poActionRefusal(po.status, action);
  if (refusal) throw new HttpError(409, refusal);
  return po;
}

async function checkRefs(trx: Knex.Transaction, input: PurchaseOrderInput): Promise<Map<number, PriceUnit>> {
  const fields: Record<string, string> = {};
  const supplier = await trx("suppliers").where({ id: input.supplierId }).first("id", "active");
  if (!supplier) fields.supplierId = "That supplier does not exist.";
  const grades = new Map<number, PriceUnit>(
    (
      (await trx("grades")
        .whereIn("id", [...new Set(input.lines.map((l) => l.gradeId))])
        .select("id", "price_unit")) as { id: number; price_unit: PriceUnit }[]
    ).map((g) => [g.id, g.price_unit]),
  );
  input.lines.forEach((l, i) => {
    if (!grades.has(l.gradeId)) fields[`lines.${i}.gradeId`] = "That grade does not exist.";
  });
  if (Object.keys(fields).length) throw new HttpError(400, "Some fields need attention.", fields);
  return grades;
}

function lineRows(poId: number, input: PurchaseOrderInput, units: Map<number, PriceUnit>) {
  return input.lines.map((l) => ({
    purchase_order_id: poId,
    grade_id: l.gradeId,
    size_x: l.size[0],
    size_y: l.size[1],
    size_z: l.size[2],
    quantity: l.quantity,
    price: l.price,
    price_unit: units.get(l.gradeId)!,
    note: l.note ?? null,
  }));
}

async function insertOrder(
  trx: Knex.Transaction,
  input: PurchaseOrderInput,
  actorId: string,
  how: string,
): Promise<number> {
  const units = await checkRefs(trx, input);
  const { rows } = await trx.raw("SELECT nextval('purchase_order_seq') AS n");
  const number = `PO-${isoDate().slice(0, 4)}-${String(rows[0].n).padStart(4, "0")}`;
  const [po] = await trx("purchase_orders")
    .insert({
      number,
      supplier_id: input.supplierId,
      status: "draft",
      expected_on: input.expectedOn ?? null,
      notes: input.notes ?? null,
      created_by: actorId,
    })
    .returning("id");
  await trx("purchase_order_lines").insert(lineRows(po!.id, input, units));
  await trx("audit_log").insert({
    actor_id: actorId,
    action: "po.create",
    subject: `po:${po!.id}`,
    detail: { number, how, ...input },
  });
  return po!.id;
}

/** A draft order written by hand. */
export async function createPurchaseOrder(input: PurchaseOrderInput, actorId: string): Promise<PurchaseOrder> {
  const id = await db().transaction((trx) => insertOrder(trx, input, actorId, "by hand"));
  return (await getPurchaseOrder(id))!;
}

/** Replaces a draft's supplier, date, notes and lines. */
export async function updatePurchaseOrder(
  id: number,
  input: PurchaseOrderInput,
  actorId: string,
): Promise<PurchaseOrder> {
  await db().transaction(async (trx) => {
    await lockOrder(trx, id, "edit");
    const units = await checkRefs(trx, input);
    await trx("purchase_orders")
      .where({ id })
      .update({ supplier_id: input.supplierId, expected_on: input.expectedOn ?? null, notes: input.notes ?? null });
    await trx("purchase_order_lines").where({ purchase_order_id: id }).delete();
    await trx("purchase_order_lines").insert(lineRows(id, input, units));
    await trx("audit_log").insert({ actor_id: actorId, action: "po.update", subject: `po:${id}`, detail: input });
  });
  return (await getPurchaseOrder(id))!;
}

/**
 * Drafts from the reorder list: one order per supplier, a line per grade of the suggested number
 * of blocks at the usual block size and the last price paid. Grades without a supplier or a
 * known block size are refused by name.
 */
export async function draftFromReorder(
  gradeIds: number[],
  expectedOn: string | null | undefined,
  actorId: string,
): Promise<PurchaseOrder[]> {
  const rows = await listReorder({ gradeIds });
  const fields: Record<string, string> = {};
  gradeIds.forEach((g, i) => {
    const r = rows.find((x) => x.gradeId === g);
    if (!r) fields[`gradeIds.${i}`] = "That grade does not exist or is no longer used.";
    else if (!r.supplier)
      fields[`gradeIds.${i}`] = `${r.gradeCode} has no usual supplier: choose one in its reorder settings.`;
    else if (!r.blockSize)
      fields[`gradeIds.${i}`] =
        `${r.gradeCode} has never been delivered, so its block size is unknown: write the order by hand.`;
  });
  if (Object.keys(fields).length) throw new HttpError(400, "Some grades cannot be drafted.", fields);
  const bySupplier = new Map<number, typeof rows>();
  for (const r of rows) bySupplier.set(r.supplier!.id, [...(bySupplier.get(r.supplier!.id) ?? []), r]);
  const ids = await db().transaction(async (trx) => {
    const out: number[] = [];
    for (const [supplierId, grades] of bySupplier) {
      const input: PurchaseOrderInput = {
        supplierId,
        // Unless the buyer says, expect it after the longest lead time among its grades.
        expectedOn: expectedOn ?? addDays(isoDate(), Math.max(...grades.map((r) => r.leadTimeDays.value))),
        notes: "Drafted from the reorder list.",
        lines: grades.map((r) => ({
          gradeId: r.gradeId,
          size: r.blockSize!,
          quantity: Math.max(1, r.result.suggestedBlocks ?? 1),
          price: r.lastPrice ?? 0,
          note: `Reorder point ${r.result.reorderPoint.toFixed(2)} m³, position ${r.result.position.toFixed(2)} m³, EOQ ${r.result.eoq.toFixed(2)} m³`,
        })),
      };
      out.push(await insertOrder(trx, input, actorId, "from reorder list"));
    }
    return out;
  });
  return Promise.all(ids.map(async (id) => (await getPurchaseOrder(id))!));
}

/** Marks an order sent (the caller e-mails it first, when asked to). */
export async function markSent(id: number, actorId: string, how: "email" | "other"): Promise<void> {
  await db().transaction(async (trx) => {
    const po = await lockOrder(trx, id, "send");
    if (po.status === "draft")
      await trx("purchase_orders").where({ id }).update({ status: "sent", sent_at: trx.fn.now() });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "po.send",
      subject: `po:${id}`,
      detail: { how, from: po.status },
    });
  });
}

/** Checks an order may be sent, before any e-mail goes out. */
export async function assertCanSend(id: number): Promise<PurchaseOrder> {
  const po = await getPurchaseOrder(id);
  if (!po) throw notFound("That purchase order");
  const refusal = poActionRefusal(po.status, "send");
  if (refusal) throw new HttpError(409, refusal);
  return po;
}

export async function cancelPurchaseOrder(id: number, reason: string, actorId: string): Promise<void> {
  await db().transaction(async (trx) => {
    const po = await lockOrder(trx, id, "cancel");
    await trx("purchase_orders")
      .where({ id })
      .update({ status: "cancelled", cancel_reason: reason, closed_at: trx.fn.now() });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "po.cancel",
      subject: `po:${id}`,
      detail: { reason, from: po.status },
    });
  });
}

export async function closePurchaseOrder(id: number, reason: string, actorId: string): Promise<void> {
  await db().transaction(async (trx) => {
    await lockOrder(trx, id, "close");
    await trx("purchase_orders").where({ id }).update({ status: "closed", closed_at: trx.fn.now() });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "po.close",
      subject: `po:${id}`,
      detail: { reason, short: true },
    });
  });
}

export interface PoReceiveResult {
  deliveryId: number;
  codes: string[];
  warnings: { index: number; message: string }[];
  /** Blocks put on hold on receipt (density outside their grade). */
  held: ReceiveResult["held"];
  status: PoStatus;
  lines: { lineId: number; ordered: number; received: number; percent: number; filled: boolean; over: boolean }[];
}

/**
 * Receives a delivery against an order, in one transaction: the blocks go into stock through the
 * same receiveDelivery as any delivery (ledger rows included), the delivery is linked to the
 * order, and each line's receipt is recorded. Terms are ±10 % of each line's volume:
 *  - a line at 90 % or more is filled; the order closes itself when every line is;
 *  - a receipt taking a line past 110 % is refused (409, naming the line) unless the buyer
 *    accepts it with a reason — then it is received and flagged on the order.
 */
export async function receiveAgainstOrder(
  id: number,
  input: ReceivePoInput,
  actorId: string,
): Promise<PoReceiveResult> {
  return db().transaction(async (trx) => {
    const po = await lockOrder(trx, id, "receive");
    const lines = await linesFor(trx, [id]);
    const byId = new Map(lines.map((l) => [l.id, l]));
    const fields: Record<string, string> = {};
    input.blocks.forEach((b, i) => {
      if (!byId.has(b.lineId)) fields[`blocks.${i}.lineId`] = "That line is not on this order.";
    });
    if (Object.keys(fields).length) throw new HttpError(400, "Some blocks need attention.", fields);

    const now = new Map<number, { blocks: number; m3: number }>();
    for (const b of input.blocks) {
      const cur = now.get(b.lineId) ?? { blocks: 0, m3: 0 };
      now.set(b.lineId, { blocks: cur.blocks + 1, m3: cur.m3 + (b.size[0] * b.size[1] * b.size[2]) / 1e9 });
    }
    const checks = lines.map((l) => {
      const got = now.get(l.id);
      const c = receivingCheck({ ordered: Number(l.volume_m3), before: Number(l.got_m3 ?? 0), now: got?.m3 ?? 0 });
      return { line: l, got, ...c };
    });
    const overs = checks.filter((c) => c.got && c.over);
    if (overs.length && !input.acceptOver) {
      const overFields: Record<string, string> = {};
      for (const c of overs) {
        const no = lines.indexOf(c.line) + 1;
        overFields[`lines.${c.line.id}`] =
          `Line ${no} (${c.line.grade_code}): ${c.total.toFixed(2)} m³ would be ${Math.round(c.ratio * 100)} % of the ${Number(c.line.volume_m3).toFixed(2)} m³ ordered, more than the +10 % the terms allow.`;
      }
      throw new HttpError(
        409,
        "More than the order allows (+10 %). Take it only if you mean to: tick “accept over the terms” and give a reason.",
        overFields,
      );
    }

    const delivery: DeliveryInput = {
      supplierId: po.supplier_id,
      receivedOn: input.receivedOn,
      poRef: po.number,
      lot: input.lot,
      notes: input.notes ?? null,
      blocks: input.blocks.map((b) => {
        const l = byId.get(b.lineId)!;
        const volume = (b.size[0] * b.size[1] * b.size[2]) / 1e9;
        return {
          code: b.code ?? null,
          gradeId: l.grade_id,
          size: b.size,
          nominalSize: [Number(l.size_x), Number(l.size_y), Number(l.size_z)] as Vec3,
          weightKg: b.weightKg ?? null,
          cost: b.cost ?? priceFor(volume, Number(l.price), l.price_unit),
          location: b.location,
          mouldedOn: b.mouldedOn ?? null,
        };
      }),
    };
    const received = await receiveDelivery(trx, delivery, actorId, `po:${id}`);
    await trx("deliveries").where({ id: received.deliveryId }).update({ purchase_order_id: id });
    await trx("purchase_order_receipts").insert(
      checks
        .filter((c) => c.got)
        .map((c) => ({
          purchase_order_id: id,
          line_id: c.line.id,
          delivery_id: received.deliveryId,
          blocks: c.got!.blocks,
          volume_m3: c.got!.m3,
          over_tolerance: c.over,
          over_reason: c.over ? input.overReason : null,
          received_by: actorId,
        })),
    );
    const status: PoStatus = checks.every((c) => c.filled) ? "closed" : "part_received";
    await trx("purchase_orders")
      .where({ id })
      .update({ status, ...(status === "closed" ? { closed_at: trx.fn.now() } : {}) });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "po.receive",
      subject: `po:${id}`,
      detail: {
        deliveryId: received.deliveryId,
        status,
        over: overs.map((c) => c.line.id),
        overReason: input.overReason ?? null,
      },
    });
    return {
      deliveryId: received.deliveryId,
      codes: received.codes,
      warnings: received.warnings,
      held: received.held,
      status,
      lines: checks.map((c) => ({
        lineId: c.line.id,
        ordered: Number(c.line.volume_m3),
        received: c.total,
        percent: Math.round(c.ratio * 1000) / 10,
        filled: c.filled,
        over: c.over,
      })),
    };
  });
}

/** Deliveries received against an order. */
export async function listOrderDeliveries(
  id: number,
): Promise<{ id: number; receivedOn: string; lot: string; blocks: number; volumeM3: number }[]> {
  const k = db();
  const rows = (await k("deliveries as d")
    .leftJoin("blocks as b", "b.delivery_id", "d.id")
    .where("d.purchase_order_id", id)
    .groupBy("d.id")
    .orderBy("d.id")
    .select(
      "d.id",
      "d.received_on",
      "d.lot",
      k.raw("count(b.id) AS n"),
      k.raw("coalesce(sum(b.volume_m3), 0) AS v"),
    )) as { id: number; received_on: string; lot: string; n: number; v: number }[];
  return rows.map((r) => ({
    id: r.id,
    receivedOn: r.received_on,
    lot: r.lot,
    blocks: Number(r.n),
    volumeM3: Number(r.v),
  }));
}
