"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button, buttonClass } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";

interface PartOnBlock {
  jobPartId: number;
  name: string;
  count: number;
}

/** At the machine: mark one block cut, with any rejected parts and why. */
export function CutBlockForm({
  runId,
  blockId,
  code,
  parts,
  stepsLeft = 0,
  stepsDone = 0,
}: {
  runId: number;
  blockId: number;
  code: string;
  parts: PartOnBlock[];
  /** Steps not checked off yet: said in the confirmation. */
  stepsLeft?: number;
  /** Steps checked off: with some (not all), the block can be recorded part-cut. */
  stepsDone?: number;
}) {
  const [confirming, setConfirming] = useState<null | "whole" | "partial">(null);
  const router = useRouter();
  const [rejects, setRejects] = useState<Record<number, { count: string; reason: string }>>({});
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<{ offcuts: string[]; rest: string[] } | null>(null);
  const [busy, setBusy] = useState(false);
  if (done) {
    return (
      <ResultNotice tone="success" title={done.rest.length ? `${code} is recorded part-cut` : `${code} is cut`}>
        {done.offcuts.length + done.rest.length ? (
          <>
            {done.offcuts.length > 0 && <>Offcuts now in stock: {done.offcuts.join(", ")}. </>}
            {done.rest.length > 0 && <>Uncut pieces back in stock: {done.rest.join(", ")}. </>}
            <Link href={`/labels?codes=${encodeURIComponent([...done.offcuts, ...done.rest].join(","))}`}>
              Print their labels
            </Link>
            .
          </>
        ) : (
          "No offcuts were kept from it."
        )}
      </ResultNotice>
    );
  }
  return (
    <form
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        if (!confirming) {
          setConfirming("whole");
          return;
        }
        setBusy(true);
        setError(null);
        try {
          const body = {
            rejects: Object.entries(rejects)
              .filter(([, r]) => r.count.trim() !== "" && Number(r.count) > 0)
              .map(([id, r]) => ({ jobPartId: Number(id), count: Number(r.count), reason: r.reason })),
            confirm: true,
            partial: confirming === "partial",
          };
          const res = await send<{ offcutCodes: string[]; remainderCodes: string[] }>(
            `/api/runs/${runId}/blocks/${blockId}/cut`,
            "POST",
            body,
          );
          setDone({ offcuts: res.offcutCodes, rest: res.remainderCodes });
          router.refresh();
        } catch (err) {
          setError(
            err instanceof ApiError
              ? `${err.message} ${Object.values(err.fields ?? {}).join(" ")}`
              : "Nothing was recorded.",
          );
        } finally {
          setBusy(false);
          setConfirming(null);
        }
      }}
    >
      {error && <ResultNotice tone="danger">{error}</ResultNotice>}
      <table className="text-sm">
        <thead>
          <tr>
            <th className="py-1">Part</th>
            <th className="pr-4 text-right">From this block</th>
            <th className="pr-3">Rejected</th>
            <th>Why</th>
          </tr>
        </thead>
        <tbody>
          {parts.map((p) => (
            <tr key={p.jobPartId} className="border-t border-bead/60">
              <td className="py-1 wrap-anywhere">{p.name}</td>
              <td className="pr-4 text-right tabular-nums">{p.count}</td>
              <td className="pr-3">
                <input
                  aria-label={`Rejected ${p.name}`}
                  inputMode="numeric"
                  className="min-h-11 w-20 rounded-md border border-bead-strong px-2"
                  value={rejects[p.jobPartId]?.count ?? ""}
                  onChange={(e) =>
                    setRejects({
                      ...rejects,
                      [p.jobPartId]: { count: e.target.value, reason: rejects[p.jobPartId]?.reason ?? "" },
                    })
                  }
                />
              </td>
              <td>
                <input
                  aria-label={`Why ${p.name} was rejected`}
                  className="min-h-11 w-full rounded-md border border-bead-strong px-2"
                  placeholder="e.g. void in the cut face"
                  value={rejects[p.jobPartId]?.reason ?? ""}
                  onChange={(e) =>
                    setRejects({
                      ...rejects,
                      [p.jobPartId]: { count: rejects[p.jobPartId]?.count ?? "", reason: e.target.value },
                    })
                  }
                />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {confirming && (
        <div role="alertdialog" aria-labelledby={`confirm-${blockId}`} className="rounded-md border-2 border-ember p-3">
          <p id={`confirm-${blockId}`} className="font-medium">
            {confirming === "partial"
              ? `Record ${code} part-cut? What the ${stepsDone} step${stepsDone === 1 ? "" : "s"} checked off made becomes parts and offcuts; the uncut pieces go back to stock with their true sizes, and the parts still in them are owed again.`
              : `Finish ${code}? It leaves stock, its parts count as cut and its offcuts enter stock.${stepsLeft > 0 ? ` ${stepsLeft} step${stepsLeft === 1 ? " is" : "s are"} not checked off yet.` : ""}`}
          </p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button type="submit" disabled={busy} autoFocus>
              {busy ? "Recording…" : confirming === "partial" ? `Yes, record ${code} part-cut` : `Yes, finish ${code}`}
            </Button>
            <Button tone="secondary" onClick={() => setConfirming(null)}>
              Not yet
            </Button>
          </div>
        </div>
      )}
      <div className="flex flex-wrap gap-2">
        {!confirming && (
          <Button type="submit" disabled={busy}>
            Finish {code}…
          </Button>
        )}
        {!confirming && stepsDone > 0 && stepsLeft > 0 && (
          <Button tone="secondary" disabled={busy} onClick={() => setConfirming("partial")}>
            Record part-cut…
          </Button>
        )}
        <Link className={buttonClass("secondary")} href={`/defects/new?code=${encodeURIComponent(code)}`}>
          Flag a newly found defect
        </Link>
      </div>
    </form>
  );
}
