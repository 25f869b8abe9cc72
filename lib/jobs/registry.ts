import type PgBoss from "pg-boss";

/** A background job type: its queue, what it does, and optionally a cron schedule. */
export interface JobDefinition<T = unknown> {
  queue: string;
  /** Per-job options for pg-boss (retries, expiry). */
  options?: Omit<PgBoss.Queue, "name">;
  schedule?: { cron: string; data?: object };
  handle(data: T, job: { id: string }): Promise<void>;
}

/** Every job the worker runs. Add a line here for a new one. */
export async function jobDefinitions(): Promise<JobDefinition<never>[]> {
  const defs: JobDefinition<never>[] = [];
  defs.push((await import("./handlers/nesting-run")).nestingRunJob as JobDefinition<never>);
  defs.push((await import("./handlers/low-stock-alert")).lowStockAlertJob as JobDefinition<never>);
  return defs;
}
