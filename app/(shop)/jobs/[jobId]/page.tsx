import type { Metadata } from "next";
import { JobRuns } from "@/components/plans/job-runs";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { getJob, listJobParts } from "@/db/queries/jobs";
import { jobPartProgress } from "@/db/queries/owed";
import { PartProgressTable } from "@/components/jobs/part-progress";
import { listLibraryParts } from "@/db/queries/library";
import { listGrades, partGradeChoices } from "@/db/queries/grades";
import { displayUnit } from "@/lib/display";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { JobStatusBadge } from "@/components/jobs/labels";
import { JobStatusControl, PartsImport } from "@/components/jobs/job-forms";
import { PartsTable } from "@/components/jobs/parts-table";
import { listMachines } from "@/db/queries/machines";
import { PartForm } from "@/components/jobs/part-form";
import { AddFromLibrary } from "@/components/jobs/add-from-library";
import { formatSize } from "@/lib/units";

type Params = { params: Promise<{ jobId: string }> };

const jobIdOf = (v: string) => (/^\d{1,9}$/.test(v) ? Number(v) : null);

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const id = jobIdOf((await params).jobId);
  const job = id ? await getJob(id) : undefined;
  return { title: job?.name ?? "Job" };
}

export default async function JobPage({ params }: Params) {
  const user = await requirePage("/jobs/[jobId]");
  const id = jobIdOf((await params).jobId);
  const job = id ? await getJob(id) : undefined;
  if (!job) notFound();
  const canEdit = allows(["planner"], user.roles);
  const open = job.status === "open";
  const cuts = allows(["planner", "cutter"], user.roles);
  const [parts, progress, unit, grades, library, machines] = await Promise.all([
    listJobParts([job.id]),
    jobPartProgress(job.id),
    displayUnit(user),
    canEdit && open ? listGrades() : Promise.resolve([]),
    canEdit && open ? listLibraryParts() : Promise.resolve([]),
    cuts ? listMachines({ activeOnly: true }) : Promise.resolve([]),
  ]);
  // Profile programs for the shop's first profile cutter, for who plans and who cuts.
  const profileCutter = machines.find((m) => m.kind === "profile");

  return (
    <>
      <PageHeader
        title={job.name}
        lead={
          <span className="flex flex-wrap items-center gap-3">
            <JobStatusBadge status={job.status} />
            <span>{job.customer ?? "No customer given"}</span>
            <span>Due {job.dueOn ?? "—"}</span>
          </span>
        }
        actions={
          <div className="flex flex-wrap items-end gap-2">
            {canEdit && <JobStatusControl jobId={job.id} status={job.status} />}
            <Link className={buttonClass("secondary")} href="/jobs">
              All jobs
            </Link>
          </div>
        }
      />
      <div className="space-y-5">
        {job.notes && <Notice>{job.notes}</Notice>}
        {!open && canEdit && (
          <Notice tone="caution">
            This job is past taking parts: its part list is fixed. Set it back to “Taking parts” to change it.
          </Notice>
        )}

        <Card title="Parts">
          <PartsTable
            jobId={job.id}
            parts={JSON.parse(JSON.stringify(parts))}
            unit={unit}
            editable={canEdit && open}
            programs={profileCutter ? { machineId: profileCutter.id, machineName: profileCutter.name } : null}
          />
        </Card>

        {progress.length > 0 && (
          <Card title="Cut so far">
            <PartProgressTable rows={progress} />
          </Card>
        )}

        {/* Nesting runs of this job: filled in by the cut-planning pages. */}
        <section
          id="runs"
          aria-labelledby="runs-title"
          className="rounded-card border border-dashed border-bead-strong bg-paper-raised p-5"
        >
          <header className="mb-2 flex flex-wrap items-center justify-between gap-3">
            <h2 id="runs-title">Nesting runs</h2>
            {canEdit && parts.length > 0 && (
              <Link className={buttonClass("primary")} href={`/plans/new?jobs=${job.id}`}>
                Plan this job
              </Link>
            )}
          </header>
          <JobRuns jobId={job.id} />
        </section>

        {canEdit && open && (
          <>
            <div className="grid gap-5 lg:grid-cols-[1fr_22rem]">
              <Card title="Add a part">
                <PartForm target={{ kind: "job", jobId: job.id }} unit={unit} grades={partGradeChoices(grades)} />
              </Card>
              <Card title="Add from the part library">
                <AddFromLibrary
                  jobId={job.id}
                  parts={library.map((l) => ({
                    id: l.id,
                    kit: l.kit,
                    name: l.name,
                    defaultQuantity: l.defaultQuantity,
                    sizeText: formatSize(l.size, unit),
                  }))}
                />
              </Card>
            </div>
            <section aria-labelledby="import-title" className="space-y-3">
              <h2 id="import-title">Import a part list</h2>
              <PartsImport jobId={job.id} />
            </section>
          </>
        )}
      </div>
    </>
  );
}
