import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { listMachines } from "@/db/queries/machines";
import { listGrades } from "@/db/queries/grades";
import { getShopSettings } from "@/db/queries/settings";
import { Card, PageHeader } from "@/components/ui/card";
import { MachineForm, MachineGradesForm } from "@/components/machines/machine-form";
import { dims, mm } from "@/lib/planning/machine";

export const metadata: Metadata = { title: "Machines" };

export default async function MachinesPage() {
  const user = await requirePage("/machines");
  const canEdit = user.roles.includes("admin") || user.roles.includes("planner");
  const [machines, grades, settings] = await Promise.all([listMachines(), listGrades(), getShopSettings()]);
  const defaults = { kerf: settings.kerf, feed: settings.feedMmPerMin };
  return (
    <>
      <PageHeader
        title="Machines"
        lead="The shop's hot-wire cutters. A plan is made for one block cutter: its wire, travel and table decide the cutting steps, and its calibrated kerf and feed per grade the plan's kerf and cut time."
      />
      <div className="space-y-6">
        {machines.length === 0 && (
          <Card>
            <p>No machines yet. Plans use the shop's kerf and feed until a block cutter is added.</p>
          </Card>
        )}
        {machines.map((m) => (
          <Card
            key={m.id}
            title={
              <>
                {m.name}{" "}
                <span className="text-sm font-normal text-ink-soft">
                  {m.kind === "block" ? "block cutter" : "profile cutter"}
                  {m.active ? "" : " · retired"}
                </span>
              </>
            }
          >
            <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2 lg:grid-cols-3">
              <div>
                <dt className="inline text-ink-soft">Wire: </dt>
                <dd className="inline">
                  {m.wire === "horizontal" ? "horizontal" : "upright"}, {mm(m.wireLength)} mm usable
                </dd>
              </div>
              <div>
                <dt className="inline text-ink-soft">Travel: </dt>
                <dd className="inline">
                  {m.dialect.axes[0]} {mm(m.travel[0])} mm · {m.dialect.axes[1]} {mm(m.travel[1])} mm
                  {m.fourAxis && m.dialect.towerAxes
                    ? ` · 4-axis: second tower ${m.dialect.towerAxes.join(" ")}, ${mm(m.wireLength)} mm apart`
                    : ""}
                </dd>
              </div>
              <div>
                <dt className="inline text-ink-soft">Largest piece: </dt>
                <dd className="inline">{dims(m.maxPiece)} mm</dd>
              </div>
              <div>
                <dt className="inline text-ink-soft">Turntable: </dt>
                <dd className="inline">{m.turntable ? "yes" : "no"}</dd>
              </div>
              <div>
                <dt className="inline text-ink-soft">Rapid · heat-up · handling: </dt>
                <dd className="inline">
                  {mm(m.rapid)} mm/min · {m.heatUpS} s · {m.handlingS} s
                </dd>
              </div>
              <div>
                <dt className="inline text-ink-soft">Programs: </dt>
                <dd className="inline">
                  {m.dialect.inch ? "inch" : "mm"} ({m.dialect.unitWords}), heat{" "}
                  {m.dialect.heatOn ? `${m.dialect.heatOn} / ${m.dialect.heatOff}` : "by hand"}
                  {m.dialect.lineNumbers ? ", numbered lines" : ""}
                </dd>
              </div>
            </dl>
            <div className="mt-4 grid gap-4 lg:grid-cols-2">
              <MachineGradesForm machine={m} grades={grades} defaults={defaults} canEdit={canEdit} />
              {canEdit && (
                <details className="self-start rounded-md border border-bead p-3">
                  <summary className="min-h-11 cursor-pointer py-2 font-medium">Edit {m.name}</summary>
                  <MachineForm initial={m} />
                </details>
              )}
            </div>
          </Card>
        ))}
        {canEdit && (
          <Card title="Add a machine">
            <MachineForm />
          </Card>
        )}
      </div>
    </>
  );
}
