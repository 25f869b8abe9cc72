/**
 * `npm run bench:stock`: 50,000 blocks in a throwaway database, then p50/p95 of `GET /api/blocks`
 * for the filters people use, and the time of a 10,000-row deliveries CSV import (commit).
 * Targets: p95 under 50 ms at any depth (keyset paging: `?after=` cursors); import under 5 s.
 * The deep page is timed both ways in the same run: by offset (`?page=600`, what links people saved
 * still do) and by keyset (the cursor the 599th page's answer gives). Prints figures; asserts nothing. Starts its own
 * cluster, S3 fake and app (TEST_SLOT, default 5) and stops them when done.
 *
 * With `--before DIR` (a checkout of an older commit, see scripts/bench-stack.ts) the older code is
 * served too, on its own copy of the same 50,000 blocks, and every filter is timed on both in
 * `--rounds` rounds (default 3), old and new alternately, so both meet the same load from the rest
 * of a shared machine; the table then gives both sides' p50 and p95.
 *
 *   npm run bench:stock              # 50,000 blocks, 60 timed requests per filter
 *   npm run bench:stock -- --blocks 20000 --runs 30 --explain
 *   npm run bench:stock -- --before /tmp/before --runs 60 --import-rows 0
 */
import os from "node:os";
import knex from "knex";
import { BENCH_SLOT, beforeDirArg, ms, percentile, runBench, saveReport, signIn, startBenchStack } from "./bench-stack";
import { DEMO_PASSWORD } from "../db/seeds/01_shop";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const BLOCKS = arg("blocks", 50_000);
const RUNS = arg("runs", 60);
const IMPORT_ROWS = arg("import-rows", 10_000);
const EXPLAIN = process.argv.includes("--explain");
const BEFORE = beforeDirArg();
const ROUNDS = arg("rounds", BEFORE ? 3 : 1);
const loadavg = () =>
  os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join(" ");

/** 50,000 blocks with their "received" ledger rows, spread over grades, statuses, sizes and ages. */
async function seedBlocks(databaseUrl: string) {
  const k = knex({ client: "pg", connection: databaseUrl });
  try {
    const t = Date.now();
    await k.raw(
      `INSERT INTO blocks (code, grade_id, lot, nominal_x, nominal_y, nominal_z, size_x, size_y, size_z, weight_kg, cost, location, moulded_on, cut_not_before, status, parent_id, created_at)
       SELECT 'BN-' || lpad(i::text, 6, '0'),
              (SELECT id FROM grades ORDER BY id OFFSET (i % (SELECT count(*) FROM grades)) LIMIT 1),
              'BL-' || (i / 40),
              sx, sy, sz, sx, sy, sz,
              round((sx * sy * sz / 1e9 * (18 + i % 12))::numeric, 3),
              round((sx * sy * sz / 1e9 * 95)::numeric, 2),
              'Bay ' || chr(65 + i % 8) || ' – rack ' || (i % 12),
              date '2026-01-01' + (i % 330),
              date '2026-01-01' + (i % 330) + (i % 30),
              CASE WHEN i % 10 < 6 THEN 'in_stock' WHEN i % 10 = 6 THEN 'earmarked' WHEN i % 10 < 9 THEN 'cut' ELSE 'written_off' END,
              NULL,
              timestamptz '2026-01-01' + (i || ' minutes')::interval * 9
         FROM (SELECT i, (300 + (i * 37) % 4600)::numeric AS sx, (200 + (i * 53) % 1100)::numeric AS sy, (50 + (i * 71) % 600)::numeric AS sz
                 FROM generate_series(1, ?) AS i) s`,
      [BLOCKS],
    );
    await k.raw(
      `INSERT INTO stock_ledger (block_id, kind, volume_m3, delta_m3, value, delta_value, reason, at)
       SELECT id, 'received', volume_m3, volume_m3, cost, cost, 'bench seed', created_at FROM blocks WHERE code LIKE 'BN-%'`,
    );
    await k.raw("ANALYZE");
    process.stderr.write(`[bench] seeded ${BLOCKS} blocks in ${((Date.now() - t) / 1000).toFixed(1)} s\n`);
  } finally {
    await k.destroy();
  }
}

/** The filters timed, for one side's database (its grade id and its deep cursor). */
async function filtersFor(databaseUrl: string): Promise<[string, string][]> {
  const k = knex({ client: "pg", connection: databaseUrl });
  try {
    const grade = (await k("grades").where({ code: "EPS-II" }).first("id"))!.id;
    // The cursor the 599th page of the default list hands on: its last row (as listBlocks encodes it).
    const row = (
      await k.raw(
        `SELECT created_at::text AS key, id FROM blocks WHERE status IN ('in_stock','earmarked','on_hold')
          ORDER BY created_at, id OFFSET ? LIMIT 1`,
        [599 * 50 - 1],
      )
    ).rows[0] as { key: string; id: number };
    const deepCursor = Buffer.from(JSON.stringify(["received", row.key, row.id])).toString("base64url");
    // The same depth sorted by grade (code, then id), as the list orders it.
    const byGrade = (
      await k.raw(
        `SELECT g.code AS key, b.id FROM blocks b JOIN grades g ON g.id = b.grade_id
          WHERE b.status IN ('in_stock','earmarked','on_hold') ORDER BY g.code, b.id OFFSET ? LIMIT 1`,
        [599 * 50 - 1],
      )
    ).rows[0] as { key: string; id: number };
    const deepGrade = Buffer.from(JSON.stringify(["grade", byGrade.key, byGrade.id])).toString("base64url");
    return [
      ["default (available, by received)", ""],
      ["status ready", "status=ready"],
      ["grade", `grade=${grade}`],
      ["code prefix", "q=BN-012"],
      ["size range", "minLength=1500&maxLength=2500"],
      ["sort by volume, desc", "sort=volume&dir=desc"],
      ["deep page by offset (page 600)", "page=600"],
      ["deep page by keyset (page 600)", `page=600&after=${deepCursor}`],
      ["sort by grade", "sort=grade"],
      ["deep page by offset, sorted by grade (page 600)", "sort=grade&page=600"],
      ["deep page by keyset, sorted by grade (page 600)", `sort=grade&page=600&after=${deepGrade}`],
      ["ready + grade + volume sort", `status=ready&grade=${grade}&sort=volume&dir=desc`],
      ["all statuses, 200 per page", "status=all&pageSize=200"],
    ];
  } finally {
    await k.destroy();
  }
}

/** `n` sequential requests (after `warm` untimed ones): their times in ms and the last total. */
async function time(url: string, cookie: string, n: number, warm: number): Promise<{ times: number[]; total: number }> {
  const times: number[] = [];
  let total = 0;
  for (let i = 0; i < n + warm; i++) {
    const t = performance.now();
    const res = await fetch(url, { headers: { cookie } });
    const body = (await res.json()) as { total?: number; error?: string };
    const dt = performance.now() - t;
    if (res.status !== 200) throw new Error(`${url}: ${res.status} ${JSON.stringify(body)}`);
    total = body.total ?? 0;
    if (i >= warm) times.push(dt);
  }
  return { times, total };
}

async function main() {
  const stack = await startBenchStack("bench-stock", { beforeServe: seedBlocks, before: BEFORE });
  const lines: string[] = [];
  const out = (s: string) => {
    lines.push(s);
    console.log(s);
  };
  try {
    const cookie = await signIn(stack.url, "admin@demo.blockyard.test", DEMO_PASSWORD);
    const filters = await filtersFor(stack.databaseUrl);
    const old = stack.before && {
      ...stack.before,
      cookie: await signIn(stack.before.url, "admin@demo.blockyard.test", DEMO_PASSWORD),
      filters: await filtersFor(stack.before.databaseUrl),
    };
    out(
      `bench:stock — ${new Date().toISOString()} — ${BLOCKS.toLocaleString("en")} blocks (+ demo stock), ${RUNS} sequential requests per filter after 5 warm-ups${old ? ` per side, in ${ROUNDS} rounds alternating before (${old.dir}) and after (this tree)` : ""}, slot ${BENCH_SLOT}, load average ${loadavg()}`,
    );
    out("");
    out(
      old
        ? "| filter | before p50 | before p95 | after p50 | after p95 | after max | total matched | load at end |"
        : "| filter | p50 | p95 | max | total matched |",
    );
    out(old ? "| --- | --- | --- | --- | --- | --- | --- | --- |" : "| --- | --- | --- | --- | --- |");
    const worst: { name: string; p95: number }[] = [];
    for (const [i, [name, query]] of filters.entries()) {
      const url = `${stack.url}/api/blocks${query ? `?${query}` : ""}`;
      const after: number[] = [];
      const before: number[] = [];
      let total = 0;
      const per = Math.ceil(RUNS / ROUNDS);
      for (let r = 0; r < ROUNDS; r++) {
        // Old and new alternately, the order swapped every round.
        const sides = old ? (r % 2 ? ["after", "before"] : ["before", "after"]) : ["after"];
        for (const side of sides) {
          if (side === "after") {
            const got = await time(url, cookie, per, r === 0 ? 5 : 0);
            after.push(...got.times);
            total = got.total;
          } else if (old) {
            const q = old.filters[i]![1];
            before.push(
              ...(await time(`${old.url}/api/blocks${q ? `?${q}` : ""}`, old.cookie, per, r === 0 ? 5 : 0)).times,
            );
          }
        }
      }
      after.sort((a, b) => a - b);
      before.sort((a, b) => a - b);
      const p95 = percentile(after, 95);
      worst.push({ name, p95 });
      out(
        old
          ? `| ${name} | ${ms(percentile(before, 50))} | ${ms(percentile(before, 95))} | ${ms(percentile(after, 50))} | ${ms(p95)} | ${ms(after.at(-1)!)} | ${total.toLocaleString("en")} | ${loadavg()} |`
          : `| ${name} | ${ms(percentile(after, 50))} | ${ms(p95)} | ${ms(after.at(-1)!)} | ${total.toLocaleString("en")} |`,
      );
    }

    // A 10,000-row deliveries file, timed from request to committed answer (--import-rows 0: none).
    if (IMPORT_ROWS > 0) {
      const rows = ["supplier,received_on,lot,grade,length_mm,width_mm,height_mm,cost,location,weight_kg"];
      for (let i = 0; i < IMPORT_ROWS; i++)
        rows.push(
          `Ashcombe Bead & Block,2026-11-30,BENCH-${Math.floor(i / 100)},EPS-II,${2000 + (i % 400)},1000,${500 + (i % 100)},${60 + (i % 40)},Bay Z,${(22 * (2000 + (i % 400)) * (500 + (i % 100))) / 1e6}`,
        );
      const csv = `${rows.join("\n")}\n`;
      const t = performance.now();
      const res = await fetch(`${stack.url}/api/imports/deliveries?commit=1&name=bench.csv`, {
        method: "POST",
        headers: { cookie, origin: stack.url, "content-type": "text/csv" },
        body: csv,
      });
      const took = performance.now() - t;
      const report = (await res.json()) as {
        committed?: boolean;
        summary?: Record<string, number>;
        problemCount?: number;
        error?: string;
      };
      out("");
      out(
        `10,000-row deliveries import (POST /api/imports/deliveries?commit=1, ${(csv.length / 1024 / 1024).toFixed(2)} MB): ${res.status} ${report.committed ? "committed" : "NOT committed"} ${report.summary?.blocks ?? 0} blocks in ${(took / 1000).toFixed(2)} s (target < 5 s)`,
      );
    }
    const slowest = worst.sort((a, b) => b.p95 - a.p95)[0]!;
    const keyset = worst.filter((w) => !w.name.includes("by offset")).sort((a, b) => b.p95 - a.p95)[0]!;
    out(`slowest filter p95: ${slowest.name} ${ms(slowest.p95)}`);
    out(`slowest with keyset paging p95: ${keyset.name} ${ms(keyset.p95)} (target < 50 ms at any depth)`);

    if (EXPLAIN) {
      const k2 = knex({ client: "pg", connection: stack.databaseUrl });
      const plan = await k2.raw(
        // The deep keyset page as listBlocks reads it: one statement, from the cursor onwards.
        `EXPLAIN (ANALYZE, BUFFERS) SELECT b.*, g.code AS grade_code, (SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id AND z.removed_at IS NULL) AS defect_count,
                b.created_at::text AS sort_key, (SELECT v FROM stock_version WHERE id = 1) AS stock_v
           FROM blocks b JOIN grades g ON g.id = b.grade_id
          WHERE b.status IN ('in_stock','earmarked','on_hold')
            AND (b.created_at, b.id) > (SELECT created_at, id FROM blocks WHERE status IN ('in_stock','earmarked','on_hold') ORDER BY created_at, id OFFSET 29949 LIMIT 1)
          ORDER BY b.created_at, b.id LIMIT 51`,
      );
      console.log(plan.rows.map((r: Record<string, string>) => r["QUERY PLAN"]).join("\n"));
      await k2.destroy();
    }
    saveReport("stock", lines);
  } finally {
    await stack.stop();
  }
}

runBench(main);
