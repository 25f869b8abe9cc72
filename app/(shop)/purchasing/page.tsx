import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { getReorderSettings, listReorder } from "@/db/queries/reorder";
import { listSuppliers } from "@/db/queries/suppliers";
import { PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { ReorderBoard } from "@/components/purchasing/reorder-board";
import { StorageCaution } from "@/components/safety/storage-caution";

export const metadata: Metadata = { title: "Reorder list" };

export default async function ReorderPage() {
  const user = await requirePage("/purchasing");
  const [rows, settings, suppliers] = await Promise.all([listReorder(), getReorderSettings(), listSuppliers()]);
  const canEdit = allows(["buyer"], user.roles);
  return (
    <>
      <PageHeader
        title="Reorder list"
        lead="Grades at or under their reorder point, with every figure behind it. On hand counts blocks in stock and earmarked; on order counts sent orders not yet received."
        actions={
          <Link className={buttonClass("secondary")} href="/purchasing/orders">
            Purchase orders
          </Link>
        }
      />
      <ReorderBoard
        rows={JSON.parse(JSON.stringify(rows))}
        settings={settings}
        suppliers={suppliers.filter((s) => s.active).map((s) => ({ id: s.id, name: s.name }))}
        canEdit={canEdit}
      />
      <div className="mt-6">
        <StorageCaution />
      </div>
    </>
  );
}
