import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, testDb } from "../support/db";
import { fingerprint } from "../support/fingerprint";

/**
 * The count by scanning (POST /api/stock-counts, GET /api/stock-counts/check): checked against
 * the register, then reconciled in the ledger the way the CSV stock count is — found elsewhere:
 * moved; re-measured: an "adjusted" entry; not found: written off with a "scrapped" entry; all
 * under the count's ref. A code not in the register refuses the whole count by name, nothing changed.
 */

afterAll(closeTestDb);

let buyer: Client;
let cutter: Client;
beforeAll(async () => {
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
});

const block = (id: number) => testDb()("blocks").where({ id }).first();

async function yard() {
  const bay = `Count bay ${Date.now().toString(36)}`;
  const other = `${bay} annexe`;
  const found = await makeBlock({ location: bay, size: [1000, 1000, 1000] });
  const remeasured = await makeBlock({ location: bay, size: [1000, 1000, 1000] });
  const elsewhere = await makeBlock({ location: other, size: [1000, 1000, 1000] });
  const lost = await makeBlock({ location: bay, size: [1200, 1000, 500], cost: 80 });
  const planned = await makeBlock({ location: bay });
  await testDb()("blocks").where({ id: planned.id }).update({ status: "earmarked" });
  return { bay, other, found, remeasured, elsewhere, lost, planned };
}

describe("a stock count by scanning", () => {
  it("is the buyer's: a cutter is refused", async () => {
    const b = await makeBlock();
    expect((await cutter.get(`/api/stock-counts/check?code=${b.code}`)).status).toBe(403);
    const res = await cutter.post("/api/stock-counts?commit=0", { location: "Test bay", counted: [{ code: b.code }] });
    expect(res.status).toBe(403);
  });

  it("looks a scanned code up: the register's size, grade and place, or a refusal naming the code", async () => {
    const b = await makeBlock({ location: "Bay Q", size: [2000, 1000, 500] });
    const ok = await buyer.get(`/api/stock-counts/check?code=${b.code.toLowerCase()}`);
    expect(ok.status).toBe(200);
    expect(ok.body.block).toMatchObject({
      code: b.code,
      gradeCode: "EPS-II",
      size: [2000, 1000, 500],
      recordedLocation: "Bay Q",
      status: "in_stock",
    });

    const none = await buyer.get("/api/stock-counts/check?code=NOPE-404");
    expect(none.status).toBe(404);
    expect(none.body.error).toBe("No block NOPE-404 in the register.");

    await testDb()("blocks").where({ id: b.id }).update({ status: "written_off" });
    const gone = await buyer.get(`/api/stock-counts/check?code=${b.code}`);
    expect(gone.status).toBe(409);
    expect(gone.body.error).toBe(`Block ${b.code} is no longer in stock (written off).`);

    const blank = await buyer.get("/api/stock-counts/check?code=");
    expect(blank.status).toBe(400);
  });

  it("refuses a count with a code that is not in the register, or a block counted twice, by name, and changes nothing", async () => {
    const y = await yard();
    const before = await fingerprint();
    const missing = await buyer.post("/api/stock-counts?commit=1", {
      location: y.bay,
      counted: [{ code: y.found.code }, { code: "NOPE-7" }],
      missing: [],
    });
    expect(missing.status).toBe(422);
    expect(missing.body.error).toBe("No block NOPE-7 in the register. Nothing was changed.");
    expect(missing.body.fields).toEqual({ "counted.1.code": "No block NOPE-7 in the register." });

    const twice = await buyer.post("/api/stock-counts?commit=0", {
      location: y.bay,
      counted: [{ code: y.found.code }, { code: y.found.code.toLowerCase() }],
    });
    expect(twice.status).toBe(422);
    expect(twice.body.error).toContain(`Block ${y.found.code} is counted twice (lines 1 and 2).`);

    const whole = await buyer.post("/api/stock-counts?commit=0", { location: null, counted: [] });
    expect(whole.status).toBe(400);
    expect(whole.body.fields.counted).toMatch(/Count at least one block/);
    expect(await fingerprint()).toEqual(before);
  });

  it("checks, then reconciles: counted blocks confirmed, one moved, one re-measured, the missing written off in the ledger", async () => {
    const y = await yard();
    const body = {
      location: y.bay,
      counted: [
        { code: y.found.code },
        { code: y.remeasured.code, size: [990, 1000, 1000] },
        // Found here, though the register has it in the annexe.
        { code: y.elsewhere.code },
      ],
    };

    const before = await fingerprint();
    const preview = await buyer.post("/api/stock-counts?commit=0", body);
    expect(preview.status).toBe(200);
    expect(await fingerprint()).toEqual(before);
    expect(preview.body).toMatchObject({ committed: false, ref: null, location: y.bay });
    expect(preview.body.summary).toEqual({ counted: 3, moved: 1, remeasured: 1, missing: 2, writtenOff: 1 });
    expect(preview.body.counted[2]).toMatchObject({
      code: y.elsewhere.code,
      recordedLocation: y.other,
      location: y.bay,
      moved: true,
    });
    expect(preview.body.counted[1].remeasured).toEqual([990, 1000, 1000]);
    expect(preview.body.missing).toEqual(
      [
        { code: y.lost.code, gradeCode: "EPS-II", size: [1200, 1000, 500], location: y.bay, earmarked: false },
        { code: y.planned.code, gradeCode: "EPS-II", size: [2000, 1000, 500], location: y.bay, earmarked: true },
      ].sort((a, b) => a.code.localeCompare(b.code)),
    );

    // Committing needs the not-found list the person confirmed, and that list must still hold.
    const unconfirmed = await buyer.post("/api/stock-counts?commit=1", body);
    expect(unconfirmed.status).toBe(400);
    const arrived = await makeBlock({ location: y.bay });
    const afterArrival = await fingerprint();
    const stale = await buyer.post("/api/stock-counts?commit=1", {
      ...body,
      missing: preview.body.missing.map((m: { code: string }) => m.code),
    });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toContain(arrived.code);
    expect(await fingerprint()).toEqual(afterArrival);
    await testDb()("blocks").where({ id: arrived.id }).update({ location: y.other });

    const gapBefore = await ledgerGap();
    const done = await buyer.post("/api/stock-counts?commit=1", {
      ...body,
      missing: preview.body.missing.map((m: { code: string }) => m.code),
    });
    expect(done.status).toBe(201);
    expect(done.body.committed).toBe(true);
    expect(done.body.ref).toMatch(/^count:\d+$/);
    expect(done.body.summary).toEqual(preview.body.summary);

    expect(await block(y.found.id)).toMatchObject({ status: "in_stock", location: y.bay });
    expect(await block(y.elsewhere.id)).toMatchObject({ status: "in_stock", location: y.bay });
    expect(Number((await block(y.remeasured.id))!.size_x)).toBe(990);
    expect((await block(y.lost.id))!.status).toBe("written_off");
    expect((await block(y.planned.id))!.status).toBe("earmarked"); // kept for the planner to release

    const entries = await testDb()("stock_ledger").where({ ref: done.body.ref }).orderBy("id");
    expect(entries.map((e) => [e.block_id, e.kind])).toEqual([
      [y.remeasured.id, "adjusted"],
      [y.lost.id, "scrapped"],
    ]);
    expect(Number(entries[0]!.delta_m3)).toBeCloseTo(-0.01, 9); // 10 mm off a 1 m cube
    expect(Number(entries[1]!.delta_m3)).toBeCloseTo(-0.6, 9);
    expect(Number(entries[1]!.delta_value)).toBe(-80);
    expect(entries[1]!.reason).toBe(`Not found at stock count at ${y.bay}`);
    // Stock on hand still equals the ledger's sum.
    expect((await ledgerGap()).m3).toBeCloseTo(gapBefore.m3, 9);
    const audit = await testDb()("audit_log").where({ action: "stock_count", subject: done.body.ref }).first();
    expect(audit!.detail).toEqual({
      moved: [{ code: y.elsewhere.code, from: y.other, to: y.bay }],
      writtenOff: [y.lost.code],
    });

    // The same count again: a block written off is no longer in stock, refused by name.
    const again = await buyer.post("/api/stock-counts?commit=0", { location: y.bay, counted: [{ code: y.lost.code }] });
    expect(again.status).toBe(422);
    expect(again.body.error).toBe(`Block ${y.lost.code} is no longer in stock (written off). Nothing was changed.`);
  });
});
