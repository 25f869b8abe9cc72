import Link from "next/link";
import { listDueGrades } from "@/db/queries/reorder";
import { countOpenOrders } from "@/db/queries/purchase-orders";
import { yieldThisMonthVsLast } from "@/db/queries/reports";

/** The buyer's home figures: grades to reorder and the orders still open. */
export async function BuyerFigures() {
  const [due, open] = await Promise.all([listDueGrades(), countOpenOrders()]);
  return (
    <div className="mt-3 space-y-3 text-sm" data-testid="buyer-figures">
      <div className="grid grid-cols-3 gap-3">
        <Fig label="To reorder" value={String(due.length)} tone={due.length ? "text-wire" : ""} />
        <Fig label="Orders out" value={String(open.sent + open.partReceived)} />
        <Fig label="Overdue" value={String(open.overdue)} tone={open.overdue ? "text-ember" : ""} />
      </div>
      {due.length > 0 && (
        <ul className="space-y-1">
          {due.slice(0, 5).map((g) => (
            <li key={g.gradeId} className="flex justify-between gap-2">
              <span>
                <span className="mr-1 inline-block size-3 rounded-sm align-middle" style={{ background: g.colour }} />
                {g.gradeCode}
              </span>
              <span className="text-ink-soft tabular-nums">
                {g.result.position.toFixed(1)} of {g.result.reorderPoint.toFixed(1)} m³
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
      <div className="grid grid-cols-2 gap-3">
        <Fig label="Yield this month" value={thisMonth.yieldPct === null ? "–" : `${thisMonth.yieldPct} %`} />
        <Fig label="Last month" value={lastMonth.yieldPct === null ? "–" : `${lastMonth.yieldPct} %`} />
      </div>
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

function Fig({ label, value, tone = "" }: { label: string; value: string; tone?: string }) {
  return (
    <div>
      <p className="text-xs uppercase tracking-wide text-ink-faint">{label}</p>
      <p className={`text-lg font-semibold tabular-nums ${tone}`}>{value}</p>
    </div>
  );
}
