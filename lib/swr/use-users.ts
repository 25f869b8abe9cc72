"use client";

import useSWR from "swr";
import { fetcher } from "./fetcher";
import type { Role } from "@/lib/roles";

export interface UserRow {
  id: string;
  email: string;
  name: string;
  active: boolean;
  mustChangePassword: boolean;
  roles: Role[];
  createdAt: string;
}

export function useUsers(fallback?: UserRow[]) {
  return useSWR<{ items: UserRow[] }>("/api/admin/users", fetcher, fallback ? { fallbackData: { items: fallback } } : undefined);
}
