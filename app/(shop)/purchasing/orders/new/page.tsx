import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { listReorder } from "@/db/queries/reorder";
import { listSuppliers } from "@/db/queries/suppliers";
import { PageHeader } from "@/components/ui/card";
import { PoForm } from "@/components/purchasing/po-form";

export const metadata: Metadata = { title: "Write an order" };

export default async function NewOrderPage() {
  await requirePage("/purchasing/orders/new");
  const [rows, suppliers] = await Promise.all([listReorder(), listSuppliers()]);
  return (
    <>
      <PageHeader
        title="Write an order"
        lead="A draft until you send it. Block size and price start from the grade's last delivery."
      />
      <PoForm
        grades={rows.map((r) => ({
          id: r.gradeId,
          code: r.gradeCode,
          priceUnit: r.priceUnit,
          blockSize: r.blockSize,
          lastPrice: r.lastPrice,
        }))}
        suppliers={suppliers.filter((s) => s.active).map((s) => ({ id: s.id, name: s.name, email: s.email }))}
      />
    </>
  );
}
