"use client";

import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { useRun, type RunLiveData } from "@/lib/swr/use-run";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { LiveNotice } from "@/components/ui/result-notice";
import { useAnnounce } from "@/components/ui/announcer";
import { formatVolume } from "@/lib/units";

/** The live progress of a nesting run: a bar, the best plan's figures so far, and Stop. */
export function RunLive({ initial, canCancel }: { initial: RunLiveData; canCancel: boolean }) {
  const router = useRouter();
  const { data, mutate } = useRun(initial.id, initial);
  const run = data?.run ?? initial;
  const [error, setError] = useState<string | null>(null);
  const was = useRef(run.status);
  const announce = useAnnounce();
  useEffect(() => {
    if (was.current !== run.status) {
      // Said once per change of state, not at every step of the progress bar.
      announce(
        run.status === "running"
          ? "A worker is searching for the plan."
          : run.status === "queued"
            ? "Waiting for a worker."
            : `The search has ended: ${run.status}.`,
      );
      if (!["queued", "running"].includes(run.status)) router.refresh();
    }
    was.current = run.status;
  }, [run.status, router, announce]);
  if (!["queued", "running"].includes(run.status)) return null;
  const pct = Math.round(run.progress * 100);
  return (
    <div className="space-y-3 rounded-card border border-kerf bg-kerf-light/40 p-5">
      <div className="flex items-center justify-between gap-3">
        <p className="font-medium">
          {run.status === "queued" ? "Waiting for a worker…" : `Searching for the best plan… ${pct} %`}
        </p>
        {canCancel && (
          <Button
            tone="secondary"
            onClick={async () => {
              try {
                await send(`/api/runs/${run.id}/cancel`, "POST");
                await mutate();
              } catch (e) {
                setError(e instanceof ApiError ? e.message : "Could not stop it.");
              }
            }}
          >
            Stop
          </Button>
        )}
      </div>
      <div
        className="h-3 overflow-hidden rounded-full bg-paper-raised"
        role="progressbar"
        aria-label="Nesting progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
      >
        <div
          className={`h-full bg-kerf transition-all ${run.status === "queued" ? "animate-pulse" : ""}`}
          style={{ width: `${Math.max(3, pct)}%` }}
        />
      </div>
      {run.best && (
        <dl className="grid grid-cols-2 gap-3 text-sm sm:grid-cols-4" data-testid="run-best">
          <div>
            <dt className="text-xs text-ink-faint">Blocks so far</dt>
            <dd className="font-semibold">
              {run.best.blocksUsed}{" "}
              <span className="font-normal text-ink-faint">(at least {run.best.lowerBoundBlocks})</span>
            </dd>
          </div>
          <div>
            <dt className="text-xs text-ink-faint">Yield</dt>
            <dd className="font-semibold">{(run.best.yield * 100).toFixed(1)} %</dd>
          </div>
          <div>
            <dt className="text-xs text-ink-faint">Parts placed</dt>
            <dd className="font-semibold">{formatVolume(run.best.placedVolume / 1e9)}</dd>
          </div>
          <div>
            <dt className="text-xs text-ink-faint">Not yet placed</dt>
            <dd className="font-semibold">{run.best.unplacedCount}</dd>
          </div>
        </dl>
      )}
      {error && <LiveNotice tone="danger">{error}</LiveNotice>}
    </div>
  );
}
