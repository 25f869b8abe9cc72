import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { connection } from "next/server";
import { requirePage } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { listChildren } from "@/db/queries/blocks";
import { Badge, Card, Notice, PageHeader } from "@/components/ui/card";
import { HotWireCaution } from "@/components/shell/safety-note";
import { PlanView } from "@/components/plans/plan-view";
import { CutBlockForm } from "@/components/plans/cut-block-form";
import { keyNamer, placedByPart, slabMembers } from "@/lib/planning/slabs";
import { stuckPieces } from "@/lib/planning/cut-regions";
import { NotCuttable } from "@/components/plans/not-cuttable";
import { StepRunner } from "@/components/plans/step-runner";
import { blockSteps } from "@/db/queries/at-the-machine";
import { UNDO_MINUTES } from "@/db/queries/cuts";
import { UndoCut } from "@/components/plans/undo-cut";
import { displayUnit } from "@/lib/display";
import { MachineUnitsNote } from "@/components/plans/machine-units";
import { formatMachineSize } from "@/lib/units";

export const metadata: Metadata = { title: "At the machine" };

export default async function AtTheMachinePage({ params }: { params: Promise<{ runId: string }> }) {
  const user = await requirePage("/plans/[runId]/cut");
  // Sizes in millimetres (the machine's unit), with inches beside them for someone who reads inches.
  const unit = await displayUnit(user);
  await connection(); // the undo window depends on the clock: render on each request
  const id = Number((await params).runId);
  const run = Number.isInteger(id) && id > 0 ? await getRun(id) : undefined;
  if (!run?.plan) notFound();
  const plan = run.plan;
  const names = new Map(run.parts.map((p) => [p.id, p.name]));
  // A slab (true-shape plan) is named "slab for N parts"; its members by their parts' names.
  const partName = keyNamer(plan, names);
  const inPlan = run.blocks.filter((b) => b.planStatus);
  const partNames = Object.fromEntries(
    plan.placements.flatMap((p) => [p.part, ...(p.slab ? slabMembers(p) : [])]).map((k) => [k, partName(k)]),
  );
  const stepsOf = new Map(
    await Promise.all(
      inPlan.filter((b) => b.planStatus === "reserved").map(async (b) => [b.id, await blockSteps(run, b.id)] as const),
    ),
  );
  const offcutsOf = new Map(
    await Promise.all(
      inPlan
        .filter((b) => b.planStatus === "cut")
        .map(async (b) => [b.id, (await listChildren(b.id)).map((c) => c.code)] as const),
    ),
  );
  return (
    <>
      <PageHeader
        title={`At the machine · plan #${run.id}`}
        lead={
          <>
            {run.jobNames.join(", ")} · <Link href={`/plans/${run.id}/sheet`}>cut sheet</Link>
          </>
        }
      />
      <div className="space-y-5">
        <HotWireCaution />
        <MachineUnitsNote unit={unit} />
        {run.status !== "approved" && (
          <Notice tone="caution">
            This plan is {run.status === "closed" ? "fully cut" : "not approved"}: nothing to record here.
          </Notice>
        )}
        {inPlan.map((b) => {
          const pb = run.problem.blocks.find((x) => x.id === b.code)!;
          const placements = plan.placements.filter((p) => p.block === b.code);
          const stuck = stuckPieces(plan, b.code, run.settings.kerf);
          const counts = placedByPart(placements);
          return (
            <Card
              key={b.id}
              title={
                <span className="flex flex-wrap items-center gap-2">
                  {b.code} <span className="text-sm font-normal text-ink-soft">{formatMachineSize(pb.size, unit)}</span>
                  {b.planStatus === "cut" ? (
                    <Badge tone="moss">cut</Badge>
                  ) : b.planStatus === "released" ? (
                    <Badge>released</Badge>
                  ) : (
                    <Badge tone="kerf">to cut</Badge>
                  )}
                </span>
              }
            >
              {stuck > 0 && (
                <div className="mb-3">
                  <NotCuttable count={stuck} />
                </div>
              )}
              {/* The steps full width above the form: at the machine they are what people look at. */}
              <div className="space-y-5">
                {stepsOf.get(b.id) && (
                  <StepRunner
                    runId={run.id}
                    initial={stepsOf.get(b.id)!}
                    partNames={partNames}
                    canCheck={run.status === "approved"}
                    unit={unit}
                  />
                )}
                <details className="rounded-md border border-bead p-3" open={!stepsOf.get(b.id)}>
                  <summary className="min-h-11 cursor-pointer py-2 font-medium">The whole block, drawn</summary>
                  <PlanView
                    block={{ id: b.code, size: pb.size, defects: pb.defects.map((d) => ({ min: d.min, max: d.max })) }}
                    placements={placements}
                    offcuts={plan.offcuts.filter((o) => o.block === b.code)}
                    cuts={plan.cuts[b.code] ?? []}
                    kerf={run.settings.kerf}
                    trim={pb.trim}
                    partName={partName}
                    showLayers={false}
                  />
                </details>
                {b.planStatus === "reserved" && run.status === "approved" ? (
                  <CutBlockForm
                    runId={run.id}
                    blockId={b.id}
                    code={b.code}
                    stepsLeft={(() => {
                      const st = stepsOf.get(b.id);
                      const n = st?.procedure.ok ? st.procedure.steps.length : 0;
                      return Math.max(0, n - (st?.done.length ?? 0));
                    })()}
                    stepsDone={stepsOf.get(b.id)?.done.length ?? 0}
                    parts={[...counts].map(([jobPartId, count]) => ({
                      jobPartId,
                      count,
                      name: names.get(jobPartId) ?? `part ${jobPartId}`,
                    }))}
                  />
                ) : b.planStatus === "cut" ? (
                  <>
                    <Notice tone="success" title={b.partial ? `${b.code} is recorded part-cut` : `${b.code} is cut`}>
                      {offcutsOf.get(b.id)?.length ? (
                        <>
                          {b.partial ? "Offcuts and uncut pieces now in stock" : "Offcuts now in stock"}:{" "}
                          {offcutsOf.get(b.id)!.join(", ")}.{" "}
                          <Link href={`/labels?codes=${encodeURIComponent(offcutsOf.get(b.id)!.join(","))}`}>
                            Print their labels
                          </Link>
                          .
                        </>
                      ) : (
                        "No offcuts were kept from it."
                      )}
                    </Notice>
                    {b.cutAt && Date.parse(b.cutAt) + UNDO_MINUTES * 60_000 > Date.now() && (
                      <UndoCut
                        runId={run.id}
                        blockId={b.id}
                        code={b.code}
                        until={new Date(Date.parse(b.cutAt) + UNDO_MINUTES * 60_000).toISOString()}
                      />
                    )}
                  </>
                ) : (
                  <p className="text-sm text-ink-soft">Released: not part of the work any more.</p>
                )}
              </div>
            </Card>
          );
        })}
      </div>
    </>
  );
}
