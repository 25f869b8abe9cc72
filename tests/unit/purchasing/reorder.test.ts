import { describe, expect, it } from "vitest";
import { dailyStats, economicOrderQuantity, planReorder, receivingCheck } from "@/lib/purchasing/reorder";
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
  it("adds open-job demand to lead-time demand and safety stock", () => {
    const r = planReorder(base);
    expect(r.safetyStock).toBeCloseTo(1.6449 * 0.2 * Math.sqrt(14), 3);
    expect(r.reorderPoint).toBeCloseTo(7 + r.safetyStock + 2, 6);
    expect(r.due).toBe(true);
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
