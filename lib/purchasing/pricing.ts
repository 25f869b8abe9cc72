import { m3ToBoardFeet } from "@/lib/units";

export type PriceUnit = "m3" | "bf";

/**
 * The price of a volume of foam in the grade's own unit: per m³ (Europe) or per board foot
 * (North America, ../shared/domain-brief.md §2).
 *
 *   priceFor(7.249, 0.45, "bf")  // 3,072 BF × $0.45 = $1,382.40
 */
export function priceFor(volumeM3: number, price: number, unit: PriceUnit): number {
  const qty = unit === "bf" ? m3ToBoardFeet(volumeM3) : volumeM3;
  return Math.round(qty * price * 100) / 100;
}

export const PRICE_UNIT_LABEL: Record<PriceUnit, string> = { m3: "per m³", bf: "per board foot" };
