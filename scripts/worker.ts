/**
 * `npm run worker`: does the background jobs (nesting runs, scheduled alerts). Start as many as
 * you like, on any machine that reaches the database; pg-boss hands each job to one of them.
 * Runs with the react-server condition so server-only modules load outside Next.
 */
import { createBoss } from "@/lib/jobs/boss";
import { jobDefinitions } from "@/lib/jobs/registry";
import { failStaleRuns } from "@/db/queries/run-worker";

// A worker's database pool is sized as a worker's (db/pool-size.ts); the pool opens on first use.
process.env.BLOCKYARD_PROCESS ??= "worker";

// A worker that dies mid-run leaves its run "running" with a stale heartbeat: every worker sweeps
// such runs to "failed" at start and then periodically, so nobody waits on a dead one for ever.
const STALE_SECONDS = Number(process.env.RUN_STALE_SECONDS ?? 90);
const SWEEP_SECONDS = Number(process.env.RUN_SWEEP_SECONDS ?? 30);

async function sweepStaleRuns() {
  try {
    const n = await failStaleRuns(STALE_SECONDS);
    if (n) console.error(`[worker] marked ${n} stalled nesting run(s) failed`);
  } catch (e) {
    console.error("[worker] stale-run sweep:", e instanceof Error ? e.message : e);
  }
}

async function main() {
  const boss = createBoss("worker");
  await boss.start();
  const defs = await jobDefinitions();
  for (const def of defs) {
    // Several workers may start at once: whoever creates the queue first wins, the others use it.
    if (!(await boss.getQueue(def.queue))) {
      await boss.createQueue(def.queue, { name: def.queue, ...(def.options ?? {}) }).catch(async (e) => {
        if (!(await boss.getQueue(def.queue))) throw e;
      });
    }
    await boss.work<unknown>(def.queue, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async (jobs) => {
      for (const job of jobs) await def.handle(job.data as never, { id: job.id });
    });
    if (def.schedule) await boss.schedule(def.queue, def.schedule.cron, def.schedule.data ?? {});
  }
  await sweepStaleRuns();
  const sweeper = setInterval(() => void sweepStaleRuns(), Math.max(1, SWEEP_SECONDS) * 1000);
  console.error(`[worker] ready: ${defs.map((d) => d.queue).join(", ") || "no queues"}`);
  const stop = async () => {
    clearInterval(sweeper);
    await boss.stop({ graceful: true, timeout: 5000 }).catch(() => {});
    process.exit(0);
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

main().catch((e) => {
  console.error("[worker]", e instanceof Error ? e.message : e);
  process.exit(1);
});
