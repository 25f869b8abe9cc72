import { formatMoney, plural } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listDeliveries } from "@/db/queries/deliveries";
import { PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";

/** The table scrolls sideways in its own box when large figures widen it. */
const TABLE_BOX = "overflow-x-auto rounded-card border border-bead bg-paper-raised shadow-card";

export const metadata: Metadata = { title: "Deliveries" };

export default async function DeliveriesPage({ searchParams }: { searchParams: Promise<{ page?: string }> }) {
  const user = await requirePage("/deliveries");
  const page = Math.max(1, Math.min(10_000, Number((await searchParams).page) || 1));
  const { items, total } = await listDeliveries({ page, pageSize: 50 });
  const canReceive = allows(["buyer"], user.roles);
  return (
    <>
      <PageHeader
        title="Deliveries"
        lead={`${plural(total, "delivery", "deliveries")} received.`}
        actions={
          <>
            <a className={buttonClass("secondary")} href="/api/deliveries/export" download>
              Export CSV
            </a>
            {canReceive && (
              <Link className={buttonClass("primary")} href="/deliveries/new">
                Receive a delivery
              </Link>
            )}
          </>
        }
      />
      {/* biome-ignore lint/a11y/noNoninteractiveTabindex: a keyboard scrolls the wide table sideways (WCAG 2.1.1) */}
      <section className={TABLE_BOX} aria-label="Deliveries" tabIndex={0}>
        <table>
          <thead className="border-b border-bead bg-paper-sunk">
            <tr>
              <th className="px-3 py-2">Received</th>
              <th className="px-3 py-2">Supplier</th>
              <th className="px-3 py-2">Lot</th>
              <th className="px-3 py-2">PO</th>
              <th className="px-3 py-2 text-right">Blocks</th>
              <th className="px-3 py-2 text-right">m³</th>
              <th className="px-3 py-2 text-right">Cost</th>
              <th className="px-3 py-2">By</th>
            </tr>
          </thead>
          <tbody>
            {items.map((d) => (
              <tr key={d.id} className="border-b border-bead/60 last:border-0">
                <td className="px-3 py-2">{d.receivedOn}</td>
                <td className="px-3 py-2">{d.supplier}</td>
                <td className="px-3 py-2">{d.lot}</td>
                <td className="px-3 py-2">{d.poRef ?? "–"}</td>
                <td className="px-3 py-2 text-right tabular-nums">{d.blocks}</td>
                <td className="px-3 py-2 text-right tabular-nums">{d.volumeM3.toFixed(2)}</td>
                <td className="px-3 py-2 text-right tabular-nums">{formatMoney(d.cost)}</td>
                <td className="px-3 py-2">{d.receivedBy ?? "–"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <div className="mt-4 flex justify-between text-sm">
        {page > 1 ? (
          <Link className={buttonClass("secondary")} href={`/deliveries?page=${page - 1}`}>
            Newer
          </Link>
        ) : (
          <span />
        )}
        {page * 50 < total && (
          <Link className={buttonClass("secondary")} href={`/deliveries?page=${page + 1}`}>
            Older
          </Link>
        )}
      </div>
    </>
  );
}
