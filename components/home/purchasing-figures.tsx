import Link from "next/link";
import { listDueGrades } from "@/db/queries/reorder";
import { countOpenOrders } from "@/db/queries/purchase-orders";
import { yieldThisMonthVsLast } from "@/db/queries/reports";
import { Figure } from "@/components/ui/figure";
import { formatVolume } from "@/lib/units";

/** The buyer's home figures: grades to reorder and the orders still open. */
export async function BuyerFigures() {
  const [due, open] = await Promise.all([listDueGrades(), countOpenOrders()]);
  return (
    <div className="mt-3 space-y-3 text-sm" data-testid="buyer-figures">
      <dl className="grid grid-cols-3 gap-3">
        <Figure label="To reorder" value={String(due.length)} tone={due.length ? "text-wire" : ""} />
        <Figure label="Orders out" value={String(open.sent + open.partReceived)} />
        <Figure label="Overdue" value={String(open.overdue)} tone={open.overdue ? "text-ember" : ""} />
      </dl>
      {due.length > 0 && (
        <ul className="space-y-1">
          {due.slice(0, 5).map((g) => (
            <li key={g.gradeId} className="flex justify-between gap-2">
              <span>
                <span className="mr-1 inline-block size-3 rounded-sm align-middle" style={{ background: g.colour }} />
                {g.gradeCode}
              </span>
              <span className="text-ink-soft tabular-nums">
                {g.result.position.toFixed(1)} of {formatVolume(g.result.reorderPoint, { digits: 1 })}
              </span>
            </li>
          ))}
        </ul>
      )}
      <div className="flex flex-wrap gap-4">
        <Link className="inline-flex min-h-11 min-w-11 items-center" href="/purchasing">
          Reorder list
        </Link>
        <Link className="inline-flex min-h-11 min-w-11 items-center" href="/purchasing/orders?status=open">
          Open orders{open.draft ? ` (${open.draft} draft${open.draft === 1 ? "" : "s"})` : ""}
        </Link>
      </div>
    </div>
  );
}

/** The manager's home figure: material yield this month against last. */
export async function ManagerFigures() {
  const { thisMonth, lastMonth } = await yieldThisMonthVsLast();
  const delta =
    thisMonth.yieldPct !== null && lastMonth.yieldPct !== null
      ? Math.round((thisMonth.yieldPct - lastMonth.yieldPct) * 10) / 10
      : null;
  return (
    <div className="mt-3 space-y-3 text-sm" data-testid="manager-figures">
      <dl className="grid grid-cols-2 gap-3">
        <Figure label="Yield this month" value={thisMonth.yieldPct === null ? "–" : `${thisMonth.yieldPct} %`} />
        <Figure label="Last month" value={lastMonth.yieldPct === null ? "–" : `${lastMonth.yieldPct} %`} />
      </dl>
      <p className="text-ink-soft">
        {delta === null ? (
          thisMonth.yieldPct === null ? (
            "No blocks cut yet this month."
          ) : (
            "No blocks were cut last month to compare with."
          )
        ) : delta === 0 ? (
          "The same as last month."
        ) : (
          <>
            <span className={delta > 0 ? "font-semibold text-moss" : "font-semibold text-ember"}>
              {delta > 0 ? "▲" : "▼"} {Math.abs(delta)} points
            </span>{" "}
            against last month.
          </>
        )}{" "}
        Parts ÷ (stock issued − offcuts kept).
      </p>
      <Link className="inline-flex min-h-11 min-w-11 items-center" href="/reports">
        Reports
      </Link>
    </div>
  );
}
