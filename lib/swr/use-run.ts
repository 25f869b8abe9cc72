"use client";

import useSWR from "swr";
import { fetcher } from "./fetcher";

export interface RunLiveData {
  id: number;
  status: "queued" | "running" | "done" | "failed" | "cancelled" | "approved" | "closed";
  progress: number;
  best: {
    placedVolume: number;
    blocksUsed: number;
    yield: number;
    unplacedCount: number;
    lowerBoundBlocks: number;
  } | null;
  error: string | null;
}

/** A run, polled twice a second while a worker is on it. */
export function useRun(id: number, fallback: RunLiveData) {
  return useSWR<{ run: RunLiveData }>(`/api/runs/${id}`, fetcher, {
    fallbackData: { run: fallback },
    refreshInterval: (data) => (data && ["queued", "running"].includes(data.run.status) ? 500 : 0),
  });
}
