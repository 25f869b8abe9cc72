import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, testDb } from "../support/db";
import { seed as seedPurchasing } from "@/db/seeds/04_purchasing";
import { addWorkingDays, workingDaysBetween } from "@/lib/purchasing/calendar";
import { addDays, isoDate } from "@/lib/stock";
import type { ReorderRow } from "@/db/queries/reorder";

/**
 * The reorder model (issue 16, items 15 and 16): demand over the lead time is the larger of the
 * forecast d·L and the open-job work due within the lead time (box + kerf), never their sum; the
 * safety stock includes lead-time spread, z·√(L·σd² + d²·σL²); everything in working days.
 */

let buyer: Client;
const jobs: number[] = [];
const deliveries: number[] = [];
let supplierId = 0;

beforeAll(async () => {
  // Other files send orders and set overrides: start from the demo shop's purchasing state.
  await seedPurchasing(testDb());
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
});
afterAll(async () => {
  const k = testDb();
  if (jobs.length) await k("jobs").whereIn("id", jobs).update({ status: "cancelled" });
  await seedPurchasing(k); // clears the test's orders, overrides and settings
  if (deliveries.length) await k("deliveries").whereIn("id", deliveries).delete();
  if (supplierId) await k("suppliers").where({ id: supplierId }).update({ active: false });
  await closeTestDb();
});

const gradeId = async (code: string) => (await testDb()("grades").where({ code }).first("id"))!.id as number;
const itemOf = async (code: string) =>
  ((await buyer.get("/api/reorder")).body.items as ReorderRow[]).find((r) => r.gradeCode === code)!;

/** An open job due on `dueOn` with one part line of `grade`. */
async function jobWith(
  dueOn: string | null,
  gradeCode: string,
  quantity: number,
  size: [number, number, number],
  trueVolumeMm3: number | null = null,
) {
  const k = testDb();
  const [j] = await k("jobs")
    .insert({ name: `Reorder test ${Date.now()}`, due_on: dueOn, status: "open" })
    .returning("id");
  jobs.push(j!.id);
  await k("job_parts").insert({
    job_id: j!.id,
    name: "Reorder test part",
    quantity,
    size_x: size[0],
    size_y: size[1],
    size_z: size[2],
    grade_id: await gradeId(gradeCode),
    rotate: "any",
    true_volume_mm3: trueVolumeMm3,
  });
  return j!.id as number;
}

describe("demand over the lead time", () => {
  it("takes the larger of the forecast and the work due within the lead time, never both, each part as box + kerf", async () => {
    const ix = await gradeId("EPS-IX");
    // A steady, small forecast: d = 0.1 m³ per working day, L = 10 working days → d·L = 1 m³.
    const set = await buyer.put(`/api/reorder/${ix}`, { dailyDemandM3: 0.1, demandSdM3: 0.01, leadTimeDays: 10 });
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    const base = set.body.item as ReorderRow;
    expect(base.result.forecast).toBeCloseTo(1, 9);
    const k = base.committed.kerfMm as number;
    expect(k).toBeGreaterThan(0);

    // Work due after the lead time ends is not in the window; a profiled part counts its box, not its profile.
    await jobWith(addDays(base.leadTimeEnds, 1), "EPS-IX", 500, [1000, 500, 100]);
    await jobWith(base.leadTimeEnds, "EPS-IX", 40, [1000, 500, 100], 1_000_000); // true volume 0.001 m³ each
    const item = await itemOf("EPS-IX");
    const booked = (40 * (1000 + k) * (500 + k) * (100 + k)) / 1e9; // ≈ 2.0 m³, more than d·L
    expect(item.committed.value - base.committed.value).toBeCloseTo(booked, 9);
    expect(item.committed.dueBy).toBe(base.leadTimeEnds);
    expect(item.committed.source).toBe("jobs");

    const { result } = item;
    const expected = Math.max(result.forecast, item.committed.value);
    expect(result.leadTimeDemand).toBeCloseTo(expected, 9);
    expect(result.demandRule).toBe(item.committed.value > result.forecast ? "committed" : "forecast");
    expect(result.reorderPoint).toBeCloseTo(expected + result.safetyStock, 9);
    // Not d·L + SS + booked (the old double count).
    expect(result.reorderPoint).toBeLessThan(result.forecast + result.safetyStock + item.committed.value - 0.5);
  });

  it("counts an undated open job as due now, and leaves out done and cancelled jobs", async () => {
    const before = (await itemOf("EPS-IX")).committed.value as number;
    const undated = await jobWith(null, "EPS-IX", 10, [500, 500, 100]);
    const withUndated = (await itemOf("EPS-IX")).committed;
    const k = withUndated.kerfMm;
    expect(withUndated.value - before).toBeCloseTo((10 * (500 + k) * (500 + k) * (100 + k)) / 1e9, 9);
    await testDb()("jobs").where({ id: undated }).update({ status: "done" });
    expect((await itemOf("EPS-IX")).committed.value).toBeCloseTo(before, 9);
  });
});

describe("working days and lead-time spread", () => {
  it("takes σL from the supplier's figure, then from its deliveries against promised dates, in working days", async () => {
    const made = await buyer.post("/api/suppliers", {
      name: `Reorder test supplier ${Date.now()}`,
      leadTimeDays: 12,
      leadTimeSdDays: 2.5,
    });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    supplierId = made.body.supplier.id;
    expect(made.body.supplier.leadTimeSdDays).toBe(2.5);
    const viii = await gradeId("EPS-VIII");
    const first = await buyer.put(`/api/reorder/${viii}`, { supplierId, dailyDemandM3: 0.4, demandSdM3: 0.1 });
    expect(first.body.item.leadTimeDays).toEqual({ value: 12, source: "supplier" });
    expect(first.body.item.leadTimeSd).toEqual({ value: 2.5, source: "supplier" });

    // Three orders: promised Fri 2026-11-06, 13, 20; came Mon 9 (+1), Fri 13 (0), Wed 18 (−2) working days.
    const k = testDb();
    for (const [promised, came] of [
      ["2026-11-06", "2026-11-09"],
      ["2026-11-13", "2026-11-13"],
      ["2026-11-20", "2026-11-18"],
    ] as const) {
      const [po] = await k("purchase_orders")
        .insert({
          number: `PO-RT-${promised}-${Date.now()}`,
          supplier_id: supplierId,
          status: "closed",
          expected_on: promised,
        })
        .returning("id");
      const [d] = await k("deliveries")
        .insert({ supplier_id: supplierId, received_on: came, lot: `RT-${came}`, purchase_order_id: po!.id })
        .returning("id");
      deliveries.push(d!.id);
    }
    const item = await itemOf("EPS-VIII");
    // By hand: lateness 1, 0, −2; mean −1/3; squares (4/3)² + (1/3)² + (5/3)² = 42/9; ÷ (3 − 1) → σL = √(7/3) = 1.528.
    expect(item.leadTimeSd.source).toBe("deliveries");
    expect(item.leadTimeSd.value).toBeCloseTo(Math.sqrt(7 / 3), 9);
    expect(item.lateness).toMatchObject({ orders: 3 });
    expect(item.lateness!.meanDays).toBeCloseTo(-1 / 3, 9);

    // SS = z·√(L·σd² + d²·σL²) with L = 12, σd = 0.1, d = 0.4, σL = √(7/3).
    const { z, safetyStock, forecast, reorderPoint, leadTimeDemand } = item.result;
    expect(safetyStock).toBeCloseTo(z * Math.sqrt(12 * 0.1 ** 2 + 0.4 ** 2 * (7 / 3)), 9);
    expect(forecast).toBeCloseTo(0.4 * 12, 9);
    expect(reorderPoint).toBeCloseTo(leadTimeDemand + safetyStock, 9);
  });

  it("counts lead time and history in the shop's working days, and a six-day week when the buyer says so", async () => {
    const today = isoDate();
    const item = await itemOf("EPS-VIII");
    expect(item.workingDays).toEqual([1, 2, 3, 4, 5]);
    expect(item.leadTimeEnds).toBe(addWorkingDays(today, item.leadTimeDays.value, [1, 2, 3, 4, 5]));
    const since = addDays(today, -item.historyDays + 1);
    expect(item.historyWorkingDays).toBe(workingDaysBetween(addDays(since, -1), today));
    expect(item.result.annualDemand).toBeCloseTo((item.dailyDemand.value * 5 * 365) / 7, 9);

    const settings = (await buyer.get("/api/reorder")).body.settings;
    const bad = await buyer.put("/api/reorder/settings", { ...settings, workingDays: [] });
    expect(bad.status).toBe(400);
    expect(bad.body.fields.workingDays).toMatch(/at least one working day/);
    const six = await buyer.put("/api/reorder/settings", { ...settings, workingDays: [6, 1, 2, 3, 4, 5] });
    expect(six.status, JSON.stringify(six.body)).toBe(200);
    const again = await itemOf("EPS-VIII");
    expect(again.workingDays).toEqual([1, 2, 3, 4, 5, 6]);
    expect(again.leadTimeEnds).toBe(addWorkingDays(today, again.leadTimeDays.value, [1, 2, 3, 4, 5, 6]));
    expect(again.result.annualDemand).toBeCloseTo((again.dailyDemand.value * 6 * 365) / 7, 9);
    // Settings saved without a calendar keep the one set.
    const { workingDays: _, ...rest } = settings;
    expect((await buyer.put("/api/reorder/settings", rest)).body.settings.workingDays).toEqual([1, 2, 3, 4, 5, 6]);
    await buyer.put("/api/reorder/settings", { ...settings, workingDays: [1, 2, 3, 4, 5] });
  });
});
