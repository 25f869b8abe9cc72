import type { ChildProcess } from "node:child_process";
import { afterAll, describe, expect, it } from "vitest";
import { TEST_SLOT } from "@/scripts/pg";
import { client, demoEmail } from "../support/http";
import { closeTestDb, makeBlock, testDb } from "../support/db";
import { makeJobWithParts } from "../support/planning-fixtures";
import { killGroup, pauseSharedWorker, sleep, startWorker, until } from "../support/workers";

/**
 * More than one worker (issue "abuse and load", item 10): two worker processes share the queue in
 * the database, as workers on two machines would. Twenty runs are each done exactly once, both
 * workers take some, and a worker killed in the middle of a run leaves that run failed with a
 * reason — not stuck, not done twice.
 */
const children = new Set<ChildProcess>();
afterAll(async () => {
  for (const c of children) killGroup(c);
  pauseSharedWorker(false);
  await closeTestDb();
});

const log = `.data/workers-test${TEST_SLOT ? `-${TEST_SLOT}` : ""}.log`;
const env = (name: string) => ({ NESTING_WORKER_NAME: name, RUN_STALE_SECONDS: "5", RUN_SWEEP_SECONDS: "1" });
const settings = (timeLimitMs: number) => ({
  kerf: 1.5,
  trim: 6,
  defectMargin: 10,
  minOffcut: [150, 150, 25],
  layout: "guillotine",
  timeLimitMs,
});

describe("several nesting workers on one queue", () => {
  it.runIf(Number(process.env.TEST_WORKER_PGID) > 0)(
    "do 20 runs once each between them, and account for the run of one killed mid-run",
    async () => {
      const planner = client();
      await planner.signIn(demoEmail("planner"));
      // Only this test's two workers may take runs: the shared one is paused.
      expect(pauseSharedWorker(true)).toBe(true);
      const workers = {
        "test-a": await startWorker(log, env("test-a"), children),
        "test-b": await startWorker(log, env("test-b"), children),
      };

      // Short runs: two panels that fill one block. One long run: more parts than the stock holds,
      // so its search runs to its 120 s limit unless its worker dies.
      const small = await makeJobWithParts([
        { name: "Worker panel", quantity: 2, size: [900, 400, 200], gradeCode: "EPS-II" },
      ]);
      const smallBlock = await makeBlock({ size: [2000, 1000, 600] });
      const big = await makeJobWithParts(
        (
          [
            [730, 410, 95],
            [515, 333, 121],
            [1210, 287, 64],
            [377, 377, 377],
          ] as [number, number, number][]
        ).map((size, i) => ({ name: `Worker load ${i}`, quantity: 30, size, gradeCode: "EPS-II" })),
      );
      const bigBlocks = [await makeBlock({ size: [2440, 1220, 610] }), await makeBlock({ size: [2440, 1220, 610] })];

      const ids: number[] = [];
      let longId = 0;
      for (let i = 0; i < 20; i++) {
        const long = i === 10;
        const res = await planner.post("/api/runs", {
          jobIds: [long ? big.jobId : small.jobId],
          blockIds: long ? bigBlocks.map((b) => b.id) : [smallBlock.id],
          settings: settings(long ? 120_000 : 500),
        });
        expect(res.status, JSON.stringify(res.body)).toBe(201);
        const id = res.body.run?.id ?? res.body.id ?? res.body.runId;
        ids.push(id);
        if (long) longId = id;
      }

      // The long run starts on one of the two; that worker is killed while it plans.
      const held = await until(
        "the long run to start",
        async () => {
          const r = await testDb()("nesting_runs").where({ id: longId }).first("status", "worker");
          return r!.status === "running" && r!.worker ? (r!.worker as keyof typeof workers) : undefined;
        },
        90_000,
      );
      await sleep(1000);
      killGroup(workers[held], "SIGKILL");

      // Everything reaches an end: the other worker does the rest and sweeps the orphan.
      const rows = await until(
        "every run to end",
        async () => {
          const r = await testDb()("nesting_runs")
            .whereIn("id", ids)
            .select("id", "status", "worker", "attempts", "error", "plan");
          return r.every((x) => x.status === "done" || x.status === "failed") ? r : undefined;
        },
        180_000,
        500,
      );
      const long = rows.find((r) => r.id === longId)!;
      expect(long.status).toBe("failed");
      expect(long.error).toMatch(/worker stopped/i);
      expect(long.worker).toBe(held);
      const done = rows.filter((r) => r.id !== longId);
      expect(done.map((r) => r.status)).toEqual(Array(19).fill("done"));
      expect(done.every((r) => r.plan !== null)).toBe(true);
      // Claimed once each: nobody did a run twice.
      expect(rows.map((r) => Number(r.attempts))).toEqual(Array(20).fill(1));
      // Both workers took runs, and no one else did.
      expect(new Set(rows.map((r) => r.worker))).toEqual(new Set(["test-a", "test-b"]));
    },
    300_000,
  );
});
