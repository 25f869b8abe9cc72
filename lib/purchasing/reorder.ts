import type { Vec3 } from "@/lib/nesting";
/**
 * Reorder arithmetic, pure: no database, no clock. Quantities in m³ of foam; time in working days
 * of the shop calendar (lib/purchasing/calendar.ts): d and σd per working day, L and σL in working
 * days, as suppliers quote them.
 *   safety stock SS = z·√(L·σd² + d²·σL²)   (demand and lead time both vary; Heizer & Render,
 *                                            Operations Management, inventory management chapter;
 *                                            with σL = 0 it is the brief's z·σd·√L, §6)
 *   demand over the lead time = max(d·L, committed work due within the lead time)
 *   reorder point ROP = demand over the lead time + SS,  order quantity EOQ = √(2DS/H).
 */

/**
 * The standard normal quantile: the z that leaves `p` of the distribution below it
 * (Acklam's rational approximation, relative error below 1.2e-9).
 *
 *   zForServiceLevel(0.95)  // 1.6449
 *   zForServiceLevel(0.90)  // 1.2816
 */
export function zForServiceLevel(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError("service level must be between 0 and 1");
  const a = [
    -3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1,
    2.506628277459239,
  ];
  const b = [
    -5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1,
  ];
  const c = [
    -7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968,
    2.938163982698783,
  ];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const lo = 0.02425;
  if (p < lo) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (
      (((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) /
      ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1)
    );
  }
  if (p > 1 - lo) return -zForServiceLevel(1 - p);
  const q = p - 0.5;
  const r = q * q;
  return (
    ((((((a[0]! * r + a[1]!) * r + a[2]!) * r + a[3]!) * r + a[4]!) * r + a[5]!) * q) /
    (((((b[0]! * r + b[1]!) * r + b[2]!) * r + b[3]!) * r + b[4]!) * r + 1)
  );
}

/**
 * Safety stock: z standard deviations of demand over a lead time that varies too,
 * SS = z·√(L·σd² + d²·σL²). With a fixed lead time (σL = 0) this is z·σd·√L.
 *
 *   safetyStock(1.56, 30 / 7, 7)          // 17.69 (σL = 0)
 *   safetyStock(1.65, 16, 5, 150, 1)      // 1.65 × √(5·16² + 150²·1²) = 254.4
 */
export function safetyStock(z: number, sdDaily: number, leadTime: number, dailyDemand = 0, sdLeadTime = 0): number {
  const L = Math.max(0, leadTime);
  return z * Math.sqrt(L * sdDaily ** 2 + dailyDemand ** 2 * sdLeadTime ** 2);
}

/**
 * Reorder point: expected demand over the lead time plus the safety stock, ROP = d·L + SS.
 *
 *   reorderPoint(200 / 7, 7, 17.69)  // 217.69
 */
export function reorderPoint(dailyDemand: number, leadTimeDays: number, safety: number): number {
  return dailyDemand * leadTimeDays + safety;
}

/**
 * Foam one part takes from stock, m³: its bounding box grown by one kerf in each direction,
 * (x + k)(y + k)(z + k). A profiled part still takes its whole box out of the block (the waste
 * around the profile is rarely a usable offcut), and every face is a cut that burns half a kerf on
 * the part's side, so one kerf per dimension.
 *
 *   partStockM3([1000, 500, 100], 2)  // 1.002 × 0.502 × 0.102 = 0.05131
 */
export function partStockM3(size: Readonly<Vec3>, kerfMm: number): number {
  const k = Math.max(0, kerfMm);
  return ((size[0] + k) * (size[1] + k) * (size[2] + k)) / 1e9;
}

/**
 * Economic order quantity, EOQ = √(2DS/H): D demand per year, S cost per order, H cost of
 * holding one unit for a year. 0 when there is no demand; Infinity is never returned (H > 0).
 *
 *   economicOrderQuantity(1000, 10, 0.5)  // 200
 */
export function economicOrderQuantity(annualDemand: number, orderCost: number, holdingCost: number): number {
  if (!(holdingCost > 0)) throw new RangeError("holding cost must be more than 0");
  if (annualDemand <= 0 || orderCost <= 0) return 0;
  return Math.sqrt((2 * annualDemand * orderCost) / holdingCost);
}

/**
 * The yearly cost of ordering Q at a time: ordering (D/Q orders × S) plus holding (Q/2 on average
 * × H). At the EOQ the two halves are equal; away from it the total rises slowly (EOQ is robust).
 *
 *   annualInventoryCost(1000, 200, 10, 0.5)  // 100
 */
export function annualInventoryCost(annualDemand: number, q: number, orderCost: number, holdingCost: number): number {
  if (!(q > 0)) throw new RangeError("order quantity must be more than 0");
  return (annualDemand / q) * orderCost + (q / 2) * holdingCost;
}

/**
 * Mean and sample standard deviation (n − 1) of a series of daily quantities. Days with no
 * movement must be in the series as 0, or the mean comes out too high.
 *
 *   dailyStats([2, 4, 4, 4, 5, 5, 7, 9])  // { mean: 5, sd: 2.138 }
 */
export function dailyStats(series: readonly number[]): { mean: number; sd: number; days: number } {
  const n = series.length;
  if (n === 0) return { mean: 0, sd: 0, days: 0 };
  const mean = series.reduce((s, v) => s + v, 0) / n;
  if (n === 1) return { mean, sd: 0, days: 1 };
  const ss = series.reduce((s, v) => s + (v - mean) ** 2, 0);
  return { mean, sd: Math.sqrt(ss / (n - 1)), days: n };
}

/** Where each input came from, so the buyer sees why. */
export type Source = "ledger" | "supplier" | "deliveries" | "settings" | "jobs" | "override" | "none";

export interface ReorderInputs {
  /** Mean consumption per working day (m³) and its standard deviation. */
  dailyDemand: number;
  demandSd: number;
  /** Lead time in working days, and its standard deviation in working days (0: always on time). */
  leadTimeDays: number;
  leadTimeSd?: number;
  serviceLevel: number;
  /**
   * Foam that open jobs due within the lead time will take (m³: each part's box plus kerf).
   * It is known demand for that window, not extra demand: the forecast d·L already holds the
   * shop's average use, booked jobs included, so the larger of the two counts, never the sum.
   */
  committed: number;
  /** S: cost of one order; H: holding cost per m³ per year. */
  orderCost: number;
  holdingCost: number;
  /** Stock on hand (in stock + earmarked) and open purchase orders still to come, m³. */
  onHand: number;
  onOrder: number;
  /** Volume of one block as usually bought, m³ (0: unknown, quantities stay in m³). */
  blockVolume: number;
  /** A buyer's fixed reorder point or order quantity, replacing the computed one. */
  reorderPointOverride?: number | null;
  orderQtyOverride?: number | null;
  /** Days a year in the unit d is measured in: working days (calendar.workingDaysPerYear); 365 when d is per calendar day. */
  daysPerYear?: number;
}

export interface ReorderResult {
  z: number;
  safetyStock: number;
  /** The forecast over the lead time, d·L. */
  forecast: number;
  /** Demand over the lead time: max(d·L, committed). */
  leadTimeDemand: number;
  /** Which of the two set it: the forecast, or the jobs already booked for the window. */
  demandRule: "forecast" | "committed";
  /** max(d·L, committed) + SS (or the override). */
  reorderPoint: number;
  annualDemand: number;
  eoq: number;
  /** on hand + on order. */
  position: number;
  /** At or under the reorder point: time to order. */
  due: boolean;
  /** What to order now: the larger of EOQ and the shortfall below the reorder point, in whole blocks when the block size is known. */
  suggestedM3: number;
  suggestedBlocks: number | null;
}

/**
 * One grade's reorder figures from its inputs. Demand over the lead time is the larger of the
 * forecast d·L and the work already booked for that window (never both added: the forecast is
 * average use, booked work included); the safety stock covers the forecast's spread and the
 * supplier's lateness.
 *
 *   planReorder({ dailyDemand: 0.5, demandSd: 0.2, leadTimeDays: 14, leadTimeSd: 2, serviceLevel: 0.95,
 *                 committed: 9, orderCost: 75, holdingCost: 18, onHand: 6, onOrder: 0, blockVolume: 7.249 })
 *   // → { forecast: 7, leadTimeDemand: 9 (committed), safetyStock: 1.645·√(14·0.04 + 0.25·4) = 2.05,
 *   //     reorderPoint: 11.05, due: true, … }
 */
export function planReorder(i: ReorderInputs): ReorderResult {
  const z = zForServiceLevel(i.serviceLevel);
  const ss = safetyStock(z, i.demandSd, i.leadTimeDays, i.dailyDemand, i.leadTimeSd ?? 0);
  const forecast = i.dailyDemand * Math.max(0, i.leadTimeDays);
  const committed = Math.max(0, i.committed);
  const demandRule = committed > forecast ? "committed" : "forecast";
  const leadTimeDemand = Math.max(forecast, committed);
  const rop = i.reorderPointOverride ?? leadTimeDemand + ss;
  const annualDemand = i.dailyDemand * (i.daysPerYear ?? 365);
  const eoq = i.orderQtyOverride ?? economicOrderQuantity(annualDemand, i.orderCost, i.holdingCost);
  const position = i.onHand + i.onOrder;
  const due = position <= rop && rop > 0;
  const shortfall = Math.max(0, rop - position);
  let suggestedM3 = due ? Math.max(eoq, shortfall) : 0;
  let suggestedBlocks: number | null = null;
  if (i.blockVolume > 0) {
    suggestedBlocks = due ? Math.max(1, Math.ceil(suggestedM3 / i.blockVolume - 1e-9)) : 0;
    suggestedM3 = suggestedBlocks * i.blockVolume;
  }
  return {
    z,
    safetyStock: ss,
    forecast,
    leadTimeDemand,
    demandRule,
    reorderPoint: rop,
    annualDemand,
    eoq,
    position,
    due,
    suggestedM3,
    suggestedBlocks,
  };
}

/**
 * Receiving terms: a line is filled when at least (1 − tolerance) of it has come, and a receipt
 * that takes the line past (1 + tolerance) is over the terms (../shared/domain-brief.md §6, ±10 %).
 *
 *   receivingCheck({ ordered: 10, before: 0, now: 10.8 })  // { filled: true, over: false, … }
 *   receivingCheck({ ordered: 10, before: 0, now: 11.5 })  // { filled: true, over: true, … }
 */
export function receivingCheck(q: { ordered: number; before: number; now: number; tolerance?: number }): {
  total: number;
  ratio: number;
  filled: boolean;
  over: boolean;
} {
  const tol = q.tolerance ?? 0.1;
  const total = q.before + q.now;
  const ratio = q.ordered > 0 ? total / q.ordered : Infinity;
  // A hair of slack so measured sizes that round to exactly 110 % are not flagged.
  return { total, ratio, filled: ratio >= 1 - tol - 1e-9, over: ratio > 1 + tol + 1e-9 };
}
