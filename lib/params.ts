import { notFound } from "@/lib/errors";

/** A numeric route parameter, or 404 (never a database error for "abc" or "1e99"). */
export function idParam(value: string | undefined, what = "That record"): number {
  if (!value || !/^\d{1,9}$/.test(value)) throw notFound(what);
  return Number(value);
}
