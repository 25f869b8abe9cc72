/**
 * `npm test`: every test, on a private throwaway database — never the demo data.
 *   1. a private Postgres cluster under .data/pg-test (or TEST_DATABASE_URL), database recreated,
 *      migrated and seeded with the demo shop as fixtures;
 *   2. the app built when needed and served on 127.0.0.1 (TEST_PORT, default 3199);
 *   3. Debian's chromium installed when missing (as root) for the browser tests;
 *   0. Biome's format and lint check and tsc's type check (SKIP_SOURCE_CHECKS=1 skips them locally);
 *   4. vitest: unit + reference, API (supertest against the served app), browser (playwright-core).
 * Extra arguments go to vitest (`npm test -- --project unit`).
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import { TEST_CLUSTER, TEST_SLOT, ensureCluster, recreateDatabase, stopCluster } from "./pg";
import { migrateAndSeed } from "./db";
import { buildIfNeeded } from "./build-if-needed";
import { TEST_S3, ensureS3 } from "./s3";

const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

function ensureChromium(): void {
  if (fs.existsSync(CHROMIUM)) return;
  if (process.getuid?.() !== 0) {
    console.error(`[test] ${CHROMIUM} is missing. Install it with: sudo apt-get install -y chromium`);
    process.exit(1);
  }
  console.error("[test] installing Debian's chromium for the browser tests (first run only)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const args of [
    ["update", "-qq"],
    ["install", "-y", "-qq", "chromium", "fonts-dejavu-core"],
  ]) {
    const r = spawnSync("apt-get", args, { stdio: "inherit", env });
    if (r.status !== 0) process.exit(r.status ?? 1);
  }
}

async function waitForHealth(url: string, server: ChildProcess): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error("the test server exited during start-up");
    try {
      const r = await fetch(`${url}/api/health`);
      if (r.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error("the test server did not answer /api/health within 60 s");
}

/** Format, lint and type check first: CI fails on drift before anything starts. */
function checkSources(): void {
  for (const [what, cmd, args] of [
    ["format and lint (biome ci)", "npx", ["biome", "ci", "."]],
    ["type check (tsc --noEmit)", "npx", ["tsc", "--noEmit", "-p", "."]],
  ] as const) {
    console.error(`[test] ${what}…`);
    const r = spawnSync(cmd, [...args], { stdio: "inherit" });
    if (r.status !== 0) {
      console.error(`[test] ${what} failed; \`npm run lint -- --write\` fixes formatting and safe lint fixes.`);
      process.exit(r.status ?? 1);
    }
  }
}

async function main() {
  const vitestArgs = process.argv.slice(2);
  if (!process.env.SKIP_SOURCE_CHECKS) checkSources();
  // Only the unit project asked for: no database, no server, no browser needed.
  const projects = vitestArgs.flatMap((a, i) =>
    a === "--project" && vitestArgs[i + 1] ? [vitestArgs[i + 1]!] : a.startsWith("--project=") ? [a.slice(10)] : [],
  );
  const onlyUnit = projects.length > 0 && projects.every((p) => p === "unit");
  delete process.env.DATABASE_URL; // the demo database is never a test database
  if (TEST_SLOT && !process.env.NEXT_DIST_DIR) process.env.NEXT_DIST_DIR = `.next-slot-${TEST_SLOT}`;
  if (TEST_SLOT) process.env.SKIP_BUILD_TYPECHECK ??= "1";

  let url = process.env.TEST_DATABASE_URL;
  if (!url) {
    url = await ensureCluster(TEST_CLUSTER);
    await recreateDatabase(TEST_CLUSTER);
  }
  const s3 = await ensureS3(TEST_S3); // an empty bucket for photos, before the seed uploads some
  Object.assign(process.env, s3.env);
  await migrateAndSeed(url, { seedWhenEmpty: false, forceSeed: true });

  let server: ChildProcess | undefined;
  let worker: ChildProcess | undefined;
  const port = process.env.TEST_PORT ?? String(TEST_SLOT ? 3200 + TEST_SLOT : 3199);
  const baseUrl = `http://127.0.0.1:${port}`;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    DATABASE_URL: url,
    APP_URL: baseUrl,
    TRUST_PROXY: "true",
    // Stalled runs are swept every 2 s (app servers and workers alike), so the sweep test is quick.
    RUN_SWEEP_SECONDS: "2",
    CHROMIUM_PATH: CHROMIUM,
    NEXT_TELEMETRY_DISABLED: "1",
  };
  const stopAll = () => {
    void s3.stop();
    for (const child of [server, worker]) {
      if (child?.pid && child.exitCode === null) {
        try {
          process.kill(-child.pid, "SIGTERM");
        } catch {
          /* gone */
        }
      }
    }
    if (!process.env.TEST_DATABASE_URL && !process.env.KEEP_TEST_DB) stopCluster(TEST_CLUSTER);
  };
  process.on("SIGINT", () => (stopAll(), process.exit(130)));

  let code = 1;
  try {
    if (!onlyUnit) {
      buildIfNeeded();
      ensureChromium();
      // Served as `npm start` serves it (scripts/serve.mjs, one process per core).
      server = spawn(process.execPath, ["scripts/serve.mjs", "--port", port, "--hostname", "127.0.0.1"], {
        env,
        detached: true,
        stdio: [
          "ignore",
          fs.openSync(`.data/test-server${TEST_SLOT ? `-${TEST_SLOT}` : ""}.log`, "w"),
          fs.openSync(`.data/test-server${TEST_SLOT ? `-${TEST_SLOT}` : ""}.log`, "a"),
        ],
      });
      await waitForHealth(baseUrl, server);
      // The background worker, as `npm start` runs it (tests of nesting runs and alerts need it).
      const workerLog = fs.openSync(`.data/test-worker${TEST_SLOT ? `-${TEST_SLOT}` : ""}.log`, "w");
      worker = spawn("npm", ["run", "--silent", "worker"], {
        env,
        detached: true,
        stdio: ["ignore", workerLog, workerLog],
      });
      // The faults test pauses this worker while its own takes a run, so the run cannot go elsewhere.
      if (worker.pid) env.TEST_WORKER_PGID = String(worker.pid);
    }
    const r = spawnSync("npx", ["vitest", "run", ...vitestArgs], { stdio: "inherit", env });
    code = r.status ?? 1;
  } finally {
    stopAll();
  }
  if (code !== 0) console.error("[test] failures above; the app's log is in .data/test-server.log");
  process.exit(code);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.stack : e);
  process.exit(1);
});
