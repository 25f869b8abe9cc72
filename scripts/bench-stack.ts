/**
 * A private stack for the benchmark scripts, built from the same pieces as `npm test`: a throwaway
 * Postgres cluster, the S3 fake, the demo seed, the built app on 127.0.0.1 (scripts/serve.mjs, as
 * `npm start` runs it; WEB_WORKERS sets its process count) — and a stop() that
 * takes all of it down again. TEST_SLOT (default 5) keeps its folders and ports apart from other
 * runs: cluster .data/pg-bench-<slot> on 55020+slot, app on 3220+slot, S3 fake on 55120+slot.
 *
 *   const stack = await startBenchStack("bench-stock");
 *   try { …fetch(`${stack.url}/api/blocks`)… } finally { await stack.stop(); }
 */
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import { ensureCluster, recreateDatabase, stopCluster, type ClusterOptions } from "./pg";
import { migrateAndSeed } from "./db";
import { buildIfNeeded } from "./build-if-needed";
import { ensureS3 } from "./s3";

export const BENCH_SLOT = Number(process.env.TEST_SLOT ?? 5);

export interface BenchStack {
  url: string;
  databaseUrl: string;
  stop(): Promise<void>;
}

export async function startBenchStack(
  name: string,
  opts: { beforeServe?: (databaseUrl: string) => Promise<void> } = {},
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
  let server: ChildProcess | undefined;
  let s3: Awaited<ReturnType<typeof ensureS3>> | undefined;
  let stopped = false;
  const stop = async () => {
    if (stopped) return;
    stopped = true;
    if (server?.pid && server.exitCode === null) {
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
    const log = fs.openSync(`.data/${name}-server-${BENCH_SLOT}.log`, "w");
    // The app as `npm start` serves it: scripts/serve.mjs, one process per core (WEB_WORKERS).
    server = spawn(process.execPath, ["scripts/serve.mjs", "--port", String(port), "--hostname", "127.0.0.1"], {
      env: {
        ...process.env,
        DATABASE_URL: databaseUrl,
        APP_URL: url,
        TRUST_PROXY: "true",
        NEXT_TELEMETRY_DISABLED: "1",
      },
      detached: true,
      stdio: ["ignore", log, log],
    });
    const deadline = Date.now() + 90_000;
    for (;;) {
      if (server.exitCode !== null)
        throw new Error(`the app exited during start-up; see .data/${name}-server-${BENCH_SLOT}.log`);
      try {
        if ((await fetch(`${url}/api/health`)).ok) break;
      } catch {
        /* not up yet */
      }
      if (Date.now() > deadline) throw new Error("the app did not answer /api/health within 90 s");
      await new Promise((r) => setTimeout(r, 250));
    }
    return { url, databaseUrl, stop };
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
