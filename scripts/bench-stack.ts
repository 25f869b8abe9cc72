/**
 * A private stack for the benchmark scripts, built from the same pieces as `npm test`: a throwaway
 * Postgres cluster, the S3 fake, the demo seed, the built app on 127.0.0.1 (scripts/serve.mjs, as
 * `npm start` runs it; WEB_WORKERS sets its process count) — and a stop() that
 * takes all of it down again. TEST_SLOT (default 5) keeps its folders and ports apart from other
 * runs: cluster .data/pg-bench-<slot> on 55020+slot, app on 3220+slot, S3 fake on 55120+slot.
 *
 * With `before` (a checkout of an older commit, e.g. `git worktree add /tmp/before <commit>` with
 * its own node_modules), that commit is served too, side by side, on a database of its own in the
 * same cluster (migrated and seeded by its own code, then given the same bench data), on port
 * 3270+slot: a bench can then time the old and the new code alternately, in the same minutes of a
 * shared machine.
 *
 *   const stack = await startBenchStack("bench-stock");
 *   try { …fetch(`${stack.url}/api/blocks`)… } finally { await stack.stop(); }
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { ensureCluster, recreateDatabase, stopCluster, type ClusterOptions } from "./pg";
import { migrateAndSeed } from "./db";
import { buildIfNeeded } from "./build-if-needed";
import { ensureS3 } from "./s3";

export const BENCH_SLOT = Number(process.env.TEST_SLOT ?? 5);

export interface BenchStack {
  url: string;
  databaseUrl: string;
  /** The older commit's app and database, when `before` was given. */
  before?: { url: string; databaseUrl: string; dir: string };
  stop(): Promise<void>;
}

/** `--before DIR` on a bench's command line: the checkout to serve beside this one. */
export function beforeDirArg(): string | undefined {
  const i = process.argv.indexOf("--before");
  return i > 0 ? path.resolve(process.argv[i + 1]!) : undefined;
}

/** Builds the checkout in `dir` into its own `.next-bench` folder unless that build exists. */
function buildBefore(dir: string) {
  if (fs.existsSync(path.join(dir, ".next-bench", "BUILD_ID"))) return;
  process.stderr.write(`[bench] building ${dir} (next build)…\n`);
  fs.writeFileSync(path.join(dir, ".next-bench.tsconfig.json"), `${JSON.stringify({ extends: "./tsconfig.json" })}\n`);
  const r = spawnSync("npx", ["next", "build"], {
    cwd: dir,
    stdio: "inherit",
    env: {
      ...process.env,
      NEXT_DIST_DIR: ".next-bench",
      NEXT_TSCONFIG: ".next-bench.tsconfig.json",
      SKIP_BUILD_TYPECHECK: "1",
      NEXT_TELEMETRY_DISABLED: "1",
    },
  });
  if (r.status !== 0) throw new Error(`next build failed in ${dir}`);
}

/** Migrates and seeds a database with the code of the checkout in `dir` (its own migrations). */
function migrateBefore(dir: string, databaseUrl: string) {
  const script = `import("./scripts/db.ts").then((m) => (m.migrateAndSeed ?? m.default.migrateAndSeed)(process.env.BENCH_DB, { seedWhenEmpty: false, forceSeed: true })).then(() => process.exit(0), (e) => { console.error(e); process.exit(1); })`;
  const r = spawnSync("npx", ["tsx", "-e", script], {
    cwd: dir,
    stdio: "inherit",
    env: { ...process.env, BENCH_DB: databaseUrl, DATABASE_URL: "" },
  });
  if (r.status !== 0) throw new Error(`migrating the database of ${dir} failed`);
}

/** The app of `cwd` on `port` (scripts/serve.mjs), its output in .data/<log>; resolves once /api/health answers. */
async function serveApp(
  cwd: string,
  port: number,
  env: Record<string, string>,
  log: string,
  servers: ChildProcess[],
): Promise<void> {
  const url = `http://127.0.0.1:${port}`;
  const fd = fs.openSync(`.data/${log}`, "w");
  // The app as `npm start` serves it: scripts/serve.mjs, one process per core (WEB_WORKERS).
  const server = spawn(process.execPath, ["scripts/serve.mjs", "--port", String(port), "--hostname", "127.0.0.1"], {
    cwd,
    env: { ...process.env, ...env, APP_URL: url, TRUST_PROXY: "true", NEXT_TELEMETRY_DISABLED: "1" },
    detached: true,
    stdio: ["ignore", fd, fd],
  });
  servers.push(server); // stop() takes it down, also when it never comes up
  const deadline = Date.now() + 90_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`the app in ${cwd} exited during start-up; see .data/${log}`);
    try {
      if ((await fetch(`${url}/api/health`)).ok) return;
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw new Error(`the app in ${cwd} did not answer /api/health within 90 s`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

export async function startBenchStack(
  name: string,
  opts: { beforeServe?: (databaseUrl: string) => Promise<void>; before?: string } = {},
): Promise<BenchStack> {
  delete process.env.DATABASE_URL; // never the demo data
  process.env.NEXT_DIST_DIR ??= `.next-slot-${BENCH_SLOT}`;
  process.env.SKIP_BUILD_TYPECHECK ??= "1";
  const cluster: ClusterOptions = {
    name: `pg-bench-${BENCH_SLOT}`,
    port: 55020 + BENCH_SLOT,
    database: "blockyard_bench",
    fast: true,
  };
  const port = 3220 + BENCH_SLOT;
  const url = `http://127.0.0.1:${port}`;
  const servers: ChildProcess[] = [];
  let s3: Awaited<ReturnType<typeof ensureS3>> | undefined;
  let stopped = false;
  const stop = async () => {
    if (stopped) return;
    stopped = true;
    for (const server of servers) {
      if (!server.pid || server.exitCode !== null) continue;
      try {
        process.kill(-server.pid, "SIGTERM");
      } catch {
        /* gone */
      }
    }
    await s3?.stop();
    stopCluster(cluster);
  };
  const onSignal = () => void stop().finally(() => process.exit(130));
  process.once("SIGINT", onSignal);
  process.once("SIGTERM", onSignal);
  try {
    const databaseUrl = await ensureCluster(cluster);
    await recreateDatabase(cluster);
    s3 = await ensureS3({ name: `s3-bench-${BENCH_SLOT}`, port: 55120 + BENCH_SLOT, fresh: true });
    Object.assign(process.env, s3.env);
    await migrateAndSeed(databaseUrl, { seedWhenEmpty: false, forceSeed: true });
    await opts.beforeServe?.(databaseUrl);
    buildIfNeeded();
    fs.mkdirSync(".data", { recursive: true });
    let before: BenchStack["before"];
    if (opts.before) {
      const old: ClusterOptions = { ...cluster, database: `${cluster.database}_before` };
      await recreateDatabase(old);
      const oldUrl = databaseUrl.replace(/\/[^/]+$/, `/${old.database}`);
      migrateBefore(opts.before, oldUrl);
      await opts.beforeServe?.(oldUrl);
      buildBefore(opts.before);
      const oldPort = 3270 + BENCH_SLOT;
      await serveApp(
        opts.before,
        oldPort,
        { DATABASE_URL: oldUrl, NEXT_DIST_DIR: ".next-bench" },
        `${name}-before-server-${BENCH_SLOT}.log`,
        servers,
      );
      before = { url: `http://127.0.0.1:${oldPort}`, databaseUrl: oldUrl, dir: opts.before };
    }
    await serveApp(process.cwd(), port, { DATABASE_URL: databaseUrl }, `${name}-server-${BENCH_SLOT}.log`, servers);
    return { url, databaseUrl, before, stop };
  } catch (e) {
    await stop();
    throw e;
  }
}

/** Signs in and returns the session cookie ("name=value"). */
export async function signIn(url: string, email: string, password: string, address = "10.50.0.1"): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: url, "x-forwarded-for": address },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.get("set-cookie");
  if (!cookie) throw new Error("sign-in set no cookie");
  return cookie.split(";")[0]!;
}

export function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i]!;
}

export const ms = (v: number) => (Number.isFinite(v) ? `${v.toFixed(1)} ms` : "—");

/** Writes a benchmark's printed report to bench-results/<name>-<date>.md. */
export function saveReport(name: string, lines: readonly string[]): void {
  fs.mkdirSync("bench-results", { recursive: true });
  fs.writeFileSync(`bench-results/${name}-${new Date().toISOString().slice(0, 10)}.md`, `${lines.join("\n")}\n`);
}

/** Runs a benchmark's main and exits: 0 when it finished, 1 with the stack when it threw. */
export function runBench(main: () => Promise<void>): void {
  main().then(
    () => process.exit(0),
    (e) => {
      console.error(e instanceof Error ? e.stack : e);
      process.exit(1);
    },
  );
}
