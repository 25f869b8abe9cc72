"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/card";
import { formatSize, formatVolume, type LengthUnit } from "@/lib/units";
import type { JobPart } from "@/db/queries/jobs";
import { RotateLabel, describeProfile } from "./labels";
import { SectionPreview } from "./section-preview";

/** A part as the table shows it (the server's JobPart; a type-only import, erased from the client bundle). */
export type PartRow = Pick<
  JobPart,
  "id" | "name" | "quantity" | "size" | "rotate" | "gradeCode" | "profile" | "trueVolumeMm3" | "libraryPartId"
>;

/** The job's part list; while the job takes parts, the planner can change a quantity or remove a line. */
export function PartsTable({
  jobId,
  parts,
  unit,
  editable,
  programs = null,
}: {
  jobId: number;
  parts: PartRow[];
  unit: LengthUnit;
  editable: boolean;
  /** The profile cutter whose programs a profile part links to; null: no links. */
  programs?: { machineId: number; machineName: string } | null;
}) {
  const router = useRouter();
  const [editing, setEditing] = useState<number | null>(null);
  const [qty, setQty] = useState("");
  const [error, setError] = useState<string | null>(null);

  async function act(fn: () => Promise<unknown>) {
    setError(null);
    try {
      await fn();
      setEditing(null);
      router.refresh();
    } catch (e) {
      setError(
        e instanceof ApiError
          ? (Object.values(e.fields ?? {})[0] ?? e.message)
          : "That did not work; nothing was changed.",
      );
    }
  }

  const totalPieces = parts.reduce((s, p) => s + p.quantity, 0);
  const totalM3 =
    parts.reduce((s, p) => s + p.quantity * (p.trueVolumeMm3 ?? p.size[0] * p.size[1] * p.size[2]), 0) / 1e9;

  return (
    <div className="space-y-3">
      {error && <Notice tone="danger">{error}</Notice>}
      <div className="overflow-x-auto">
        <table data-testid="job-parts">
          <thead className="border-b border-bead">
            <tr>
              <th className="py-2 pr-3">Part</th>
              <th className="pr-3">Shape</th>
              <th className="pr-3">Box for nesting</th>
              <th className="pr-3">Grade</th>
              <th className="pr-3">Turning</th>
              <th className="pr-3 text-right">dm³ each</th>
              <th className="pr-3 text-right">Qty</th>
              {editable && <th />}
            </tr>
          </thead>
          <tbody>
            {parts.map((p) => (
              <tr
                key={p.id}
                className="border-b border-bead/60 align-middle last:border-0"
                data-testid={`part-${p.id}`}
              >
                <td className="py-2 pr-3 wrap-anywhere">
                  <span className="font-medium">{p.name}</span>
                  {p.libraryPartId && <span className="ml-1 text-xs text-ink-faint">library</span>}
                  <span className="block text-xs text-ink-soft">{describeProfile(p.profile)}</span>
                  {programs && p.profile && (
                    <span className="flex gap-3 text-xs" data-testid={`part-${p.id}-program`}>
                      <a
                        className="inline-flex min-h-11 items-center"
                        href={`/api/jobs/${jobId}/parts/${p.id}/program?machineId=${programs.machineId}`}
                        download
                        title={`Profile program for ${programs.machineName}`}
                      >
                        G-code
                      </a>
                      <a
                        className="inline-flex min-h-11 items-center"
                        href={`/api/jobs/${jobId}/parts/${p.id}/program?machineId=${programs.machineId}&format=svg`}
                        target="_blank"
                        rel="noopener"
                        title={`The wire's path on ${programs.machineName}, to scale`}
                      >
                        Path drawing
                      </a>
                    </span>
                  )}
                </td>
                <td className="pr-3">
                  <SectionPreview
                    profile={p.profile}
                    size={p.size}
                    width={88}
                    height={40}
                    label={`${p.name} profile`}
                  />
                </td>
                <td className="whitespace-nowrap pr-3">{formatSize(p.size, unit)}</td>
                <td className="pr-3">{p.gradeCode ?? <span className="text-ink-faint">any</span>}</td>
                <td className="pr-3 text-xs">
                  <RotateLabel rotate={p.rotate} />
                </td>
                <td
                  className="pr-3 text-right tabular-nums"
                  title={p.trueVolumeMm3 === null ? "No profile: the box counts" : "Foam in the finished part"}
                >
                  {((p.trueVolumeMm3 ?? p.size[0] * p.size[1] * p.size[2]) / 1e6).toFixed(2)}
                  {p.trueVolumeMm3 === null && <span className="text-ink-faint">*</span>}
                </td>
                <td className="pr-3 text-right tabular-nums">
                  {editing === p.id ? (
                    <input
                      aria-label={`Quantity of ${p.name}`}
                      autoFocus
                      inputMode="numeric"
                      value={qty}
                      onChange={(e) => setQty(e.target.value)}
                      className="min-h-11 w-20 rounded-md border border-bead-strong px-2 text-right"
                    />
                  ) : (
                    p.quantity
                  )}
                </td>
                {editable && (
                  <td className="text-right">
                    <div className="flex flex-col items-end xl:flex-row xl:justify-end">
                      {editing === p.id ? (
                        <>
                          <Button
                            tone="primary"
                            onClick={() =>
                              act(() =>
                                send(`/api/jobs/${jobId}/parts/${p.id}`, "PATCH", {
                                  quantity: qty.trim() === "" ? null : Number(qty),
                                }),
                              )
                            }
                          >
                            Save
                          </Button>
                          <Button tone="quiet" onClick={() => setEditing(null)}>
                            Cancel
                          </Button>
                        </>
                      ) : (
                        <>
                          <Button
                            tone="quiet"
                            onClick={() => {
                              setEditing(p.id);
                              setQty(String(p.quantity));
                            }}
                            aria-label={`Change quantity of ${p.name}`}
                          >
                            Quantity
                          </Button>
                          <Button
                            tone="quiet"
                            onClick={() =>
                              confirm(`Remove ${p.name} from this job?`) &&
                              act(() => send(`/api/jobs/${jobId}/parts/${p.id}`, "DELETE"))
                            }
                            aria-label={`Remove ${p.name}`}
                          >
                            Remove
                          </Button>
                        </>
                      )}
                    </div>
                  </td>
                )}
              </tr>
            ))}
            {!parts.length && (
              <tr>
                <td colSpan={8} className="py-8 text-center text-ink-soft">
                  No parts yet. Add them by hand, from the library or from a CSV file.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {parts.length > 0 && (
        <p className="text-sm text-ink-soft" data-testid="job-totals">
          <strong>{parts.length}</strong> {parts.length === 1 ? "line" : "lines"} ·{" "}
          <strong>{totalPieces.toLocaleString("en")}</strong> {totalPieces === 1 ? "piece" : "pieces"} ·{" "}
          <strong>{formatVolume(totalM3)}</strong> of foam in the parts
          <span className="text-ink-faint"> (* no profile: the box counts)</span>
        </p>
      )}
    </div>
  );
}
