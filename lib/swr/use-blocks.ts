"use client";

import useSWR from "swr";
import { fetcher } from "./fetcher";
import type { ShownStatus, Material, BlockStatus } from "@/lib/stock";

export interface BlockRow {
  id: number;
  code: string;
  gradeId: number;
  gradeCode: string;
  material: Material;
  neverHotWire: boolean;
  colour: string;
  lot: string;
  size: [number, number, number];
  volumeM3: number;
  weightKg: number | null;
  densityKgM3: number | null;
  minDensity: number | null;
  cost: number;
  location: string;
  mouldedOn: string | null;
  cutNotBefore: string;
  status: BlockStatus;
  shown: ShownStatus;
  isOffcut: boolean;
  parentId: number | null;
  defectCount: number;
  fifo: number | null;
  receivedOn: string | null;
  supplier: string | null;
}

export interface BlockListResponse {
  items: BlockRow[];
  total: number;
  totals: { volumeM3: number; value: number };
  page: number;
  pageSize: number;
}

/** One page of the stock list, keyed on its API URL (the query string is the filter). */
export function useBlocks(query: string, fallback?: BlockListResponse) {
  return useSWR<BlockListResponse>(`/api/blocks?${query}`, fetcher, { fallbackData: fallback, keepPreviousData: true });
}
