import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import knex, { type Knex } from "knex";
import { afterAll, describe, expect, it } from "vitest";
import { backupDatabase, restoreDatabase, withDatabase } from "@/scripts/backup";
import { closeTestDb, makeBlock } from "../support/db";

/**
 * `npm run db:backup` / `db:restore` in one round trip: the test database is dumped, restored
 * into a fresh database beside it, and every table's row count and the ledger's totals compared.
 */

const TARGET = `blockyard_restore_${process.pid}`;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "blockyard-backup-"));
const opened: Knex[] = [];

function open(url: string): Knex {
  const k = knex({ client: "pg", connection: url, pool: { min: 0, max: 2 } });
  opened.push(k);
  return k;
}

afterAll(async () => {
  await Promise.all(opened.map((k) => k.destroy()));
  const admin = knex({ client: "pg", connection: withDatabase(process.env.DATABASE_URL!, "postgres") });
  await admin.raw(`DROP DATABASE IF EXISTS "${TARGET}" WITH (FORCE)`);
  await admin.destroy();
  fs.rmSync(dir, { recursive: true, force: true });
  await closeTestDb();
});

/** Every table's row count (public and pg-boss schemas) and the ledger totals. */
async function census(k: Knex) {
  const tables = (await k
    .select("schemaname", "tablename")
    .from("pg_tables")
    .whereNotIn("schemaname", ["pg_catalog", "information_schema"])
    .orderBy(["schemaname", "tablename"])) as { schemaname: string; tablename: string }[];
  const counts: Record<string, number> = {};
  for (const t of tables) {
    const r = await k.withSchema(t.schemaname).from(t.tablename).count<{ n: number }[]>({ n: "*" }).first();
    counts[`${t.schemaname}.${t.tablename}`] = Number(r?.n ?? 0);
  }
  const ledger = await k("stock_ledger")
    .select(
      k.raw("coalesce(sum(delta_m3), 0)::text AS m3, coalesce(sum(delta_value), 0)::text AS value, count(*)::int AS n"),
    )
    .first();
  const stock = await k("blocks")
    .whereIn("status", ["in_stock", "earmarked"])
    .select(k.raw("coalesce(sum(volume_m3), 0)::text AS m3, coalesce(sum(cost), 0)::text AS value"))
    .first();
  return { counts, ledger, stock };
}

describe("backup and restore", () => {
  it("restores a backup into a fresh database with every table's rows and the same ledger totals", async () => {
    const url = process.env.DATABASE_URL!;
    await makeBlock({ location: "Backup bay" }); // something of this run's own in it
    const source = open(url);
    const before = await census(source);
    expect(Object.keys(before.counts).length).toBeGreaterThan(10);
    expect(before.counts["public.blocks"]).toBeGreaterThan(0);

    const file = backupDatabase(url, path.join(dir, "test.dump"));
    expect(fs.statSync(file).size).toBeGreaterThan(1000);
    const target = await restoreDatabase(file, url, TARGET);

    const after = await census(open(target));
    expect(after.counts).toEqual(before.counts);
    expect(after.ledger).toEqual(before.ledger);
    expect(after.stock).toEqual(before.stock);
  }, 120_000);

  it("refuses to restore over a database that has tables, unless forced", async () => {
    const url = process.env.DATABASE_URL!;
    const file = path.join(dir, "test.dump");
    await expect(restoreDatabase(file, url, TARGET)).rejects.toThrow(/not empty.*--force/);
    const target = await restoreDatabase(file, url, TARGET, { force: true });
    const restored = open(target);
    expect(Number((await restored("blocks").count<{ n: number }[]>({ n: "*" }).first())?.n)).toBeGreaterThan(0);
    await expect(restoreDatabase(file, url, "bad name; DROP")).rejects.toThrow(/not a database name/);
  }, 120_000);
});
