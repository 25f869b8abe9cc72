import { describe, expect, it } from "vitest";
import { dailyStats, planReorder, reorderPoint, safetyStock } from "@/lib/purchasing/reorder";
import { addWorkingDays, workingDaysBetween } from "@/lib/purchasing/calendar";

/**
 * Safety stock when both daily demand and lead time vary: σdLT = √(L·σd² + d²·σL²), SS = z·σdLT,
 * ROP = d·L + SS.
 * Source: Heizer & Render, Operations Management, inventory management chapter ("probabilistic
 * demand and lead time", the example of a store selling 9-volt battery six-packs). Edition not
 * confirmed; the example's figures are recalled from the book, not re-checked against the text
 * (the domain brief gives only the formula's special case z·σd·√L, §6). Every figure below is
 * worked out by hand in the comments, so the check stands on its arithmetic whatever the edition.
 */
describe("safety stock with variable demand and variable lead time", () => {
  it("gives σdLT 154.2, SS 254.4 and ROP 1,004 for d 150/day, σd 16, L 5 days, σL 1 day, z 1.65 (Heizer & Render, inventory chapter; edition not confirmed)", () => {
    // By hand:
    //   L·σd²  = 5 × 16²     = 5 × 256     =  1,280
    //   d²·σL² = 150² × 1²   = 22,500 × 1  = 22,500
    //   σdLT   = √(1,280 + 22,500) = √23,780 = 154.208…
    //   SS     = 1.65 × 154.208 = 254.443…
    //   ROP    = 150 × 5 + 254.443 = 750 + 254.443 = 1,004.44 → 1,004 six-packs
    const ss = safetyStock(1.65, 16, 5, 150, 1);
    expect(Math.sqrt(5 * 16 ** 2 + 150 ** 2 * 1 ** 2)).toBeCloseTo(154.208, 3);
    expect(ss).toBeCloseTo(254.443, 3);
    const rop = reorderPoint(150, 5, ss);
    expect(rop).toBeCloseTo(1004.443, 3);
    expect(Math.round(rop)).toBe(1004);
  });

  it("plans the same example end to end: forecast rule, 95 % service (exact z 1.6449 gives 1,003.7)", () => {
    // With the exact z for 95 % (1.6449 rather than the table's 1.65): SS = 1.6449 × 154.208 = 253.66.
    const r = planReorder({
      dailyDemand: 150,
      demandSd: 16,
      leadTimeDays: 5,
      leadTimeSd: 1,
      serviceLevel: 0.95,
      committed: 0,
      orderCost: 10,
      holdingCost: 1,
      onHand: 900,
      onOrder: 0,
      blockVolume: 0,
    });
    expect(r.z).toBeCloseTo(1.6449, 4);
    expect(r.safetyStock).toBeCloseTo(1.64485 * 154.2076, 2);
    expect(r.demandRule).toBe("forecast");
    expect(r.reorderPoint).toBeCloseTo(1003.66, 1);
    expect(r.due).toBe(true);
  });

  it("reduces to z·σd·√L when the lead time is fixed (σL = 0): brief §6 check value 7, 17.69 (Russell & Taylor method; confidence M)", () => {
    // 1.56 × (30/7) × √7 = 1.56 × 4.2857 × 2.6458 = 17.69
    expect(safetyStock(1.56, 30 / 7, 7, 200 / 7, 0)).toBeCloseTo(17.69, 2);
  });

  it("reduces to z·d·σL when daily demand is steady (σd = 0)", () => {
    // 10 a day, σL 1 day, z 2.055: SS = 2.055 × 10 × 1 = 20.55 (by hand)
    expect(safetyStock(2.055, 0, 6, 10, 1)).toBeCloseTo(20.55, 9);
  });
});

describe("lead times in working days (shop calendar, Monday to Friday)", () => {
  it("measures a supplier's σL from promised and received dates in working days (arithmetic by hand)", () => {
    // Promised Fri 2026-12-04; came Mon 7 (+1), Fri 4 (0), Wed 2 (−2), Tue 8 (+2) working days.
    const late = [
      workingDaysBetween("2026-12-04", "2026-12-07"),
      workingDaysBetween("2026-12-04", "2026-12-04"),
      workingDaysBetween("2026-12-04", "2026-12-02"),
      workingDaysBetween("2026-12-04", "2026-12-08"),
    ];
    expect(late).toEqual([1, 0, -2, 2]);
    // mean 1/4 = 0.25; squares of deviations 0.5625 + 0.0625 + 5.0625 + 3.0625 = 8.75; /(4 − 1) → σL = √2.9167 = 1.708
    const s = dailyStats(late);
    expect(s.mean).toBeCloseTo(0.25, 12);
    expect(s.sd).toBeCloseTo(Math.sqrt(8.75 / 3), 12);
    expect(s.sd).toBeCloseTo(1.708, 3);
  });

  it("ends a 12-working-day lead time quoted on Friday 2026-12-04 on Tuesday 2026-12-22, 18 calendar days on", () => {
    expect(addWorkingDays("2026-12-04", 12)).toBe("2026-12-22");
    expect(workingDaysBetween("2026-12-04", "2026-12-22")).toBe(12);
  });
});
