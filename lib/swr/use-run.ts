"use client";

import useSWR from "swr";
import { fetcher } from "./fetcher";
import type { RunSummary } from "@/db/queries/runs";

/** What a progress bar reads of a run (the server's RunSummary; a type-only import, erased from the client bundle). */
export type RunLiveData = Pick<RunSummary, "id" | "status" | "progress" | "best" | "error">;

/** A run, polled twice a second while a worker is on it. */
export function useRun(id: number, fallback: RunLiveData) {
  return useSWR<{ run: RunLiveData }>(`/api/runs/${id}`, fetcher, {
    fallbackData: { run: fallback },
    refreshInterval: (data) => (data && ["queued", "running"].includes(data.run.status) ? 500 : 0),
  });
}
