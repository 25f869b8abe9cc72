import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { prepared } from "@/db/prepared";
import type { BlocksRow, DeliveriesRow, GradesRow } from "@/db/tables";
import { appendLedger, toEntry, type LedgerEntry, type LedgerRow } from "./ledger";
import { toDefect, toZoneEvent, type Defect, type DefectRow, type ZoneEvent, type ZoneHistoryRow } from "./defects";
import { byStockVersion, hasKept, keep, keptAt } from "./stock-version";
import { HttpError } from "@/lib/errors";
import {
  HOLD_LABELS,
  OVER_DENSITY_FACTOR,
  PHYSICAL_STATUSES,
  densityHold,
  isoDate,
  shownStatus,
  type BlockStatus,
  type HoldReason,
} from "@/lib/stock";
import type { BlockQuery } from "@/lib/validations/stock";

import type { Vec3 } from "@/lib/nesting";
import type { BlockSummary } from "@/lib/stock-types";

export type { BlockSummary };

export interface BlockDetail extends BlockSummary {
  nominalSize: Vec3;
  deliveryId: number | null;
  parentCode: string | null;
  originInParent: Vec3 | null;
  notes: string | null;
  poRef: string | null;
  cureDays: number;
  gradeLabel: string;
}

/** "b.code" → "code": the block columns a select names. */
type Unprefixed<T> = T extends `b.${infer C extends keyof BlocksRow}` ? C : never;

/** A block as selectBlocks reads it (summary columns): the block, its grade, its delivery (none for an offcut) and who holds it. */
type Row = Pick<BlocksRow, Unprefixed<(typeof SUMMARY_COLUMNS)[number]>> &
  Pick<GradesRow, "material" | "never_hot_wire" | "colour" | "min_density_kg_m3"> & {
    grade_code: string;
    received_on: DeliveriesRow["received_on"] | null;
    supplier_name: string | null;
    held_by_name: string | null;
    /** count(*): BIGINT, a number (db/types.ts). */
    defect_count: number;
    fifo?: number | null;
  };

function toSummary(r: Row, today: string): BlockSummary {
  const size: Vec3 = [Number(r.size_x), Number(r.size_y), Number(r.size_z)];
  const volume = Number(r.volume_m3);
  const weight = r.weight_kg === null ? null : Number(r.weight_kg);
  // DATE columns arrive as their 'YYYY-MM-DD' text (db/types.ts).
  const cnb = r.cut_not_before;
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
    mouldedOn: r.moulded_on,
    cutNotBefore: cnb,
    status: r.status,
    shown: shownStatus(r.status, cnb, today),
    isOffcut: r.parent_id !== null,
    parentId: r.parent_id,
    defectCount: Number(r.defect_count ?? 0),
    fifo: r.fifo === null || r.fifo === undefined ? null : Number(r.fifo),
    receivedOn: r.received_on,
    supplier: r.supplier_name,
    hold:
      r.status === "on_hold" && r.hold_reason && r.held_at
        ? {
            reason: r.hold_reason,
            note: r.hold_note,
            since: new Date(r.held_at).toISOString(),
            by: r.held_by_name ?? null,
          }
        : null,
  };
}

/** The block columns a summary (toSummary) reads: a list page parses no more than these per row. */
const SUMMARY_COLUMNS = [
  "b.id",
  "b.code",
  "b.grade_id",
  "b.lot",
  "b.parent_id",
  "b.size_x",
  "b.size_y",
  "b.size_z",
  "b.volume_m3",
  "b.weight_kg",
  "b.cost",
  "b.location",
  "b.moulded_on",
  "b.cut_not_before",
  "b.status",
  "b.hold_reason",
  "b.hold_note",
  "b.held_at",
] as const;

/** What getBlock reads beyond a summary. */
const DETAIL_COLUMNS = [
  "b.delivery_id",
  "b.origin_in_parent",
  "b.nominal_x",
  "b.nominal_y",
  "b.nominal_z",
  "b.notes",
  "g.cure_days",
  "g.grade_system",
  "g.grade as grade_name",
  "d.po_ref",
] as const;

/**
 *   selectBlocks(db())          // the columns of a BlockSummary
 *   selectBlocks(db(), true)    // and those of a BlockDetail
 * Base select with grade, delivery, supplier, who holds it and the defect count. Only the columns
 * the answer uses: parsing the rows is much of what a list page costs (the stock list API reads 50
 * at a time under load).
 */
function selectBlocks(k: Knex, detail = false) {
  return k("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .leftJoin("deliveries as d", "d.id", "b.delivery_id")
    .leftJoin("suppliers as s", "s.id", "d.supplier_id")
    .leftJoin("users as hu", "hu.id", "b.held_by")
    .select(
      ...SUMMARY_COLUMNS,
      ...(detail ? DETAIL_COLUMNS : []),
      "hu.name as held_by_name",
      "g.code as grade_code",
      "g.material",
      "g.never_hot_wire",
      "g.colour",
      "g.min_density_kg_m3",
      "d.received_on",
      "s.name as supplier_name",
      k.raw("(SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id AND z.removed_at IS NULL) AS defect_count"),
    );
}

/**
 * Blocks (`b`) whose code a person typed: a bare number is the number on the label (it finds
 * HF-1047 and its offcuts HF-1047.1…, not HF-10470); anything else is the start of the code.
 *   whereCodeMatches(db()("blocks as b"), "hf-10") // HF-1001, HF-1002.1, …
 */
export function whereCodeMatches(q: Knex.QueryBuilder, text: string): Knex.QueryBuilder {
  if (/^\d+$/.test(text)) return q.whereRaw("b.code ~ ?", [`(^|[^0-9])${text}([^0-9]|$)`]);
  return q.whereRaw("upper(b.code) LIKE ?", [`${text.toUpperCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`]);
}

function applyFilters(q: Knex.QueryBuilder, f: BlockQuery, today: string) {
  if (f.q) whereCodeMatches(q, f.q);
  if (f.grade) q.where("b.grade_id", f.grade);
  if (f.location) q.where("b.location", f.location);
  if (f.minLength !== undefined) q.whereRaw("GREATEST(b.size_x, b.size_y, b.size_z) >= ?", [f.minLength]);
  if (f.maxLength !== undefined) q.whereRaw("GREATEST(b.size_x, b.size_y, b.size_z) <= ?", [f.maxLength]);
  if (f.minVolume !== undefined) q.where("b.volume_m3", ">=", f.minVolume);
  if (f.offcuts === "only") q.whereNotNull("b.parent_id");
  if (f.offcuts === "exclude") q.whereNull("b.parent_id");
  switch (f.status ?? "available") {
    case "available":
      // What stands in the yard: held blocks too, shown with their hold (not free to plan).
      q.whereIn("b.status", PHYSICAL_STATUSES);
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
  grade: "b.grade_code",
  volume: "b.volume_m3",
  cut_not_before: "b.cut_not_before",
  received: "b.created_at",
  location: "b.location",
  cost: "b.cost",
};
/** The SQL type of each sort column, to read a cursor's value back exactly (timestamps to the µs). */
const SORT_TYPES: Record<BlockQuery["sort"], string> = {
  code: "text",
  grade: "text",
  volume: "numeric",
  cut_not_before: "date",
  received: "timestamptz",
  location: "text",
  cost: "numeric",
};

/** A cursor names one row of one ordering: its sort value (as Postgres writes it) and its id. */
function encodeCursor(sort: BlockQuery["sort"], key: string, id: number): string {
  return Buffer.from(JSON.stringify([sort, key, id])).toString("base64url");
}
function decodeCursor(sort: BlockQuery["sort"], cursor: string, param: "after" | "before"): [string, number] {
  try {
    const [s, key, id] = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8")) as [string, string, number];
    if (s === sort && typeof key === "string" && Number.isSafeInteger(id)) return [key, id];
  } catch {
    /* refused below */
  }
  throw new HttpError(400, `${param} is not a cursor of this list (sort "${sort}"): start again from the first page.`);
}

export type { BlockList } from "@/lib/stock-types";
import type { BlockList } from "@/lib/stock-types";

/** The count and totals of everything a filter matches. */
interface Totals {
  n: number;
  v: number;
  c: number;
}

/** Everything that decides which rows match (not their order or page), and the day `ready` is judged on. */
function filterKey(f: BlockQuery, today: string): string {
  const { q, grade, status, location, minLength, maxLength, minVolume, offcuts } = f;
  return `totals:${today}:${JSON.stringify([q, grade, status, location, minLength, maxLength, minVolume, offcuts])}`;
}

/**
 *   listBlocks({ status: "ready", grade: 2, sort: "received", page: 1, pageSize: 50 })
 *   listBlocks({ ..., after: list.next })   // the next page, by keyset
 * One page of stock, with the count and totals of everything the filters match. With `after` or
 * `before` the page is found by keyset (the row the cursor names, then the index onwards), so a
 * deep page costs what the first does; `page` alone is offset paging, kept for links people saved.
 *
 * One statement reads the page's ids and then their rows with grade, supplier, defect count and
 * the stock version; the count and totals (a pass over every matching row) and the FIFO positions are kept
 * per filter and stock version (stock-version.ts), so they are read again only after a write to
 * `blocks`: while stock stands still, a page is that one statement.
 */
export async function listBlocks(f: BlockQuery, today = isoDate()): Promise<BlockList> {
  const k = db();
  const col = SORT_COLUMNS[f.sort];
  const backwards = !f.after && !!f.before;
  const dir = backwards ? (f.dir === "asc" ? "desc" : "asc") : f.dir;
  const cursor = f.after ?? f.before;
  // The page's ids from the narrow index (or a sort of narrow rows, for a column without one), then
  // the full rows of those ids only, in the same statement: a deep page does not build (or count
  // the defects of) any row it skips. One row more than the page tells whether there is a page beyond.
  const ids = applyFilters(k("blocks as b"), f, today)
    .select("b.id")
    .orderBy(col, dir)
    .orderBy("b.id", dir)
    .limit(f.pageSize + 1);
  if (cursor) {
    const [key, id] = decodeCursor(f.sort, cursor, f.after ? "after" : "before");
    ids.whereRaw(`(${col}, b.id) ${dir === "asc" ? ">" : "<"} (CAST(? AS ${SORT_TYPES[f.sort]}), ?)`, [key, id]);
  } else ids.offset((f.page - 1) * f.pageSize);
  const page = selectBlocks(k)
    .select(k.raw(`${col}::text AS sort_key`), k.raw(`(SELECT v FROM stock_version WHERE id = 1) AS stock_v`))
    .whereIn("b.id", ids)
    .orderBy(col, dir)
    .orderBy("b.id", dir);
  const key = filterKey(f, today);
  const readTotals = async (): Promise<Totals> => {
    const r = (await applyFilters(k("blocks as b"), f, today)
      .select(
        k.raw(
          `count(*) AS n, coalesce(sum(b.volume_m3), 0) AS v, coalesce(sum(b.cost), 0) AS c, (SELECT v FROM stock_version WHERE id = 1) AS stock_v`,
        ),
      )
      .first()) as (Totals & { stock_v: number }) | undefined;
    const t = { n: Number(r?.n ?? 0), v: Number(r?.v ?? 0), c: Number(r?.c ?? 0) };
    keep(key, Number(r?.stock_v ?? -1), t);
    return t;
  };
  // Kept totals are checked against the version the page's statement read; none kept: both at once.
  const rowsQ = prepared(page) as unknown as Promise<(Row & { sort_key: string; stock_v: number })[]>;
  const [found, fresh] = await Promise.all([rowsQ, hasKept(key) ? null : readTotals()]);
  const v = Number(found[0]?.stock_v ?? -1);
  // An empty first page is the answer's totals too: nothing matches (same filters, same snapshot).
  const none = !found.length && !cursor && f.page === 1 ? { n: 0, v: 0, c: 0 } : undefined;
  const totals = fresh ?? none ?? keptAt<Totals>(key, v) ?? (await readTotals());
  const more = found.length > f.pageSize;
  const rows = found.slice(0, f.pageSize);
  if (backwards) rows.reverse();
  const items = rows.map((r) => toSummary(r, today));
  await withFifo(items, today, v);
  const first = rows[0];
  const last = rows.at(-1);
  // Forwards, a page beyond exists when the extra row came; backwards, when it came the other way.
  const hasNext = backwards ? true : more;
  const hasPrev = backwards ? more : !!f.after || (!cursor && f.page > 1);
  return {
    items,
    total: totals.n,
    totals: { volumeM3: totals.v, value: totals.c },
    page: f.page,
    pageSize: f.pageSize,
    next: hasNext && last ? encodeCursor(f.sort, last.sort_key, last.id) : null,
    prev: hasPrev && first ? encodeCursor(f.sort, first.sort_key, first.id) : null,
  };
}

/**
 *   await withFifo(rows, today, v)
 * Sets each ready row's first-in, first-out position among ready stock of the same grade (oldest
 * moulding/receipt first, `fifo_on`, then id; the blocks_fifo index order). The positions of the
 * whole register are ranked in one statement and kept per stock version and day, so while stock
 * does not change a page at any depth costs no ranking at all.
 */
async function withFifo(items: BlockSummary[], today: string, v: number): Promise<void> {
  const ready = items.filter((b) => b.shown === "ready");
  if (!ready.length) return;
  const key = `fifo:${today}`;
  let positions = keptAt<Map<number, number>>(key, v);
  if (!positions) {
    // The version in the same statement as the ranking (a row even when nothing is ready).
    const r = (await db().raw(
      `SELECT sv.v AS stock_v, f.id, f.fifo
         FROM stock_version sv
         LEFT JOIN (SELECT id, row_number() OVER (PARTITION BY grade_id ORDER BY fifo_on, id) AS fifo
                      FROM blocks WHERE status = 'in_stock' AND cut_not_before <= ?) f ON true
        WHERE sv.id = 1`,
      [today],
    )) as { rows: { stock_v: number; id: number | null; fifo: number | null }[] };
    positions = new Map();
    for (const row of r.rows) if (row.id !== null) positions.set(row.id, Number(row.fifo));
    keep(key, Number(r.rows[0]?.stock_v ?? -1), positions);
  }
  for (const b of ready) b.fifo = positions.get(b.id) ?? null;
}

/** A block as getBlock reads it: the summary columns, DETAIL_COLUMNS, its parent's code and the stock version. */
type DetailRow = Row &
  Pick<BlocksRow, "delivery_id" | "origin_in_parent" | "nominal_x" | "nominal_y" | "nominal_z" | "notes"> & {
    cure_days: number;
    grade_system: string;
    grade_name: string;
    po_ref: string | null;
    parent_code: string | null;
    stock_v: number;
  };

/** A detail select (selectBlocks with detail) with its parent's code and the stock version, for one block by id or code. */
function selectDetail(k: Knex, idOrCode: number | string) {
  const q = selectBlocks(k, true)
    .select("p.code as parent_code", k.raw(`(SELECT v FROM stock_version WHERE id = 1) AS stock_v`))
    .leftJoin("blocks as p", "p.id", "b.parent_id");
  if (typeof idOrCode === "number") q.where("b.id", idOrCode);
  else q.whereRaw("upper(b.code) = upper(?)", [idOrCode]);
  return q;
}

async function toDetail(r: DetailRow, today: string): Promise<BlockDetail> {
  const s = toSummary(r, today);
  await withFifo([s], today, Number(r.stock_v));
  return {
    ...s,
    nominalSize: [Number(r.nominal_x), Number(r.nominal_y), Number(r.nominal_z)],
    deliveryId: r.delivery_id,
    parentCode: r.parent_code ?? null,
    originInParent: r.origin_in_parent ? (r.origin_in_parent.map(Number) as Vec3) : null,
    notes: r.notes,
    poRef: r.po_ref ?? null,
    cureDays: r.cure_days,
    gradeLabel: `${r.grade_system} ${r.grade_name}`,
  };
}

export async function getBlock(idOrCode: number | string, today = isoDate()): Promise<BlockDetail | undefined> {
  const r = (await prepared(selectDetail(db(), idOrCode).first())) as DetailRow | undefined;
  return r ? toDetail(r, today) : undefined;
}

export interface Offcut {
  id: number;
  code: string;
  size: Vec3;
  status: BlockStatus;
}

/** Everything the block page shows, read in one statement (getBlockPage). */
export interface BlockPage {
  block: BlockDetail;
  /** Its defect zones in force, with photos. */
  defects: Defect[];
  /** The offcuts kept from it. */
  offcuts: Offcut[];
  /** Its ledger movements, newest first: the latest `historyLimit`. */
  history: LedgerEntry[];
  /** How many movements it has in all. */
  historyCount: number;
  /** Its zones flagged, corrected and removed (audit log), newest first: the latest `historyLimit`. */
  zoneHistory: ZoneEvent[];
  zoneHistoryCount: number;
}

/** Most movements and zone events the block page reads, also when asked for all of them. */
export const BLOCK_PAGE_HISTORY_MAX = 500;

/**
 *   getBlockPage("HF-1047")                       // the latest 20 movements and zone events
 *   getBlockPage("HF-1047", { historyLimit: 500 }) // up to 500 of each
 * The block page's data — the block, its defect zones with photos, its offcuts, its latest ledger
 * movements and zone events with their counts — in one prepared statement (JSON sub-selects), not
 * one per list: a page is then one round trip and one pooled connection, which is what it costs
 * most under load (each statement waits for a connection, and for the event loop to take its
 * answer, while the request holds the others).
 */
export async function getBlockPage(
  code: string,
  opts: { historyLimit?: number; today?: string } = {},
): Promise<BlockPage | undefined> {
  const k = db();
  const limit = Math.min(Math.max(1, Math.trunc(opts.historyLimit ?? 20)), BLOCK_PAGE_HISTORY_MAX);
  const q = selectDetail(k, code).select(
    k.raw(
      `coalesce((SELECT json_agg(json_build_object('id', z.id, 'block_id', z.block_id, 'kind', z.kind,
         'min_x', z.min_x, 'min_y', z.min_y, 'min_z', z.min_z, 'max_x', z.max_x, 'max_y', z.max_y, 'max_z', z.max_z,
         'found_by', z.found_by, 'found_at', z.found_at, 'note', z.note, 'inherited_from', z.inherited_from,
         'updated_at', z.updated_at, 'found_by_name', zf.name, 'updated_by_name', ze.name,
         'photo_list', coalesce((SELECT json_agg(json_build_object('id', ph.id, 'contentType', ph.content_type,
            'bytes', ph.bytes, 'width', ph.width, 'height', ph.height, 'uploadedAt', ph.uploaded_at) ORDER BY ph.id)
            FROM defect_photos ph WHERE ph.defect_id = z.id), '[]')) ORDER BY z.id)
         FROM defect_zones z LEFT JOIN users zf ON zf.id = z.found_by LEFT JOIN users ze ON ze.id = z.updated_by
        WHERE z.block_id = b.id AND z.removed_at IS NULL), '[]') AS page_defects,
       coalesce((SELECT json_agg(json_build_object('id', c.id, 'code', c.code, 'size_x', c.size_x, 'size_y', c.size_y,
         'size_z', c.size_z, 'status', c.status) ORDER BY c.id)
         FROM blocks c WHERE c.parent_id = b.id), '[]') AS page_offcuts,
       coalesce((SELECT json_agg(json_build_object('id', l.id, 'block_id', l.block_id, 'kind', l.kind,
         'volume_m3', l.volume_m3, 'delta_m3', l.delta_m3, 'value', l.value, 'delta_value', l.delta_value,
         'user_name', l.user_name, 'at', l.at, 'reason', l.reason, 'ref', l.ref) ORDER BY l.at DESC, l.id DESC)
         FROM (SELECT l.id, l.block_id, l.kind, l.volume_m3, l.delta_m3, l.value, l.delta_value, l.at, l.reason, l.ref,
                      lu.name AS user_name
                 FROM stock_ledger l LEFT JOIN users lu ON lu.id = l.user_id
                WHERE l.block_id = b.id ORDER BY l.at DESC, l.id DESC LIMIT ?) l), '[]') AS page_history,
       (SELECT count(*) FROM stock_ledger l WHERE l.block_id = b.id) AS page_history_count,
       coalesce((SELECT json_agg(json_build_object('id', a.id, 'action', a.action, 'detail', a.detail, 'at', a.at,
         'name', a.name) ORDER BY a.at DESC, a.id DESC)
         FROM (SELECT a.id, a.action, a.detail, a.at, au.name
                 FROM audit_log a LEFT JOIN users au ON au.id = a.actor_id
                WHERE a.subject = 'block:' || b.id AND a.action IN ('defect.create', 'defect.update', 'defect.remove')
                ORDER BY a.at DESC, a.id DESC LIMIT ?) a), '[]') AS page_zone_history,
       (SELECT count(*) FROM audit_log a
         WHERE a.subject = 'block:' || b.id AND a.action IN ('defect.create', 'defect.update', 'defect.remove'))
         AS page_zone_history_count`,
      [limit, limit],
    ),
  );
  const r = (await prepared(q.first())) as
    | (DetailRow & {
        page_defects: DefectRow[];
        page_offcuts: {
          id: number;
          code: string;
          size_x: number;
          size_y: number;
          size_z: number;
          status: BlockStatus;
        }[];
        page_history: Omit<LedgerRow, "code">[];
        page_history_count: number;
        page_zone_history: ZoneHistoryRow[];
        page_zone_history_count: number;
      })
    | undefined;
  if (!r) return undefined;
  const block = await toDetail(r, opts.today ?? isoDate());
  return {
    block,
    defects: r.page_defects.map(toDefect),
    offcuts: r.page_offcuts.map((c) => ({
      id: c.id,
      code: c.code,
      size: [Number(c.size_x), Number(c.size_y), Number(c.size_z)],
      status: c.status,
    })),
    history: r.page_history.map((l) => toEntry({ ...l, code: block.code })),
    historyCount: Number(r.page_history_count),
    zoneHistory: r.page_zone_history.map(toZoneEvent),
    zoneHistoryCount: Number(r.page_zone_history_count),
  };
}

export async function listChildren(parentId: number): Promise<Offcut[]> {
  const rows = await prepared(
    db()("blocks")
      .where({ parent_id: parentId })
      .orderBy("id")
      .select("id", "code", "size_x", "size_y", "size_z", "status"),
  );
  return rows.map((r) => ({ id: r.id, code: r.code, size: [r.size_x, r.size_y, r.size_z] as Vec3, status: r.status }));
}

/** Where stock stands now, A to Z (kept per stock version: it is a pass over every block in stock). */
export async function listLocations(): Promise<string[]> {
  const kept = await byStockVersion("locations", async () => {
    const rows = await db()("blocks").distinct("location").whereIn("status", PHYSICAL_STATUSES).orderBy("location");
    return rows.map((r: { location: string }) => r.location);
  });
  return kept.slice();
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

const NO_HOLD = { hold_reason: null, hold_note: null, held_at: null, held_by: null };

async function lockAvailable(trx: Knex.Transaction, id: number) {
  const b = await trx("blocks").where({ id }).forUpdate().first();
  if (!b) throw new HttpError(404, "That block was not found.");
  if (b.status === "cut" || b.status === "written_off")
    throw new HttpError(409, `Block ${b.code} is no longer in stock.`);
  if (b.status === "earmarked") throw new HttpError(409, `Block ${b.code} is earmarked for a plan; release it first.`);
  return b;
}

/** Writes a block off (damaged, lost): no hard deletes, the ledger keeps the reason. */
export async function scrapBlock(id: number, reason: string, actorId: string) {
  await db().transaction(async (trx) => {
    const b = await lockAvailable(trx, id);
    await trx("blocks")
      .where({ id })
      .update({ status: "written_off", ...NO_HOLD, updated_at: trx.fn.now() });
    await appendLedger(trx, [
      { blockId: id, kind: "scrapped", volumeM3: Number(b.volume_m3), value: Number(b.cost), userId: actorId, reason },
    ]);
  });
}

/** Re-measures a block; the ledger records the change in volume. */
export async function adjustBlock(id: number, size: Vec3, reason: string, actorId: string) {
  await db().transaction(async (trx) => {
    const b = await lockAvailable(trx, id);
    const before = Number(b.volume_m3);
    const [after] = await trx("blocks")
      .where({ id })
      .update({ size_x: size[0], size_y: size[1], size_z: size[2], updated_at: trx.fn.now() })
      .returning("volume_m3");
    const delta = Number(after!.volume_m3) - before;
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
    .whereIn("status", PHYSICAL_STATUSES)
    .where("created_at", ">=", db().raw("now() - make_interval(days => ?)", [days]))
    .orderBy([{ column: "created_at" }, { column: "id" }])
    .limit(limit)
    .pluck("code");
  if (kind === "offcuts") q.whereNotNull("parent_id");
  else q.whereNull("parent_id");
  return (await q) as string[];
}

/**
 *   holdBlock(12, { reason: "wet", note: "Water in the core at the saw" }, userId)
 * Holds a block out of usable stock: not on hand for reorder sums, not offered to planning, until
 * released. Only a free block (in stock, not earmarked for a plan) is held; the ledger keeps who,
 * when and why (a zero movement), and so does the audit log.
 */
export async function holdBlock(
  id: number,
  hold: { reason: HoldReason; note: string | null },
  actorId: string,
): Promise<void> {
  await db().transaction(async (trx) => {
    const b = await trx("blocks")
      .where({ id })
      .forUpdate()
      .first("id", "code", "status", "hold_reason", "volume_m3", "cost");
    if (!b) throw new HttpError(404, "That block was not found.");
    if (b.status === "on_hold")
      throw new HttpError(
        409,
        `Block ${b.code} is already on hold (${HOLD_LABELS[b.hold_reason as HoldReason] ?? b.hold_reason}); release it first to change the reason.`,
      );
    if (b.status === "earmarked") {
      const run = await trx("plan_blocks").where({ block_id: id, status: "reserved" }).first("run_id");
      throw new HttpError(
        409,
        `Block ${b.code} is earmarked for ${run ? `plan #${run.run_id}` : "a plan"}: release it from the plan first, then put it on hold.`,
      );
    }
    if (b.status !== "in_stock") throw new HttpError(409, `Block ${b.code} is no longer in stock.`);
    await trx("blocks").where({ id }).update({
      status: "on_hold",
      hold_reason: hold.reason,
      hold_note: hold.note,
      held_at: trx.fn.now(),
      held_by: actorId,
      updated_at: trx.fn.now(),
    });
    await appendLedger(trx, [
      {
        blockId: id,
        kind: "held",
        volumeM3: Number(b.volume_m3),
        value: Number(b.cost),
        userId: actorId,
        reason: `On hold: ${HOLD_LABELS[hold.reason]}${hold.note ? ` · ${hold.note}` : ""}`,
      },
    ]);
    await trx("audit_log").insert({ actor_id: actorId, action: "block.hold", subject: `block:${id}`, detail: hold });
  });
}

/**
 *   releaseBlock(12, { weightKg: 171.5, note: null }, userId)
 * Puts a held block back into usable stock, with its new weight when it was weighed again. A block
 * whose density is (still) outside its grade is released only with a note saying why it may be
 * used anyway; otherwise it stays on hold (claim it, or write it off).
 */
export async function releaseBlock(
  id: number,
  input: { weightKg: number | null; note: string | null },
  actorId: string,
): Promise<void> {
  await db().transaction(async (trx) => {
    const b = await trx("blocks as b")
      .join("grades as g", "g.id", "b.grade_id")
      .where("b.id", id)
      .forUpdate("b")
      .first(
        "b.id",
        "b.code",
        "b.status",
        "b.hold_reason",
        "b.weight_kg",
        "b.volume_m3",
        "b.cost",
        "g.code as grade_code",
        "g.min_density_kg_m3",
      );
    if (!b) throw new HttpError(404, "That block was not found.");
    if (b.status !== "on_hold") throw new HttpError(409, `Block ${b.code} is not on hold.`);
    const weight = input.weightKg ?? (b.weight_kg === null ? null : Number(b.weight_kg));
    const density = weight === null ? null : weight / Number(b.volume_m3);
    const min = b.min_density_kg_m3 === null ? null : Number(b.min_density_kg_m3);
    const off = densityHold(density, min);
    if (off && !input.note) {
      const where =
        off === "under_density"
          ? `still below the ${b.grade_code} minimum of ${min} kg/m³`
          : `more than ${OVER_DENSITY_FACTOR} × the ${b.grade_code} minimum of ${min} kg/m³`;
      throw new HttpError(
        409,
        `Block ${b.code} weighs in at ${density!.toFixed(1)} kg/m³, ${where}. Keep it on hold and claim it from the supplier or write it off; to use it anyway, say why in the note.`,
        { note: `Say why ${b.code} may be used at ${density!.toFixed(1)} kg/m³.` },
      );
    }
    await trx("blocks")
      .where({ id })
      .update({
        status: "in_stock",
        ...NO_HOLD,
        ...(input.weightKg !== null ? { weight_kg: input.weightKg } : {}),
        updated_at: trx.fn.now(),
      });
    const parts = [
      `Was on hold: ${HOLD_LABELS[b.hold_reason as HoldReason] ?? b.hold_reason}`,
      input.weightKg !== null && density !== null
        ? `re-weighed ${input.weightKg} kg (${density.toFixed(1)} kg/m³)`
        : null,
      input.note,
    ].filter(Boolean);
    await appendLedger(trx, [
      {
        blockId: id,
        kind: "hold_released",
        volumeM3: Number(b.volume_m3),
        value: Number(b.cost),
        userId: actorId,
        reason: parts.join(" · "),
      },
    ]);
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "block.release",
      subject: `block:${id}`,
      detail: { was: b.hold_reason, weightKg: input.weightKg, note: input.note },
    });
  });
}
