import { formatDate } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listRuns } from "@/db/queries/runs";
import { Card, PageHeader } from "@/components/ui/card";
import { buttonClass, rowLinkClass } from "@/components/ui/button";
import { RunStatusBadge } from "@/components/plans/run-status";

export const metadata: Metadata = { title: "Plans" };

const PAGE = 40;

export default async function PlansPage({ searchParams }: { searchParams: Promise<{ before?: string }> }) {
  const user = await requirePage("/plans");
  const raw = (await searchParams).before ?? "";
  const before = /^\d{1,9}$/.test(raw) ? Number(raw) : undefined;
  const [approved, page] = await Promise.all([
    listRuns({ statuses: ["approved"] }),
    listRuns({
      statuses: ["queued", "running", "done", "failed", "cancelled", "closed"],
      limit: PAGE + 1,
      ...(before ? { beforeId: before } : {}),
    }),
  ]);
  const others = page.slice(0, PAGE);
  const older = page.length > PAGE ? others.at(-1)!.id : undefined;
  const Row = ({ r }: { r: (typeof approved)[number] }) => (
    <tr className="border-t border-bead/60">
      <td>
        <Link className={rowLinkClass} href={`/plans/${r.id}`}>
          Plan #{r.id}
        </Link>
      </td>
      <td className="wrap-anywhere">{r.jobNames.join(", ")}</td>
      <td>
        <RunStatusBadge status={r.status} stuck={r.stuckBlocks.length > 0} />
      </td>
      <td className="text-right tabular-nums">{r.stats ? `${(r.stats.yield * 100).toFixed(1)} %` : "–"}</td>
      <td className="text-right tabular-nums">{r.stats?.blocksUsed ?? "–"}</td>
      <td className="text-right text-ink-faint">{formatDate(r.createdAt)}</td>
    </tr>
  );
  const head = (
    <thead>
      <tr>
        <th className="py-1">Plan</th>
        <th>Jobs</th>
        <th>Status</th>
        <th className="text-right">Yield</th>
        <th className="text-right">Blocks</th>
        <th className="text-right">Made</th>
      </tr>
    </thead>
  );
  return (
    <>
      <PageHeader
        title="Plans"
        lead="Nesting runs: what to cut, from which blocks, in which order."
        actions={
          allows(["planner"], user.roles) && (
            <Link className={buttonClass("primary")} href="/plans/new">
              New plan
            </Link>
          )
        }
      />
      <div className="space-y-5">
        <Card title={user.roles.includes("cutter") ? "Approved plans to cut" : "Approved plans (stock earmarked)"}>
          {approved.length ? (
            <table>
              {head}
              <tbody>
                {approved.map((r) => (
                  <Row key={r.id} r={r} />
                ))}
              </tbody>
            </table>
          ) : (
            <p className="text-sm text-ink-soft">No approved plans waiting.</p>
          )}
        </Card>
        <Card title={before ? `Other runs before plan #${before}` : "Other runs"}>
          {others.length ? (
            <table>
              {head}
              <tbody>
                {others.map((r) => (
                  <Row key={r.id} r={r} />
                ))}
              </tbody>
            </table>
          ) : (
            <p className="text-sm text-ink-soft">
              {before ? "No older runs." : "No runs yet. Start one with New plan or from a job."}
            </p>
          )}
          {(before || older) && (
            <nav aria-label="Older and newer runs" className="mt-3 flex flex-wrap gap-2">
              {before && (
                <Link className={buttonClass("secondary")} href="/plans">
                  Newest runs
                </Link>
              )}
              {older && (
                <Link className={buttonClass("secondary")} href={`/plans?before=${older}`}>
                  Older runs
                </Link>
              )}
            </nav>
          )}
        </Card>
      </div>
    </>
  );
}
