import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { MONEY_FIELDS, allows, seesMoney, withoutMoney } from "@/lib/auth/policy";
import { listBlocks, listLocations } from "@/db/queries/blocks";
import { listGrades } from "@/db/queries/grades";
import { blockQuerySchema } from "@/lib/validations/stock";
import { toStockRows } from "@/lib/stock-types";
import { displayUnit } from "@/lib/display";
import { PageHeader, Notice } from "@/components/ui/card";
import { StockTable } from "@/components/stock/stock-table";
import { buttonClass } from "@/components/ui/button";
import { StorageCaution } from "@/components/safety/storage-caution";

export const metadata: Metadata = { title: "Stock" };

export default async function StockPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePage("/stock");
  const raw = Object.fromEntries(
    Object.entries(await searchParams).filter((e): e is [string, string] => typeof e[1] === "string" && e[1] !== ""),
  );
  const parsed = blockQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : blockQuerySchema.parse({});
  const [list, grades, locations, unit] = await Promise.all([
    listBlocks(query).then((l) => (seesMoney(user.roles) ? l : withoutMoney(l, MONEY_FIELDS["GET /api/blocks"]!))),
    listGrades(),
    listLocations(),
    displayUnit(user),
  ]);
  const qs = new URLSearchParams(raw).toString();
  const canExport = allows(["buyer", "planner", "manager"], user.roles);
  const canReceive = allows(["buyer"], user.roles);
  return (
    <>
      <PageHeader
        title="Stock"
        lead="Every block and offcut the shop holds. Settling blocks are still shrinking: cut them after their cut-not-before date."
        actions={
          canReceive && (
            <Link className={buttonClass("primary")} href="/deliveries/new">
              Receive a delivery
            </Link>
          )
        }
      />
      {!parsed.success && (
        <div className="mb-4">
          <Notice tone="caution">Some filters in the address were not understood and were ignored.</Notice>
        </div>
      )}
      <StockTable
        initial={toStockRows(list)}
        query={qs}
        unit={unit}
        grades={grades.map((g) => ({ id: g.id, code: g.code }))}
        locations={locations}
        canExport={canExport}
      />
      <div className="mt-6">
        <StorageCaution compact />
      </div>
    </>
  );
}
