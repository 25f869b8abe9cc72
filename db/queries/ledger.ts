import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { LedgerKind } from "@/lib/stock";

export interface LedgerEntryInput {
  blockId: number;
  kind: LedgerKind;
  volumeM3: number;
  value: number;
  userId: string | null;
  reason?: string | null;
  ref?: string | null;
  at?: Date;
}

/** The sign each kind applies to stock on hand: reserve and release move nothing in or out. */
const ON_HAND_SIGN: Record<LedgerKind, number> = {
  received: 1,
  offcut_created: 1,
  consumed: -1,
  scrapped: -1,
  adjusted: 1, // adjustments carry their own sign in volume/value
  reversed: 1, // so do reversals of an undone recording
  reserved: 0,
  released: 0,
  // A hold keeps the block owned and in the yard; it only stops it being used.
  held: 0,
  hold_released: 0,
};

/** Appends movements (inside the caller's transaction: a movement never stands without its change). */
export async function appendLedger(trx: Knex.Transaction | Knex, entries: LedgerEntryInput[]): Promise<void> {
  if (!entries.length) return;
  const rows = entries.map((e) => ({
    block_id: e.blockId,
    kind: e.kind,
    volume_m3: Math.abs(e.volumeM3),
    delta_m3: ON_HAND_SIGN[e.kind] * e.volumeM3,
    value: Math.abs(e.value),
    delta_value: ON_HAND_SIGN[e.kind] * e.value,
    user_id: e.userId,
    reason: e.reason ?? null,
    ref: e.ref ?? null,
    ...(e.at ? { at: e.at } : {}),
  }));
  for (let i = 0; i < rows.length; i += 1000) await trx("stock_ledger").insert(rows.slice(i, i + 1000));
}

export interface LedgerEntry {
  id: number;
  blockId: number;
  blockCode: string;
  kind: LedgerKind;
  volumeM3: number;
  deltaM3: number;
  value: number;
  deltaValue: number;
  user: string | null;
  at: string;
  reason: string | null;
  ref: string | null;
}

/** A movement with its block's code and who made it: as listLedgerEntries reads it, or as JSON (`at` then ISO text). */
export interface LedgerRow {
  id: number;
  block_id: number;
  code: string;
  kind: LedgerKind;
  volume_m3: number;
  delta_m3: number;
  value: number;
  delta_value: number;
  user_name: string | null;
  at: Date | string;
  reason: string | null;
  ref: string | null;
}

export const toEntry = (r: LedgerRow): LedgerEntry => ({
  id: Number(r.id),
  blockId: r.block_id,
  blockCode: r.code,
  kind: r.kind,
  volumeM3: Number(r.volume_m3),
  deltaM3: Number(r.delta_m3),
  value: Number(r.value),
  deltaValue: Number(r.delta_value),
  user: r.user_name,
  at: new Date(r.at).toISOString(),
  reason: r.reason,
  ref: r.ref,
});

export interface LedgerQuery {
  blockId?: number;
  kind?: LedgerKind;
  from?: string;
  to?: string;
  /** Keyset paging: only entries older than this entry (by time, then id), newest first. */
  before?: number;
  page?: number;
  pageSize?: number;
}

function ledgerBase(q: LedgerQuery) {
  const k = db()("stock_ledger as l").join("blocks as b", "b.id", "l.block_id");
  if (q.blockId) k.where("l.block_id", q.blockId);
  if (q.kind) k.where("l.kind", q.kind);
  if (q.from) k.where("l.at", ">=", q.from);
  if (q.to) k.where("l.at", "<", db().raw("?::date + 1", [q.to]));
  return k;
}

/**
 * One page of the ledger, newest first, with the filters' total and the cursor to the next older
 * page (`older`: pass it back as `before`; null on the last page). Keyset paging: a page stays
 * right while new movements are written, and page 500 costs what page 1 does.
 *
 *   listLedger({ kind: "consumed", pageSize: 100 })            // { items, total, older: 8841 }
 *   listLedger({ kind: "consumed", pageSize: 100, before: 8841 })
 */
export async function listLedger(
  q: LedgerQuery,
): Promise<{ items: LedgerEntry[]; total: number; older: number | null }> {
  const pageSize = q.pageSize ?? 100;
  const [rows, count] = await Promise.all([
    listLedgerEntries({ ...q, pageSize: pageSize + 1 }),
    ledgerBase({ ...q, before: undefined })
      .count<{ n: number }[]>({ n: "*" })
      .first(),
  ]);
  const items = rows.slice(0, pageSize);
  const older = rows.length > pageSize ? (items[items.length - 1]?.id ?? null) : null;
  return { items, total: Number(count?.n ?? 0), older };
}

/** One page of ledger entries, newest first, without counting them all (a block's history, exports). */
export async function listLedgerEntries(q: LedgerQuery): Promise<LedgerEntry[]> {
  const pageSize = q.pageSize ?? 100;
  const page = q.page ?? 1;
  const base = ledgerBase(q);
  if (q.before) base.whereRaw("(l.at, l.id) < (SELECT x.at, x.id FROM stock_ledger x WHERE x.id = ?)", [q.before]);
  const rows = await base
    .leftJoin("users as u", "u.id", "l.user_id")
    .select("l.*", "b.code", "u.name as user_name")
    .orderBy([
      { column: "l.at", order: "desc" },
      { column: "l.id", order: "desc" },
    ])
    .limit(pageSize)
    .offset((page - 1) * pageSize);
  return (rows as LedgerRow[]).map(toEntry);
}

/** Stock on hand according to the ledger (m³ and value): the figure every page must agree with. */
export async function ledgerOnHand(trx: Knex | Knex.Transaction = db()): Promise<{ m3: number; value: number }> {
  const r = await trx("stock_ledger").sum({ m3: "delta_m3", value: "delta_value" }).first();
  return { m3: Number(r?.m3 ?? 0), value: Number(r?.value ?? 0) };
}
