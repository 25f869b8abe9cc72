import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { PageHeader } from "@/components/ui/card";
import { CsvImport } from "@/components/stock/csv-import";

export const metadata: Metadata = { title: "CSV import" };

export default async function ImportPage() {
  await requirePage("/stock/import");
  return (
    <>
      <PageHeader
        title="CSV import"
        lead="Bring in deliveries or a stock count from your purchasing spreadsheet. Every row is checked first; then all rows go in, or none."
      />
      <CsvImport />
    </>
  );
}
