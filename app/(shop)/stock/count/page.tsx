import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { displayUnit } from "@/lib/display";
import { listLocations } from "@/db/queries/blocks";
import { PageHeader } from "@/components/ui/card";
import { StockCount } from "@/components/stock/stock-count";

export const metadata: Metadata = { title: "Stock count" };

export default async function StockCountPage() {
  const user = await requirePage("/stock/count");
  const [unit, locations] = await Promise.all([displayUnit(user), listLocations()]);
  return (
    <>
      <PageHeader
        title="Stock count"
        lead="Walk the yard with the tablet: scan each block's label, check its size and place, next. At the end, blocks found elsewhere are moved and blocks not found are written off in the ledger, after you confirm."
      />
      <StockCount locations={locations} unit={unit} />
    </>
  );
}
