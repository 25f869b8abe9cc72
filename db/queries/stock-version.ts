import "server-only";
import { db } from "@/db";

/**
 * Figures over many blocks kept between requests in this process, each under the stock version it
 * was read at (table `stock_version`: every transaction that writes `blocks` adds one in its own
 * commit, migration 20261205000200). A figure is used only while the version reads the same, so a
 * write by any process or machine makes the next answer read it afresh. Bounded: the oldest
 * entries go first.
 */
const kept = new Map<string, { v: number; value: unknown }>();
const MAX_KEPT = 500;

// The version is selected beside other columns as the literal `(SELECT v FROM stock_version WHERE id = 1)`
// (written out where used: SQL text is never built from variables; tests/api/security.test.ts).

/**
 *   const v = await stockVersion();   // 412
 * The register's version now (one row, by primary key).
 */
export async function stockVersion(): Promise<number> {
  const r = (await db().raw(`SELECT (SELECT v FROM stock_version WHERE id = 1) AS v`)) as {
    rows: { v: number | null }[];
  };
  return Number(r.rows[0]?.v ?? 0);
}

/**
 *   keptAt<Totals>("totals:…", 412)   // what was kept for that key at version 412, else undefined
 */
export function keptAt<T>(key: string, v: number): T | undefined {
  const e = kept.get(key);
  return e && e.v === v ? (e.value as T) : undefined;
}

/** Whether anything is kept for `key`, at whatever version. */
export function hasKept(key: string): boolean {
  return kept.has(key);
}

/**
 *   keep("totals:…", 412, { n: 35_000, … })
 * Keeps a figure read at version `v` (read in the same statement, or before the figure).
 */
export function keep(key: string, v: number, value: unknown): void {
  kept.delete(key);
  kept.set(key, { v, value });
  if (kept.size > MAX_KEPT) kept.delete(kept.keys().next().value!);
}

/**
 *   const locations = await byStockVersion("locations", () => readLocations());
 * A figure kept per stock version: the version is read first, so the figure is at least as new.
 */
export async function byStockVersion<T>(key: string, read: () => Promise<T>): Promise<T> {
  const v = await stockVersion();
  const hit = keptAt<T>(key, v);
  if (hit !== undefined) return hit;
  const value = await read();
  keep(key, v, value);
  return value;
}
