import { afterAll, describe, expect, it } from "vitest";
import { closeTestDb, testDb } from "../support/db";

afterAll(closeTestDb);

/** The shared test worker's process group (set by `npm test`): paused so that only the app can sweep. */
const sharedWorker = Number(process.env.TEST_WORKER_PGID) || undefined;
const pause = (on: boolean) => sharedWorker && process.kill(-sharedWorker, on ? "SIGSTOP" : "SIGCONT");

describe("stalled nesting runs", () => {
  it.runIf(sharedWorker)("are swept to failed by the app servers even when no worker is alive", async () => {
    const k = testDb();
    const [run] = await k("nesting_runs")
      .insert({
        status: "running",
        job_ids: [],
        block_ids: [],
        settings: JSON.stringify({}),
        problem: JSON.stringify({ version: 1, blocks: [], parts: [] }),
        heartbeat_at: k.raw("now() - interval '10 minutes'"),
        started_at: k.raw("now() - interval '11 minutes'"),
      })
      .returning("id");
    pause(true);
    try {
      await expect
        .poll(async () => (await k("nesting_runs").where({ id: run!.id }).first("status"))!.status, {
          timeout: 15_000,
          interval: 500,
        })
        .toBe("failed");
      const row = await k("nesting_runs").where({ id: run!.id }).first("error");
      expect(row!.error).toBe("The worker stopped while planning. Start the run again.");
    } finally {
      pause(false);
    }
  });
});
