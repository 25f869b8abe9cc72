import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePage } from "@/lib/auth/guard";
import { getPurchaseOrder } from "@/db/queries/purchase-orders";
import { listLocations } from "@/db/queries/blocks";
import { Notice, PageHeader } from "@/components/ui/card";
import { ReceiveForm } from "@/components/purchasing/receive-form";
import { StorageCaution } from "@/components/safety/storage-caution";
import { poActionRefusal } from "@/lib/purchasing/orders";
import { isoDate } from "@/lib/stock";

export const metadata: Metadata = { title: "Receive against an order" };

export default async function ReceivePage({ params }: { params: Promise<{ poId: string }> }) {
  await requirePage("/purchasing/orders/[poId]/receive");
  const { poId } = await params;
  if (!/^\d{1,9}$/.test(poId)) notFound();
  const po = await getPurchaseOrder(Number(poId));
  if (!po) notFound();
  const refusal = poActionRefusal(po.status, "receive");
  const locations = await listLocations();
  return (
    <>
      <PageHeader
        title={`Receive against ${po.number}`}
        lead={`${po.supplier}. Weigh each block: density is checked against the grade's minimum. Cut-not-before dates follow each grade's cure days.`}
        actions={
          <Link className="self-center text-sm" href={`/purchasing/orders/${po.id}`}>
            Back to the order
          </Link>
        }
      />
      {refusal ? (
        <Notice tone="caution">{refusal}</Notice>
      ) : (
        <ReceiveForm
          poId={po.id}
          lines={po.lines.map((l, i) => ({
            id: l.id,
            no: i + 1,
            gradeCode: l.gradeCode,
            size: l.size,
            quantity: l.quantity,
            volumeM3: l.volumeM3,
            receivedM3: l.receivedM3,
            receivedBlocks: l.receivedBlocks,
          }))}
          locations={locations.length ? locations : ["Curing room"]}
          today={isoDate()}
        />
      )}
      <div className="mt-6">
        <StorageCaution />
      </div>
    </>
  );
}
