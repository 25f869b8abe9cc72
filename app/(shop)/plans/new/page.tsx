import type { Metadata } from "next";
import { requireRole } from "@/lib/auth/guard";
import { candidateStock, jobNames } from "@/db/queries/runs";
import { getShopSettings } from "@/db/queries/settings";
import { Notice, PageHeader } from "@/components/ui/card";
import { NewRunForm } from "@/components/plans/new-run-form";

export const metadata: Metadata = { title: "New plan" };

export default async function NewPlanPage({ searchParams }: { searchParams: Promise<{ jobs?: string }> }) {
  await requireRole("planner");
  const raw = (await searchParams).jobs ?? "";
  const jobIds = /^\d+(,\d+)*$/.test(raw) ? raw.split(",").map(Number) : [];
  if (!jobIds.length) {
    return (
      <>
        <PageHeader title="New plan" />
        <Notice tone="caution">Choose the jobs to plan from the Jobs page.</Notice>
      </>
    );
  }
  const [jobs, candidates, s] = await Promise.all([jobNames(jobIds), candidateStock(jobIds), getShopSettings()]);
  return (
    <>
      <PageHeader title="New plan" lead={`Nest the parts still owed on ${[...jobs.values()].join(", ")} into the stock you choose.`} />
      <NewRunForm
        jobIds={jobIds}
        candidates={candidates}
        defaults={{ kerf: s.kerf, trim: s.trim, defectMargin: s.defectMargin, minOffcut: s.minOffcut, layout: s.layout, timeLimitMs: s.nestingTimeLimitMs }}
      />
    </>
  );
}
