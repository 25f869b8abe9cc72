"use client";

import { noun } from "@/lib/format";
import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import useSWR from "swr";
import type { BlockSteps } from "@/db/queries/at-the-machine";
import { ApiError, fetcher, send } from "@/lib/swr/fetcher";
import { mm } from "@/lib/planning/machine";
import { partIdFromKey } from "@/lib/planning/problem";
import { expandKeys } from "@/lib/planning/slabs";
import { formatMachineSize, type LengthUnit } from "@/lib/units";
import { Button, buttonClass } from "@/components/ui/button";
import { Notice } from "@/components/ui/card";
import { StepDrawing, describeNext } from "./step-drawing";
import { ResultNotice } from "@/components/ui/result-notice";

const AXIS_WORDS = { x: "length", y: "width", z: "height" } as const;

/**
 * At the machine, one step at a time: the piece on the table and how it lies, its cuts in wire
 * order (tap one to see it highlighted), what comes off, the program of this placement, and a
 * large "done". Checked steps are stored, so another tablet or cutter carries on from here.
 */
export function StepRunner({
  runId,
  initial,
  partNames,
  canCheck,
  unit = "mm",
}: {
  runId: number;
  initial: BlockSteps;
  partNames: Record<string, string>;
  canCheck: boolean;
  /** The person's length unit: sizes get inches beside the millimetres (positions stay in mm). */
  unit?: LengthUnit;
}) {
  const router = useRouter();
  const url = `/api/runs/${runId}/blocks/${initial.blockId}/steps`;
  const { data, mutate } = useSWR<BlockSteps>(url, fetcher, { fallbackData: initial, revalidateOnFocus: true });
  const s = data ?? initial;
  const proc = s.procedure;
  const doneSet = new Set(s.done.map((d) => d.step));
  const steps = proc.ok ? proc.steps : [];
  const firstOpen = steps.find((st) => !doneSet.has(st.n))?.n ?? steps.length;
  const [at, setAt] = useState<number>(Math.max(1, firstOpen));
  const [cut, setCut] = useState<number | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [rejects, setRejects] = useState<{ jobPartId: number; count: number; reason: string }[]>([]);
  const [rejectPart, setRejectPart] = useState("");
  const [rejectCount, setRejectCount] = useState("1");
  const [rejectReason, setRejectReason] = useState("");
  // The check being sent and its id: sent again unchanged (its answer was lost), it keeps the id,
  // so the server does not add its rejects twice.
  const attempt = useRef<{ key: string; id: string } | null>(null);
  const partName = (k: string) => partNames[k] ?? k;

  if (!proc.ok) {
    return (
      <Notice tone="danger" title={`${s.code} cannot be cut on ${s.machine.name}`}>
        <ul className="list-disc pl-5">
          {proc.problems.map((p) => (
            <li key={p.piece}>
              Piece {p.piece} ({formatMachineSize(p.size, unit)}): {p.limit}.
            </li>
          ))}
        </ul>
      </Notice>
    );
  }
  if (steps.length === 0) return <p className="text-ink-soft">{s.code} needs no cut: it goes as it is.</p>;

  const step = steps[Math.min(at, steps.length) - 1]!;
  const current = cut !== null && step.cuts.some((c) => c.n === cut) ? cut : (step.cuts[0]?.n ?? null);
  const isDone = doneSet.has(step.n);
  const doneBy = s.done.find((d) => d.step === step.n);
  const editable = canCheck && s.status === "reserved";

  const check = async (done: boolean) => {
    setBusy(true);
    setError(null);
    const payload = { done, rejects: done ? rejects : [] };
    const key = JSON.stringify([step.n, payload]);
    if (attempt.current?.key !== key) attempt.current = { key, id: requestId() };
    try {
      await send(`/api/runs/${runId}/blocks/${s.blockId}/steps/${step.n}`, "PUT", {
        ...payload,
        requestId: attempt.current.id,
      });
      attempt.current = null;
      setRejects([]);
      await mutate();
      router.refresh(); // the finish form beside offers part-cut recording once steps are done
      if (done && step.n < steps.length) {
        setAt(step.n + 1);
        setCut(null);
      }
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "Not saved: check the connection and try again.");
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="space-y-4" data-testid={`steps-${s.code}`}>
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span className="font-medium">
          {doneSet.size} of {steps.length} {noun(steps.length, "step")} done
        </span>
        <progress className="h-3 w-48" max={steps.length} value={doneSet.size} aria-label="Steps done" />
        {s.time && (
          <span className="text-ink-soft">
            about {Math.round(s.time.totalMin)} min on {s.machine.name} ({s.time.placements} placement
            {s.time.placements === 1 ? "" : "s"}, {s.time.turns} turn{s.time.turns === 1 ? "" : "s"})
          </span>
        )}
      </div>
      <nav aria-label={`Steps of ${s.code}`} className="flex flex-wrap gap-2">
        {steps.map((st) => (
          <button
            key={st.n}
            type="button"
            onClick={() => {
              setAt(st.n);
              setCut(null);
            }}
            aria-current={st.n === step.n ? "step" : undefined}
            className={`min-h-11 min-w-11 rounded-md border px-3 text-sm font-medium ${
              st.n === step.n
                ? "border-kerf bg-kerf text-white"
                : doneSet.has(st.n)
                  ? "border-moss bg-paper-sunk text-ink"
                  : "border-bead-strong bg-paper-raised text-ink"
            }`}
          >
            {doneSet.has(st.n) ? "✓ " : ""}
            {st.n}
          </button>
        ))}
      </nav>

      <section aria-labelledby={`step-head-${s.code}`} className="space-y-3">
        <h3 id={`step-head-${s.code}`} className="text-lg font-semibold">
          Step {step.n} of {steps.length}: {step.kind === "turn" ? "turn" : "place"} piece {step.piece} ·{" "}
          {formatMachineSize(step.size, unit)}{" "}
          {isDone && <span className="text-moss">· done{doneBy?.by ? ` by ${doneBy.by}` : ""}</span>}
        </h3>
        <p className="rounded-md bg-paper-sunk p-3">{step.howToPlace}</p>
        <StepDrawing
          step={step}
          machine={s.machine}
          kerf={proc.kerf}
          current={current}
          partName={partName}
          offcutCodes={s.offcutCodes}
        />
        <ol className="space-y-1" aria-label={`Cuts of step ${step.n}`}>
          {step.cuts.map((c) => (
            <li key={c.n} value={c.n}>
              <button
                type="button"
                onClick={() => setCut(c.n)}
                aria-pressed={c.n === current}
                className={`flex min-h-11 w-full flex-wrap items-center gap-x-3 rounded-md border px-3 py-2 text-left ${
                  c.n === current ? "border-ember bg-[#fbeee7]" : "border-bead"
                }`}
              >
                <span className="font-semibold tabular-nums">Cut {c.n}</span>
                <span>
                  {c.machineAxis === "X" ? "down" : "across"}, kerf from {mm(c.pos)} mm off the piece's{" "}
                  {c.machineAxis === "X" ? "zero end" : "bottom face"} ({AXIS_WORDS[c.axis]} of the block)
                  {c.kind === "trim" ? " · trim" : ""}
                </span>
                {c.frees.length > 0 && (
                  <span className="text-sm text-ink-soft">
                    off: {c.frees.map((n) => describeNext(n, partName, s.offcutCodes)).join("; ")}
                  </span>
                )}
              </button>
            </li>
          ))}
        </ol>
        {(() => {
          // Parts this step frees: a reject found as it comes off is recorded here, on its step.
          // A slab (true-shape plan) comes off whole: a reject is one of its members.
          const freed = new Map<string, number>();
          const freedKeys = expandKeys(
            step.next.flatMap((n) => (n.what.kind === "part" ? [n.what.part] : [])),
            s.slabs ?? {},
          );
          for (const k of freedKeys) freed.set(k, (freed.get(k) ?? 0) + 1);
          const recorded = doneBy?.rejects ?? [];
          const nameOf = (id: number) => partName([...freed.keys()].find((k) => partIdFromKey(k) === id) ?? `jp-${id}`);
          if (!freed.size) return null;
          return (
            <div className="space-y-2 rounded-md border border-bead p-3">
              {recorded.length > 0 && (
                <p className="text-sm">
                  Rejected in this step:{" "}
                  {recorded.map((r) => `${r.count} × ${nameOf(r.jobPartId)} (${r.reason})`).join("; ")}
                </p>
              )}
              {rejects.length > 0 && (
                <p className="text-sm">
                  To record with this step:{" "}
                  {rejects.map((r) => `${r.count} × ${nameOf(r.jobPartId)} (${r.reason})`).join("; ")}{" "}
                  <button type="button" className="min-h-11 text-kerf underline" onClick={() => setRejects([])}>
                    clear
                  </button>
                </p>
              )}
              {editable && !isDone && (
                <details>
                  <summary className="min-h-11 cursor-pointer py-2 font-medium">A part from this step is bad…</summary>
                  <div className="grid gap-2 sm:grid-cols-[2fr_1fr_3fr_auto] sm:items-end">
                    <label className="text-sm">
                      <span className="block text-ink-soft">Part</span>
                      <select
                        className="min-h-11 w-full rounded-md border border-bead-strong px-2"
                        value={rejectPart}
                        onChange={(e) => setRejectPart(e.target.value)}
                      >
                        <option value="">Choose…</option>
                        {[...freed].map(([k, n]) => (
                          <option key={k} value={k}>
                            {partName(k)} ({n} in this step)
                          </option>
                        ))}
                      </select>
                    </label>
                    <label className="text-sm">
                      <span className="block text-ink-soft">How many</span>
                      <input
                        inputMode="numeric"
                        className="min-h-11 w-full rounded-md border border-bead-strong px-2"
                        value={rejectCount}
                        onChange={(e) => setRejectCount(e.target.value)}
                      />
                    </label>
                    <label className="text-sm">
                      <span className="block text-ink-soft">Why</span>
                      <input
                        className="min-h-11 w-full rounded-md border border-bead-strong px-2"
                        placeholder="e.g. void in the cut face"
                        value={rejectReason}
                        onChange={(e) => setRejectReason(e.target.value)}
                      />
                    </label>
                    <Button
                      tone="secondary"
                      disabled={!rejectPart || !rejectReason.trim() || !(Number(rejectCount) > 0)}
                      onClick={() => {
                        setRejects([
                          ...rejects,
                          {
                            jobPartId: partIdFromKey(rejectPart),
                            count: Number(rejectCount),
                            reason: rejectReason.trim(),
                          },
                        ]);
                        setRejectPart("");
                        setRejectCount("1");
                        setRejectReason("");
                      }}
                    >
                      Add reject
                    </Button>
                  </div>
                  <p className="mt-1 text-sm text-ink-soft">
                    A void found in the block itself:{" "}
                    <a href={`/defects/new?code=${encodeURIComponent(s.code)}`}>flag it</a> so the next plans keep clear
                    of it.
                  </p>
                </details>
              )}
            </div>
          );
        })()}
        {error && <ResultNotice tone="danger">{error}</ResultNotice>}
        <div className="flex flex-wrap items-center gap-3">
          {editable &&
            (isDone ? (
              <Button tone="secondary" disabled={busy} onClick={() => check(false)}>
                Step {step.n} not done after all
              </Button>
            ) : (
              <Button disabled={busy} onClick={() => check(true)} className="min-h-14 px-8 text-lg">
                {busy ? "Saving…" : `Step ${step.n} done`}
              </Button>
            ))}
          <a
            className={buttonClass("secondary")}
            href={`/api/runs/${runId}/gcode?block=${encodeURIComponent(s.code)}&step=${step.n}`}
          >
            Program for step {step.n} (G-code)
          </a>
          {step.n > 1 && (
            <Button tone="quiet" onClick={() => setAt(step.n - 1)}>
              ← Step {step.n - 1}
            </Button>
          )}
          {step.n < steps.length && (
            <Button tone="quiet" onClick={() => setAt(step.n + 1)}>
              Step {step.n + 1} →
            </Button>
          )}
        </div>
      </section>
    </div>
  );
}

/** A random id for one check (crypto.randomUUID needs https; a shop's tablets may reach the app over plain http). */
function requestId(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("");
}
