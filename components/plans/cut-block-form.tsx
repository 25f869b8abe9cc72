"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button, buttonClass } from "@/components/ui/button";
import { Notice } from "@/components/ui/card";

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
}: {
  runId: number;
  blockId: number;
  code: string;
  parts: PartOnBlock[];
}) {
  const router = useRouter();
  const [rejects, setRejects] = useState<Record<number, { count: string; reason: string }>>({});
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string[] | null>(null);
  const [busy, setBusy] = useState(false);
  if (done) {
    return (
      <Notice tone="success" title={`${code} is cut`}>
        {done.length ? (
          <>
            Offcuts now in stock: {done.join(", ")}.{" "}
            <Link href={`/labels?codes=${encodeURIComponent(done.join(","))}`}>Print their labels</Link>.
          </>
        ) : (
          "No offcuts were kept from it."
        )}
      </Notice>
    );
  }
  return (
    <form
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        setError(null);
        try {
          const body = {
            rejects: Object.entries(rejects)
              .filter(([, r]) => r.count.trim() !== "" && Number(r.count) > 0)
              .map(([id, r]) => ({ jobPartId: Number(id), count: Number(r.count), reason: r.reason })),
          };
          const res = await send<{ offcutCodes: string[] }>(`/api/runs/${runId}/blocks/${blockId}/cut`, "POST", body);
          setDone(res.offcutCodes);
          router.refresh();
        } catch (err) {
          setError(
            err instanceof ApiError
              ? `${err.message} ${Object.values(err.fields ?? {}).join(" ")}`
              : "Nothing was recorded.",
          );
        } finally {
          setBusy(false);
        }
      }}
    >
      {error && <Notice tone="danger">{error}</Notice>}
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
              <td className="py-1">{p.name}</td>
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
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={busy}>
          {busy ? "Recording…" : `Mark ${code} cut`}
        </Button>
        <Link className={buttonClass("secondary")} href={`/defects/new?code=${encodeURIComponent(code)}`}>
          Flag a newly found defect
        </Link>
      </div>
    </form>
  );
}
