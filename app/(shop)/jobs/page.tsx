import { plural } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listJobs } from "@/db/queries/jobs";
import { jobQuerySchema } from "@/lib/validations/jobs";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { JobStatusBadge } from "@/components/jobs/labels";
import { NewJobForm } from "@/components/jobs/job-forms";
import { JOB_STATUSES, JOB_STATUS_LABELS } from "@/lib/job-terms";
import { isoDate } from "@/lib/stock";

export const metadata: Metadata = { title: "Jobs" };

const FILTERS: [string, string][] = [
  ["active", "In hand"],
  ...JOB_STATUSES.map((s) => [s, JOB_STATUS_LABELS[s]] as [string, string]),
  ["all", "Everything"],
];

export default async function JobsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePage("/jobs");
  const raw = Object.fromEntries(
    Object.entries(await searchParams).filter((e): e is [string, string] => typeof e[1] === "string" && e[1] !== ""),
  );
  const parsed = jobQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : jobQuerySchema.parse({});
  const list = await listJobs(query);
  const canEdit = allows(["planner"], user.roles);
  const pages = Math.max(1, Math.ceil(list.total / list.pageSize));
  const today = isoDate();
  const href = (next: Record<string, string | number>) =>
    `/jobs?${new URLSearchParams({ ...raw, ...Object.fromEntries(Object.entries(next).map(([k, v]) => [k, String(v)])) }).toString()}`;

  return (
    <>
      <PageHeader
        title="Jobs"
        lead="Batches of parts to cut, soonest due first. A job takes parts until it is planned."
        actions={
          canEdit && (
            <>
              <Link className={buttonClass("secondary")} href="/plans/new">
                Plan jobs together
              </Link>
              <Link className={buttonClass("secondary")} href="/library">
                Part library
              </Link>
            </>
          )
        }
      />
      {!parsed.success && (
        <div className="mb-4">
          <Notice tone="caution">Some filters in the address were not understood and were ignored.</Notice>
        </div>
      )}
      <div className={`grid gap-5 ${canEdit ? "lg:grid-cols-[1fr_22rem]" : ""}`}>
        <div className="space-y-4">
          <nav aria-label="Job status" className="flex flex-wrap gap-2">
            {FILTERS.map(([k, label]) => (
              <Link
                key={k}
                href={href({ status: k, page: 1 })}
                aria-current={query.status === k ? "page" : undefined}
                className={`inline-flex min-h-11 min-w-11 items-center rounded-full border px-4 text-sm no-underline hover:no-underline ${query.status === k ? "border-kerf bg-kerf text-white" : "border-bead-strong bg-paper-raised text-ink"}`}
              >
                {label}
              </Link>
            ))}
          </nav>
          <div className="overflow-x-auto rounded-card border border-bead bg-paper-raised shadow-card">
            <table data-testid="job-list">
              <thead className="border-b border-bead bg-paper-sunk">
                <tr>
                  <th className="px-3 py-2">Job</th>
                  <th className="px-3 py-2">Customer or project</th>
                  <th className="px-3 py-2">Due</th>
                  <th className="px-3 py-2">Status</th>
                  <th className="px-3 py-2 text-right">Lines</th>
                  <th className="px-3 py-2 text-right">Pieces</th>
                  <th className="px-3 py-2 text-right">m³ of parts</th>
                </tr>
              </thead>
              <tbody>
                {list.items.map((j) => {
                  const late = j.dueOn !== null && j.dueOn < today && ["open", "planned", "cutting"].includes(j.status);
                  return (
                    <tr key={j.id} className="border-b border-bead/60 last:border-0 hover:bg-paper">
                      <td className="px-3 py-0 wrap-anywhere">
                        <Link
                          className="flex min-h-11 items-center font-medium no-underline hover:underline"
                          href={`/jobs/${j.id}`}
                        >
                          {j.name}
                        </Link>
                      </td>
                      <td className="px-3 py-2">{j.customer ?? "–"}</td>
                      <td className={`whitespace-nowrap px-3 py-2 ${late ? "font-semibold text-ember" : ""}`}>
                        {j.dueOn ?? "–"}
                        {late && " · late"}
                      </td>
                      <td className="whitespace-nowrap px-3 py-2">
                        <JobStatusBadge status={j.status} />
                      </td>
                      <td className="px-3 py-2 text-right tabular-nums">{j.lineCount}</td>
                      <td className="px-3 py-2 text-right tabular-nums">{j.pieceCount.toLocaleString("en")}</td>
                      <td className="px-3 py-2 text-right tabular-nums">{j.partVolumeM3.toFixed(3)}</td>
                    </tr>
                  );
                })}
                {!list.items.length && (
                  <tr>
                    <td colSpan={7} className="px-3 py-10 text-center text-ink-soft">
                      No jobs here.
                    </td>
                  </tr>
                )}
              </tbody>
            </table>
          </div>
          <nav className="flex items-center justify-between gap-3" aria-label="Pages">
            {list.page > 1 ? (
              <Link className={buttonClass("secondary")} href={href({ page: list.page - 1 })}>
                Previous
              </Link>
            ) : (
              <span />
            )}
            <span className="text-sm text-ink-soft">
              Page {list.page} of {pages} · {plural(list.total, "job")}
            </span>
            {list.page < pages ? (
              <Link className={buttonClass("secondary")} href={href({ page: list.page + 1 })}>
                Next
              </Link>
            ) : (
              <span />
            )}
          </nav>
        </div>
        {canEdit && (
          <Card title="New job">
            <NewJobForm />
          </Card>
        )}
      </div>
    </>
  );
}
