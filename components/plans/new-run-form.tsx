"use client";

import { lengthMmOrNull, numberOrNull as num } from "@/lib/forms";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { send } from "@/lib/swr/fetcher";
import { useSubmit } from "@/components/ui/use-submit";
import { Button } from "@/components/ui/button";
import { Card, Notice } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { BUDGET_S, type RunSettings, secondsToMs } from "@/lib/validations/runs";
import { formatDate, plural } from "@/lib/format";
import type { Candidate } from "@/db/queries/run-plan";
import { leftOutLine, type LeftOut } from "@/lib/planning/usable";
import { formatLength, formatSize, formatVolume, lengthNumber, mmToIn, type LengthUnit } from "@/lib/units";

/** Choose the stock (proposed: ready, right grade, oldest first) and the settings, then start. */
export function NewRunForm({
  jobIds,
  candidates,
  leftOut = [],
  capped = null,
  defaults,
  machines,
  slabCutter = null,
  unit = "mm",
}: {
  jobIds: number[];
  candidates: Candidate[];
  /** Ready stock of the grades that cannot hold any part still owed, with the reason: not offered. */
  leftOut?: LeftOut[];
  /** More ready stock than the form offers: how many (the oldest) are, said under the list; null: all are. */
  capped?: number | null;
  defaults: RunSettings;
  /** Active block cutters; the first is proposed. */
  machines: { id: number; name: string }[];
  /** The profile cutter true-shape slabs are sized for, with its largest slab [thickness, across, up] mm; null: none. */
  slabCutter?: { name: string; slabMax: [number, number, number] } | null;
  /** The person's length unit: sizes are shown and lengths typed in it (the run keeps millimetres). */
  unit?: LengthUnit;
}) {
  // A length field shows the default in the person's unit (inches to 0.0001); left as shown, the
  // default goes back in millimetres exactly (no drift from converting there and back).
  const shown = (mm: number) => (unit === "in" ? String(Math.round(mmToIn(mm) * 10_000) / 10_000) : String(mm));
  const lengthField = (fd: FormData, name: string, mm: number): number | null => {
    const raw = fd.get(name);
    return String(raw ?? "").trim() === shown(mm) ? mm : lengthMmOrNull(raw, unit);
  };
  const router = useRouter();
  const [chosen, setChosen] = useState<Set<number>>(new Set(candidates.map((c) => c.id)));
  const { busy, fields, message, submit } = useSubmit();
  const toggle = (id: number) =>
    setChosen((s) => {
      const n = new Set(s);
      if (n.has(id)) n.delete(id);
      else n.add(id);
      return n;
    });
  const volume = candidates.filter((c) => chosen.has(c.id)).reduce((s, c) => s + c.volumeM3, 0);
  return (
    <form
      className="space-y-5"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const started = await submit(
          () =>
            send<{ id: number }>("/api/runs", "POST", {
              jobIds,
              blockIds: [...chosen],
              machineId: fd.get("machineId") ? Number(fd.get("machineId")) : null,
              settings: {
                kerf: lengthField(fd, "kerf", defaults.kerf),
                trim: lengthField(fd, "trim", defaults.trim),
                defectMargin: lengthField(fd, "defectMargin", defaults.defectMargin),
                minOffcut: [0, 1, 2].map((i) => lengthField(fd, `mo${i}`, defaults.minOffcut[i]!)),
                layout: fd.get("layout"),
                // Typed in seconds; the API keeps milliseconds.
                timeLimitMs: secondsToMs(num(fd.get("timeBudgetS"))),
                trueShape: fd.get("trueShape") === "on",
              },
            }),
          { failed: "The run was not started." },
        );
        if (started) router.push(`/plans/${started.id}`);
      }}
    >
      {message && <Notice tone={message.tone}>{message.text}</Notice>}
      <Card
        title={`Stock to plan into (${chosen.size} of ${candidates.length}, ${formatVolume(volume, { digits: 2 })})`}
        action={<span className="text-sm text-ink-faint">ready, right grade, oldest first</span>}
      >
        {fields.blockIds && <p className="mb-2 text-sm text-ember">{fields.blockIds}</p>}
        {candidates.length === 0 ? (
          <p className="text-sm text-ink-soft">
            {leftOut.length
              ? `No ready block can hold any of these parts: ${plural(leftOut.length, "block")} of their grades, listed below with the reason. Receive larger stock, or check the parts' sizes.`
              : "No ready stock of the grades these parts need. Receive some, or wait for settling blocks."}
          </p>
        ) : (
          <div className="max-h-96 overflow-y-auto">
            <table>
              <thead>
                <tr>
                  <th className="py-2 pr-3">
                    <span className="sr-only">Use</span>
                  </th>
                  <th className="px-3 py-2">Code</th>
                  <th className="px-3 py-2">Grade</th>
                  <th className="whitespace-nowrap px-3 py-2">Size ({unit})</th>
                  <th className="px-3 py-2 text-right">m³</th>
                  <th className="px-3 py-2">Since</th>
                  <th className="px-3 py-2">Location</th>
                  <th className="py-2 pl-3 text-right">Defects</th>
                </tr>
              </thead>
              <tbody>
                {candidates.map((c) => (
                  <tr key={c.id} className="border-t border-bead/60">
                    <td className="pr-3">
                      {/* The whole cell is the tap target (44 px), not just the 20 px box. */}
                      <label className="flex min-h-11 min-w-11 cursor-pointer items-center">
                        <input
                          type="checkbox"
                          className="size-5 accent-kerf"
                          aria-label={`Use ${c.code}`}
                          checked={chosen.has(c.id)}
                          onChange={() => toggle(c.id)}
                        />
                      </label>
                    </td>
                    <td className="whitespace-nowrap px-3 py-1 font-medium">
                      {c.code}
                      {c.isOffcut && <span className="ml-1 text-xs text-ink-faint">offcut</span>}
                    </td>
                    <td className="px-3 py-1">{c.gradeCode}</td>
                    <td className="whitespace-nowrap px-3 py-1 tabular-nums">
                      {c.size.map((v) => lengthNumber(v, unit)).join(" × ")}
                    </td>
                    <td className="px-3 py-1 text-right tabular-nums">{c.volumeM3.toFixed(3)}</td>
                    <td className="whitespace-nowrap px-3 py-1 tabular-nums">{formatDate(c.since)}</td>
                    <td className="px-3 py-1">{c.location}</td>
                    <td className="py-1 pl-3 text-right tabular-nums">{c.defectCount || "–"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        {capped !== null && (
          <p className="mt-2 text-sm text-ink-soft" data-testid="candidates-capped">
            Only the {capped} oldest ready blocks of these grades are offered. Find a newer block by its code above, or
            give the parts their grade to narrow the list.
          </p>
        )}
        {leftOut.length > 0 && (
          <details className="mt-3 text-sm" data-testid="left-out-stock">
            <summary className="cursor-pointer text-ink-soft">
              {leftOut.length} ready {leftOut.length === 1 ? "block" : "blocks"} not offered: too small or of no use for
              these parts
            </summary>
            <ul className="mt-1 list-disc pl-5 text-ink-soft">
              {leftOut.map((l) => (
                <li key={l.id}>{leftOutLine(l)}</li>
              ))}
            </ul>
          </details>
        )}
        <div className="mt-2 flex gap-3 text-sm">
          <button type="button" className="text-kerf" onClick={() => setChosen(new Set(candidates.map((c) => c.id)))}>
            Use all
          </button>
          <button
            type="button"
            className="text-kerf"
            onClick={() => setChosen(new Set(candidates.filter((c) => c.isOffcut).map((c) => c.id)))}
          >
            Offcuts only
          </button>
          <button type="button" className="text-kerf" onClick={() => setChosen(new Set())}>
            None
          </button>
        </div>
      </Card>
      <Card title="Settings for this run (from the shop defaults)">
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <Field label={`Kerf (${unit})`} name="kerf" error={fields["settings.kerf"]}>
            <Input name="kerf" inputMode="decimal" defaultValue={shown(defaults.kerf)} />
          </Field>
          <Field label={`Face trim (${unit})`} name="trim" error={fields["settings.trim"]}>
            <Input name="trim" inputMode="decimal" defaultValue={shown(defaults.trim)} />
          </Field>
          <Field label={`Defect margin (${unit})`} name="defectMargin" error={fields["settings.defectMargin"]}>
            <Input name="defectMargin" inputMode="decimal" defaultValue={shown(defaults.defectMargin)} />
          </Field>
          <Field
            label="Block cutter"
            name="machineId"
            error={fields.machineId}
            hint="Its kerf for these grades replaces the kerf above; the cutting steps are made for it."
          >
            <Select name="machineId" defaultValue={machines[0]?.id ?? ""}>
              {machines.map((m) => (
                <option key={m.id} value={m.id}>
                  {m.name}
                </option>
              ))}
              <option value="">No machine in particular (shop kerf)</option>
            </Select>
          </Field>
          <Field label="Layout" name="layout" error={fields["settings.layout"]}>
            <Select name="layout" defaultValue={defaults.layout}>
              <option value="guillotine">guillotine (through cuts only)</option>
              <option value="layers">layers (slabs, then profiles)</option>
              <option value="free">free (comparison only: may not be cuttable, cannot be approved then)</option>
            </Select>
          </Field>
          <Field label={`Smallest offcut kept: length (${unit})`} name="mo0" error={fields["settings.minOffcut.0"]}>
            <Input name="mo0" inputMode="decimal" defaultValue={shown(defaults.minOffcut[0]!)} />
          </Field>
          <Field label={`… width (${unit})`} name="mo1" error={fields["settings.minOffcut.1"]}>
            <Input name="mo1" inputMode="decimal" defaultValue={shown(defaults.minOffcut[1]!)} />
          </Field>
          <Field label={`… height (${unit})`} name="mo2" error={fields["settings.minOffcut.2"]}>
            <Input name="mo2" inputMode="decimal" defaultValue={shown(defaults.minOffcut[2]!)} />
          </Field>
          <Field
            label="Time budget (seconds)"
            name="timeBudgetS"
            error={fields["settings.timeLimitMs"]}
            hint={`How long the search may run: ${BUDGET_S.min} to ${BUDGET_S.max} s.`}
          >
            <Input name="timeBudgetS" inputMode="decimal" defaultValue={defaults.timeLimitMs / 1000} />
          </Field>
        </div>
        <label className="mt-4 flex min-h-11 items-start gap-3">
          <input type="checkbox" name="trueShape" className="mt-1 size-5" data-testid="true-shape" />
          <span>
            <span className="block font-medium">Nest profiles by their true shape</span>
            <span className="block text-sm text-ink-soft">
              Letters, wing cores and other profiles share slabs by their outlines instead of taking a whole box each;
              the run also nests them as boxes and shows how much foam each way uses.
            </span>
            <span className="block text-sm text-ink-soft" data-testid="slab-cutter">
              {slabCutter
                ? `Each slab is sized for ${slabCutter.name}: a face of at most ${formatSize(slabCutter.slabMax.slice(1), unit)} (across × up), ${formatLength(slabCutter.slabMax[0], unit)} along the wire.`
                : "The shop has no profile cutter yet: slabs are sized by the blocks alone."}
            </span>
            {fields["settings.trueShape"] && (
              <span className="block text-sm text-ember">{fields["settings.trueShape"]}</span>
            )}
          </span>
        </label>
      </Card>
      <Button type="submit" disabled={busy || chosen.size === 0}>
        {busy ? "Starting…" : "Start nesting"}
      </Button>
    </form>
  );
}
