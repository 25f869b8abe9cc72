/**
 * Reorder arithmetic, pure: no database, no clock. Quantities in m³ of foam, time in days.
 * Formulas as ../shared/domain-brief.md §6 gives them:
 *   safety stock SS = z·σd·√L,  reorder point ROP = d·L + SS,  order quantity EOQ = √(2DS/H).
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
 * Safety stock: z standard deviations of demand over the lead time, SS = z·σd·√L.
 *
 *   safetyStock(1.56, 30 / 7, 7)  // 17.69
 */
export function safetyStock(z: number, sdDaily: number, leadTimeDays: number): number {
  return z * sdDaily * Math.sqrt(Math.max(0, leadTimeDays));
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
export type Source = "ledger" | "supplier" | "settings" | "jobs" | "override" | "none";

export interface ReorderInputs {
  /** Mean daily consumption (m³/day) and its standard deviation. */
  dailyDemand: number;
  demandSd: number;
  leadTimeDays: number;
  serviceLevel: number;
  /** Part volume of open jobs not yet cut (m³), committed on top of lead-time demand. */
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
}

export interface ReorderResult {
  z: number;
  safetyStock: number;
  /** d·L + SS + committed (or the override). */
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
 * One grade's reorder figures from its inputs. Open-job demand is added to the reorder point:
 * stock must cover the parts already promised as well as what the lead time will use.
 *
 *   planReorder({ dailyDemand: 0.5, demandSd: 0.2, leadTimeDays: 14, serviceLevel: 0.95, committed: 2,
 *                 orderCost: 75, holdingCost: 18, onHand: 6, onOrder: 0, blockVolume: 7.249 })
 *   // → { reorderPoint: 0.5·14 + 1.645·0.2·√14 + 2 = 10.23, due: true, … }
 */
export function planReorder(i: ReorderInputs): ReorderResult {
  const z = zForServiceLevel(i.serviceLevel);
  const ss = safetyStock(z, i.demandSd, i.leadTimeDays);
  const rop = i.reorderPointOverride ?? reorderPoint(i.dailyDemand, i.leadTimeDays, ss) + i.committed;
  const annualDemand = i.dailyDemand * 365;
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
  return { z, safetyStock: ss, reorderPoint: rop, annualDemand, eoq, position, due, suggestedM3, suggestedBlocks };
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
