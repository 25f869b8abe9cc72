import { formatDate, formatMoney, plural } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { getPurchaseOrder, listOrderDeliveries } from "@/db/queries/purchase-orders";
import { listReorder } from "@/db/queries/reorder";
import { listSuppliers } from "@/db/queries/suppliers";
import { Badge, Card, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { PoStatusBadge } from "@/components/purchasing/po-status";
import { PoActions } from "@/components/purchasing/po-actions";
import { PoForm } from "@/components/purchasing/po-form";
import { PRICE_UNIT_LABEL } from "@/lib/purchasing/pricing";
import { formatVolume, m3ToBoardFeet } from "@/lib/units";

export const metadata: Metadata = { title: "Purchase order" };

const money = formatMoney;

export default async function OrderPage({ params }: { params: Promise<{ poId: string }> }) {
  const user = await requirePage("/purchasing/orders/[poId]");
  const { poId } = await params;
  if (!/^\d{1,9}$/.test(poId)) notFound();
  const po = await getPurchaseOrder(Number(poId));
  if (!po) notFound();
  const deliveries = await listOrderDeliveries(po.id);
  const canEdit = allows(["buyer"], user.roles);
  const [grades, suppliers] =
    canEdit && po.status === "draft" ? await Promise.all([listReorder(), listSuppliers()]) : [[], []];
  return (
    <>
      <PageHeader
        title={po.number}
        lead={
          <span className="flex flex-wrap items-center gap-3">
            <PoStatusBadge status={po.status} />
            <span>{po.supplier}</span>
            {po.expectedOn && <span>expected {po.expectedOn}</span>}
          </span>
        }
        actions={
          <Link className="self-center text-sm" href="/purchasing/orders">
            All orders
          </Link>
        }
      />
      <div className="space-y-5">
        {canEdit ? (
          <PoActions id={po.id} status={po.status} supplierEmail={po.supplierEmail} />
        ) : (
          <a className={buttonClass("secondary")} href={`/api/purchase-orders/${po.id}/export`} download>
            Export CSV
          </a>
        )}
        {!po.supplierEmail && po.status === "draft" && (
          <Notice tone="caution">
            {po.supplier} has no e-mail address: add one on the suppliers page, or send the order another way and mark
            it sent.
          </Notice>
        )}
        {po.cancelReason && (
          <Notice tone="danger" title="Cancelled">
            {po.cancelReason}
          </Notice>
        )}
        {po.lines.some((l) => l.overTolerance) && (
          <Notice tone="caution" title="Received over the terms">
            At least one line came in above +10 % of what was ordered and was accepted with a reason. Check the invoice
            against what arrived.
          </Notice>
        )}
        <Card title="Lines">
          {/* biome-ignore lint/a11y/noNoninteractiveTabindex: a keyboard scrolls the wide lines sideways (WCAG 2.1.1) */}
          <section className="-mx-5 overflow-x-auto" aria-label="Order lines" tabIndex={0}>
            <table className="min-w-[40rem]">
              <thead className="border-b border-bead">
                <tr>
                  <th className="px-3 py-2">#</th>
                  <th className="px-3 py-2">Grade</th>
                  <th className="px-3 py-2">Block (mm)</th>
                  <th className="px-3 py-2 text-right">Blocks</th>
                  <th className="px-3 py-2 text-right">Volume</th>
                  <th className="px-3 py-2 text-right">Price</th>
                  <th className="px-3 py-2 text-right">Line total</th>
                  <th className="px-3 py-2 text-right">Received</th>
                </tr>
              </thead>
              <tbody>
                {po.lines.map((l, i) => {
                  const pctGot = l.volumeM3 > 0 ? (l.receivedM3 / l.volumeM3) * 100 : 0;
                  return (
                    <tr key={l.id} className="border-b border-bead/60 last:border-0" data-testid={`line-${i + 1}`}>
                      <td className="px-3 py-2">{i + 1}</td>
                      <td className="px-3 py-2">
                        {l.gradeCode}
                        <p className="text-xs text-ink-faint">{l.gradeLabel}</p>
                      </td>
                      <td className="whitespace-nowrap px-3 py-2 tabular-nums">{l.size.join(" × ")}</td>
                      <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{l.quantity}</td>
                      <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                        {formatVolume(l.volumeM3)}
                        <p className="text-xs text-ink-faint">
                          {Math.round(m3ToBoardFeet(l.volumeM3)).toLocaleString("en")} BF
                        </p>
                      </td>
                      <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                        {l.price} <span className="text-xs text-ink-faint">{PRICE_UNIT_LABEL[l.priceUnit]}</span>
                      </td>
                      <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{money(l.value)}</td>
                      <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                        {plural(l.receivedBlocks, "block")} · {Math.round(pctGot)} %
                        {l.overTolerance ? (
                          <p>
                            <Badge tone="wire">over +10 %</Badge>
                          </p>
                        ) : pctGot >= 90 ? (
                          <p>
                            <Badge tone="moss">filled</Badge>
                          </p>
                        ) : null}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
              <tfoot>
                <tr className="border-t border-bead font-medium">
                  <td className="px-3 py-2" colSpan={4}>
                    Total
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{formatVolume(po.volumeM3)}</td>
                  <td />
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{money(po.value)}</td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                    {po.volumeM3 > 0 ? Math.round((po.receivedM3 / po.volumeM3) * 100) : 0} %
                  </td>
                </tr>
              </tfoot>
            </table>
          </section>
          {po.notes && <p className="mt-3 text-sm text-ink-soft">Notes: {po.notes}</p>}
          <p className="mt-2 text-xs text-ink-faint">
            Written by {po.createdBy ?? "–"} on {formatDate(po.createdAt)}
            {po.sentAt && `; sent ${formatDate(po.sentAt)}`}
            {po.closedAt && `; ${po.status === "cancelled" ? "cancelled" : "closed"} ${formatDate(po.closedAt)}`}.
          </p>
        </Card>
        <Card title="Deliveries against this order">
          {deliveries.length ? (
            <ul className="divide-y divide-bead text-sm">
              {deliveries.map((d) => (
                <li key={d.id} className="py-2">
                  {d.receivedOn} · lot {d.lot} · {plural(d.blocks, "block")} · {formatVolume(d.volumeM3)}
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-ink-faint">Nothing received yet.</p>
          )}
        </Card>
        {canEdit && po.status === "draft" && (
          <section>
            <h2 className="mb-3">Change the draft</h2>
            <PoForm
              grades={grades.map((r) => ({
                id: r.gradeId,
                code: r.gradeCode,
                priceUnit: r.priceUnit,
                blockSize: r.blockSize,
                lastPrice: r.lastPrice,
              }))}
              suppliers={suppliers
                .filter((s) => s.active || s.id === po.supplierId)
                .map((s) => ({ id: s.id, name: s.name, email: s.email }))}
              initial={{
                id: po.id,
                supplierId: po.supplierId,
                expectedOn: po.expectedOn,
                notes: po.notes,
                lines: po.lines.map((l) => ({
                  gradeId: l.gradeId,
                  size: l.size,
                  quantity: l.quantity,
                  price: l.price,
                  note: l.note,
                })),
              }}
            />
          </section>
        )}
      </div>
    </>
  );
}
