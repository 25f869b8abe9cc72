"use client";

import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { send } from "@/lib/swr/fetcher";
import { DEFECT_KINDS, DEFECT_LABELS } from "@/lib/stock";
import { Button } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";
import { Field, Input, Select } from "@/components/ui/field";
import { useSubmit } from "@/components/ui/use-submit";
import type { Defect } from "@/db/queries/defects";
import type { Vec3 } from "@/lib/nesting";

/** What a correction needs of a zone (the server's Defect; a type-only import, erased from the client bundle). */
export type EditableZone = Pick<Defect, "id" | "kind" | "min" | "max" | "note">;

const AXES = [
  { key: "x", name: "length" },
  { key: "y", name: "width" },
  { key: "z", name: "height" },
] as const;

/**
 * Correct or take back one defect zone (the cutter who flagged it or a planner: the server decides).
 * `onDone` runs after a change is saved; without it the page is refreshed.
 *
 *   <ZoneEdit zone={zone} blockCode="HF-1001" size={[2440, 1220, 610]} />
 */
export function ZoneEdit({
  zone,
  blockCode,
  size,
  onDone,
}: {
  zone: EditableZone;
  blockCode: string;
  size: Vec3;
  onDone?: () => Promise<void> | void;
}) {
  const router = useRouter();
  const [mode, setMode] = useState<"idle" | "edit" | "remove">("idle");
  const [kind, setKind] = useState<string>(zone.kind);
  const [min, setMin] = useState<string[]>(zone.min.map(String));
  const [max, setMax] = useState<string[]>(zone.max.map(String));
  const [note, setNote] = useState(zone.note ?? "");
  const [done, setDone] = useState<string | null>(null);
  const { busy, fields, message, submit } = useSubmit();
  const finish = async (text: string) => {
    setMode("idle");
    setDone(text);
    if (onDone) await onDone();
    else router.refresh();
  };

  const save = async (e: FormEvent) => {
    e.preventDefault();
    const n = (s: string) => (s.trim() === "" ? null : Number(s));
    const ok = await submit(
      () =>
        send<{ changed: boolean }>(`/api/defects/${zone.id}`, "PATCH", {
          kind,
          min: min.map(n),
          max: max.map(n),
          note: note.trim() || null,
        }),
      { failed: `Zone ${zone.id} was not changed: the server could not be reached.` },
    );
    if (ok) await finish(ok.changed ? `Zone ${zone.id} on ${blockCode} corrected.` : "Nothing was different.");
  };

  const remove = async () => {
    const ok = await submit(() => send<{ ok: true }>(`/api/defects/${zone.id}`, "DELETE"), {
      failed: `Zone ${zone.id} was not removed: the server could not be reached.`,
    });
    if (ok) await finish(`Zone ${zone.id} removed from ${blockCode}; it stays in the block's history.`);
  };

  if (mode === "idle")
    return (
      <div className="space-y-2" data-testid={`edit-zone-${zone.id}`}>
        {done && <ResultNotice tone="success">{done}</ResultNotice>}
        <div className="flex flex-wrap items-center gap-2">
          <Button tone="quiet" onClick={() => (setDone(null), setMode("edit"))}>
            Correct zone {zone.id}
          </Button>
          <Button tone="quiet" onClick={() => (setDone(null), setMode("remove"))}>
            Remove zone {zone.id}
          </Button>
        </div>
      </div>
    );

  if (mode === "remove")
    return (
      <div className="space-y-2" data-testid={`edit-zone-${zone.id}`}>
        {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
        <p className="text-sm">
          Remove zone {zone.id} ({DEFECT_LABELS[zone.kind] ?? zone.kind}) from {blockCode}? Plans made from now on no
          longer keep clear of it; the block's history keeps what it was, who removed it and when.
        </p>
        <div className="flex flex-wrap gap-2">
          <Button tone="danger" disabled={busy} onClick={() => void remove()}>
            {busy ? "Removing…" : `Remove zone ${zone.id}`}
          </Button>
          <Button tone="secondary" onClick={() => setMode("idle")}>
            Keep it
          </Button>
        </div>
      </div>
    );

  const id = (name: string) => `zone-${zone.id}-${name}`;
  return (
    <form className="space-y-3" onSubmit={save} noValidate data-testid={`edit-zone-${zone.id}`}>
      {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
      <Field label="Kind of defect" name={id("kind")} error={fields.kind}>
        <Select name={id("kind")} value={kind} onChange={(e) => setKind(e.target.value)} error={fields.kind}>
          {DEFECT_KINDS.map((k) => (
            <option key={k} value={k}>
              {DEFECT_LABELS[k]}
            </option>
          ))}
        </Select>
      </Field>
      <div className="grid grid-cols-[auto_1fr_1fr] items-start gap-x-3 gap-y-2">
        <span />
        <span className="text-xs font-medium text-ink-faint">from (mm)</span>
        <span className="text-xs font-medium text-ink-faint">to (mm)</span>
        {AXES.map((ax, i) => {
          const errMin = fields[`min.${i}`];
          const errMax = fields[`max.${i}`];
          return (
            <div key={ax.key} className="contents">
              <span className="pt-2.5 text-sm whitespace-nowrap text-ink-soft">
                {ax.key} · {ax.name}
                <span className="block text-xs text-ink-faint">0 – {size[i]} mm</span>
              </span>
              {(["min", "max"] as const).map((end) => {
                const err = end === "min" ? errMin : errMax;
                const name = id(`${end}.${i}`);
                return (
                  <div key={end} className="space-y-1">
                    <Input
                      name={name}
                      aria-label={`${ax.key} · ${ax.name} ${end === "min" ? "from" : "to"} (mm)`}
                      inputMode="decimal"
                      type="number"
                      min={0}
                      max={size[i]}
                      step="any"
                      value={(end === "min" ? min : max)[i]}
                      onChange={(e) => {
                        const next = [...(end === "min" ? min : max)];
                        next[i] = e.target.value;
                        (end === "min" ? setMin : setMax)(next);
                      }}
                      error={err}
                    />
                    {err && (
                      <p id={`${name}-error`} className="text-sm text-ember">
                        {err}
                      </p>
                    )}
                  </div>
                );
              })}
            </div>
          );
        })}
      </div>
      <Field label="Note" name={id("note")} error={fields.note}>
        <Input name={id("note")} value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} />
      </Field>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={busy}>
          {busy ? "Saving…" : "Save the correction"}
        </Button>
        <Button tone="secondary" onClick={() => setMode("idle")}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
