import { listMachines } from "@/db/queries/machines";
import { slabMaxFor } from "@/lib/planning/machine";
import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { jobNames } from "@/db/queries/runs";
import { CANDIDATE_LIMIT, candidateStock } from "@/db/queries/run-plan";
import { getShopSettings } from "@/db/queries/settings";
import { listJobs } from "@/db/queries/jobs";
import { JOB_STATUS_LABELS } from "@/lib/job-terms";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { NewRunForm } from "@/components/plans/new-run-form";
import { displayUnit } from "@/lib/display";

export const metadata: Metadata = { title: "New plan" };

/** Open jobs listed in the chooser at most, soonest due first; the rest are found by name. */
const JOBS_SHOWN = 300;

/** `?jobs=3,5` (from a job's page) or `?job=3&job=5` (from the chooser below). */
function chosenJobs(q: { jobs?: string; job?: string | string[] }): number[] {
  const raw = [q.jobs ?? "", ...[q.job ?? []].flat()].join(",");
  return [
    ...new Set(
      raw
        .split(",")
        .filter((x) => /^\d+$/.test(x))
        .map(Number),
    ),
  ];
}

/** A search of this page (jobs by name, stock by code), sent as the address so it can be kept. */
function FindForm(props: {
  label: string;
  name: string;
  value: string;
  maxLength: number;
  button: string;
  /** The jobs already chosen, kept through the search. */
  jobs?: string;
  children?: React.ReactNode;
}) {
  return (
    <form method="get" action="/plans/new" className="mb-4 flex flex-wrap items-end gap-2">
      {props.jobs && <input type="hidden" name="jobs" value={props.jobs} />}
      <label className="flex flex-col text-sm font-medium text-ink-soft">
        {props.label}
        <input
          type="search"
          name={props.name}
          defaultValue={props.value}
          maxLength={props.maxLength}
          className="mt-1 min-h-11 rounded border border-bead px-3 text-base text-ink"
        />
      </label>
      <button type="submit" className={buttonClass("secondary")}>
        {props.button}
      </button>
      {props.children}
    </form>
  );
}

export default async function NewPlanPage({
  searchParams,
}: {
  searchParams: Promise<{ jobs?: string; job?: string | string[]; q?: string; stock?: string }>;
}) {
  const user = await requirePage("/plans/new");
  const sp = await searchParams;
  const jobIds = chosenJobs(sp);
  if (!jobIds.length) {
    const q = typeof sp.q === "string" ? sp.q.trim().slice(0, 60) : "";
    const { items, total } = await listJobs({ status: "active", page: 1, pageSize: JOBS_SHOWN, q: q || undefined });
    const open = items.filter((j) => j.pieceCount > 0);
    return (
      <>
        <PageHeader
          title="New plan"
          lead="Choose the jobs to nest together: their parts share the stock you pick next."
        />
        <FindForm label="Find a job by name or customer" name="q" value={q} maxLength={60} button="Find" />
        {total > items.length && (
          <p className="mb-2 text-sm text-ink-soft">
            Showing the {items.length} soonest due of {total} open jobs; find a job by name to see others.
          </p>
        )}
        {open.length === 0 ? (
          <Notice tone="caution">
            {q
              ? `No open job with parts matches “${q}”.`
              : "No open job has parts to plan. Add a job and its parts on the Jobs page first."}
          </Notice>
        ) : (
          <Card>
            <form method="get" action="/plans/new" className="space-y-3">
              <fieldset>
                <legend className="mb-2 text-sm font-medium text-ink-soft">Jobs ({open.length})</legend>
                <ul className="divide-y divide-bead">
                  {open.map((j) => (
                    <li key={j.id}>
                      <label className="flex min-h-11 items-center gap-3 py-2">
                        <input type="checkbox" name="job" value={j.id} className="size-5" />
                        <span className="flex-1">
                          <span className="font-medium">{j.name}</span>
                          {j.customer && <span className="text-ink-soft"> · {j.customer}</span>}
                          <span className="block text-sm text-ink-faint">
                            {JOB_STATUS_LABELS[j.status]} · {j.lineCount} {j.lineCount === 1 ? "line" : "lines"} ·{" "}
                            {j.pieceCount} {j.pieceCount === 1 ? "piece" : "pieces"}
                            {j.dueOn && <> · due {j.dueOn}</>}
                          </span>
                        </span>
                      </label>
                    </li>
                  ))}
                </ul>
              </fieldset>
              <button type="submit" className={buttonClass("primary")}>
                Choose stock for these jobs
              </button>
            </form>
          </Card>
        )}
      </>
    );
  }
  // A block code typed in the stock search: past the oldest blocks offered, any ready block by its code.
  const code = typeof sp.stock === "string" ? sp.stock.trim().slice(0, 40) : "";
  const [jobs, stock, s, machines] = await Promise.all([
    jobNames(jobIds),
    candidateStock(jobIds, { code: code || undefined }),
    getShopSettings(),
    listMachines({ activeOnly: true }),
  ]);
  // True-shape slabs are sized for the first active profile cutter (as the run and the plan page do).
  const profileCutter = machines.find((m) => m.kind === "profile");
  return (
    <>
      <PageHeader
        title="New plan"
        lead={`Nest the parts still owed on ${[...jobs.values()].join(", ")} into the stock you choose.`}
      />
      {(stock.capped || code) && (
        <FindForm
          label="Find stock by block code or label number"
          name="stock"
          value={code}
          maxLength={40}
          button="Find stock"
          jobs={jobIds.join(",")}
        >
          {code && (
            <Link className={buttonClass("quiet")} href={`/plans/new?jobs=${jobIds.join(",")}`}>
              All stock
            </Link>
          )}
        </FindForm>
      )}
      {code && (
        <p className="mb-2 text-sm text-ink-soft" data-testid="stock-search">
          Ready blocks whose code matches “{code}”.
        </p>
      )}
      <NewRunForm
        key={code}
        jobIds={jobIds}
        candidates={stock.items}
        leftOut={stock.leftOut}
        capped={stock.capped ? CANDIDATE_LIMIT : null}
        machines={machines.filter((m) => m.kind === "block").map((m) => ({ id: m.id, name: m.name }))}
        slabCutter={profileCutter ? { name: profileCutter.name, slabMax: slabMaxFor(profileCutter) } : null}
        unit={await displayUnit(user)}
        defaults={{
          kerf: s.kerf,
          trim: s.trim,
          defectMargin: s.defectMargin,
          minOffcut: s.minOffcut,
          layout: s.layout,
          timeLimitMs: s.nestingTimeLimitMs,
        }}
      />
    </>
  );
}
