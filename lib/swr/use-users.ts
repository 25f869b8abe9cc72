"use client";

import useSWR from "swr";
import { fetcher } from "./fetcher";
import type { UserSummary } from "@/lib/user-types";

export type UserRow = UserSummary;

export function useUsers(fallback?: UserRow[]) {
  return useSWR<{ items: UserRow[] }>(
    "/api/admin/users",
    fetcher,
    fallback ? { fallbackData: { items: fallback } } : undefined,
  );
}
