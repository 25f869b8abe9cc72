import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { listSuppliers } from "@/db/queries/suppliers";
import { PageHeader } from "@/components/ui/card";
import { SupplierEditor } from "@/components/stock/supplier-editor";

export const metadata: Metadata = { title: "Suppliers" };

export default async function SuppliersPage() {
  await requirePage("/suppliers");
  return (
    <>
      <PageHeader title="Suppliers" lead="Who the shop buys foam from, and how long their blocks take to arrive." />
      <SupplierEditor suppliers={await listSuppliers()} />
    </>
  );
}
