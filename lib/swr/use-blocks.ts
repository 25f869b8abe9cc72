"use client";

import { useEffect } from "react";
import useSWR from "swr";
import { fetcher } from "./fetcher";
import type { StockRows } from "@/lib/stock-types";

export type BlockListResponse = StockRows;

/**
 * One page of the stock list, keyed on its API URL (the query string is the filter). The page
 * arrives rendered by the server with `fallback` for this very key, so nothing is fetched on mount
 * or when the filter changes (the server renders the new page); SWR refreshes it when the window
 * regains focus or the network comes back. A fresh server render also replaces what SWR cached for
 * the key, so going back to an earlier filter never shows rows older than the server's.
 */
export function useBlocks(query: string, fallback?: BlockListResponse) {
  const key = `/api/blocks?${query}`;
  const swr = useSWR<BlockListResponse>(key, fetcher, {
    fallbackData: fallback,
    revalidateOnMount: !fallback,
    revalidateIfStale: !fallback,
  });
  const { mutate } = swr;
  useEffect(() => {
    if (fallback) void mutate(fallback, { revalidate: false });
  }, [fallback, mutate]);
  return swr;
}
