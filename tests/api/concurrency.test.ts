import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, testDb } from "../support/db";
import { makeApprovedRun, makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

/**
 * Many requests at once against the same rows: the database (row locks, the one-reservation
 * index, unique codes) must decide, and the ledger must still reconcile to the cubic millimetre.
 */

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
let buyer: Client;
beforeAll(async () => {
  [planner, cutter, buyer] = [client(), client(), client()];
  await planner.signIn(demoEmail("planner"));
  await cutter.signIn(demoEmail("cutter"));
  await buyer.signIn(demoEmail("buyer"));
});

const count = async (table: string, where: Record<string, unknown> = {}) =>
  Number((await testDb()(table).where(where).count<{ n: number }[]>({ n: "*" }).first())?.n ?? 0);

describe("approvals racing for one block", () => {
  it("100 parallel approvals of plans using the same block: exactly one wins, 99 get 409, one reservation", async () => {
    const block = await makeBlock({ size: [2000, 1000, 600] });
    const { jobId } = await makeJobWithParts([
      { name: "Panel", quantity: 2, size: [900, 400, 200], gradeCode: "EPS-II" },
    ]);
    const first = await makeDoneRun(jobId, [block]);
    // 99 more finished plans of the same problem and plan (copies: the solver need not run 100 times).
    const row = await testDb()("nesting_runs").where({ id: first.runId }).first();
    const copies = await testDb()("nesting_runs")
      .insert(
        Array.from({ length: 99 }, () => ({
          status: "done",
          job_ids: row!.job_ids,
          block_ids: row!.block_ids,
          settings: row!.settings,
          problem: JSON.stringify(row!.problem),
          plan: JSON.stringify(row!.plan),
          progress: 1,
          finished_at: row!.finished_at,
        })),
      )
      .returning("id");
    const runIds = [first.runId, ...copies.map((c: { id: number }) => c.id)];
    const gap = await ledgerGap();
    const ledgerRows = await count("stock_ledger");

    const answers = await Promise.all(runIds.map((id) => planner.post(`/api/runs/${id}/approve`)));

    const statuses = answers.map((a) => a.status);
    expect(
      statuses.filter((s) => s >= 500),
      JSON.stringify(answers.filter((a) => a.status >= 500).map((a) => a.body)),
    ).toEqual([]);
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(99);
    for (const a of answers.filter((x) => x.status === 409)) expect(a.body.error).toMatch(/earmarked|Another plan/);
    const winner = runIds[statuses.indexOf(200)]!;
    expect(await testDb()("plan_blocks").where({ block_id: block.id }).select("run_id", "status")).toEqual([
      { run_id: winner, status: "reserved" },
    ]);
    expect((await testDb()("blocks").where({ id: block.id }).first())!.status).toBe("earmarked");
    expect(await count("nesting_runs", { status: "approved", id: winner })).toBe(1);
    expect(await testDb()("nesting_runs").whereIn("id", runIds).where("status", "approved").pluck("id")).toEqual([
      winner,
    ]);
    expect(await count("stock_ledger")).toBe(ledgerRows + 1); // the one "reserved" row
    const after = await ledgerGap();
    expect(after.m3).toBeCloseTo(gap.m3, 9);
    expect(after.value).toBeCloseTo(gap.value, 6);
  }, 120_000);
});

/** A deliveries CSV of `n` blocks; `codes` names some of them (the rest get generated codes). */
function deliveriesCsv(lot: string, n: number, codes: string[] = []): string {
  const lines = ["supplier,received_on,lot,grade,length_mm,width_mm,height_mm,cost,location,code"];
  for (let i = 0; i < n; i++)
    lines.push(
      `Ashcombe Bead & Block,2026-11-30,${lot},EPS-II,${1000 + i},500,400,${40 + i},Race bay,${codes[i] ?? ""}`,
    );
  return `${lines.join("\n")}\n`;
}

describe("imports and cuts at the same time", () => {
  it("10 delivery imports at once (some clashing on codes) and 8 cuts on different blocks: every winner whole, every loser absent, the ledger reconciles", async () => {
    const tag = crypto.randomBytes(3).toString("hex").toUpperCase();
    const existing = await makeBlock();
    // Files 0/1 and 2/3 each share one code; file 4 names a block already in stock.
    const files = Array.from({ length: 10 }, (_, k) => {
      const codes = Array.from({ length: 30 }, (_, j) => (j % 3 === 0 ? `RACE-${tag}-${k}-${j}` : ""));
      if (k === 0 || k === 1) codes[1] = `RACE-${tag}-SHARED-A`;
      if (k === 2 || k === 3) codes[1] = `RACE-${tag}-SHARED-B`;
      if (k === 4) codes[1] = existing.code;
      return {
        lot: `RACE-${tag}-${k}`,
        csv: deliveriesCsv(`RACE-${tag}-${k}`, 30, codes),
        codes: codes.filter(Boolean),
      };
    });
    const approved = [];
    for (let i = 0; i < 8; i++) approved.push(await makeApprovedRun());

    const gap = await ledgerGap();
    const blocksBefore = await count("blocks");
    const importsBefore = await count("csv_imports");
    const receivedBefore = await count("stock_ledger", { kind: "received" });

    const [imports, cuts] = await Promise.all([
      Promise.all(
        files.map((f) =>
          buyer.call("post", "/api/imports/deliveries?commit=1").set("Content-Type", "text/csv").send(f.csv),
        ),
      ),
      Promise.all(
        approved.map((a) =>
          cutter.post(`/api/runs/${a.runId}/blocks/${a.block.id}/cut`, { rejects: [], confirm: true }),
        ),
      ),
    ]);

    expect(
      imports.map((r) => r.status).filter((s) => s >= 500),
      JSON.stringify(imports.map((r) => r.body.error)),
    ).toEqual([]);
    expect(
      cuts.map((r) => r.status),
      JSON.stringify(cuts.map((r) => r.body)),
    ).toEqual(cuts.map(() => 200));
    const won = imports.map((r) => r.status === 201);
    // Exactly one of each clashing pair; never the file naming a block already in stock.
    expect(Number(won[0]) + Number(won[1])).toBe(1);
    expect(Number(won[2]) + Number(won[3])).toBe(1);
    expect(won[4]).toBe(false);
    expect(won.slice(5)).toEqual([true, true, true, true, true]);
    for (const [k, f] of files.entries()) {
      const rows = await count("blocks", { lot: f.lot });
      expect(rows, `file ${k} answered ${imports[k]!.status}`).toBe(won[k] ? 30 : 0); // all or nothing
      if (won[k])
        expect(
          await testDb()("blocks")
            .whereIn("code", f.codes)
            .count<{ n: number }[]>({ n: "*" })
            .first()
            .then((r) => Number(r?.n)),
        ).toBe(f.codes.length);
      else expect(imports[k]!.body.error ?? imports[k]!.body.problems).toBeTruthy();
    }
    const winners = won.filter(Boolean).length;
    expect(await count("csv_imports")).toBe(importsBefore + winners);
    expect(await count("stock_ledger", { kind: "received" })).toBe(receivedBefore + 30 * winners);
    // Every cut block left stock; its offcuts came in, each with its ledger row.
    for (const a of approved) expect((await testDb()("blocks").where({ id: a.block.id }).first())!.status).toBe("cut");
    const offcuts = await testDb()("blocks")
      .whereIn(
        "parent_id",
        approved.map((a) => a.block.id),
      )
      .pluck("id");
    expect(await count("blocks")).toBe(blocksBefore + 30 * winners + offcuts.length);
    if (offcuts.length)
      expect(
        Number(
          (
            await testDb()("stock_ledger")
              .whereIn("block_id", offcuts)
              .where({ kind: "offcut_created" })
              .count<{ n: number }[]>({ n: "*" })
              .first()
          )?.n,
        ),
      ).toBe(offcuts.length);
    const after = await ledgerGap();
    expect(after.m3).toBeCloseTo(gap.m3, 9);
    expect(after.value).toBeCloseTo(gap.value, 6);
  }, 180_000);

  it("two cut recordings of the same block at once: one records, the other gets 409, the block is consumed once", async () => {
    const a = await makeApprovedRun();
    const gap = await ledgerGap();
    const [x, y] = await Promise.all(
      [0, 1].map(() => cutter.post(`/api/runs/${a.runId}/blocks/${a.block.id}/cut`, { rejects: [], confirm: true })),
    );
    expect([x!.status, y!.status].sort()).toEqual([200, 409]);
    expect(await count("stock_ledger", { block_id: a.block.id, kind: "consumed" })).toBe(1);
    expect(await count("cut_parts", { block_id: a.block.id })).toBeGreaterThan(0);
    expect((await ledgerGap()).m3).toBeCloseTo(gap.m3, 9);
  });
});
