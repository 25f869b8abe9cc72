import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listPurchaseOrders } from "@/db/queries/purchase-orders";
import { PageHeader } from "@/components/ui/card";
import { buttonClass, rowLinkClass } from "@/components/ui/button";
import { PoStatusBadge } from "@/components/purchasing/po-status";
import { PO_STATUSES, PO_STATUS_LABELS, type PoStatus } from "@/lib/purchasing/orders";
import { formatMoney } from "@/lib/format";

export const metadata: Metadata = { title: "Purchase orders" };

export default async function OrdersPage({
  searchParams,
}: {
  searchParams: Promise<{ status?: string; page?: string }>;
}) {
  const user = await requirePage("/purchasing/orders");
  const sp = await searchParams;
  const status =
    sp.status === "open" || (PO_STATUSES as readonly string[]).includes(sp.status ?? "")
      ? (sp.status as PoStatus | "open")
      : undefined;
  const page = Math.max(1, Math.min(10_000, Number(sp.page) || 1));
  const { items, total } = await listPurchaseOrders({ status, page });
  const canEdit = allows(["buyer"], user.roles);
  const tab = (s: string | undefined, label: string) => (
    <Link
      key={label}
      href={s ? `/purchasing/orders?status=${s}` : "/purchasing/orders"}
      aria-current={status === s ? "page" : undefined}
      className={`inline-flex min-h-11 min-w-11 items-center justify-center rounded-md px-3 text-sm ${status === s ? "bg-kerf text-white hover:no-underline" : "text-ink-soft"}`}
    >
      {label}
    </Link>
  );
  return (
    <>
      <PageHeader
        title="Purchase orders"
        lead={`${total} order${total === 1 ? "" : "s"}${status ? ` ${status === "open" ? "still open" : PO_STATUS_LABELS[status].toLowerCase()}` : ""}.`}
        actions={
          <>
            <Link className={buttonClass("secondary")} href="/purchasing">
              Reorder list
            </Link>
            {canEdit && (
              <Link className={buttonClass("primary")} href="/purchasing/orders/new">
                Write an order
              </Link>
            )}
          </>
        }
      />
      <nav className="mb-4 flex flex-wrap gap-1" aria-label="Filter by state">
        {[tab(undefined, "All"), tab("open", "Open"), ...PO_STATUSES.map((s) => tab(s, PO_STATUS_LABELS[s]))]}
      </nav>
      <div className="overflow-x-auto rounded-card border border-bead bg-paper-raised shadow-card">
        <table>
          <thead className="border-b border-bead bg-paper-sunk">
            <tr>
              <th className="px-3 py-2">Order</th>
              <th className="px-3 py-2">Supplier</th>
              <th className="px-3 py-2">State</th>
              <th className="px-3 py-2">Expected</th>
              <th className="px-3 py-2">Grades</th>
              <th className="px-3 py-2 text-right">m³</th>
              <th className="px-3 py-2 text-right">Received</th>
              <th className="px-3 py-2 text-right">Value</th>
            </tr>
          </thead>
          <tbody>
            {items.map((o) => (
              <tr key={o.id} className="border-b border-bead/60 last:border-0">
                <td className="px-3 py-0">
                  <Link className={rowLinkClass} href={`/purchasing/orders/${o.id}`}>
                    {o.number}
                  </Link>
                </td>
                <td className="px-3 py-2">{o.supplier}</td>
                <td className="px-3 py-2">
                  <PoStatusBadge status={o.status} />
                </td>
                <td className="px-3 py-2">{o.expectedOn ?? "–"}</td>
                <td className="px-3 py-2">{[...new Set(o.lines.map((l) => l.gradeCode))].join(", ")}</td>
                <td className="px-3 py-2 text-right tabular-nums">{o.volumeM3.toFixed(2)}</td>
                <td className="px-3 py-2 text-right tabular-nums">
                  {o.volumeM3 > 0 ? `${Math.round((o.receivedM3 / o.volumeM3) * 100)} %` : "–"}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">{formatMoney(o.value)}</td>
              </tr>
            ))}
            {!items.length && (
              <tr>
                <td colSpan={8} className="px-3 py-6 text-center text-ink-faint">
                  No orders here.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <div className="mt-4 flex justify-between text-sm">
        {page > 1 ? (
          <Link
            className={buttonClass("secondary")}
            href={`/purchasing/orders?page=${page - 1}${status ? `&status=${status}` : ""}`}
          >
            Newer
          </Link>
        ) : (
          <span />
        )}
        {page * 50 < total && (
          <Link
            className={buttonClass("secondary")}
            href={`/purchasing/orders?page=${page + 1}${status ? `&status=${status}` : ""}`}
          >
            Older
          </Link>
        )}
      </div>
    </>
  );
}
