import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { combineBasis, materialYield, type VolumeBasis } from "@/lib/reports/yield";
import { addDays, isoDate } from "@/lib/stock";
import { m3ToBoardFeet } from "@/lib/units";
import type { Vec3 } from "@/lib/nesting";

/** A report period, inclusive dates. */
export interface Period {
  from: string;
  to: string;
}

export const REPORTS = ["yield", "losses", "offcuts", "suppliers", "stock-value"] as const;
export type ReportName = (typeof REPORTS)[number];

/** Thirteen weeks to today, the default window. */
export function defaultPeriod(today = isoDate()): Period {
  return { from: addDays(today, -90), to: today };
}

const inPeriod = (k: Knex, column: string, p: Period) =>
  k.raw(`${column} >= ?::date AND ${column} < ?::date + 1`, [p.from, p.to]);
const r4 = (v: number) => Math.round(v * 10000) / 10000;
const pct = (v: number | null) => (v === null ? null : Math.round(v * 1000) / 10);

export interface YieldRow {
  key: string;
  label: string;
  partM3: number;
  issuedM3: number;
  offcutM3: number;
  /** part ÷ (issued − offcut), in %. */
  yieldPct: number | null;
  basis: VolumeBasis | null;
}

function yieldRow(
  key: string,
  label: string,
  part: number,
  issued: number,
  offcut: number,
  bases: (string | null)[],
): YieldRow {
  return {
    key,
    label,
    partM3: r4(part),
    issuedM3: r4(issued),
    offcutM3: r4(offcut),
    yieldPct: pct(materialYield(part, issued, offcut)),
    basis: combineBasis(bases),
  };
}

export interface YieldReport {
  period: Period;
  total: YieldRow;
  weekly: YieldRow[];
  byGrade: YieldRow[];
  byJob: (YieldRow & { customer: string | null })[];
}

/**
 * Material yield of the blocks cut in the period (plan_blocks, status cut): part volume ÷ (block
 * volume − usable offcut kept), weekly (weeks start on Monday), by grade and by job. Part volume
 * is the true volume where the part has a profile, else its bounding box; `basis` says which.
 * A job's share of a block's stock is in proportion to its part volume in that block.
 */
export async function yieldReport(p: Period): Promise<YieldReport> {
  const k = db();
  const blocks = (await k("plan_blocks as pb")
    .join("blocks as b", "b.id", "pb.block_id")
    .join("grades as g", "g.id", "b.grade_id")
    .where("pb.status", "cut")
    .whereRaw(inPeriod(k, "pb.cut_at", p))
    .select(
      "pb.id",
      "pb.run_id",
      "pb.block_id",
      "g.code as grade_code",
      "g.id as grade_id",
      "pb.volume_basis",
      k.raw("to_char(date_trunc('week', pb.cut_at), 'YYYY-MM-DD') AS week"),
      k.raw("coalesce(pb.part_volume_m3, 0) AS part"),
      k.raw("coalesce(pb.block_volume_m3, b.volume_m3) AS issued"),
      k.raw("coalesce(pb.offcut_volume_m3, 0) AS offcut"),
    )) as {
    id: number;
    run_id: number;
    block_id: number;
    grade_code: string;
    grade_id: number;
    volume_basis: string | null;
    week: string;
    part: number;
    issued: number;
    offcut: number;
  }[];

  const group = <K extends string>(
    keyOf: (b: (typeof blocks)[number]) => K,
    labelOf: (b: (typeof blocks)[number]) => string,
  ) => {
    const m = new Map<K, { label: string; part: number; issued: number; offcut: number; bases: (string | null)[] }>();
    for (const b of blocks) {
      const key = keyOf(b);
      const cur = m.get(key) ?? { label: labelOf(b), part: 0, issued: 0, offcut: 0, bases: [] };
      cur.part += Number(b.part);
      cur.issued += Number(b.issued);
      cur.offcut += Number(b.offcut);
      cur.bases.push(b.volume_basis);
      m.set(key, cur);
    }
    return [...m.entries()].map(([key, v]) => yieldRow(key, v.label, v.part, v.issued, v.offcut, v.bases));
  };
  const weekly = group(
    (b) => b.week,
    (b) => `Week of ${b.week}`,
  ).sort((a, b) => a.key.localeCompare(b.key));
  const byGrade = group(
    (b) => b.grade_code,
    (b) => b.grade_code,
  ).sort((a, b) => a.key.localeCompare(b.key));
  const total = yieldRow(
    "total",
    "All blocks cut",
    ...blocks.reduce<Vec3>(
      (s, b) => [s[0] + Number(b.part), s[1] + Number(b.issued), s[2] + Number(b.offcut)],
      [0, 0, 0],
    ),
    blocks.map((b) => b.volume_basis),
  );

  // By job: each job's good parts, and its share of each block's net stock.
  const parts = blocks.length
    ? ((await k("cut_parts as c")
        .join("job_parts as jp", "jp.id", "c.job_part_id")
        .join("jobs as j", "j.id", "jp.job_id")
        .join("plan_blocks as pb", function () {
          this.on("pb.run_id", "c.run_id").andOn("pb.block_id", "c.block_id");
        })
        .whereIn(
          "pb.id",
          blocks.map((b) => b.id),
        )
        .select(
          "j.id as job_id",
          "j.name as job_name",
          "j.customer",
          "pb.id as pb_id",
          "c.part_volume_m3",
          "c.volume_basis",
        )) as {
        job_id: number;
        job_name: string;
        customer: string | null;
        pb_id: number;
        part_volume_m3: number;
        volume_basis: string;
      }[])
    : [];
  const partByBlock = new Map<number, number>();
  for (const c of parts) partByBlock.set(c.pb_id, (partByBlock.get(c.pb_id) ?? 0) + Number(c.part_volume_m3));
  const blockById = new Map(blocks.map((b) => [b.id, b]));
  const jobs = new Map<number, { name: string; customer: string | null; part: number; net: number; bases: string[] }>();
  for (const c of parts) {
    const b = blockById.get(c.pb_id)!;
    const share = Number(c.part_volume_m3) / (partByBlock.get(c.pb_id) || 1);
    const cur = jobs.get(c.job_id) ?? { name: c.job_name, customer: c.customer, part: 0, net: 0, bases: [] };
    cur.part += Number(c.part_volume_m3);
    cur.net += share * (Number(b.issued) - Number(b.offcut));
    cur.bases.push(c.volume_basis);
    jobs.set(c.job_id, cur);
  }
  const byJob = [...jobs.entries()]
    .map(([id, j]) => ({ ...yieldRow(String(id), j.name, j.part, j.net, 0, j.bases), customer: j.customer }))
    .sort((a, b) => a.label.localeCompare(b.label));
  return { period: p, total, weekly, byGrade, byJob };
}

export const LOSS_KINDS = ["trim", "kerf", "defect", "unusable", "reject"] as const;
export type LossKind = (typeof LOSS_KINDS)[number];
export const LOSS_LABELS: Record<LossKind, string> = {
  trim: "Face trim",
  kerf: "Kerf",
  defect: "Defect cut-outs",
  unusable: "Unusable offcut",
  reject: "Rejected parts",
};

export interface LossRow {
  key: string;
  label: string;
  issuedM3: number;
  losses: Record<LossKind, number>;
  totalM3: number;
  /** total loss ÷ issued, in %. */
  lossPct: number | null;
}

/** Losses by kind in the blocks cut in the period, in total and by grade. */
export async function lossReport(p: Period): Promise<{ period: Period; total: LossRow; byGrade: LossRow[] }> {
  const k = db();
  const rows = (await k("plan_blocks as pb")
    .join("blocks as b", "b.id", "pb.block_id")
    .join("grades as g", "g.id", "b.grade_id")
    .where("pb.status", "cut")
    .whereRaw(inPeriod(k, "pb.cut_at", p))
    .groupBy("g.code")
    .orderBy("g.code")
    .select(
      "g.code",
      k.raw("sum(coalesce(pb.block_volume_m3, b.volume_m3)) AS issued"),
      k.raw("sum(coalesce(pb.loss_trim_m3, 0)) AS trim"),
      k.raw("sum(coalesce(pb.loss_kerf_m3, 0)) AS kerf"),
      k.raw("sum(coalesce(pb.loss_defect_m3, 0)) AS defect"),
      k.raw("sum(coalesce(pb.loss_unusable_m3, 0)) AS unusable"),
      k.raw("sum(coalesce(pb.loss_reject_m3, 0)) AS reject"),
    )) as ({ code: string; issued: string } & Record<LossKind, string>)[];
  const toRow = (key: string, label: string, issued: number, l: Record<LossKind, number>): LossRow => {
    const total = LOSS_KINDS.reduce((s, x) => s + l[x], 0);
    return {
      key,
      label,
      issuedM3: r4(issued),
      losses: Object.fromEntries(LOSS_KINDS.map((x) => [x, r4(l[x])])) as Record<LossKind, number>,
      totalM3: r4(total),
      lossPct: issued > 0 ? pct(total / issued) : null,
    };
  };
  const byGrade = rows.map((r) =>
    toRow(
      r.code,
      r.code,
      Number(r.issued),
      Object.fromEntries(LOSS_KINDS.map((x) => [x, Number(r[x])])) as Record<LossKind, number>,
    ),
  );
  const sum = (f: (r: LossRow) => number) => byGrade.reduce((s, r) => s + f(r), 0);
  const total = toRow(
    "total",
    "All grades",
    sum((r) => r.issuedM3),
    Object.fromEntries(LOSS_KINDS.map((x) => [x, sum((r) => r.losses[x])])) as Record<LossKind, number>,
  );
  return { period: p, total, byGrade };
}

export const AGE_BUCKETS = [
  { key: "0-30", label: "Up to 30 days", max: 30 },
  { key: "31-90", label: "31–90 days", max: 90 },
  { key: "91-180", label: "91–180 days", max: 180 },
  { key: "181+", label: "Over 180 days", max: Infinity },
] as const;

export interface OffcutReport {
  period: Period;
  /** Offcuts in stock now, by age since they were cut off. */
  byAge: { key: string; label: string; count: number; m3: number; value: number }[];
  /** Offcuts created in the period, by what became of them. */
  fate: { key: "used" | "in_stock" | "written_off"; label: string; count: number; m3: number }[];
  usedPct: number | null;
}

/** Offcuts (blocks with a parent): stock by age, and whether those cut off in the period were ever used (status cut). */
export async function offcutReport(p: Period, today = isoDate()): Promise<OffcutReport> {
  const k = db();
  const stock = (await k("blocks")
    .whereNotNull("parent_id")
    .whereIn("status", ["in_stock", "earmarked"])
    .select(k.raw("(?::date - created_at::date) AS age", [today]), "volume_m3", "cost")) as {
    age: number;
    volume_m3: number;
    cost: number;
  }[];
  const byAge = AGE_BUCKETS.map((b, i) => {
    const lo = i === 0 ? -Infinity : AGE_BUCKETS[i - 1]!.max;
    const xs = stock.filter((s) => Number(s.age) > lo && Number(s.age) <= b.max);
    return {
      key: b.key,
      label: b.label,
      count: xs.length,
      m3: r4(xs.reduce((s, x) => s + Number(x.volume_m3), 0)),
      value: Math.round(xs.reduce((s, x) => s + Number(x.cost), 0) * 100) / 100,
    };
  });
  const made = (await k("blocks")
    .whereNotNull("parent_id")
    .whereRaw(inPeriod(k, "created_at", p))
    .groupBy("status")
    .select("status", k.raw("count(*) AS n"), k.raw("sum(volume_m3) AS m3"))) as {
    status: string;
    n: number;
    m3: number;
  }[];
  const get = (...s: string[]) =>
    made
      .filter((m) => s.includes(m.status))
      .reduce((a, m) => ({ count: a.count + Number(m.n), m3: a.m3 + Number(m.m3) }), { count: 0, m3: 0 });
  const fate = [
    { key: "used" as const, label: "Used (cut up)", ...get("cut") },
    { key: "in_stock" as const, label: "Still in stock", ...get("in_stock", "earmarked") },
    { key: "written_off" as const, label: "Written off", ...get("written_off") },
  ].map((f) => ({ ...f, m3: r4(f.m3) }));
  const all = fate.reduce((s, f) => s + f.count, 0);
  return { period: p, byAge, fate, usedPct: all ? pct(fate[0]!.count / all) : null };
}

export interface SupplierQualityRow {
  supplierId: number;
  supplier: string;
  lot: string | null;
  blocks: number;
  m3: number;
  defects: number;
  defectsPerM3: number | null;
  weighed: number;
  belowMinDensity: number;
  /** Of those blocks, how many are on hold now (out of usable stock, waiting for a release). */
  onHold: number;
}

/** Claims to a supplier opened in the period, and what came of them. */
export interface SupplierClaimsRow {
  supplierId: number;
  supplier: string;
  claims: number;
  blocks: number;
  open: number;
  /** Accepted, with or without the credit recorded yet (credited counts as accepted). */
  accepted: number;
  rejected: number;
  credited: number;
  /** Accepted share of the claims the supplier has answered, %; null while none is answered. */
  acceptedPct: number | null;
  creditAsked: number;
  creditReceived: number;
}

/**
 * Incoming quality of the blocks delivered in the period (offcuts excluded; defects found on
 * their parent count once): defect zones per m³, measured density below the grade minimum, blocks
 * on hold; and the claims opened to each supplier in the period with their outcome and credit.
 */
export async function supplierQualityReport(p: Period): Promise<{
  period: Period;
  bySupplier: SupplierQualityRow[];
  byLot: SupplierQualityRow[];
  lowDensity: { code: string; supplier: string; lot: string; grade: string; density: number; minDensity: number }[];
  claims: SupplierClaimsRow[];
}> {
  const k = db();
  const base = () =>
    k("blocks as b")
      .join("deliveries as d", "d.id", "b.delivery_id")
      .join("suppliers as s", "s.id", "d.supplier_id")
      .join("grades as g", "g.id", "b.grade_id")
      .whereNull("b.parent_id")
      .whereRaw(inPeriod(k, "d.received_on", p));
  const cols = [
    k.raw("count(*) AS blocks"),
    k.raw("sum(b.volume_m3) AS m3"),
    k.raw(
      "sum((SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id AND z.inherited_from IS NULL AND z.removed_at IS NULL)) AS defects",
    ),
    k.raw("count(b.weight_kg) AS weighed"),
    k.raw(
      "count(*) FILTER (WHERE b.weight_kg IS NOT NULL AND g.min_density_kg_m3 IS NOT NULL AND b.weight_kg / b.volume_m3 < g.min_density_kg_m3) AS low",
    ),
    k.raw("count(*) FILTER (WHERE b.status = 'on_hold') AS held"),
  ];
  type Raw = {
    supplier_id: number;
    name: string;
    lot?: string;
    blocks: number;
    m3: number;
    defects: number;
    weighed: number;
    low: number;
    held: number;
  };
  const toRow = (r: Raw): SupplierQualityRow => ({
    supplierId: r.supplier_id,
    supplier: r.name,
    lot: r.lot ?? null,
    blocks: Number(r.blocks),
    m3: r4(Number(r.m3)),
    defects: Number(r.defects),
    defectsPerM3: Number(r.m3) > 0 ? Math.round((Number(r.defects) / Number(r.m3)) * 1000) / 1000 : null,
    weighed: Number(r.weighed),
    belowMinDensity: Number(r.low),
    onHold: Number(r.held),
  });
  const [bySupplier, byLot, low, claims] = await Promise.all([
    base()
      .groupBy("s.id", "s.name")
      .orderBy("s.name")
      .select("s.id as supplier_id", "s.name", ...cols),
    base()
      .groupBy("s.id", "s.name", "b.lot")
      .orderBy(["s.name", "b.lot"])
      .select("s.id as supplier_id", "s.name", "b.lot", ...cols),
    base()
      .whereNotNull("b.weight_kg")
      .whereNotNull("g.min_density_kg_m3")
      .whereRaw("b.weight_kg / b.volume_m3 < g.min_density_kg_m3")
      .orderBy("b.code")
      .select(
        "b.code",
        "s.name",
        "b.lot",
        "g.code as grade",
        k.raw("b.weight_kg / b.volume_m3 AS density"),
        "g.min_density_kg_m3",
      ),
    k("supplier_claims as c")
      .join("suppliers as s", "s.id", "c.supplier_id")
      .whereRaw(inPeriod(k, "c.created_at", p))
      .groupBy("s.id", "s.name")
      .orderBy("s.name")
      .select(
        "s.id as supplier_id",
        "s.name",
        k.raw("count(*) AS claims"),
        k.raw("sum((SELECT count(*) FROM supplier_claim_blocks cb WHERE cb.claim_id = c.id)) AS blocks"),
        k.raw("count(*) FILTER (WHERE c.status = 'open') AS open"),
        k.raw("count(*) FILTER (WHERE c.status IN ('accepted', 'credited')) AS accepted"),
        k.raw("count(*) FILTER (WHERE c.status = 'rejected') AS rejected"),
        k.raw("count(*) FILTER (WHERE c.status = 'credited') AS credited"),
        k.raw("coalesce(sum(c.credit_asked), 0) AS asked"),
        k.raw("coalesce(sum(c.credit_received), 0) AS received"),
      ) as Promise<
      {
        supplier_id: number;
        name: string;
        claims: number;
        blocks: number;
        open: number;
        accepted: number;
        rejected: number;
        credited: number;
        asked: number;
        received: number;
      }[]
    >,
  ]);
  return {
    period: p,
    bySupplier: (bySupplier as Raw[]).map(toRow),
    byLot: (byLot as Raw[]).map(toRow),
    lowDensity: (
      low as { code: string; name: string; lot: string; grade: string; density: string; min_density_kg_m3: string }[]
    ).map((r) => ({
      code: r.code,
      supplier: r.name,
      lot: r.lot,
      grade: r.grade,
      density: Math.round(Number(r.density) * 10) / 10,
      minDensity: Number(r.min_density_kg_m3),
    })),
    claims: claims.map((c) => {
      const accepted = Number(c.accepted);
      const answered = accepted + Number(c.rejected);
      return {
        supplierId: c.supplier_id,
        supplier: c.name,
        claims: Number(c.claims),
        blocks: Number(c.blocks),
        open: Number(c.open),
        accepted,
        rejected: Number(c.rejected),
        credited: Number(c.credited),
        acceptedPct: answered ? pct(accepted / answered) : null,
        creditAsked: Math.round(Number(c.asked) * 100) / 100,
        creditReceived: Math.round(Number(c.received) * 100) / 100,
      };
    }),
  };
}

export interface StockValueRow {
  grade: string;
  location: string;
  blocks: number;
  m3: number;
  boardFeet: number;
  value: number;
}

/**
 * Stock on hand at the end of the period, by grade and location, straight from the ledger (so it
 * reconciles with it by construction): each block's movements up to `to`, summed, kept where the
 * block still holds volume. Location is where the block is now.
 */
export async function stockValueReport(p: Period): Promise<{
  period: Period;
  rows: StockValueRow[];
  byGrade: StockValueRow[];
  byLocation: StockValueRow[];
  total: StockValueRow;
}> {
  const k = db();
  const perBlock = k("stock_ledger")
    .where("at", "<", k.raw("?::date + 1", [p.to]))
    .groupBy("block_id")
    .select("block_id", k.raw("sum(delta_m3) AS m3"), k.raw("sum(delta_value) AS value"));
  const rows = (await k
    .from(perBlock.as("l"))
    .join("blocks as b", "b.id", "l.block_id")
    .join("grades as g", "g.id", "b.grade_id")
    .groupBy("g.code", "b.location")
    .orderBy(["g.code", "b.location"])
    .select(
      "g.code as grade",
      "b.location",
      k.raw("count(*) FILTER (WHERE l.m3 > 0.0000001) AS blocks"),
      k.raw("sum(l.m3) AS m3"),
      k.raw("sum(l.value) AS value"),
    )
    .havingRaw("abs(sum(l.m3)) > 0.0000001 OR abs(sum(l.value)) > 0.001")) as {
    grade: string;
    location: string;
    blocks: number;
    m3: number;
    value: number;
  }[];
  const toRow = (grade: string, location: string, blocks: number, m3: number, value: number): StockValueRow => ({
    grade,
    location,
    blocks,
    m3: r4(m3),
    boardFeet: Math.round(m3ToBoardFeet(m3)),
    value: Math.round(value * 100) / 100,
  });
  const out = rows.map((r) => toRow(r.grade, r.location, Number(r.blocks), Number(r.m3), Number(r.value)));
  const roll = (keyOf: (r: StockValueRow) => [string, string]) => {
    const m = new Map<string, { g: string; l: string; blocks: number; m3: number; value: number }>();
    for (const r of out) {
      const [g, l] = keyOf(r);
      const cur = m.get(`${g}|${l}`) ?? { g, l, blocks: 0, m3: 0, value: 0 };
      cur.blocks += r.blocks;
      cur.m3 += Number(rows.find((x) => x.grade === r.grade && x.location === r.location)!.m3);
      cur.value += Number(rows.find((x) => x.grade === r.grade && x.location === r.location)!.value);
      m.set(`${g}|${l}`, cur);
    }
    return [...m.values()].map((v) => toRow(v.g, v.l, v.blocks, v.m3, v.value));
  };
  const byGrade = roll((r) => [r.grade, "All locations"]);
  const byLocation = roll((r) => ["All grades", r.location]).sort((a, b) => a.location.localeCompare(b.location));
  const [total] = roll(() => ["All grades", "All locations"]);
  return { period: p, rows: out, byGrade, byLocation, total: total ?? toRow("All grades", "All locations", 0, 0, 0) };
}

/** Yield this calendar month so far against last month, for the manager's home page. */
export async function yieldThisMonthVsLast(today = isoDate()): Promise<{ thisMonth: YieldRow; lastMonth: YieldRow }> {
  const first = `${today.slice(0, 7)}-01`;
  const lastFirst = `${addDays(first, -1).slice(0, 7)}-01`;
  const [a, b] = await Promise.all([
    yieldReport({ from: first, to: today }),
    yieldReport({ from: lastFirst, to: addDays(first, -1) }),
  ]);
  return { thisMonth: a.total, lastMonth: b.total };
}
