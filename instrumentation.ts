/**
 * Runs once when an app server starts (Next's instrumentation hook). Every app server sweeps
 * nesting runs whose worker stopped (no heartbeat for RUN_STALE_SECONDS) to "failed", so a run is
 * never left "running" for ever even when no worker is alive to sweep it. Idempotent: several
 * servers and workers sweeping at once mark each run once.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { failStaleRuns } = await import("@/db/queries/run-worker");
  const stale = Number(process.env.RUN_STALE_SECONDS ?? 90);
  const every = Math.max(1, Number(process.env.RUN_SWEEP_SECONDS ?? 30)) * 1000;
  const sweep = async () => {
    try {
      const n = await failStaleRuns(stale);
      if (n) console.error(`[app] marked ${n} stalled nesting run(s) failed`);
    } catch {
      /* the database is down: the next sweep tries again */
    }
  };
  setInterval(() => void sweep(), every).unref();
}
