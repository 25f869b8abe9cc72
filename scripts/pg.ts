/**
 * A private PostgreSQL cluster for Blockyard, from Debian's packages, listening on 127.0.0.1 only
 * (BLOCKYARD_PG_HOST may name another loopback address, never one other machines can reach: it has
 * no password; see scripts/loopback.ts).
 *
 *   ensureCluster({ name: "demo", port: 54320 })  → "postgres://postgres@127.0.0.1:54320/blockyard"
 *
 * Idempotent: creates the cluster under .data/<name> on first use, starts it when stopped, creates
 * the database when missing. Runs the server as the `postgres` system user when we are root
 * (initdb and postgres refuse to run as root). When DATABASE_URL is already set, nothing is started.
 */
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import crypto from "node:crypto";
import pg from "pg";
import { loopbackHost, urlHost } from "./loopback";

export interface ClusterOptions {
  name: string; // folder under .data/
  port: number;
  database: string;
  fast?: boolean; // fsync off: for throwaway test clusters only
}

const isRoot = process.getuid?.() === 0;

/** Where the private cluster listens: loopback only (throws `NotLoopback` otherwise). */
export function clusterHost(): string {
  return loopbackHost("BLOCKYARD_PG_HOST", process.env.BLOCKYARD_PG_HOST);
}

function log(msg: string) {
  process.stderr.write(`[postgres] ${msg}\n`);
}

export function findBinDir(): string | undefined {
  const base = "/usr/lib/postgresql";
  if (!fs.existsSync(base)) return undefined;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, "bin", "postgres")))
    .sort((a, b) => Number(b) - Number(a));
  return versions[0] ? path.join(base, versions[0], "bin") : undefined;
}

export function ensureServerInstalled(): string {
  let bin = findBinDir();
  if (bin) return bin;
  if (!isRoot) {
    log("PostgreSQL server binaries are missing. Install them with:");
    log("  sudo apt-get install -y postgresql");
    process.exit(1);
  }
  log("installing postgresql with apt-get (first run only)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit", env });
  execFileSync("apt-get", ["install", "-y", "-qq", "postgresql"], { stdio: "inherit", env });
  bin = findBinDir();
  if (!bin) throw new Error("postgresql installed but no server binary found under /usr/lib/postgresql");
  return bin;
}

/** Runs a server binary as the postgres user when we are root, from / (it cannot enter root-only folders). */
function runPg(bin: string, args: string[], opts: { allowFail?: boolean } = {}) {
  const cmd = isRoot ? "runuser" : bin;
  const full = isRoot ? ["-u", "postgres", "--", bin, ...args] : args;
  const r = spawnSync(cmd, full, { cwd: "/", encoding: "utf8" });
  if (r.status !== 0 && !opts.allowFail) {
    throw new Error(`${path.basename(bin)} ${args.join(" ")} failed:\n${r.stdout}\n${r.stderr}`);
  }
  return r;
}

/** Can the postgres user reach this folder? (A clone under /root is not traversable by it.) */
function traversableByPostgres(dir: string): boolean {
  if (!isRoot) return true;
  return spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", dir], { cwd: "/" }).status === 0;
}

export function dataDirFor(name: string): string {
  const repo = process.cwd();
  const local = path.join(repo, ".data");
  fs.mkdirSync(local, { recursive: true });
  if (traversableByPostgres(local)) return path.join(local, name);
  // Fall back to a folder the postgres user can reach, keyed by this checkout's path.
  const key = crypto.createHash("sha1").update(repo).digest("hex").slice(0, 10);
  const dir = path.join("/var/tmp", `blockyard-${key}`);
  fs.mkdirSync(dir, { recursive: true, mode: 0o755 });
  return path.join(dir, name);
}

export function clusterStatus(opts: ClusterOptions): "running" | "stopped" | "absent" {
  const bin = findBinDir();
  const dir = dataDirFor(opts.name);
  if (!bin || !fs.existsSync(path.join(dir, "PG_VERSION"))) return "absent";
  const r = runPg(path.join(bin, "pg_ctl"), ["-D", dir, "status"], { allowFail: true });
  return r.status === 0 ? "running" : "stopped";
}

export async function ensureCluster(opts: ClusterOptions): Promise<string> {
  if (process.env.DATABASE_URL) {
    log("DATABASE_URL is set: using that server, starting nothing");
    return process.env.DATABASE_URL;
  }
  const host = clusterHost(); // before anything is installed or started
  const bin = ensureServerInstalled();
  const dir = dataDirFor(opts.name);
  if (!fs.existsSync(path.join(dir, "PG_VERSION"))) {
    log(`creating cluster in ${dir}`);
    fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
    if (isRoot) execFileSync("chown", ["postgres:", dir]);
    runPg(path.join(bin, "initdb"), [
      "-D",
      dir,
      "--auth=trust",
      "--username=postgres",
      "--encoding=UTF8",
      "--locale=C",
    ]);
  }
  if (clusterStatus(opts) !== "running") {
    const serverOpts = [
      `-c listen_addresses=${host}`,
      `-c port=${opts.port}`,
      "-c unix_socket_directories=''",
      "-c max_connections=200",
      ...(opts.fast ? ["-c fsync=off", "-c synchronous_commit=off", "-c full_page_writes=off"] : []),
    ].join(" ");
    log(`starting on ${urlHost(host)}:${opts.port}`);
    runPg(path.join(bin, "pg_ctl"), [
      "-D",
      dir,
      "-l",
      path.join(dir, "server.log"),
      "-o",
      serverOpts,
      "-w",
      "-t",
      "60",
      "start",
    ]);
  }
  const admin = new pg.Client({ host, port: opts.port, user: "postgres", database: "postgres" });
  await admin.connect();
  try {
    const exists = await admin.query("SELECT 1 FROM pg_database WHERE datname = $1", [opts.database]);
    if (exists.rowCount === 0) {
      await admin.query(`CREATE DATABASE "${opts.database.replace(/"/g, "")}"`);
      log(`created database ${opts.database}`);
    }
  } finally {
    await admin.end();
  }
  return `postgres://postgres@${urlHost(host)}:${opts.port}/${opts.database}`;
}

/** Drops and re-creates a database in a running cluster (tests start from nothing). */
export async function recreateDatabase(opts: ClusterOptions): Promise<void> {
  const admin = new pg.Client({ host: clusterHost(), port: opts.port, user: "postgres", database: "postgres" });
  await admin.connect();
  try {
    const name = opts.database.replace(/"/g, "");
    await admin.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
    await admin.query(`CREATE DATABASE "${name}"`);
  } finally {
    await admin.end();
  }
}

export function stopCluster(opts: ClusterOptions): void {
  const bin = findBinDir();
  if (!bin || clusterStatus(opts) !== "running") return;
  runPg(path.join(bin, "pg_ctl"), ["-D", dataDirFor(opts.name), "-m", "fast", "-w", "stop"]);
  log(`stopped ${opts.name}`);
}

export const DEMO_CLUSTER: ClusterOptions = {
  name: "pg",
  port: Number(process.env.BLOCKYARD_PG_PORT ?? 54320),
  database: "blockyard",
};

/** TEST_SLOT=n gives a test run its own cluster, bucket and port, so runs side by side do not collide. */
export const TEST_SLOT = Number(process.env.TEST_SLOT ?? 0);

export const TEST_CLUSTER: ClusterOptions = {
  name: TEST_SLOT ? `pg-test-${TEST_SLOT}` : "pg-test",
  port: Number(process.env.BLOCKYARD_TEST_PG_PORT ?? (TEST_SLOT ? 55000 + TEST_SLOT : 54329)),
  database: "blockyard_test",
  fast: true,
};
