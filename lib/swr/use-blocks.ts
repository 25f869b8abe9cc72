"use client";

import useSWR from "swr";
import { fetcher } from "./fetcher";
import type { StockRows } from "@/lib/stock-types";

export type BlockListResponse = StockRows;

/** One page of the stock list, keyed on its API URL (the query string is the filter). */
export function useBlocks(query: string, fallback?: BlockListResponse) {
  return useSWR<BlockListResponse>(`/api/blocks?${query}`, fetcher, { fallbackData: fallback, keepPreviousData: true });
}
