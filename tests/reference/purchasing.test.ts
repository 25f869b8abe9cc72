import { describe, expect, it } from "vitest";
import {
  annualInventoryCost,
  economicOrderQuantity,
  planReorder,
  reorderPoint,
  safetyStock,
  zForServiceLevel,
} from "@/lib/purchasing/reorder";
import { materialYield } from "@/lib/reports/yield";
import { HIGH_PILED, STYRENE } from "@/lib/safety/limits";
import { boardFeet, m3ToBoardFeet } from "@/lib/units";
import { priceFor } from "@/lib/purchasing/pricing";

describe("economic order quantity", () => {
  // Source: Heizer & Render, Operations Management, ch. 12, example 3 (domain brief §6, check value 6, H).
  it("gives 200 units for D 1,000/yr, S $10, H $0.50 (Heizer & Render ch. 12 ex. 3)", () => {
    expect(economicOrderQuantity(1000, 10, 0.5)).toBeCloseTo(200, 9);
    // 5 orders a year; ordering + holding = $50 + $50 = $100 a year.
    const q = economicOrderQuantity(1000, 10, 0.5);
    expect(1000 / q).toBeCloseTo(5, 9);
    expect((1000 / q) * 10 + (q / 2) * 0.5).toBeCloseTo(100, 9);
  });

  // Arithmetic, not an example from the book: the EOQ formula √(2DS/H) (Heizer & Render ch. 12) with
  // the example's S and H and D raised to 1,200: √(2 × 1,200 × 10 ÷ 0.5) = √48,000 = 219.09.
  it("gives 219 units when demand rises to 1,200 (arithmetic on the EOQ formula, not the book's example)", () => {
    expect(economicOrderQuantity(1200, 10, 0.5)).toBeCloseTo(Math.sqrt(48_000), 9);
    expect(Math.round(economicOrderQuantity(1200, 10, 0.5))).toBe(219);
  });

  // Source: Heizer & Render, Operations Management, EOQ chapter, the robustness of the EOQ model —
  // keeping Q = 200 of the example when D rises to 1,500 (from memory; edition not confirmed, the
  // trade brief does not give it). By hand: 1,500/200 × $10 + 200/2 × $0.50 = $75 + $50 = $125 a
  // year, against √(2 × 1,500 × 10 × 0.5) = $122.47 at the new EOQ √60,000 = 244.9: about 2 % more.
  it("costs $125 a year to keep Q = 200 when D rises to 1,500, about 2 % above the new EOQ's $122.47", () => {
    expect(annualInventoryCost(1500, 200, 10, 0.5)).toBeCloseTo(125, 9);
    const eoq = economicOrderQuantity(1500, 10, 0.5);
    expect(eoq).toBeCloseTo(244.95, 2);
    expect(annualInventoryCost(1500, eoq, 10, 0.5)).toBeCloseTo(Math.sqrt(15_000), 9);
    expect(annualInventoryCost(1500, 200, 10, 0.5) / annualInventoryCost(1500, eoq, 10, 0.5)).toBeCloseTo(1.0206, 3);
    // The example itself: at the EOQ the ordering and holding halves are equal, $50 + $50.
    expect(annualInventoryCost(1000, 200, 10, 0.5)).toBeCloseTo(100, 9);
  });
});

describe("safety stock and reorder point", () => {
  // Source: domain brief §6 worked example, a course example using the Russell & Taylor method;
  // arithmetic re-checked. Confidence M (check value 7).
  it("gives SS 17.69 and ROP 218 for z 1.56, σd 30/7, L 7, d·L 200 (brief §6, Russell & Taylor method; confidence M)", () => {
    const ss = safetyStock(1.56, 30 / 7, 7);
    expect(ss).toBeCloseTo(17.69, 2);
    const rop = reorderPoint(200 / 7, 7, ss);
    expect(rop).toBeCloseTo(217.69, 2);
    expect(Math.round(rop)).toBe(218);
  });

  // Source: domain brief §6 (H): z = 1.28 for 90 %, 1.645 for 95 % service.
  it("turns 90 % and 95 % service into z 1.28 and 1.645 (brief §6, standard normal table)", () => {
    expect(zForServiceLevel(0.9)).toBeCloseTo(1.2816, 3);
    expect(zForServiceLevel(0.95)).toBeCloseTo(1.6449, 3);
    expect(zForServiceLevel(0.5)).toBeCloseTo(0, 9);
    expect(zForServiceLevel(0.99)).toBeCloseTo(2.3263, 3);
  });

  it("plans the worked example end to end when the buyer overrides nothing", () => {
    const r = planReorder({
      dailyDemand: 200 / 7,
      demandSd: 30 / 7,
      leadTimeDays: 7,
      serviceLevel: 0.9406,
      committed: 0,
      orderCost: 10,
      holdingCost: 0.5,
      onHand: 150,
      onOrder: 50,
      blockVolume: 0,
    });
    expect(r.z).toBeCloseTo(1.56, 2);
    expect(r.reorderPoint).toBeCloseTo(217.7, 0);
    expect(r.due).toBe(true);
  });
});

describe("yield in board feet", () => {
  // Source: domain brief §2 and §7, check values 3 and 10 (H): a 4×4×16 ft block = 3,072 BF;
  // 2,000 BF of parts from it = 65.1 %.
  it("gives 65.1 % for 2,000 BF of parts from one 3,072 BF block (brief check value 10)", () => {
    const block = boardFeet(1219.2 * 1219.2 * 4876.8);
    expect(block).toBeCloseTo(3072, 6);
    expect(materialYield(2000, block)! * 100).toBeCloseTo(65.1, 1);
  });

  it("subtracts usable offcuts returned to stock from what was issued (brief §7, common practice)", () => {
    expect(materialYield(2000, 3072, 72)).toBeCloseTo(2000 / 3000, 9);
    expect(materialYield(1, 0)).toBeNull();
  });

  it("prices a 4×4×16 ft block per board foot through m³ (1 m³ = 423.78 BF, brief check value 4)", () => {
    expect(m3ToBoardFeet(1)).toBeCloseTo(423.78, 2);
    expect(priceFor(7.249, 0.45, "bf")).toBeCloseTo(3072 * 0.45, 0);
    expect(priceFor(2, 80, "m3")).toBe(160);
  });
});

describe("styrene limits and storage heights on the safety page", () => {
  // Sources: OSHA 29 CFR 1910.1000 Table Z-2 (PEL), NIOSH Pocket Guide (REL, IDLH); brief check value 8 (H).
  it("states OSHA PEL 100 ppm TWA, NIOSH REL 50 ppm TWA and IDLH 700 ppm (OSHA; NIOSH Pocket Guide)", () => {
    expect(STYRENE.oshaPelTwaPpm).toBe(100);
    expect(STYRENE.nioshRelTwaPpm).toBe(50);
    expect(STYRENE.idlhPpm).toBe(700);
    expect(STYRENE.oshaCeilingPpm).toBe(200);
    expect(STYRENE.nioshStelPpm).toBe(100);
  });

  // Source: International Fire Code (2018) ch. 32; brief check value 9 (H).
  it("states high-piled storage above 12 ft, 6 ft for Group A plastics, permit above 500 ft² (IFC 2018 ch. 32)", () => {
    expect(HIGH_PILED).toEqual({ generalFt: 12, groupAPlasticsFt: 6, permitAreaFt2: 500 });
  });
});
