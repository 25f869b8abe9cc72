import { describe, expect, it } from "vitest";
import {
  dailyStats,
  economicOrderQuantity,
  partStockM3,
  planReorder,
  receivingCheck,
  safetyStock,
} from "@/lib/purchasing/reorder";
import {
  addWorkingDays,
  describeWorkingDays,
  weekday,
  workingDaySeries,
  workingDaysBetween,
  workingDaysPerYear,
} from "@/lib/purchasing/calendar";
import { combineBasis } from "@/lib/reports/yield";

const base = {
  dailyDemand: 0.5,
  demandSd: 0.2,
  leadTimeDays: 14,
  serviceLevel: 0.95,
  committed: 2,
  orderCost: 75,
  holdingCost: 18,
  onHand: 6,
  onOrder: 0,
  blockVolume: 7.249,
};

describe("reorder planning", () => {
  it("does not count booked work on top of the forecast: the forecast d·L already holds it", () => {
    // d·L = 0.5 × 14 = 7 m³; 2 m³ of booked work fits inside it.
    const r = planReorder(base);
    expect(r.safetyStock).toBeCloseTo(1.6449 * 0.2 * Math.sqrt(14), 3);
    expect(r.forecast).toBeCloseTo(7, 9);
    expect(r.leadTimeDemand).toBeCloseTo(7, 9);
    expect(r.demandRule).toBe("forecast");
    expect(r.reorderPoint).toBeCloseTo(7 + r.safetyStock, 6);
    expect(r.due).toBe(true);
  });

  it("lets booked work set lead-time demand when it outruns the forecast", () => {
    const r = planReorder({ ...base, committed: 9 });
    expect(r.leadTimeDemand).toBe(9);
    expect(r.demandRule).toBe("committed");
    expect(r.reorderPoint).toBeCloseTo(9 + r.safetyStock, 9);
    // Doubling the booked work moves the point by the booked work alone, not by it plus d·L.
    expect(planReorder({ ...base, committed: 18 }).reorderPoint - r.reorderPoint).toBeCloseTo(9, 9);
  });

  it("widens the safety stock with the lead time's spread: z·√(L·σd² + d²·σL²)", () => {
    const r = planReorder({ ...base, leadTimeSd: 2 });
    // 14 × 0.2² + 0.5² × 2² = 0.56 + 1 = 1.56
    expect(r.safetyStock).toBeCloseTo(r.z * Math.sqrt(1.56), 9);
    expect(r.safetyStock).toBeGreaterThan(planReorder(base).safetyStock);
    expect(safetyStock(2, 1, 9)).toBeCloseTo(6, 12); // σL = 0: z·σd·√L
  });

  it("counts a year in the days d is measured in", () => {
    const r = planReorder({ ...base, daysPerYear: workingDaysPerYear([1, 2, 3, 4, 5]) });
    expect(r.annualDemand).toBeCloseTo((0.5 * (5 * 365)) / 7, 9);
  });

  it("measures a part's foam as its box plus one kerf in each dimension", () => {
    expect(partStockM3([1000, 500, 100], 2)).toBeCloseTo((1002 * 502 * 102) / 1e9, 12);
    expect(partStockM3([1000, 500, 100], 0)).toBeCloseTo(0.05, 12);
  });

  it("orders whole blocks: at least the EOQ, at least the shortfall", () => {
    const r = planReorder(base);
    expect(r.eoq).toBeCloseTo(Math.sqrt((2 * 0.5 * 365 * 75) / 18), 6);
    expect(r.suggestedBlocks).toBe(Math.ceil(Math.max(r.eoq, r.reorderPoint - 6) / 7.249));
    expect(r.suggestedM3).toBeCloseTo(r.suggestedBlocks! * 7.249, 9);
  });

  it("counts open purchase orders as on order and stops asking once they cover the point", () => {
    const r = planReorder({ ...base, onOrder: 10 });
    expect(r.position).toBe(16);
    expect(r.due).toBe(false);
    expect(r.suggestedBlocks).toBe(0);
  });

  it("lets the buyer fix the reorder point and the order quantity", () => {
    const r = planReorder({ ...base, reorderPointOverride: 5, orderQtyOverride: 30 });
    expect(r.reorderPoint).toBe(5);
    expect(r.eoq).toBe(30);
    expect(r.due).toBe(false);
  });

  it("never asks for a grade nobody uses", () => {
    const r = planReorder({ ...base, dailyDemand: 0, demandSd: 0, committed: 0, onHand: 0 });
    expect(r.due).toBe(false);
    expect(economicOrderQuantity(0, 75, 18)).toBe(0);
  });

  it("refuses a service level outside (0, 1) and a holding cost of 0", () => {
    expect(() => planReorder({ ...base, serviceLevel: 1 })).toThrow(RangeError);
    expect(() => economicOrderQuantity(10, 10, 0)).toThrow(RangeError);
  });
});

describe("daily statistics", () => {
  it("gives the mean and the sample standard deviation", () => {
    const s = dailyStats([2, 4, 4, 4, 5, 5, 7, 9]);
    expect(s.mean).toBe(5);
    expect(s.sd).toBeCloseTo(Math.sqrt(32 / 7), 9);
    expect(dailyStats([])).toEqual({ mean: 0, sd: 0, days: 0 });
    expect(dailyStats([3]).sd).toBe(0);
  });
});

describe("receiving against a line, ±10 %", () => {
  it("accepts 90 % to 110 % as filled and not over", () => {
    expect(receivingCheck({ ordered: 10, before: 0, now: 9 })).toMatchObject({ filled: true, over: false });
    expect(receivingCheck({ ordered: 10, before: 4, now: 7 })).toMatchObject({ filled: true, over: false });
  });
  it("leaves a line under 90 % open and flags anything past 110 %", () => {
    expect(receivingCheck({ ordered: 10, before: 0, now: 8.9 })).toMatchObject({ filled: false, over: false });
    expect(receivingCheck({ ordered: 10, before: 6, now: 5.2 })).toMatchObject({ filled: true, over: true });
  });
});

describe("volume basis", () => {
  it("says mixed when profile and box figures are added together", () => {
    expect(combineBasis(["profile", "profile"])).toBe("profile");
    expect(combineBasis(["profile", "box", null])).toBe("mixed");
    expect(combineBasis([])).toBeNull();
  });
});

describe("the shop calendar (working days)", () => {
  // 2026-12-04 is a Friday (2026-01-01 is a Thursday; 4 December is day 338, 337 = 48 × 7 + 1 days later).
  it("knows the weekday of a date", () => {
    expect(weekday("2026-12-04")).toBe(5);
    expect(weekday("2026-12-06")).toBe(7);
    expect(weekday("2026-12-07")).toBe(1);
  });

  it("ends a lead time of 12 working days from a Friday on the Tuesday 18 calendar days later (Mon–Fri)", () => {
    // Mon 7 … Fri 11 (5), Mon 14 … Fri 18 (10), Mon 21 (11), Tue 22 (12).
    expect(addWorkingDays("2026-12-04", 12)).toBe("2026-12-22");
    expect(addWorkingDays("2026-12-04", 0)).toBe("2026-12-04");
    // A six-day shop: Saturdays count.
    expect(addWorkingDays("2026-12-04", 12, [1, 2, 3, 4, 5, 6])).toBe("2026-12-18");
  });

  it("counts working days between two dates, negative when the second is earlier", () => {
    expect(workingDaysBetween("2026-12-04", "2026-12-08")).toBe(2);
    expect(workingDaysBetween("2026-12-08", "2026-12-04")).toBe(-2);
    expect(workingDaysBetween("2026-12-05", "2026-12-06")).toBe(0);
    expect(workingDaysBetween("2026-12-04", "2026-12-04")).toBe(0);
  });

  it("builds a daily series over working days only, a day off's use counted on the day before", () => {
    const used = new Map([
      ["2026-12-04", 1],
      ["2026-12-05", 3], // a Saturday shift
      ["2026-12-07", 2],
    ]);
    expect(workingDaySeries(used, "2026-12-04", "2026-12-08")).toEqual([4, 2, 0]);
    // A window that opens on a weekend keeps that use too.
    expect(workingDaySeries(used, "2026-12-05", "2026-12-08")).toEqual([5, 0]);
    const total = [...used.values()].reduce((a, b) => a + b, 0);
    expect(workingDaySeries(used, "2026-12-01", "2026-12-31").reduce((a, b) => a + b, 0)).toBe(total);
  });

  it("has 260.7 working days a year Mon–Fri, describes the calendar, refuses an empty one", () => {
    expect(workingDaysPerYear()).toBeCloseTo(260.714, 3);
    expect(describeWorkingDays([1, 2, 3, 4, 5])).toBe("Mon–Fri");
    expect(describeWorkingDays([1, 3, 5])).toBe("Mon, Wed, Fri");
    expect(() => addWorkingDays("2026-12-04", 1, [])).toThrow(RangeError);
  });
});
