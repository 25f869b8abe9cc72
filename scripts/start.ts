/**
 * `npm start`: Postgres (private cluster on 127.0.0.1 unless DATABASE_URL is set) → migrations →
 * demo seed when the database is empty → build when needed → serve on http://localhost:$PORT
 * (scripts/serve.mjs: Next's request handler in one process per core). `npm run dev` does the same
 * with `next dev`.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { DEMO_CLUSTER, ensureCluster } from "./pg";
import { migrateAndSeed } from "./db";
import { buildIfNeeded } from "./build-if-needed";
import { DEMO_S3, ensureS3 } from "./s3";
import { checkLocalServiceHosts } from "./loopback";

async function main() {
  // The private Postgres and the S3 fake have no passwords: refuse a non-loopback host before
  // starting either of them (see scripts/loopback.ts).
  checkLocalServiceHosts(process.env);
  const dev = process.argv.includes("--dev");
  const port = process.env.PORT ?? "3000";
  const url = await ensureCluster(DEMO_CLUSTER);
  const s3 = await ensureS3(DEMO_S3); // photo storage, before the seed uploads demo photos
  Object.assign(process.env, s3.env);
  await migrateAndSeed(url, { seedWhenEmpty: true });
  if (!dev) buildIfNeeded();

  const env = { ...process.env, DATABASE_URL: url, PORT: port, NEXT_TELEMETRY_DISABLED: "1" };
  const children: ChildProcess[] = [];
  // Production: scripts/serve.mjs, one app process per core (WEB_WORKERS to change). Both it and
  // next dev spawn children: give them a process group so we can stop all of it.
  const web = dev
    ? spawn("npx", ["next", "dev", "-p", port], { stdio: "inherit", env, detached: true })
    : spawn(process.execPath, ["scripts/serve.mjs", "--port", port], { stdio: "inherit", env, detached: true });
  children.push(web);
  // Background workers alongside (nesting runs, scheduled alerts): NESTING_WORKERS of them (1 by
  // default; more workers may run on other machines against the same database — see README).
  // Each is supervised: restarted when it dies (a second later, then backing off to a minute when
  // it keeps dying); its run is swept to "failed" by any live app server or worker meanwhile.
  let stopping = false;
  const workers = workerCount(process.env.NESTING_WORKERS);
  const startWorker = (n: number, restarts: number[] = []) => {
    const worker = spawn("npm", ["run", "--silent", "worker"], { stdio: "inherit", env, detached: true });
    children.push(worker);
    worker.on("exit", (code, signal) => {
      if (stopping) return;
      const now = Date.now();
      const recent = [...restarts.filter((t) => now - t < 10 * 60_000), now];
      const wait = Math.min(60_000, 1000 * 2 ** Math.max(0, recent.length - 1));
      process.stderr.write(
        `[start] worker ${n} stopped (${signal ?? `exit ${code}`}); starting another in ${Math.round(wait / 1000)} s\n`,
      );
      setTimeout(() => {
        if (!stopping) startWorker(n, recent);
      }, wait);
    });
  };
  for (let n = 1; n <= workers; n++) startWorker(n);
  process.stderr.write(`[start] Blockyard on http://localhost:${port} (demo users: see README)\n`);

  const stop = (code: number) => {
    stopping = true;
    void s3.stop();
    for (const c of children) {
      if (c.pid && c.exitCode === null) {
        try {
          process.kill(-c.pid, "SIGTERM");
        } catch {
          /* already gone */
        }
      }
    }
    process.exit(code);
  };
  process.on("SIGINT", () => stop(0));
  process.on("SIGTERM", () => stop(0));
  web.on("exit", (code) => stop(code ?? 1));
}

/** NESTING_WORKERS: how many background workers this machine runs (1 to 16; 0 runs none here). */
function workerCount(raw: string | undefined): number {
  if (raw === undefined || raw === "") return 1;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 16) {
    console.error(`NESTING_WORKERS must be a whole number from 0 to 16 (got "${raw}").`);
    process.exit(1);
  }
  return n;
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
