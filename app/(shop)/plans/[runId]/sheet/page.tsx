import { plural } from "@/lib/format";
import { offcutCodesOf } from "@/db/queries/offcut-codes";
import { planSteps } from "@/db/queries/at-the-machine";
import { StepDrawing, describeNext } from "@/components/plans/step-drawing";
import { Notice } from "@/components/ui/card";
import type { Metadata } from "next";
import { notFound } from "next/navigation";
import QRCode from "qrcode";
import { requirePage } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { getShopSettings } from "@/db/queries/settings";
import { listChildren } from "@/db/queries/blocks";
import { PlanView } from "@/components/plans/plan-view";
import { PrintButton } from "@/components/stock/print-button";
import { cutEstimate } from "@/lib/planning/wire-travel";
import { piecesOf, stuckPieces } from "@/lib/planning/cut-regions";
import { NotCuttable } from "@/components/plans/not-cuttable";
import { keyNamer, memberList, slabIndex } from "@/lib/planning/slabs";
import { cutRuns, groupPlacements } from "@/lib/planning/sheet";
import { displayUnit } from "@/lib/display";
import { MachineUnitsNote } from "@/components/plans/machine-units";
import { formatMachineSize } from "@/lib/units";

export const metadata: Metadata = { title: "Cut sheet" };

/** Millimetres as a cutter reads them: a tenth at most, no float noise. */
const mm = (v: number) => String(Math.round(v * 10) / 10);

/** The printable cut sheet: per block, the through cuts in order, the parts, and labels for the offcuts it will make. */
export default async function CutSheetPage({ params }: { params: Promise<{ runId: string }> }) {
  const user = await requirePage("/plans/[runId]/sheet");
  // Sizes in millimetres (the machine's unit), with inches beside them for someone who reads inches.
  const unit = await displayUnit(user);
  const size = (v: readonly number[]) => formatMachineSize(v, unit);
  const id = Number((await params).runId);
  const run = Number.isInteger(id) && id > 0 ? await getRun(id) : undefined;
  if (!run?.plan) notFound();
  const plan = run.plan;
  const settings = await getShopSettings();
  const names = new Map(run.parts.map((p) => [p.id, p.name]));
  // A slab (true-shape plan) is named "slab for N parts"; the table lists its members.
  const partName = keyNamer(plan, names);
  const slabs = slabIndex(plan);
  const memberNames = (k: string) => (slabs[k] ? memberList(slabs[k], partName) : null);
  const used = run.problem.blocks.filter((b) => plan.placements.some((p) => p.block === b.id));
  // Codes are fixed when the plan is approved; before that they are the next free numbers.
  const fixedCodes = await offcutCodesOf(run.id);
  const machineSteps = await planSteps(run);
  const stepsOf = new Map(machineSteps.blocks.map((s) => [s.code, s]));
  const sheets = await Promise.all(
    used.map(async (b) => {
      const blockId = run.blocks.find((x) => x.code === b.id)?.id;
      const fixed = (blockId && fixedCodes.get(blockId)) || [];
      const existing = blockId && !fixed.length ? (await listChildren(blockId)).length : 0;
      const offcuts = plan.offcuts.filter((o) => o.block === b.id);
      const labels = await Promise.all(
        offcuts.map(async (o, i) => {
          const code = fixed[i] ?? `${b.id}.${existing + i + 1}`;
          return {
            code,
            size: o.size,
            svg: await QRCode.toString(code, { type: "svg", margin: 1, errorCorrectionLevel: "M" }),
          };
        }),
      );
      return {
        b,
        offcuts,
        labels,
        stuck: stuckPieces(plan, b.id, run.settings.kerf),
        estimate: cutEstimate(b.size, plan.cuts[b.id] ?? [], settings.feedMmPerMin, 10, {
          trim: b.trim,
          kerf: run.settings.kerf,
          pieces: piecesOf(plan, b.id),
        }),
      };
    }),
  );
  return (
    <div className="space-y-6 print:text-[11pt]">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1>Cut sheet · plan #{run.id}</h1>
          <p className="text-ink-soft">
            {run.jobNames.join(", ")} · kerf {run.settings.kerf} mm · trim {run.settings.trim} mm · feed{" "}
            {settings.feedMmPerMin} mm/min
          </p>
          <MachineUnitsNote unit={unit} />
        </div>
        <PrintButton label="Print cut sheet" />
      </div>
      <section className="rounded-md border-2 border-wire bg-wire-light p-3 text-sm">
        <p className="font-semibold">Before you heat the wire</p>
        <p>
          Ventilate: heated polystyrene gives off styrene; use the lowest wire heat that cuts, and the wire should never
          smoke. The wire burns and may carry tens of volts: never leave it hot and unattended. Never hot-wire
          polyurethane. Follow local codes, the material&apos;s safety data sheet and licensed practice.
        </p>
      </section>
      {sheets.map(({ b, offcuts, labels, stuck, estimate }) => {
        const st = stepsOf.get(b.id);
        const proc = st?.procedure;
        const codes = labels.map((l) => l.code);
        return (
          <section key={b.id} className="break-inside-avoid space-y-3 border-t border-bead pt-4 print:break-after-page">
            <h2>
              Block {b.id}{" "}
              <span className="text-sm font-normal text-ink-soft">
                {size(b.size)} · {b.grade}
                {b.offcut ? " · offcut (faces clean)" : ` · trim ${run.settings.trim} mm each face first`}
              </span>
            </h2>
            {stuck > 0 && <NotCuttable count={stuck} />}
            {proc && !proc.ok && (
              <Notice tone="danger" title={`Not on ${machineSteps.machine.name}`}>
                {proc.problems.map((p) => `Piece ${p.piece} (${size(p.size)}): ${p.limit}.`).join(" ")}
              </Notice>
            )}
            {proc?.ok && proc.steps.length > 0 && (
              <div className="space-y-3">
                <h3 className="text-sm font-semibold">
                  Steps on {machineSteps.machine.name} ({plural(proc.steps.length, "step")},{" "}
                  {plural(proc.cutCount, "cut")}
                  {st?.time ? `, about ${Math.round(st.time.totalMin)} min` : ""}): positions are measured from the
                  piece&apos;s own faces
                </h3>
                <ol className="grid gap-3 md:grid-cols-2 print:grid-cols-2">
                  {proc.steps.map((s) => (
                    <li key={s.n} className="break-inside-avoid space-y-2 rounded border border-bead p-2 text-sm">
                      <p className="font-semibold">
                        Step {s.n}: {s.kind === "turn" ? "turn" : "place"} piece {s.piece} · {size(s.size)}
                      </p>
                      <p>{s.howToPlace}</p>
                      <div className="max-w-sm [&_svg]:max-h-56">
                        <StepDrawing
                          step={s}
                          machine={machineSteps.machine}
                          kerf={proc.kerf}
                          current={null}
                          partName={partName}
                          offcutCodes={codes}
                        />
                      </div>
                      <ol className="list-decimal pl-6">
                        {s.cuts.map((c) => (
                          <li key={c.n} value={c.n}>
                            {c.machineAxis === "X" ? "down" : "across"}, kerf from {mm(c.pos)} mm off the{" "}
                            {c.machineAxis === "X" ? "zero end" : "bottom face"}
                            {c.kind === "trim" ? " (trim)" : ""}
                            {c.frees.length > 0 && (
                              <span className="text-ink-soft">
                                {" "}
                                → {c.frees.map((n) => describeNext(n, partName, codes)).join("; ")}
                              </span>
                            )}
                          </li>
                        ))}
                      </ol>
                      <p className="pt-2">Done by (initials): ________ &nbsp; at: ________</p>
                    </li>
                  ))}
                </ol>
              </div>
            )}
            <div className="grid gap-4 lg:grid-cols-2">
              <div>
                <h3 className="text-sm font-semibold">
                  Through cuts of the plan, in order{proc?.ok ? " (as the steps above make them, without trims)" : ""}
                </h3>
                <ol className="mt-1 list-decimal pl-6 text-sm">
                  {cutRuns(plan.cuts[b.id] ?? []).map((r) => {
                    const across = r.axis === "x" ? "the length" : r.axis === "y" ? "the width" : "the height";
                    return r.to === r.from ? (
                      <li key={r.from} value={r.from}>
                        across {across}, kerf starting at {mm(r.first)} mm
                      </li>
                    ) : (
                      <li key={r.from} value={r.from}>
                        <span className="font-medium">
                          cuts {r.from}–{r.to}
                        </span>
                        : across {across},{" "}
                        {r.step > 0
                          ? `kerf starting at ${mm(r.first)} mm, then every ${mm(r.step)} mm to ${mm(r.last)} mm (${plural(r.to - r.from + 1, "cut")})`
                          : `kerf starting at ${mm(r.first)} mm in each of the next ${plural(r.to - r.from + 1, "piece")}`}
                      </li>
                    );
                  })}
                </ol>
                <p className="mt-1 text-xs text-ink-faint">
                  About {Math.round(estimate.minutes)} min of cutting ({(estimate.lengthMm / 1000).toFixed(1)} m of wire
                  travel across the pieces each cut splits).
                </p>
                <h3 className="mt-3 text-sm font-semibold">Parts</h3>
                <table className="text-sm">
                  <thead>
                    <tr className="text-left [&>th]:pr-4 [&>th]:font-medium">
                      <th>Part</th>
                      <th className="text-right">Count</th>
                      <th>Size</th>
                      <th>At (x, y, z mm)</th>
                    </tr>
                  </thead>
                  <tbody>
                    {groupPlacements(plan.placements.filter((p) => p.block === b.id)).map((l, i) => (
                      <tr key={i} className="border-t border-bead/60 align-top [&>td]:pr-4">
                        <td>
                          {partName(l.part)}
                          {memberNames(l.part) && (
                            <span className="block text-xs text-ink-soft">
                              to the profile cutter: {memberNames(l.part)}
                            </span>
                          )}
                        </td>
                        <td className="text-right tabular-nums">{l.count}</td>
                        <td className={unit === "in" ? "" : "whitespace-nowrap"}>{size(l.size)}</td>
                        <td>
                          {l.origins
                            .slice(0, 4)
                            .map((o) => `(${o.map(mm).join(", ")})`)
                            .join(" · ")}
                          {l.count > 4 && (
                            <span className="text-ink-faint"> and {l.count - 4} more (see the drawing)</span>
                          )}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              <PlanView
                block={{ id: b.id, size: b.size, defects: b.defects.map((d) => ({ min: d.min, max: d.max })) }}
                placements={plan.placements.filter((p) => p.block === b.id)}
                offcuts={offcuts}
                cuts={plan.cuts[b.id] ?? []}
                kerf={run.settings.kerf}
                trim={b.trim}
                partName={partName}
                showLayers={false}
                facts={false}
              />
            </div>
            {labels.length > 0 && (
              <div>
                <h3 className="text-sm font-semibold">Offcut labels (stick on as each offcut comes free)</h3>
                <div className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-3">
                  {labels.map((l) => (
                    <div
                      key={l.code}
                      className="flex items-center gap-3 rounded border border-ink p-2"
                      data-testid="offcut-label"
                    >
                      <div className="size-20 shrink-0" dangerouslySetInnerHTML={{ __html: l.svg }} />
                      <div className="text-sm">
                        <p className="text-lg font-bold">{l.code}</p>
                        <p>{size(l.size)}</p>
                        <p>
                          {b.grade} · offcut of {b.id}
                        </p>
                      </div>
                    </div>
                  ))}
                </div>
              </div>
            )}
          </section>
        );
      })}
    </div>
  );
}
