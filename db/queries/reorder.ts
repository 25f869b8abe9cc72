import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { GradeReorderRow } from "@/db/tables";
import { HttpError } from "@/lib/errors";
import {
  DEFAULT_WORKING_DAYS,
  addWorkingDays,
  workingDaySeries,
  workingDaysBetween,
  workingDaysPerYear,
} from "@/lib/purchasing/calendar";
import { dailyStats, partStockM3, planReorder, type ReorderResult, type Source } from "@/lib/purchasing/reorder";
import { addDays, isoDate } from "@/lib/stock";
import { m3ToBoardFeet } from "@/lib/units";
import type { GradeReorderInput, ReorderSettings, ReorderSettingsInput } from "@/lib/validations/purchasing";
import type { Vec3 } from "@/lib/nesting";

export const DEFAULT_REORDER_SETTINGS: ReorderSettings = {
  serviceLevel: 0.95,
  historyDays: 90,
  orderCost: 75,
  holdingCost: 18,
  workingDays: [...DEFAULT_WORKING_DAYS],
};

/** Orders with a promised date and a delivery it takes before a supplier's σL comes from them. */
export const MIN_ORDERS_FOR_LATENESS = 3;
/** The newest orders that count towards σL: a supplier's habits change. */
const LATENESS_ORDERS = 20;

export async function getReorderSettings(k: Knex | Knex.Transaction = db()): Promise<ReorderSettings> {
  const r = await k("reorder_settings").where({ id: 1 }).first();
  if (!r) return DEFAULT_REORDER_SETTINGS;
  return {
    serviceLevel: Number(r.service_level),
    historyDays: r.history_days,
    orderCost: Number(r.order_cost),
    holdingCost: Number(r.holding_cost_m3_year),
    workingDays: Array.isArray(r.working_days) && r.working_days.length ? r.working_days.map(Number) : [1, 2, 3, 4, 5],
  };
}

/** Saves the shop's reorder settings; a calendar left out stays as it was. */
export async function saveReorderSettings(input: ReorderSettingsInput, actorId: string): Promise<ReorderSettings> {
  return db().transaction(async (trx) => {
    const s: ReorderSettings = {
      ...input,
      workingDays: input.workingDays ?? (await getReorderSettings(trx)).workingDays,
    };
    await trx("reorder_settings")
      .insert({
        id: 1,
        service_level: s.serviceLevel,
        history_days: s.historyDays,
        order_cost: s.orderCost,
        holding_cost_m3_year: s.holdingCost,
        working_days: s.workingDays,
        updated_by: actorId,
        updated_at: trx.fn.now(),
      })
      .onConflict("id")
      .merge();
    await trx("audit_log").insert({ actor_id: actorId, action: "reorder.settings", subject: "shop", detail: s });
    return s;
  });
}

export async function saveGradeReorder(gradeId: number, o: GradeReorderInput, actorId: string): Promise<void> {
  await db().transaction(async (trx) => {
    if (!(await trx("grades").where({ id: gradeId }).first("id")))
      throw new HttpError(404, "That grade was not found.");
    if (o.supplierId && !(await trx("suppliers").where({ id: o.supplierId }).first("id"))) {
      throw new HttpError(400, "Some fields need attention.", { supplierId: "That supplier does not exist." });
    }
    const row = {
      grade_id: gradeId,
      supplier_id: o.supplierId ?? null,
      lead_time_days: o.leadTimeDays ?? null,
      service_level: o.serviceLevel ?? null,
      daily_demand_m3: o.dailyDemandM3 ?? null,
      demand_sd_m3: o.demandSdM3 ?? null,
      order_cost: o.orderCost ?? null,
      holding_cost_m3_year: o.holdingCost ?? null,
      reorder_point_m3: o.reorderPointM3 ?? null,
      order_qty_m3: o.orderQtyM3 ?? null,
      note: o.note ?? null,
      updated_by: actorId,
      updated_at: trx.fn.now(),
    };
    await trx("grade_reorder").insert(row).onConflict("grade_id").merge();
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "reorder.grade",
      subject: `grade:${gradeId}`,
      detail: o,
    });
  });
}

export interface ReorderInput<T> {
  value: T;
  source: Source;
}

/** Open-job work booked for the lead time: what the reorder point takes when it outruns the forecast. */
export interface CommittedDemand extends ReorderInput<number> {
  /** The last day of the lead time window: jobs due on or before it count (undated jobs too). */
  dueBy: string;
  jobs: number;
  /** Parts still owed (ordered less good parts cut). */
  pieces: number;
  /** Kerf added to each dimension of a part's box, mm. */
  kerfMm: number;
}

export interface ReorderRow {
  gradeId: number;
  gradeCode: string;
  gradeLabel: string;
  colour: string;
  priceUnit: "m3" | "bf";
  neverHotWire: boolean;
  supplier: { id: number; name: string; email: string | null } | null;
  supplierSource: Source;
  /** Per working day of the shop calendar. */
  dailyDemand: ReorderInput<number>;
  demandSd: ReorderInput<number>;
  historyDays: number;
  /** Working days in the history window (the days the series of daily use has). */
  historyWorkingDays: number;
  /** In working days. */
  leadTimeDays: ReorderInput<number>;
  /** Standard deviation of the lead time, working days: from the supplier's deliveries, else its own figure. */
  leadTimeSd: ReorderInput<number>;
  /** How the supplier's deliveries kept their promised dates (null: no such orders yet). */
  lateness: { orders: number; meanDays: number; sdDays: number } | null;
  /** The calendar date the lead time ends on, counted from today. */
  leadTimeEnds: string;
  workingDays: number[];
  serviceLevel: ReorderInput<number>;
  committed: CommittedDemand;
  orderCost: ReorderInput<number>;
  holdingCost: ReorderInput<number>;
  onHand: number;
  onOrder: number;
  inDraft: number;
  blockSize: Vec3 | null;
  blockVolume: number;
  /** What the shop last paid, in the grade's price unit (from the newest delivered block). */
  lastPrice: number | null;
  reorderPointOverride: number | null;
  orderQtyOverride: number | null;
  note: string | null;
  result: ReorderResult;
}

const n = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/**
 * Every active grade's reorder figures, each input with where it came from, in working days of the
 * shop calendar (reorder_settings.working_days):
 *   demand    – stock used per working day over the last `historyDays` (ledger: consumed less
 *               offcuts kept; a day off's use counts on the working day before it),
 *   supplier  – the grade's usual supplier (newest delivery of the grade), its quoted lead time L
 *               and σL: the spread of its deliveries against their promised dates, in working days
 *               (its newest orders, once there are MIN_ORDERS_FOR_LATENESS), else its own figure,
 *   committed – foam that open jobs due within the lead time still need: parts owed × (box + kerf),
 *               jobs without a due date counted as due now,
 *   on hand   – blocks in stock or earmarked; on order – sent orders not yet received.
 * `today` is handed in so tests and the seed agree on the window.
 */
export async function listReorder(opts: { today?: string; gradeIds?: number[] } = {}): Promise<ReorderRow[]> {
  const k = db();
  const today = opts.today ?? isoDate();
  const settings = await getReorderSettings();
  const cal = settings.workingDays;
  const since = addDays(today, -settings.historyDays + 1);

  const gradesQ = k("grades").where({ active: true }).orderBy(["material", "code"]);
  if (opts.gradeIds) gradesQ.whereIn("id", opts.gradeIds);
  const grades = await gradesQ;
  if (!grades.length) return [];
  const ids = grades.map((g) => g.id);

  const [overrides, onHand, onOrder, inDraft, usage, openParts, kerfs, usual, lastBlocks, suppliers, promised] =
    await Promise.all([
      k("grade_reorder").whereIn("grade_id", ids),
      k("blocks")
        .whereIn("grade_id", ids)
        .whereIn("status", ["in_stock", "earmarked"])
        .groupBy("grade_id")
        .select<{ grade_id: number; m3: number }[]>("grade_id", k.raw("sum(volume_m3) AS m3")),
      k("purchase_order_lines as l")
        .join("purchase_orders as p", "p.id", "l.purchase_order_id")
        .leftJoin(
          k("purchase_order_receipts").groupBy("line_id").select("line_id", k.raw("sum(volume_m3) AS got")).as("r"),
          "r.line_id",
          "l.id",
        )
        .whereIn("p.status", ["sent", "part_received"])
        .whereIn("l.grade_id", ids)
        .groupBy("l.grade_id")
        .select("l.grade_id", k.raw("sum(greatest(l.volume_m3 - coalesce(r.got, 0), 0)) AS m3")),
      k("purchase_order_lines as l")
        .join("purchase_orders as p", "p.id", "l.purchase_order_id")
        .where("p.status", "draft")
        .whereIn("l.grade_id", ids)
        .groupBy("l.grade_id")
        .select("l.grade_id", k.raw("sum(l.volume_m3) AS m3")),
      k("stock_ledger as s")
        .join("blocks as b", "b.id", "s.block_id")
        .whereIn("b.grade_id", ids)
        .whereIn("s.kind", ["consumed", "offcut_created"])
        .where("s.at", ">=", since)
        .where("s.at", "<", k.raw("?::date + 1", [today]))
        .groupBy("b.grade_id", k.raw("s.at::date"))
        .select(
          "b.grade_id",
          k.raw("s.at::date::text AS day"),
          k.raw("sum(CASE WHEN s.kind = 'consumed' THEN s.volume_m3 ELSE -s.volume_m3 END) AS m3"),
        ),
      openJobParts(k, ids),
      gradeKerfs(k, ids),
      k
        .select(k.raw("DISTINCT ON (b.grade_id) b.grade_id, d.supplier_id"))
        .from("blocks as b")
        .join("deliveries as d", "d.id", "b.delivery_id")
        .whereIn("b.grade_id", ids)
        .orderBy([
          { column: "b.grade_id" },
          { column: "d.received_on", order: "desc" },
          { column: "d.id", order: "desc" },
        ]),
      k
        .select(
          k.raw("DISTINCT ON (b.grade_id) b.grade_id, b.nominal_x, b.nominal_y, b.nominal_z, b.cost, b.volume_m3"),
        )
        .from("blocks as b")
        .whereIn("b.grade_id", ids)
        .whereNull("b.parent_id")
        .orderBy([
          { column: "b.grade_id" },
          { column: "b.created_at", order: "desc" },
          { column: "b.id", order: "desc" },
        ]),
      k("suppliers").select("id", "name", "email", "lead_time_days", "lead_time_sd_days"),
      // Each order's promised date against the day its first delivery came.
      k("purchase_orders as p")
        .join("deliveries as d", "d.purchase_order_id", "p.id")
        .whereNotNull("p.expected_on")
        .groupBy("p.id", "p.supplier_id", "p.expected_on")
        .select("p.supplier_id", k.raw("p.expected_on::text AS promised"), k.raw("min(d.received_on)::text AS came"))
        .orderBy([
          { column: "came", order: "desc" },
          { column: "p.id", order: "desc" },
        ]),
    ]);

  const by = <T extends { grade_id: number }>(rows: T[]) => new Map(rows.map((r) => [r.grade_id, r]));
  const ov = by(overrides);
  const hand = by(onHand);
  const order = by(onOrder as { grade_id: number; m3: number }[]);
  const draft = by(inDraft as { grade_id: number; m3: number }[]);
  const usualSupplier = by(usual as { grade_id: number; supplier_id: number }[]);
  const last = by(
    lastBlocks as {
      grade_id: number;
      nominal_x: number;
      nominal_y: number;
      nominal_z: number;
      cost: number;
      volume_m3: number;
    }[],
  );
  const supplierById = new Map(
    (
      suppliers as {
        id: number;
        name: string;
        email: string | null;
        lead_time_days: number;
        lead_time_sd_days: number;
      }[]
    ).map((s) => [s.id, s]),
  );
  const lateBySupplier = new Map<number, number[]>();
  for (const p of promised as { supplier_id: number; promised: string; came: string }[]) {
    const list = lateBySupplier.get(p.supplier_id) ?? [];
    if (list.length < LATENESS_ORDERS) list.push(workingDaysBetween(p.promised, p.came, cal));
    lateBySupplier.set(p.supplier_id, list);
  }
  const daysPerYear = workingDaysPerYear(cal);
  const shopKerf = kerfs.shop;

  return grades.map((g) => {
    const o: Partial<GradeReorderRow> = ov.get(g.id) ?? {};
    const byDate = new Map<string, number>();
    for (const u of usage as { grade_id: number; day: string; m3: number }[])
      if (u.grade_id === g.id) byDate.set(u.day, Math.max(0, Number(u.m3)));
    const series = workingDaySeries(byDate, since, today, cal);
    const stats = dailyStats(series);
    const overSupplier = n(o.supplier_id);
    const supplierId = overSupplier ?? usualSupplier.get(g.id)?.supplier_id ?? null;
    const supplier = supplierId ? (supplierById.get(supplierId) ?? null) : null;
    const pick = (override: unknown, computed: number, source: Source): ReorderInput<number> =>
      n(override) !== null ? { value: n(override)!, source: "override" } : { value: computed, source };
    const lb = last.get(g.id);
    const blockSize = lb ? ([Number(lb.nominal_x), Number(lb.nominal_y), Number(lb.nominal_z)] as Vec3) : null;
    const blockVolume = blockSize ? (blockSize[0] * blockSize[1] * blockSize[2]) / 1e9 : 0;
    const lastPrice =
      lb && Number(lb.volume_m3) > 0
        ? Number(lb.cost) / (g.price_unit === "bf" ? m3ToBoardFeet(Number(lb.volume_m3)) : Number(lb.volume_m3))
        : null;

    const leadTimeDays = pick(o.lead_time_days, supplier?.lead_time_days ?? 14, supplier ? "supplier" : "settings");
    const late = supplier ? (lateBySupplier.get(supplier.id) ?? []) : [];
    const lateStats = late.length ? dailyStats(late) : null;
    const leadTimeSd: ReorderInput<number> =
      lateStats && late.length >= MIN_ORDERS_FOR_LATENESS
        ? { value: lateStats.sd, source: "deliveries" }
        : supplier
          ? { value: Number(supplier.lead_time_sd_days), source: "supplier" }
          : { value: 0, source: "none" };
    const leadTimeEnds = addWorkingDays(today, leadTimeDays.value, cal);

    const kerfMm = kerfs.byGrade.get(g.id) ?? shopKerf;
    let committedM3 = 0;
    let pieces = 0;
    const jobs = new Set<number>();
    for (const p of openParts)
      if (p.gradeId === g.id && p.owed > 0 && (p.dueOn === null || p.dueOn <= leadTimeEnds)) {
        committedM3 += p.owed * partStockM3(p.size, kerfMm);
        pieces += p.owed;
        jobs.add(p.jobId);
      }

    const row = {
      dailyDemand: pick(o.daily_demand_m3, stats.mean, "ledger"),
      demandSd: pick(o.demand_sd_m3, stats.sd, "ledger"),
      leadTimeDays,
      leadTimeSd,
      serviceLevel: pick(o.service_level, settings.serviceLevel, "settings"),
      committed: {
        value: committedM3,
        source: "jobs" as Source,
        dueBy: leadTimeEnds,
        jobs: jobs.size,
        pieces,
        kerfMm,
      },
      orderCost: pick(o.order_cost, settings.orderCost, "settings"),
      holdingCost: pick(o.holding_cost_m3_year, settings.holdingCost, "settings"),
    };
    const onHandM3 = Number(hand.get(g.id)?.m3 ?? 0);
    const onOrderM3 = Number(order.get(g.id)?.m3 ?? 0);
    const result = planReorder({
      dailyDemand: row.dailyDemand.value,
      demandSd: row.demandSd.value,
      leadTimeDays: row.leadTimeDays.value,
      leadTimeSd: row.leadTimeSd.value,
      serviceLevel: row.serviceLevel.value,
      committed: row.committed.value,
      orderCost: row.orderCost.value,
      holdingCost: row.holdingCost.value,
      onHand: onHandM3,
      onOrder: onOrderM3,
      blockVolume,
      reorderPointOverride: n(o.reorder_point_m3),
      orderQtyOverride: n(o.order_qty_m3),
      daysPerYear,
    });
    return {
      gradeId: g.id,
      gradeCode: g.code,
      gradeLabel: `${g.grade_system} ${g.grade}`,
      colour: g.colour,
      priceUnit: g.price_unit,
      neverHotWire: g.never_hot_wire,
      supplier: supplier ? { id: supplier.id, name: supplier.name, email: supplier.email } : null,
      supplierSource: overSupplier ? "override" : supplier ? "ledger" : "none",
      ...row,
      historyDays: settings.historyDays,
      historyWorkingDays: series.length,
      lateness: lateStats ? { orders: late.length, meanDays: lateStats.mean, sdDays: lateStats.sd } : null,
      leadTimeEnds,
      workingDays: cal,
      onHand: onHandM3,
      onOrder: onOrderM3,
      inDraft: Number(draft.get(g.id)?.m3 ?? 0),
      blockSize,
      blockVolume,
      lastPrice: lastPrice === null ? null : Math.round(lastPrice * 10000) / 10000,
      reorderPointOverride: n(o.reorder_point_m3),
      orderQtyOverride: n(o.order_qty_m3),
      note: (o.note as string | null | undefined) ?? null,
      result,
    };
  });
}

interface OpenPart {
  jobId: number;
  gradeId: number;
  dueOn: string | null;
  size: Vec3;
  /** Ordered less good parts cut (rejects and parts not cut stay owed). */
  owed: number;
}

/** Parts of open jobs (not done, not cancelled) still owed, with their job's due date. */
async function openJobParts(k: Knex, gradeIds: number[]): Promise<OpenPart[]> {
  const rows = (await k("job_parts as p")
    .join("jobs as j", "j.id", "p.job_id")
    .leftJoin(
      k("cut_parts").groupBy("job_part_id").select("job_part_id", k.raw("sum(good_count) AS good")).as("c"),
      "c.job_part_id",
      "p.id",
    )
    .whereNotIn("j.status", ["done", "cancelled"])
    .whereIn("p.grade_id", gradeIds)
    .select(
      "p.job_id",
      "p.grade_id",
      k.raw("j.due_on::text AS due_on"),
      "p.size_x",
      "p.size_y",
      "p.size_z",
      k.raw("greatest(p.quantity - coalesce(c.good, 0), 0) AS owed"),
    )) as {
    job_id: number;
    grade_id: number;
    due_on: string | null;
    size_x: number;
    size_y: number;
    size_z: number;
    owed: string | number;
  }[];
  return rows.map((r) => ({
    jobId: r.job_id,
    gradeId: r.grade_id,
    dueOn: r.due_on,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)],
    owed: Number(r.owed),
  }));
}

/**
 * The kerf a grade is cut with: the widest calibrated on an active machine (the part may go to
 * either), else the shop's setting.
 */
async function gradeKerfs(k: Knex, gradeIds: number[]): Promise<{ shop: number; byGrade: Map<number, number> }> {
  const [shop, rows] = await Promise.all([
    k("shop_settings").where({ id: 1 }).first("kerf_mm"),
    k("machine_grades as mg")
      .join("machines as m", "m.id", "mg.machine_id")
      .where("m.active", true)
      .whereIn("mg.grade_id", gradeIds)
      .groupBy("mg.grade_id")
      .select("mg.grade_id", k.raw("max(mg.kerf_mm) AS kerf")) as Promise<{ grade_id: number; kerf: string }[]>,
  ]);
  return {
    shop: shop ? Number(shop.kerf_mm) : 1.5,
    byGrade: new Map(rows.map((r) => [r.grade_id, Number(r.kerf)])),
  };
}

/** The grades at or under their reorder point. */
export async function listDueGrades(today?: string): Promise<ReorderRow[]> {
  return (await listReorder({ today })).filter((r) => r.result.due);
}
