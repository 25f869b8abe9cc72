"use client";

import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { numberOrNull as num } from "@/lib/forms";
import { send } from "@/lib/swr/fetcher";
import { useSubmit } from "@/components/ui/use-submit";
import { Field, Input, Select } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import type { StoredMachine } from "@/db/queries/machines";
import { ResultNotice } from "@/components/ui/result-notice";

const text = (v: FormDataEntryValue | null) => {
  const s = String(v ?? "").trim();
  return s === "" ? null : s;
};

/** Adds a cutter, or edits one: its wire, travel, table, rates and program dialect. */
export function MachineForm({ initial }: { initial?: StoredMachine }) {
  const router = useRouter();
  const { busy, fields, message, submit } = useSubmit();
  const m = initial;
  const f = (k: string) => fields[k];
  const id = (k: string) => `${m ? `m${m.id}-` : "new-"}${k}`;
  return (
    <form
      className="space-y-4"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const g = (k: string) => fd.get(id(k));
        const body = {
          name: g("name"),
          kind: g("kind"),
          wire: g("wire"),
          wireLength: num(g("wireLength")),
          travel: [num(g("travel.0")), num(g("travel.1"))],
          maxPiece: [num(g("maxPiece.0")), num(g("maxPiece.1")), num(g("maxPiece.2"))],
          turntable: g("turntable") === "yes",
          rapid: num(g("rapid")),
          heatUpS: num(g("heatUpS")),
          handlingS: num(g("handlingS")),
          dialect: {
            unitWords: g("unitWords"),
            inch: g("inch") === "in",
            heatOn: text(g("heatOn")),
            heatOff: text(g("heatOff")),
            axes: [String(g("axis.0") ?? "").trim(), String(g("axis.1") ?? "").trim()],
            towerAxes:
              g("fourAxis") === "yes" ? [String(g("axis.2") ?? "").trim(), String(g("axis.3") ?? "").trim()] : null,
            lineNumbers: g("lineNumbers") === "yes",
          },
          fourAxis: g("fourAxis") === "yes",
          active: g("active") !== "no",
        };
        const ok = await submit(() => send(m ? `/api/machines/${m.id}` : "/api/machines", m ? "PUT" : "POST", body), {
          ok: m ? `${body.name} saved.` : `${body.name} added.`,
          failed: "The machine was not saved.",
        });
        if (ok) router.refresh();
      }}
    >
      {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        <Field label="Name" name={id("name")} error={f("name")}>
          <Input name={id("name")} defaultValue={m?.name} error={f("name")} />
        </Field>
        <Field label="Kind" name={id("kind")} error={f("kind")}>
          <Select name={id("kind")} defaultValue={m?.kind ?? "block"}>
            <option value="block">Block cutter (through cuts)</option>
            <option value="profile">Profile cutter</option>
          </Select>
        </Field>
        <Field
          label="Wire"
          name={id("wire")}
          error={f("wire")}
          hint="Horizontal: across the table, moving along and up."
        >
          <Select name={id("wire")} defaultValue={m?.wire ?? "horizontal"}>
            <option value="horizontal">Horizontal, across the table</option>
            <option value="vertical">Upright, through the table</option>
          </Select>
        </Field>
        <Field label="Usable wire length (mm)" name={id("wireLength")} error={f("wireLength")}>
          <Input name={id("wireLength")} inputMode="decimal" defaultValue={m?.wireLength} error={f("wireLength")} />
        </Field>
        <Field label="Travel along X (mm)" name={id("travel.0")} error={f("travel.0")}>
          <Input name={id("travel.0")} inputMode="decimal" defaultValue={m?.travel[0]} error={f("travel.0")} />
        </Field>
        <Field label="Travel along Y (mm)" name={id("travel.1")} error={f("travel.1")}>
          <Input name={id("travel.1")} inputMode="decimal" defaultValue={m?.travel[1]} error={f("travel.1")} />
        </Field>
        <Field label="Largest piece: length (mm)" name={id("maxPiece.0")} error={f("maxPiece.0")}>
          <Input name={id("maxPiece.0")} inputMode="decimal" defaultValue={m?.maxPiece[0]} error={f("maxPiece.0")} />
        </Field>
        <Field label="… width (mm)" name={id("maxPiece.1")} error={f("maxPiece.1")}>
          <Input name={id("maxPiece.1")} inputMode="decimal" defaultValue={m?.maxPiece[1]} error={f("maxPiece.1")} />
        </Field>
        <Field label="… height (mm)" name={id("maxPiece.2")} error={f("maxPiece.2")}>
          <Input name={id("maxPiece.2")} inputMode="decimal" defaultValue={m?.maxPiece[2]} error={f("maxPiece.2")} />
        </Field>
        <Field label="Turntable" name={id("turntable")} error={f("turntable")}>
          <Select name={id("turntable")} defaultValue={m?.turntable ? "yes" : "no"}>
            <option value="no">No</option>
            <option value="yes">Yes: a piece turns without being lifted</option>
          </Select>
        </Field>
        <Field label="Rapid rate (mm/min)" name={id("rapid")} error={f("rapid")}>
          <Input name={id("rapid")} inputMode="decimal" defaultValue={m?.rapid ?? 2000} error={f("rapid")} />
        </Field>
        <Field label="Wire heat-up (s)" name={id("heatUpS")} error={f("heatUpS")}>
          <Input name={id("heatUpS")} inputMode="decimal" defaultValue={m?.heatUpS ?? 20} error={f("heatUpS")} />
        </Field>
        <Field
          label="Handling per placement (s)"
          name={id("handlingS")}
          error={f("handlingS")}
          hint="Lift on, square up, take off."
        >
          <Input name={id("handlingS")} inputMode="decimal" defaultValue={m?.handlingS ?? 90} error={f("handlingS")} />
        </Field>
      </div>
      <fieldset className="grid gap-4 rounded-md border border-bead p-3 sm:grid-cols-2 lg:grid-cols-4">
        <legend className="px-1 text-sm font-medium text-ink-soft">Program dialect</legend>
        <Field label="Unit words" name={id("unitWords")} error={f("dialect.unitWords")}>
          <Select name={id("unitWords")} defaultValue={m?.dialect.unitWords ?? "G20/G21"}>
            <option value="G20/G21">G21 mm / G20 inch</option>
            <option value="G70/G71">G71 mm / G70 inch</option>
          </Select>
        </Field>
        <Field label="Program units" name={id("inch")} error={f("dialect.inch")}>
          <Select name={id("inch")} defaultValue={m?.dialect.inch ? "in" : "mm"}>
            <option value="mm">millimetres</option>
            <option value="in">inches</option>
          </Select>
        </Field>
        <Field label="Heat on" name={id("heatOn")} error={f("dialect.heatOn")} hint="Empty: switched by hand.">
          <Input name={id("heatOn")} defaultValue={m?.dialect.heatOn ?? "M3"} error={f("dialect.heatOn")} />
        </Field>
        <Field label="Heat off" name={id("heatOff")} error={f("dialect.heatOff")}>
          <Input name={id("heatOff")} defaultValue={m?.dialect.heatOff ?? "M5"} error={f("dialect.heatOff")} />
        </Field>
        <Field label="First axis letter" name={id("axis.0")} error={f("dialect.axes.0")}>
          <Input name={id("axis.0")} defaultValue={m?.dialect.axes[0] ?? "X"} error={f("dialect.axes.0")} />
        </Field>
        <Field label="Second axis letter" name={id("axis.1")} error={f("dialect.axes.1")}>
          <Input name={id("axis.1")} defaultValue={m?.dialect.axes[1] ?? "Y"} error={f("dialect.axes.1")} />
        </Field>
        <Field
          label="Axes"
          name={id("fourAxis")}
          error={f("fourAxis")}
          hint="4-axis: two towers, the wire length apart, move apart for tapered parts."
        >
          <Select name={id("fourAxis")} defaultValue={m?.fourAxis ? "yes" : "no"}>
            <option value="no">2-axis</option>
            <option value="yes">4-axis (profile cutter)</option>
          </Select>
        </Field>
        <Field
          label="Second tower: first letter"
          name={id("axis.2")}
          error={f("dialect.towerAxes.0")}
          hint="4-axis only."
        >
          <Input name={id("axis.2")} defaultValue={m?.dialect.towerAxes?.[0] ?? "U"} error={f("dialect.towerAxes.0")} />
        </Field>
        <Field label="Second tower: second letter" name={id("axis.3")} error={f("dialect.towerAxes.1")}>
          <Input name={id("axis.3")} defaultValue={m?.dialect.towerAxes?.[1] ?? "V"} error={f("dialect.towerAxes.1")} />
        </Field>
        <Field label="Line numbers" name={id("lineNumbers")} error={f("dialect.lineNumbers")}>
          <Select name={id("lineNumbers")} defaultValue={m?.dialect.lineNumbers ? "yes" : "no"}>
            <option value="no">No</option>
            <option value="yes">N words on every line</option>
          </Select>
        </Field>
        {m && (
          <Field label="In use" name={id("active")}>
            <Select name={id("active")} defaultValue={m.active ? "yes" : "no"}>
              <option value="yes">Yes</option>
              <option value="no">Retired</option>
            </Select>
          </Field>
        )}
      </fieldset>
      <Button type="submit" disabled={busy}>
        {busy ? "Saving…" : m ? "Save machine" : "Add machine"}
      </Button>
    </form>
  );
}

/** Kerf and feed per grade on one machine; grades left empty take the shop's defaults. */
export function MachineGradesForm({
  machine,
  grades,
  defaults,
  canEdit,
}: {
  machine: StoredMachine;
  grades: { id: number; code: string; neverHotWire: boolean }[];
  defaults: { kerf: number; feed: number };
  canEdit: boolean;
}) {
  const router = useRouter();
  const { busy, fields, message, submit } = useSubmit();
  const [open, setOpen] = useState(false);
  const sent = useRef<number[]>([]);
  const usable = grades.filter((g) => !g.neverHotWire);
  return (
    <Card title="Kerf and feed per grade">
      {!open ? (
        <>
          <table className="w-full text-sm">
            <thead className="text-left text-ink-soft">
              <tr>
                <th className="py-1 pr-3">Grade</th>
                <th className="py-1 pr-3 text-right">Kerf (mm)</th>
                <th className="py-1 text-right">Feed (mm/min)</th>
              </tr>
            </thead>
            <tbody>
              {usable.map((g) => {
                const cal = machine.grades.find((x) => x.gradeId === g.id);
                return (
                  <tr key={g.id} className="border-t border-bead/60">
                    <td className="py-1 pr-3">{g.code}</td>
                    <td className="py-1 pr-3 text-right tabular-nums">
                      {cal ? cal.kerf : <span className="text-ink-faint">{defaults.kerf} (shop default)</span>}
                    </td>
                    <td className="py-1 text-right tabular-nums">
                      {cal ? cal.feed : <span className="text-ink-faint">{defaults.feed} (shop default)</span>}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {canEdit && (
            <Button tone="secondary" className="mt-3" onClick={() => setOpen(true)}>
              Calibrate…
            </Button>
          )}
        </>
      ) : (
        <form
          className="space-y-3"
          onSubmit={async (e) => {
            e.preventDefault();
            const fd = new FormData(e.currentTarget);
            const rows = usable
              .map((g) => ({ gradeId: g.id, kerf: num(fd.get(`kerf-${g.id}`)), feed: num(fd.get(`feed-${g.id}`)) }))
              .filter((r) => r.kerf !== null || r.feed !== null)
              .map((r) => ({ gradeId: r.gradeId, kerf: r.kerf ?? defaults.kerf, feed: r.feed ?? defaults.feed }));
            sent.current = rows.map((r) => r.gradeId);
            const ok = await submit(() => send(`/api/machines/${machine.id}/grades`, "PUT", { grades: rows }), {
              ok: "Calibration saved. New runs on this machine take these.",
              failed: "The calibration was not saved.",
            });
            if (ok) {
              setOpen(false);
              router.refresh();
            }
          }}
        >
          {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
          <p className="text-sm text-ink-soft">
            Measure the kerf with a test cut at the feed you give; leave a grade empty for the shop default.
          </p>
          {usable.map((g) => {
            const cal = machine.grades.find((x) => x.gradeId === g.id);
            const i = sent.current.indexOf(g.id); // the server names rows by their place in what was sent
            return (
              <div key={g.id} className="grid grid-cols-3 items-end gap-3">
                <span className="pb-3 text-sm font-medium">{g.code}</span>
                <Field label={`${g.code} kerf (mm)`} name={`kerf-${g.id}`} error={fields[`grades.${i}.kerf`]}>
                  <Input name={`kerf-${g.id}`} inputMode="decimal" defaultValue={cal?.kerf} />
                </Field>
                <Field label={`${g.code} feed (mm/min)`} name={`feed-${g.id}`} error={fields[`grades.${i}.feed`]}>
                  <Input name={`feed-${g.id}`} inputMode="decimal" defaultValue={cal?.feed} />
                </Field>
              </div>
            );
          })}
          <div className="flex gap-3">
            <Button type="submit" disabled={busy}>
              {busy ? "Saving…" : "Save calibration"}
            </Button>
            <Button tone="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
          </div>
        </form>
      )}
    </Card>
  );
}
