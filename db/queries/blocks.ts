import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { appendLedger } from "./ledger";
import { HttpError } from "@/lib/errors";
import { isoDate, shownStatus, type BlockStatus, type Material } from "@/lib/stock";
import type { BlockQuery } from "@/lib/validations/stock";

import type { BlockSummary, Size } from "@/lib/stock-types";

export type { BlockSummary, Size };

export interface BlockDetail extends BlockSummary {
  nominalSize: Size;
  deliveryId: number | null;
  parentCode: string | null;
  originInParent: Size | null;
  notes: string | null;
  poRef: string | null;
  cureDays: number;
  gradeLabel: string;
}

interface Row {
  id: number;
  code: string;
  grade_id: number;
  grade_code: string;
  material: Material;
  never_hot_wire: boolean;
  colour: string;
  lot: string;
  size_x: string;
  size_y: string;
  size_z: string;
  volume_m3: string;
  weight_kg: string | null;
  min_density_kg_m3: string | null;
  cost: string;
  location: string;
  moulded_on: Date | string | null;
  cut_not_before: Date | string;
  status: BlockStatus;
  parent_id: number | null;
  defect_count: string | number;
  fifo: string | number | null;
  received_on: Date | string | null;
  supplier_name: string | null;
}

const day = (v: Date | string | null): string | null =>
  v === null ? null : typeof v === "string" ? v.slice(0, 10) : isoDate(v);

function toSummary(r: Row, today: string): BlockSummary {
  const size: Size = [Number(r.size_x), Number(r.size_y), Number(r.size_z)];
  const volume = Number(r.volume_m3);
  const weight = r.weight_kg === null ? null : Number(r.weight_kg);
  const cnb = day(r.cut_not_before)!;
  return {
    id: r.id,
    code: r.code,
    gradeId: r.grade_id,
    gradeCode: r.grade_code,
    material: r.material,
    neverHotWire: r.never_hot_wire,
    colour: r.colour,
    lot: r.lot,
    size,
    volumeM3: volume,
    weightKg: weight,
    densityKgM3: weight === null ? null : weight / volume,
    minDensity: r.min_density_kg_m3 === null ? null : Number(r.min_density_kg_m3),
    cost: Number(r.cost),
    location: r.location,
    mouldedOn: day(r.moulded_on),
    cutNotBefore: cnb,
    status: r.status,
    shown: shownStatus(r.status, cnb, today),
    isOffcut: r.parent_id !== null,
    parentId: r.parent_id,
    defectCount: Number(r.defect_count ?? 0),
    fifo: r.fifo === null || r.fifo === undefined ? null : Number(r.fifo),
    receivedOn: day(r.received_on),
    supplier: r.supplier_name,
  };
}

/** Base select with grade, delivery, defect count and FIFO position among ready stock of the grade. */
function selectBlocks(k: Knex) {
  return k("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .leftJoin("deliveries as d", "d.id", "b.delivery_id")
    .leftJoin("suppliers as s", "s.id", "d.supplier_id")
    .select(
      "b.*",
      "g.code as grade_code",
      "g.material",
      "g.never_hot_wire",
      "g.colour",
      "g.min_density_kg_m3",
      "g.cure_days",
      "g.grade_system",
      "g.grade as grade_name",
      "d.received_on",
      "d.po_ref",
      "s.name as supplier_name",
      k.raw("(SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id) AS defect_count"),
    );
}

function applyFilters(q: Knex.QueryBuilder, f: BlockQuery, today: string) {
  if (f.q) {
    // A bare number is the number on the label: it finds HF-1047 and its offcuts HF-1047.1…, not
    // HF-10470. Anything else is the start of the code.
    if (/^\d+$/.test(f.q)) q.whereRaw("b.code ~ ?", [`(^|[^0-9])${f.q}([^0-9]|$)`]);
    else q.whereRaw("upper(b.code) LIKE ?", [`${f.q.toUpperCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`]);
  }
  if (f.grade) q.where("b.grade_id", f.grade);
  if (f.location) q.where("b.location", f.location);
  if (f.minLength !== undefined) q.whereRaw("GREATEST(b.size_x, b.size_y, b.size_z) >= ?", [f.minLength]);
  if (f.maxLength !== undefined) q.whereRaw("GREATEST(b.size_x, b.size_y, b.size_z) <= ?", [f.maxLength]);
  if (f.minVolume !== undefined) q.where("b.volume_m3", ">=", f.minVolume);
  if (f.offcuts === "only") q.whereNotNull("b.parent_id");
  if (f.offcuts === "exclude") q.whereNull("b.parent_id");
  switch (f.status ?? "available") {
    case "available":
      q.whereIn("b.status", ["in_stock", "earmarked"]);
      break;
    case "settling":
      q.where("b.status", "in_stock").where("b.cut_not_before", ">", today);
      break;
    case "ready":
      q.where("b.status", "in_stock").where("b.cut_not_before", "<=", today);
      break;
    case "all":
      break;
    default:
      q.where("b.status", f.status!);
  }
  return q;
}

const SORT_COLUMNS: Record<BlockQuery["sort"], string> = {
  code: "b.code",
  grade: "g.code",
  volume: "b.volume_m3",
  cut_not_before: "b.cut_not_before",
  received: "b.created_at",
  location: "b.location",
  cost: "b.cost",
};

export type { BlockList } from "@/lib/stock-types";
import type { BlockList } from "@/lib/stock-types";

/**
 *   listBlocks({ status: "ready", grade: 2, sort: "received", page: 1, pageSize: 50 })
 * One page of stock, with the count and totals of everything the filters match.
 */
export async function listBlocks(f: BlockQuery, today = isoDate()): Promise<BlockList> {
  const k = db();
  // No filter reads the grade: counting and totals need the blocks alone (a covering index).
  const filtered = applyFilters(k("blocks as b"), f, today);
  // The page's ids first, from the narrow index, so a deep page does not build (and count the
  // defects of) every row it skips; then the full rows of those ids only.
  const pageIds = applyFilters(
    f.sort === "grade" ? k("blocks as b").join("grades as g", "g.id", "b.grade_id") : k("blocks as b"),
    f,
    today,
  )
    .select("b.id")
    .orderBy(SORT_COLUMNS[f.sort], f.dir)
    .orderBy("b.id", f.dir)
    .limit(f.pageSize)
    .offset((f.page - 1) * f.pageSize);
  const pageQ = selectBlocks(k).whereIn("b.id", pageIds).orderBy(SORT_COLUMNS[f.sort], f.dir).orderBy("b.id", f.dir);
  const [rows, totals] = await Promise.all([
    pageQ,
    filtered
      .clone()
      .select(k.raw("count(*) AS n, coalesce(sum(b.volume_m3), 0) AS v, coalesce(sum(b.cost), 0) AS c"))
      .first() as Promise<{ n: string; v: string; c: string } | undefined>,
  ]);
  const items = (rows as Row[]).map((r) => toSummary(r, today));
  await attachFifo(items, today);
  return {
    items,
    total: Number(totals?.n ?? 0),
    totals: { volumeM3: Number(totals?.v ?? 0), value: Number(totals?.c ?? 0) },
    page: f.page,
    pageSize: f.pageSize,
  };
}

/**
 * First-in, first-out position among ready stock of the same grade (oldest moulding/receipt first,
 * `fifo_on`). Ranks in the order of the blocks_fifo index, and only up to the page's latest block
 * in each grade: nothing after it can change the positions shown.
 */
async function attachFifo(items: BlockSummary[], today: string) {
  const ready = items.filter((b) => b.shown === "ready");
  if (!ready.length) return;
  const ids = ready.map((b) => b.id);
  const rows = await db()
    .with(
      "upto",
      db()("blocks").whereIn("id", ids).groupBy("grade_id").select("grade_id", db().raw("max(fifo_on) AS fifo_on")),
    )
    .with(
      "ranked",
      db()("upto as u")
        .join("blocks as b", function () {
          this.on("b.grade_id", "u.grade_id").andOn("b.fifo_on", "<=", "u.fifo_on");
        })
        .select("b.id", db().raw("row_number() OVER (PARTITION BY b.grade_id ORDER BY b.fifo_on, b.id) AS fifo"))
        .where("b.status", "in_stock")
        .where("b.cut_not_before", "<=", today),
    )
    .select("id", "fifo")
    .from("ranked")
    .whereIn("id", ids);
  const byId = new Map((rows as { id: number; fifo: string }[]).map((r) => [r.id, Number(r.fifo)]));
  for (const b of ready) b.fifo = byId.get(b.id) ?? null;
}

export async function getBlock(idOrCode: number | string, today = isoDate()): Promise<BlockDetail | undefined> {
  const q = selectBlocks(db()).select("p.code as parent_code").leftJoin("blocks as p", "p.id", "b.parent_id");
  if (typeof idOrCode === "number") q.where("b.id", idOrCode);
  else q.whereRaw("upper(b.code) = upper(?)", [idOrCode]);
  const r = await q.first();
  if (!r) return undefined;
  const s = toSummary(r as Row, today);
  await attachFifo([s], today);
  return {
    ...s,
    nominalSize: [Number(r.nominal_x), Number(r.nominal_y), Number(r.nominal_z)],
    deliveryId: r.delivery_id,
    parentCode: r.parent_code ?? null,
    originInParent: r.origin_in_parent ? (r.origin_in_parent.map(Number) as Size) : null,
    notes: r.notes,
    poRef: r.po_ref ?? null,
    cureDays: r.cure_days,
    gradeLabel: `${r.grade_system} ${r.grade_name}`,
  };
}

export async function listChildren(
  parentId: number,
): Promise<{ id: number; code: string; size: Size; status: BlockStatus }[]> {
  const rows = await db()("blocks").where({ parent_id: parentId }).orderBy("id");
  return rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    code: r.code as string,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as Size,
    status: r.status as BlockStatus,
  }));
}

export async function listLocations(): Promise<string[]> {
  const rows = await db()("blocks")
    .distinct("location")
    .whereIn("status", ["in_stock", "earmarked"])
    .orderBy("location");
  return rows.map((r: { location: string }) => r.location);
}

export async function updateBlock(id: number, patch: { location?: string; notes?: string | null }, actorId: string) {
  return db().transaction(async (trx) => {
    const n = await trx("blocks")
      .where({ id })
      .update({ ...patch, updated_at: trx.fn.now() });
    if (!n) throw new HttpError(404, "That block was not found.");
    await trx("audit_log").insert({ actor_id: actorId, action: "block.update", subject: `block:${id}`, detail: patch });
  });
}

async function lockAvailable(trx: Knex.Transaction, id: number) {
  const b = await trx("blocks").where({ id }).forUpdate().first();
  if (!b) throw new HttpError(404, "That block was not found.");
  if (b.status === "cut" || b.status === "written_off")
    throw new HttpError(409, `Block ${b.code} is no longer in stock.`);
  if (b.status === "earmarked") throw new HttpError(409, `Block ${b.code} is earmarked for a plan; release it first.`);
  return b as {
    id: number;
    code: string;
    volume_m3: string;
    cost: string;
    size_x: string;
    size_y: string;
    size_z: string;
  };
}

/** Writes a block off (damaged, lost): no hard deletes, the ledger keeps the reason. */
export async function scrapBlock(id: number, reason: string, actorId: string) {
  await db().transaction(async (trx) => {
    const b = await lockAvailable(trx, id);
    await trx("blocks").where({ id }).update({ status: "written_off", updated_at: trx.fn.now() });
    await appendLedger(trx, [
      { blockId: id, kind: "scrapped", volumeM3: Number(b.volume_m3), value: Number(b.cost), userId: actorId, reason },
    ]);
  });
}

/** Re-measures a block; the ledger records the change in volume. */
export async function adjustBlock(id: number, size: Size, reason: string, actorId: string) {
  await db().transaction(async (trx) => {
    const b = await lockAvailable(trx, id);
    const before = Number(b.volume_m3);
    const [after] = await trx("blocks")
      .where({ id })
      .update({ size_x: size[0], size_y: size[1], size_z: size[2], updated_at: trx.fn.now() })
      .returning("volume_m3");
    const delta = Number(after.volume_m3) - before;
    await appendLedger(trx, [{ blockId: id, kind: "adjusted", volumeM3: delta, value: 0, userId: actorId, reason }]);
  });
}

export async function nextBlockCodes(trx: Knex | Knex.Transaction, n: number, prefix = "HF"): Promise<string[]> {
  const codes: string[] = [];
  // Skip numbers someone already used by hand (a code typed on receipt, an imported one).
  while (codes.length < n) {
    const want = n - codes.length;
    const rows = await trx.raw("SELECT nextval('block_code_seq') AS v FROM generate_series(1, ?)", [want]);
    const fresh = (rows.rows as { v: string }[]).map((r) => `${prefix}-${r.v}`);
    const taken = new Set(
      ((await trx("blocks").whereRaw("upper(code) = ANY(?)", [fresh]).pluck("code")) as string[]).map((c) =>
        c.toUpperCase(),
      ),
    );
    codes.push(...fresh.filter((c) => !taken.has(c)));
  }
  return codes;
}

/**
 * Codes of what still stands in stock and came in lately — offcuts cut, or blocks received, in the
 * last `days` days — oldest first, for labelling a batch at once.
 */
export async function recentCodes(kind: "offcuts" | "received", days: number, limit: number): Promise<string[]> {
  const q = db()("blocks")
    .whereIn("status", ["in_stock", "earmarked"])
    .where("created_at", ">=", db().raw("now() - make_interval(days => ?)", [days]))
    .orderBy([{ column: "created_at" }, { column: "id" }])
    .limit(limit)
    .pluck("code");
  if (kind === "offcuts") q.whereNotNull("parent_id");
  else q.whereNull("parent_id");
  return (await q) as string[];
}
