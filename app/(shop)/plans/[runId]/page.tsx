import { formatDate, formatMoney, plural } from "@/lib/format";
import { planSteps, stepProblems } from "@/db/queries/at-the-machine";
import { RunTable } from "@/components/plans/job-runs";
import { rowLinkClass } from "@/components/ui/button";
import { boundGap } from "@/lib/planning/bound-gap";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePage } from "@/lib/auth/guard";
import { Figure } from "@/components/ui/figure";
import { allows, seesMoney } from "@/lib/auth/policy";
import { getRun, listRuns } from "@/db/queries/runs";
import { owedByRun } from "@/db/queries/owed";
import { getShopSettings } from "@/db/queries/settings";
import { Badge, Card, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { RunLive } from "@/components/plans/run-live";
import { RunActions } from "@/components/plans/run-actions";
import { PlanView } from "@/components/plans/plan-view";
import { RunStatusBadge } from "@/components/plans/run-status";
import { HotWireCaution } from "@/components/shell/safety-note";
import { stuckPieces } from "@/lib/planning/cut-regions";
import { NotCuttable } from "@/components/plans/not-cuttable";
import { partIdFromKey } from "@/lib/planning/problem";
import { SlabFace } from "@/components/plans/slab-face";
import { keyNamer, memberList, slabMembers } from "@/lib/planning/slabs";
import { leftOutLine } from "@/lib/planning/usable";
import { planProfiles, profileTime } from "@/db/queries/profile-programs";
import { formatLength, formatSize, formatVolume } from "@/lib/units";
import { displayUnit } from "@/lib/display";
import type { Vec3 } from "@/lib/nesting";

export async function generateMetadata({ params }: { params: Promise<{ runId: string }> }): Promise<Metadata> {
  return { title: `Plan #${(await params).runId}` };
}

export default async function RunPage({ params }: { params: Promise<{ runId: string }> }) {
  const user = await requirePage("/plans/[runId]");
  const money = seesMoney(user.roles);
  const id = Number((await params).runId);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const run = await getRun(id);
  if (!run) notFound();
  const [settings, siblings, owed, steps, profiles, unit] = await Promise.all([
    getShopSettings(),
    listRuns({ jobId: run.jobIds[0], limit: 8 }),
    owedByRun(id, run.plan),
    planSteps(run),
    run.plan ? planProfiles(run) : Promise.resolve(null),
    displayUnit(user),
  ]);
  const len = (v: number) => formatLength(v, unit);
  // Profile parts: their slab programs on the shop's profile cutter add to the cut time.
  // A large plan: the figures stored when it finished (the programs are worked out on download).
  const profTime = !profiles
    ? null
    : profiles.listOnly
      ? (run.profiles ?? null)
      : profileTime(profiles.machine, profiles.slabs);
  const profMinutes = profTime?.minutes ?? 0;
  const profNote = profTime?.slabs
    ? `; profiles ${Math.round(profMinutes)} min (${profTime.slabs} slab${profTime.slabs === 1 ? "" : "s"}) on ${profTime.machine}`
    : "";
  const stepsOf = new Map(steps.blocks.map((b) => [b.code, b]));
  const cannotCut = stepProblems(steps.blocks);
  // Cut time from the cutting steps where they were worked out, else from the stored wire travel.
  const timed = steps.blocks.filter((b) => b.time);
  const untimed = steps.blocks.filter((b) => !b.procedure);
  const stepMinutes = timed.reduce((s, b) => s + b.time!.totalMin, 0);
  const placements = timed.reduce((s, b) => s + b.time!.placements, 0);
  const turns = timed.reduce((s, b) => s + b.time!.turns, 0);
  const planner = allows(["planner"], user.roles);
  const cutter = allows(["cutter"], user.roles);
  const names = new Map(run.parts.map((p) => [p.id, p.name]));
  const plan = run.plan;
  // A slab (true-shape plan) is named "slab for N parts"; its members are listed under its block.
  const partName = keyNamer(plan, names);
  const outlines = new Map(run.problem.parts.flatMap((q) => (q.outline ? [[q.id, q.outline] as const] : [])));
  const used = plan ? run.problem.blocks.filter((b) => plan.placements.some((p) => p.block === b.id)) : [];
  const uncuttable = run.stuckBlocks;
  // Wire travel was worked out once, when the run finished (the run's figures); time follows from the feed.
  const totalLength = run.cutLengthMm ?? 0;
  const totalMinutes = settings.feedMmPerMin > 0 ? totalLength / settings.feedMmPerMin : 0;
  const owes = [...owed.values()].some((n) => n > 0);
  // The plan's yield counts the parts' boxes; with profile parts, the foam actually kept too (holes out).
  const trueVolume = new Map(run.parts.map((p) => [p.id, p.trueVolumeMm3]));
  // The same denominator as the plan's yield (lib/nesting/solver/assemble.ts): stock used less the offcuts kept.
  const netStock = plan ? plan.stats.stockVolume - plan.stats.offcutVolume : 0;
  const trueYield =
    plan && netStock > 0 && run.parts.some((p) => p.trueVolumeMm3 !== null)
      ? plan.placements.reduce(
          (s, p) =>
            s +
            (p.slab
              ? slabMembers(p).reduce((v, k) => v + (trueVolume.get(partIdFromKey(k)) ?? 0), 0)
              : (trueVolume.get(partIdFromKey(p.part)) ?? p.size[0] * p.size[1] * p.size[2])),
          0,
        ) / netStock
      : null;

  return (
    <>
      <PageHeader
        title={`Plan #${run.id}`}
        lead={
          <span className="flex flex-wrap items-center gap-2">
            <RunStatusBadge status={run.status} stuck={uncuttable.length > 0} />
            <span>for {run.jobNames.join(", ")}</span>
            {run.settings.layout ? (
              <span className="text-ink-faint">
                {run.settings.layout} layout · kerf {len(run.settings.kerf)} · trim {len(run.settings.trim)} · defect
                margin {len(run.settings.defectMargin)}
              </span>
            ) : (
              <span className="text-ink-faint">recorded history (no plan stored)</span>
            )}
            {run.parentRunId && (
              <span>
                re-plan of <Link href={`/plans/${run.parentRunId}`}>#{run.parentRunId}</Link>
              </span>
            )}
          </span>
        }
        actions={
          plan && (
            <>
              <Link className={buttonClass("secondary")} href={`/plans/${run.id}/sheet`}>
                Cut sheet
              </Link>
              <a className={buttonClass("secondary")} href={`/api/runs/${run.id}/cut-list`} download>
                Cut list CSV
              </a>
              {cutter && run.status === "approved" && (
                <Link className={buttonClass("primary")} href={`/plans/${run.id}/cut`}>
                  At the machine
                </Link>
              )}
            </>
          )
        }
      />
      <div className="space-y-5">
        <RunLive
          initial={{ id: run.id, status: run.status, progress: run.progress, best: run.best, error: run.error }}
          canCancel={planner}
        />
        {run.status === "failed" && (
          <Notice tone="danger" title="This run failed">
            {run.error ?? "The worker stopped."} Start a new run from the job.
          </Notice>
        )}
        {run.status === "cancelled" && (
          <Notice tone="caution">
            This plan was stopped or released{plan ? "; the best plan found before then is shown." : "."}
          </Notice>
        )}
        {run.zoneChanges.length > 0 && (
          <Notice tone="caution" title="Defect zones changed after this plan was made">
            <ul className="list-disc pl-5" data-testid="changed-zones">
              {run.zoneChanges.map((z) => (
                <li key={z.zone}>
                  Zone {z.zone} on <Link href={`/stock/${encodeURIComponent(z.blockCode)}`}>{z.blockCode}</Link>{" "}
                  {z.change} after this plan was made ({z.by ?? "someone"}, {formatDate(z.at)}).
                </li>
              ))}
            </ul>
            <p className="mt-2">
              The plan keeps clear of the zones as they were when it was made. Check those blocks, and plan the job
              again if a part now sits on a defect or the change frees room.
            </p>
          </Notice>
        )}
        {run.leftOut.length > 0 && (
          <Notice
            tone="info"
            title={`${run.leftOut.length} chosen ${run.leftOut.length === 1 ? "block was" : "blocks were"} left out of this plan`}
          >
            <ul className="list-disc pl-5" data-testid="left-out">
              {run.leftOut.map((l) => (
                <li key={l.id}>{leftOutLine(l)}.</li>
              ))}
            </ul>
          </Notice>
        )}

        {plan && (
          <>
            <dl className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5" data-testid="plan-figures">
              <Figure
                boxed
                label="Yield"
                value={`${(plan.stats.yield * 100).toFixed(1)} %`}
                note={trueYield === null ? undefined : `${(trueYield * 100).toFixed(1)} % by the parts' true shapes`}
              />
              <Figure
                boxed
                label="Blocks"
                value={`${plan.stats.blocksUsed}`}
                note={`at least ${plan.stats.lowerBoundBlocks}`}
              />
              {money && <Figure boxed label="Stock cost" value={formatMoney(run.cost ?? 0)} />}
              <Figure
                boxed
                label="Offcuts kept"
                value={formatVolume(plan.stats.offcutVolume / 1e9)}
                note={plural(plan.offcuts.length, "piece")}
              />
              {timed.length > 0 && untimed.length === 0 ? (
                <Figure
                  boxed
                  label="Cut time (estimate)"
                  value={`${Math.round(stepMinutes + profMinutes)} min`}
                  note={`on ${steps.machine.name}: ${placements} placement${placements === 1 ? "" : "s"}, ${turns} turn${turns === 1 ? "" : "s"}${profNote}`}
                />
              ) : (
                <Figure
                  boxed
                  label="Cut time (estimate)"
                  value={`${Math.round(totalMinutes + profMinutes)} min`}
                  note={`${(totalLength / 1000).toFixed(1)} m of wire travel at ${settings.feedMmPerMin} mm/min${profNote}`}
                />
              )}
            </dl>
            {run.shapes && (
              <p className="text-sm text-ink-soft" data-testid="shape-comparison">
                {(() => {
                  const c = run.shapes;
                  const used = (m3: number) => formatVolume(m3, { digits: 3 });
                  const diff =
                    c.savedPct >= 0
                      ? `${c.savedPct.toFixed(1)} % less by true shape`
                      : `${(-c.savedPct).toFixed(1)} % more by true shape`;
                  const unlike =
                    c.unplaced.trueShape !== c.unplaced.box
                      ? ` Not like for like: ${plural(c.unplaced.trueShape, "piece")} left unplaced by true shape, ${c.unplaced.box} as boxes.`
                      : "";
                  return c.slabs === 0
                    ? `Foam used: ${used(c.trueShapeM3)}. No slab of profiles took less foam than their boxes, so every part is nested as a box (box nesting alone: ${used(c.boxM3)}).${unlike}`
                    : `Foam used: ${used(c.trueShapeM3)} nested by true shape (${plural(c.slabs, "slab")}), ${used(c.boxM3)} with the same parts as boxes: ${diff}.${unlike}`;
                })()}
              </p>
            )}
            {plan.unplaced.length > 0 && (
              <Notice tone="caution" title="Not everything fits">
                <ul className="list-disc pl-5">
                  {plan.unplaced.map((u) => (
                    <li key={u.part}>
                      {u.count} × {partName(u.part)}: {u.reason}
                    </li>
                  ))}
                </ul>
              </Notice>
            )}
            {(() => {
              const gap = boundGap(run.problem, plan);
              if (!gap) return null;
              return (
                <Notice
                  tone="info"
                  title={`${plural(gap.used, "block")}, where no plan can use fewer than ${gap.bound}`}
                >
                  <p>
                    The parts fill {gap.partBlocks.toFixed(2)} of the largest block used, by volume (before kerf and
                    trim). What keeps this plan above the bound:
                  </p>
                  <ul className="list-disc pl-5">
                    {gap.largest.map((l) => (
                      <li key={l.part}>
                        {l.count} × {partName(l.part)}, each {Math.round(l.share * 100)} % of a block: large parts leave
                        room that the smaller ones rarely fill exactly;
                      </li>
                    ))}
                    {gap.defects > 0 && (
                      <li>
                        {gap.defects} defect zone{gap.defects === 1 ? "" : "s"} in {gap.blocksWithDefects} of the
                        blocks, kept clear with their margin.
                      </li>
                    )}
                  </ul>
                  <p>
                    A longer time budget helps when the parts are many and small; with a few large parts it rarely saves
                    a block.
                  </p>
                </Notice>
              );
            })()}
            {uncuttable.length > 0 && (
              <Notice tone="danger" title="This plan cannot be cut">
                {uncuttable.length === 1 ? `Block ${uncuttable[0]} holds` : `Blocks ${uncuttable.join(", ")} hold`}{" "}
                pieces that no through cut frees (free layout, for comparison only), so the plan cannot be approved.
                Plan the job again with the guillotine or layers rule.
              </Notice>
            )}
            {cannotCut.length > 0 && (
              <Notice tone="danger" title={`This plan cannot be cut on ${steps.machine.name}`}>
                <ul className="list-disc pl-5">
                  {cannotCut.map((c) => (
                    <li key={c}>{c}.</li>
                  ))}
                </ul>
                <p className="mt-2">It cannot be approved for this machine. Plan again for another machine.</p>
              </Notice>
            )}
            {steps.chosen !== "plan" && run.status !== "failed" && (
              <p className="text-sm text-ink-soft">
                This plan was made for no machine in particular: its steps are shown for {steps.machine.name}.
              </p>
            )}
            {planner && (
              <RunActions
                runId={run.id}
                status={run.status}
                owes={owes}
                canApprove={uncuttable.length === 0 && cannotCut.length === 0}
              />
            )}
            <HotWireCaution />
            {used.map((b) => {
              const status = run.blocks.find((x) => x.code === b.id)?.planStatus;
              return (
                <Card
                  key={b.id}
                  title={
                    <span className="flex flex-wrap items-center gap-2">
                      <Link className={rowLinkClass} href={`/stock/${encodeURIComponent(b.id)}`}>
                        {b.id}
                      </Link>
                      <span className="text-sm font-normal text-ink-soft">
                        {formatSize(b.size, unit)} · {b.grade}
                        {b.offcut && " · offcut"}
                      </span>
                      {status === "cut" && <Badge tone="moss">cut</Badge>}
                      {status === "reserved" && <Badge tone="kerf">earmarked</Badge>}
                    </span>
                  }
                  action={(() => {
                    const st = stepsOf.get(b.id);
                    if (!st?.procedure?.ok) return undefined;
                    return (
                      <span className="text-sm text-ink-soft">
                        {st.procedure.steps.length} step{st.procedure.steps.length === 1 ? "" : "s"}
                        {st.time ? ` · about ${Math.round(st.time.totalMin)} min` : ""}
                      </span>
                    );
                  })()}
                >
                  {(cutter || planner) && stepsOf.get(b.id)?.procedure?.ok && (
                    <p className="mb-3 flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
                      <span className="text-ink-soft">Programs for {steps.machine.name}:</span>
                      {(stepsOf.get(b.id)!.procedure as { steps: { n: number; piece: string }[] }).steps.map((s) => (
                        <a
                          key={s.n}
                          className="inline-flex min-h-11 min-w-11 items-center"
                          href={`/api/runs/${run.id}/gcode?block=${encodeURIComponent(b.id)}&step=${s.n}`}
                        >
                          step {s.n} (piece {s.piece})
                        </a>
                      ))}
                    </p>
                  )}
                  {(cutter || planner) &&
                    profiles?.slabs.some((s) => s.slab.block === b.id) &&
                    (() => {
                      const mine = profiles.slabs.filter((s) => s.slab.block === b.id);
                      const base = `/api/runs/${run.id}/profile-programs?machineId=${profiles.machine.id}&slab=`;
                      return (
                        <div className="mb-3 text-sm" data-testid={`profile-programs-${b.id}`}>
                          <span className="text-ink-soft">Profile programs for {profiles.machine.name}:</span>
                          <ul className="mt-1 space-y-1">
                            {mine.map((s) => (
                              <li key={s.label} className="flex flex-wrap items-center gap-x-3">
                                <span>
                                  slab {s.slab.n} ({memberList(s.names, (n) => n)})
                                </span>
                                {s.program || profiles.listOnly ? (
                                  <>
                                    <a
                                      className="inline-flex min-h-11 items-center"
                                      href={`${base}${encodeURIComponent(s.label)}`}
                                      download
                                    >
                                      G-code
                                    </a>
                                    <a
                                      className="inline-flex min-h-11 items-center"
                                      href={`${base}${encodeURIComponent(s.label)}&format=svg`}
                                      target="_blank"
                                      rel="noopener"
                                    >
                                      path drawing
                                    </a>
                                    {s.program && (
                                      <span className="text-ink-faint">
                                        about {Math.max(1, Math.round(s.program.minutes.total))} min
                                        {s.program.warnings.length
                                          ? ` · ${s.program.warnings.length} note${s.program.warnings.length === 1 ? "" : "s"} in the program`
                                          : ""}
                                      </span>
                                    )}
                                  </>
                                ) : (
                                  <span className="text-ember">cannot be cut there: {s.problem}</span>
                                )}
                              </li>
                            ))}
                          </ul>
                        </div>
                      );
                    })()}
                  {plan.placements.some((p) => p.block === b.id && p.slab) && (
                    <div className="mb-3 text-sm" data-testid={`slabs-${b.id}`}>
                      <p className="text-ink-soft">
                        True-shape slabs: the through cuts free each slab whole; the profile cutter then cuts its parts
                        out, each from its own lead-in.
                        {run.problem.settings.slabMax &&
                          ` Each was sized for the profile cutter: a face of at most ${formatSize(run.problem.settings.slabMax.slice(1), unit)} (across × up), ${len(run.problem.settings.slabMax[0])} along the wire.`}
                      </p>
                      <ul className="mt-1 space-y-2">
                        {plan.placements
                          .map((p, i) => ({ p, i }))
                          .filter(({ p }) => p.block === b.id && p.slab)
                          .map(({ p, i }, k) => {
                            // Named as its profile program is ("HF-1001 slab 2"), else by its order in the block.
                            const label =
                              profiles?.slabs.find((s) => s.slab.block === b.id && s.slab.parts[0]?.placement === i)
                                ?.label ?? `${b.id} slab ${k + 1}`;
                            const [t, u, v] = p.slab!.size;
                            return (
                              <li key={p.part}>
                                <span className="font-medium">
                                  {label}: {partName(p.part)}
                                </span>{" "}
                                <span className="text-ink-soft">
                                  ({len(t!)} thick, face {formatSize([u!, v!], unit)}) —{" "}
                                  {memberList(slabMembers(p), partName)}
                                </span>
                                <details className="mt-1" open={k < 4}>
                                  <summary className="cursor-pointer text-sm text-ink-soft">Face drawing</summary>
                                  <SlabFace
                                    id={label}
                                    slab={p.slab!}
                                    outlines={outlines}
                                    kerf={run.settings.kerf}
                                    partName={partName}
                                  />
                                </details>
                              </li>
                            );
                          })}
                      </ul>
                    </div>
                  )}
                  {uncuttable.includes(b.id) && (
                    <div className="mb-3">
                      <NotCuttable count={stuckPieces(plan, b.id, run.settings.kerf)} />
                    </div>
                  )}
                  <PlanView
                    block={{
                      id: b.id,
                      size: b.size,
                      defects: b.defects.map((d) => ({
                        min: d.min.map((v) => Math.max(0, v - run.settings.defectMargin)) as Vec3,
                        max: d.max.map((v, i) => Math.min(b.size[i]!, v + run.settings.defectMargin)) as [
                          number,
                          number,
                          number,
                        ],
                      })),
                    }}
                    placements={plan.placements.filter((p) => p.block === b.id)}
                    offcuts={plan.offcuts.filter((o) => o.block === b.id)}
                    cuts={plan.cuts[b.id] ?? []}
                    kerf={run.settings.kerf}
                    trim={b.trim}
                    partName={partName}
                    unit={unit}
                  />
                </Card>
              );
            })}
          </>
        )}

        {siblings.length > 1 && (
          <Card title="Runs for the same job, side by side">
            <RunTable
              runs={siblings}
              feedMmPerMin={settings.feedMmPerMin}
              currentId={run.id}
              testId="run-compare"
              money={money}
            />
          </Card>
        )}
      </div>
    </>
  );
}
