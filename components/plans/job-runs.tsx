import { formatDate, formatMoney } from "@/lib/format";
import { formatVolume } from "@/lib/units";
import Link from "next/link";
import { rowLinkClass } from "@/components/ui/button";
import { listRuns, type RunSummary } from "@/db/queries/runs";
import { getShopSettings } from "@/db/queries/settings";
import { RunStatusBadge } from "./run-status";
import { getCurrentSession } from "@/lib/auth/session";
import { seesMoney } from "@/lib/auth/policy";

/** The runs that nested a job's parts, side by side, so the planner can pick the best. */
export async function JobRuns({ jobId }: { jobId: number }) {
  const [runs, { feedMmPerMin }, { user }] = await Promise.all([
    listRuns({ jobId, limit: 12 }),
    getShopSettings(),
    getCurrentSession(),
  ]);
  const money = !!user && seesMoney(user.roles);
  if (!runs.length)
    return (
      <p className="text-sm text-ink-soft">No runs yet. Plan this job to see how its parts nest into the stock.</p>
    );
  return <RunTable runs={runs} feedMmPerMin={feedMmPerMin} testId="job-runs" money={money} />;
}

/**
 * Runs side by side: yield, blocks, cost, offcuts, foam used (blocks less offcuts kept: the measure
 * that compares a true-shape run with box nesting, whose own box figure is in its tooltip), cut time
 * with the placements and turns of the cutting steps (on the run's machine), what did not fit,
 * layout. The current run is shaded.
 */
export function RunTable({
  runs,
  feedMmPerMin,
  currentId,
  testId,
  money,
}: {
  runs: RunSummary[];
  feedMmPerMin: number;
  currentId?: number;
  testId: string;
  /** Whether the person sees money (lib/auth/policy.ts, MONEY): the cost column is left out if not. */
  money: boolean;
}) {
  return (
    <div className="overflow-x-auto">
      <table data-testid={testId}>
        <thead>
          <tr>
            <th className="py-1">Plan</th>
            <th>Status</th>
            <th className="text-right">Yield</th>
            <th className="text-right">Blocks</th>
            {money && <th className="text-right">Stock cost</th>}
            <th className="text-right">Offcuts m³</th>
            <th className="text-right">Foam used m³</th>
            <th className="text-right">Cut time</th>
            <th className="text-right">Placements · turns</th>
            <th className="text-right">Not placed</th>
            <th className="pl-4">Layout</th>
            <th className="text-right">Made</th>
          </tr>
        </thead>
        <tbody>
          {runs.map((r) => (
            <tr key={r.id} className={`border-t border-bead/60 ${r.id === currentId ? "bg-kerf-light/40" : ""}`}>
              <td>
                <Link className={rowLinkClass} href={`/plans/${r.id}`}>
                  #{r.id}
                </Link>
              </td>
              <td>
                <RunStatusBadge status={r.status} stuck={r.stuckBlocks.length > 0} />
              </td>
              <td className="text-right tabular-nums">{r.stats ? `${(r.stats.yield * 100).toFixed(1)} %` : "–"}</td>
              <td className="text-right tabular-nums">{r.stats?.blocksUsed ?? "–"}</td>
              {money && <td className="text-right tabular-nums">{formatMoney(r.cost)}</td>}
              <td className="text-right tabular-nums">{r.stats ? (r.stats.offcutVolume / 1e9).toFixed(3) : "–"}</td>
              <td
                className="text-right tabular-nums"
                title={
                  r.shapes ? `${formatVolume(r.shapes.boxM3, { digits: 3 })} with the same parts as boxes` : undefined
                }
              >
                {r.stats ? ((r.stats.stockVolume - r.stats.offcutVolume) / 1e9).toFixed(3) : "–"}
                {r.shapes && r.shapes.slabs > 0 && (
                  <span className="block text-xs text-ink-soft">
                    {r.shapes.savedPct >= 0
                      ? `${r.shapes.savedPct.toFixed(1)} % less than boxes`
                      : `${(-r.shapes.savedPct).toFixed(1)} % more than boxes`}
                  </span>
                )}
              </td>
              <td className="text-right tabular-nums">
                {r.steps
                  ? `${Math.round(r.steps.minutes)} min`
                  : r.cutLengthMm === null
                    ? "–"
                    : `${Math.round(r.cutLengthMm / feedMmPerMin)} min`}
              </td>
              <td className="text-right tabular-nums" title={r.steps ? `on ${r.steps.machine}` : undefined}>
                {r.steps ? `${r.steps.placements} · ${r.steps.turns}` : "–"}
              </td>
              <td className="text-right tabular-nums">{r.best?.unplacedCount ?? "–"}</td>
              <td className="pl-4">
                {r.settings.layout ?? "–"}
                {r.settings.trueShape ? " · true shape" : ""}
              </td>
              <td className="text-right text-ink-faint">{formatDate(r.createdAt)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
