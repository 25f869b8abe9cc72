import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, testDb } from "../support/db";
import { diff, fingerprint } from "../support/fingerprint";
import { makeJobWithParts } from "../support/planning-fixtures";
import { killGroup, pauseSharedWorker, sleep, startWorker, until } from "../support/workers";
import { TEST_CLUSTER, TEST_SLOT, ensureCluster, stopCluster } from "@/scripts/pg";
import { DEMO_PASSWORD } from "@/db/seeds/01_shop";

/**
 * Faults: Postgres stopping under the shared test server, and an app server and a worker of this
 * file's own (never the shared ones) killed in the middle of their work.
 */

const ownsCluster = !process.env.TEST_DATABASE_URL;
const children = new Set<ChildProcess>();

afterAll(async () => {
  for (const c of children) killGroup(c);
  await closeTestDb();
});

/** Starts the cluster again with DATABASE_URL hidden (ensureCluster uses a set DATABASE_URL as is). */
async function startCluster() {
  const saved = process.env.DATABASE_URL;
  delete process.env.DATABASE_URL;
  try {
    await ensureCluster(TEST_CLUSTER);
  } finally {
    process.env.DATABASE_URL = saved;
  }
}

describe("Postgres stops while the app is serving", () => {
  let admin: Client;
  beforeAll(async () => {
    admin = client();
    await admin.signIn(demoEmail("admin"));
  });

  it.skipIf(!ownsCluster)(
    "answers 503 with a clear message (never 500) while it is down, and recovers when it returns",
    async () => {
      expect((await admin.get("/api/blocks")).status).toBe(200);
      await closeTestDb(); // our own pool would hold dead connections
      // Requests in flight as it stops: each gets an answer, 200 or 503.
      const inFlight = Array.from({ length: 20 }, () => admin.get("/api/blocks?status=all&pageSize=200"));
      await sleep(30);
      stopCluster(TEST_CLUSTER);
      try {
        const during = await Promise.all(inFlight);
        expect(during.map((r) => r.status).filter((s) => s !== 200 && s !== 503)).toEqual([]);

        const health = await client().get("/api/health");
        expect(health.status).toBe(503);
        expect(health.body).toMatchObject({ ok: false, database: "down" });
        for (const [method, url, body] of [
          ["get", "/api/blocks", undefined],
          ["get", "/api/me", undefined],
          ["get", "/api/runs", undefined],
          ["post", "/api/grades", { code: "DOWN-1", material: "EPS", gradeSystem: "shop", grade: "x", cureDays: 1 }],
          ["post", "/api/imports/deliveries?commit=1", "supplier\nx\n"],
        ] as const) {
          let req = admin.call(method, url);
          if (typeof body === "string") req = req.set("Content-Type", "text/csv").send(body);
          else if (body) req = req.send(body);
          const res = await req;
          expect(res.status, `${method} ${url}: ${JSON.stringify(res.body)}`).toBe(503);
          expect(res.body.error).toMatch(/database cannot be reached/i);
          expect(res.headers["retry-after"]).toBeTruthy();
        }
        // Signing in needs the database too: a 503, not "wrong password".
        const signIn = await client().post("/api/auth/sign-in", { email: demoEmail("buyer"), password: DEMO_PASSWORD });
        expect(signIn.status).toBe(503);
      } finally {
        await startCluster();
      }
      await until("health to come back", async () => (await client().get("/api/health")).status === 200, 60_000, 250);
      // The same session works again: nothing was lost with the connections.
      const after = await admin.get("/api/blocks");
      expect(after.status).toBe(200);
      expect(after.body.total).toBeGreaterThan(0);
    },
    120_000,
  );
});

// ---- an app server of our own ----

const OWN_PORT = Number(process.env.FAULTS_PORT ?? 3250 + (TEST_SLOT || 0));
const OWN_URL = `http://127.0.0.1:${OWN_PORT}`;

function startOwnServer(): ChildProcess {
  const log = fs.openSync(`.data/faults-server${TEST_SLOT ? `-${TEST_SLOT}` : ""}.log`, "a");
  const child = spawn("npx", ["next", "start", "-p", String(OWN_PORT), "-H", "127.0.0.1"], {
    env: { ...process.env, APP_URL: OWN_URL, PORT: String(OWN_PORT) },
    detached: true,
    stdio: ["ignore", log, log],
  });
  children.add(child);
  return child;
}

async function waitUp(child: ChildProcess) {
  await until(
    "our own server to answer",
    async () => {
      if (child.exitCode !== null) throw new Error("our own server exited");
      return (await fetch(`${OWN_URL}/api/health`)).ok;
    },
    90_000,
    250,
  );
}

/** Client backends of this database in the middle of a write (ours excluded). */
async function writesInFlight(): Promise<number> {
  const r = await testDb().raw(
    `SELECT count(*)::int AS n FROM pg_stat_activity
      WHERE datname = current_database() AND pid <> pg_backend_pid() AND backend_type = 'client backend'
        AND (state = 'idle in transaction' OR (state = 'active' AND query ILIKE 'insert into%'))`,
  );
  return r.rows[0].n as number;
}

function bigDeliveriesCsv(lot: string, n: number): string {
  const lines = ["supplier,received_on,lot,grade,length_mm,width_mm,height_mm,cost,location"];
  for (let i = 0; i < n; i++)
    lines.push(`Ashcombe Bead & Block,2026-11-30,${lot},EPS-II,${1000 + (i % 500)},500,400,${40 + (i % 50)},Fault bay`);
  return `${lines.join("\n")}\n`;
}

describe("the app is killed in the middle of an import", () => {
  it("leaves no half-written rows, and the same import succeeds whole after a restart", async () => {
    let server = startOwnServer();
    await waitUp(server);
    const agent = request.agent(OWN_URL);
    const signIn = await agent
      .post("/api/auth/sign-in")
      .set("Origin", OWN_URL)
      .set("X-Forwarded-For", "10.66.0.1")
      .send({ email: demoEmail("buyer"), password: DEMO_PASSWORD });
    expect(signIn.status).toBe(200);

    const lot = `KILL-${Date.now().toString(36)}`.toUpperCase();
    const rows = 19_000;
    const csv = bigDeliveriesCsv(lot, rows);
    const before = await fingerprint();
    const gap = await ledgerGap();

    const pending = agent
      .post("/api/imports/deliveries?commit=1")
      .set("Origin", OWN_URL)
      .set("Content-Type", "text/csv")
      .send(csv)
      .then(
        (r) => ({ status: r.status }),
        (e: Error) => ({ error: e.message }),
      );
    let finished = false;
    void pending.then(() => (finished = true));
    // Kill the server while its import transaction is open.
    await until(
      "the import's transaction to be open",
      async () => {
        if (finished) throw new Error("the import finished before it could be interrupted");
        return (await writesInFlight()) > 0;
      },
      60_000,
      10,
    );
    killGroup(server, "SIGKILL");
    const outcome = await pending;
    expect(outcome, "the client saw the connection drop").toHaveProperty("error");

    // Postgres rolls the transaction back once it sees the client gone.
    await until("the killed server's transaction to end", async () => (await writesInFlight()) === 0, 30_000, 100);
    expect(diff(before, await fingerprint())).toEqual([]);
    expect(
      await testDb()("blocks")
        .where({ lot })
        .count<{ n: number }[]>({ n: "*" })
        .first()
        .then((r) => Number(r?.n)),
    ).toBe(0);
    const mid = await ledgerGap();
    expect(mid.m3).toBeCloseTo(gap.m3, 9);

    // Restarted, the same session and the same file go through whole.
    server = startOwnServer();
    await waitUp(server);
    const again = await agent
      .post("/api/imports/deliveries?commit=1")
      .set("Origin", OWN_URL)
      .set("Content-Type", "text/csv")
      .send(csv);
    expect(again.status, JSON.stringify(again.body).slice(0, 300)).toBe(201);
    expect(
      await testDb()("blocks")
        .where({ lot })
        .count<{ n: number }[]>({ n: "*" })
        .first()
        .then((r) => Number(r?.n)),
    ).toBe(rows);
    const end = await ledgerGap();
    expect(end.m3).toBeCloseTo(gap.m3, 6);
    killGroup(server, "SIGTERM");
  }, 240_000);
});

// ---- a worker of our own ----

const workerLog = `.data/faults-worker${TEST_SLOT ? `-${TEST_SLOT}` : ""}.log`;

/** Starts a worker of this file's own and waits until it polls for jobs (its "ready" line). */
const startOwnWorker = () => startWorker(workerLog, { RUN_STALE_SECONDS: "5", RUN_SWEEP_SECONDS: "1" }, children);

afterAll(() => void pauseSharedWorker(false));

describe("a worker is killed in the middle of a nesting run", () => {
  it("after a restart the run is marked failed with a reason, never left running", async () => {
    const planner = client();
    await planner.signIn(demoEmail("planner"));
    // More parts than the stock can hold: the search cannot finish early and runs to its time limit.
    const blocks = [await makeBlock({ size: [2440, 1220, 610] }), await makeBlock({ size: [2440, 1220, 610] })];
    const sizes: [number, number, number][] = [
      [730, 410, 95],
      [515, 333, 121],
      [1210, 287, 64],
      [377, 377, 377],
      [905, 150, 45],
      [640, 480, 210],
    ];

    // The shared test worker competes for the job: it is paused (under `npm test`); otherwise
    // repeat until the one we kill had it.
    let orphan: number | undefined;
    const paused = pauseSharedWorker(true);
    for (let attempt = 0; attempt < (paused ? 1 : 6) && !orphan; attempt++) {
      const worker = await startOwnWorker();
      const { jobId } = await makeJobWithParts(
        sizes.map((s, i) => ({ name: `Fault part ${i}`, quantity: 30, size: s, gradeCode: "EPS-II" })),
      );
      const created = await planner.post("/api/runs", {
        jobIds: [jobId],
        blockIds: blocks.map((b) => b.id),
        settings: {
          kerf: 1.5,
          trim: 6,
          defectMargin: 10,
          minOffcut: [150, 150, 25],
          layout: "guillotine",
          timeLimitMs: 120_000,
        },
      });
      expect(created.status, JSON.stringify(created.body)).toBe(201);
      const runId = created.body.run?.id ?? created.body.id ?? created.body.runId;
      await until(
        "the run to start",
        async () => (await testDb()("nesting_runs").where({ id: runId }).first("status"))!.status === "running",
        60_000,
      );
      killGroup(worker, "SIGKILL");
      // A progress write the worker sent just before it died may still commit: let it land first.
      await sleep(500);
      const h1 = (await testDb()("nesting_runs").where({ id: runId }).first("heartbeat_at"))!.heartbeat_at as Date;
      await sleep(2500);
      const row = await testDb()("nesting_runs").where({ id: runId }).first("status", "heartbeat_at");
      if (row!.status === "running" && (row!.heartbeat_at as Date).getTime() === h1.getTime()) orphan = runId;
      else await planner.post(`/api/runs/${runId}/cancel`); // the shared worker had it: stop it, try again
    }
    pauseSharedWorker(false);
    expect(orphan, "a run held by the killed worker").toBeTruthy();

    // The "restart": a fresh worker sweeps the stalled run.
    const restarted = await startOwnWorker();
    const failed = await until(
      "the stalled run to be swept",
      async () => {
        const r = await testDb()("nesting_runs").where({ id: orphan }).first("status", "error", "finished_at");
        return r!.status !== "running" ? r : undefined;
      },
      60_000,
      250,
    );
    expect(failed.status).toBe("failed");
    expect(failed.error).toMatch(/worker stopped/i);
    expect(failed.finished_at).toBeTruthy();
    expect(await testDb()("plan_blocks").where({ run_id: orphan })).toEqual([]);
    const seen = await planner.get(`/api/runs/${orphan}`);
    expect(seen.body.run.status).toBe("failed");
    killGroup(restarted, "SIGTERM");
  }, 300_000);
});
