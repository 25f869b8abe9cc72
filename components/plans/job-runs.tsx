import Link from "next/link";
import { listRuns } from "@/db/queries/runs";
import { getShopSettings } from "@/db/queries/settings";
import { RunStatusBadge } from "./run-status";

/** The runs that nested a job's parts, side by side, so the planner can pick the best. */
export async function JobRuns({ jobId }: { jobId: number }) {
  const [runs, { feedMmPerMin }] = await Promise.all([listRuns({ jobId, limit: 12 }), getShopSettings()]);
  if (!runs.length)
    return (
      <p className="text-sm text-ink-soft">No runs yet. Plan this job to see how its parts nest into the stock.</p>
    );
  return (
    <div className="overflow-x-auto">
      <table data-testid="job-runs">
        <thead>
          <tr>
            <th className="py-1">Plan</th>
            <th>Status</th>
            <th className="text-right">Yield</th>
            <th className="text-right">Blocks</th>
            <th className="text-right">Stock cost</th>
            <th className="text-right">Offcuts m³</th>
            <th className="text-right">Cut time</th>
            <th className="text-right">Not placed</th>
            <th>Layout</th>
            <th className="text-right">Made</th>
          </tr>
        </thead>
        <tbody>
          {runs.map((r) => (
            <tr key={r.id} className="border-t border-bead/60">
              <td className="py-1">
                <Link href={`/plans/${r.id}`}>#{r.id}</Link>
              </td>
              <td>
                <RunStatusBadge status={r.status} stuck={r.stuckBlocks.length > 0} />
              </td>
              <td className="text-right tabular-nums">{r.stats ? `${(r.stats.yield * 100).toFixed(1)} %` : "–"}</td>
              <td className="text-right tabular-nums">{r.stats?.blocksUsed ?? "–"}</td>
              <td className="text-right tabular-nums">
                {r.cost === null ? "–" : r.cost.toLocaleString("en", { style: "currency", currency: "USD" })}
              </td>
              <td className="text-right tabular-nums">{r.stats ? (r.stats.offcutVolume / 1e9).toFixed(3) : "–"}</td>
              <td className="text-right tabular-nums">
                {r.cutLengthMm === null ? "–" : `${Math.round(r.cutLengthMm / feedMmPerMin)} min`}
              </td>
              <td className="text-right tabular-nums">{r.best?.unplacedCount ?? "–"}</td>
              <td>{r.settings.layout ?? "–"}</td>
              <td className="text-right text-ink-faint">{r.createdAt.slice(0, 10)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
