import { formatDateTime, formatMoney, plural } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { listLedger, ledgerOnHand } from "@/db/queries/ledger";
import { ledgerQuery } from "@/lib/validations/stock";
import { PageHeader } from "@/components/ui/card";
import { buttonClass, rowLinkClass } from "@/components/ui/button";
import { LEDGER_KINDS, LEDGER_LABELS } from "@/lib/stock";
import { formatVolume } from "@/lib/units";

/** The table scrolls sideways in its own box when large figures widen it. */
const TABLE_BOX = "overflow-x-auto rounded-card border border-bead bg-paper-raised shadow-card";

export const metadata: Metadata = { title: "Stock ledger" };

const PAGE_SIZE = 100;

/** The plan a movement came from ("run:12" → 12), for a link to its plan page. */
const planOf = (ref: string | null) => {
  const m = ref ? /^run:(\d{1,9})$/.exec(ref) : null;
  return m ? Number(m[1]) : null;
};

export default async function LedgerPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  await requirePage("/ledger");
  const raw = await searchParams;
  const parsed = ledgerQuery.safeParse(raw);
  const q = parsed.success ? parsed.data : ledgerQuery.parse({});
  const [{ items, total, older }, onHand] = await Promise.all([
    listLedger({ kind: q.kind, from: q.from, to: q.to, before: q.before, pageSize: PAGE_SIZE }),
    ledgerOnHand(),
  ]);
  const qs = new URLSearchParams(
    Object.entries({ kind: q.kind, from: q.from, to: q.to }).filter((e): e is [string, string] => Boolean(e[1])),
  ).toString();
  // The same filters, newest first (no cursor) or older than an entry.
  const pageLink = (before?: number) => {
    const p = new URLSearchParams(qs);
    if (before) p.set("before", String(before));
    const s = p.toString();
    return s ? `/ledger?${s}` : "/ledger";
  };
  return (
    <>
      <PageHeader
        title="Stock ledger"
        lead={`Every movement of stock, never edited. On hand by the ledger: ${formatVolume(onHand.m3, { digits: 2, boardFeet: true })}, value ${formatMoney(onHand.value)}.`}
        actions={
          <a className={buttonClass("secondary")} href={`/api/ledger/export?${qs}`} download>
            Export CSV
          </a>
        }
      />
      <form className="mb-4 flex flex-wrap items-end gap-3 text-sm" method="get">
        <label>
          <span className="block text-ink-soft">Kind</span>
          <select
            name="kind"
            defaultValue={q.kind ?? ""}
            className="min-h-11 rounded-md border border-bead-strong bg-paper-raised px-3"
          >
            <option value="">All movements</option>
            {LEDGER_KINDS.map((k) => (
              <option key={k} value={k}>
                {LEDGER_LABELS[k]}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="block text-ink-soft">From</span>
          <input
            type="date"
            name="from"
            defaultValue={q.from}
            className="min-h-11 rounded-md border border-bead-strong bg-paper-raised px-3"
          />
        </label>
        <label>
          <span className="block text-ink-soft">To</span>
          <input
            type="date"
            name="to"
            defaultValue={q.to}
            className="min-h-11 rounded-md border border-bead-strong bg-paper-raised px-3"
          />
        </label>
        <button className={buttonClass("secondary")} type="submit">
          Show
        </button>
      </form>
      {/* biome-ignore lint/a11y/noNoninteractiveTabindex: a keyboard scrolls the wide table sideways (WCAG 2.1.1) */}
      <section className={TABLE_BOX} aria-label="Ledger entries" tabIndex={0}>
        <table>
          <thead className="border-b border-bead bg-paper-sunk">
            <tr>
              <th className="px-3 py-2">When</th>
              <th className="px-3 py-2">Block</th>
              <th className="px-3 py-2">Movement</th>
              <th className="px-3 py-2 text-right">Change m³</th>
              <th className="px-3 py-2 text-right">Change value</th>
              <th className="px-3 py-2">Who</th>
              <th className="px-3 py-2">Why</th>
            </tr>
          </thead>
          <tbody>
            {items.map((e) => (
              <tr key={e.id} className="border-b border-bead/60 last:border-0">
                <td className="whitespace-nowrap px-3 py-2">{formatDateTime(e.at)}</td>
                <td className="px-3 py-0">
                  <Link className={rowLinkClass} href={`/stock/${encodeURIComponent(e.blockCode)}`}>
                    {e.blockCode}
                  </Link>
                </td>
                <td className="px-3 py-2">{LEDGER_LABELS[e.kind]}</td>
                <td className={`px-3 py-2 text-right tabular-nums ${e.deltaM3 < 0 ? "text-ember" : ""}`}>
                  {e.deltaM3 === 0 ? "–" : e.deltaM3.toFixed(3)}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">
                  {e.deltaValue === 0 ? "–" : e.deltaValue.toFixed(2)}
                </td>
                <td className="px-3 py-2">{e.user ?? "–"}</td>
                <td className="px-3 py-0 text-ink-soft">
                  {planOf(e.ref) !== null ? (
                    <Link
                      className="flex min-h-11 min-w-11 items-center font-medium"
                      href={`/plans/${planOf(e.ref)}`}
                      data-testid="ledger-plan-link"
                    >
                      {e.reason ?? `Plan #${planOf(e.ref)}`}
                    </Link>
                  ) : (
                    <span className="flex min-h-11 items-center">{e.reason}</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <nav aria-label="Ledger pages" className="mt-3 flex flex-wrap items-center gap-3 text-sm">
        <p className="text-ink-faint">
          {plural(total, "movement")}
          {items.length > 0 &&
            (q.before || older !== null) &&
            `; ${q.before ? "older ones" : "the newest"}, ${formatDateTime(items[0]!.at)} back to ${formatDateTime(items[items.length - 1]!.at)}`}
          .
        </p>
        {q.before && (
          <Link className={buttonClass("secondary")} href={pageLink()}>
            Newest
          </Link>
        )}
        {older !== null && (
          <Link className={buttonClass("secondary")} href={pageLink(older)} rel="next">
            Older
          </Link>
        )}
      </nav>
    </>
  );
}
