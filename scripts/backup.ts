/**
 * Backups with Debian's pg_dump / pg_restore (custom format, -Fc).
 *
 *   npm run db:backup                          # DATABASE_URL, or the demo cluster → .data/backups/<db>-<time>.dump
 *   npm run db:backup -- --out /mnt/b/x.dump
 *   npm run db:restore -- --db blockyard_copy                 # the newest backup into a database of that name
 *   npm run db:restore -- .data/backups/x.dump --db blockyard --force   # over a non-empty one: only with --force
 *
 * The restore target lives on the same server as DATABASE_URL (or the demo cluster); it is created
 * when missing. A database that already has tables is refused unless --force, which drops and
 * re-creates it first.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import pg from "pg";
import { DEMO_CLUSTER, ensureCluster, ensureServerInstalled } from "./pg";

export const BACKUP_DIR = path.join(process.cwd(), ".data", "backups");

function tool(name: "pg_dump" | "pg_restore"): string {
  return path.join(ensureServerInstalled(), name);
}

function run(bin: string, args: string[]) {
  const r = spawnSync(bin, args, { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (r.status !== 0) throw new Error(`${path.basename(bin)} failed (${r.status}):\n${r.stderr || r.stdout}`);
  return r;
}

const stamp = () => new Date().toISOString().replace(/[-:]/g, "").replace(/\..+/, "").replace("T", "-");

/** Dumps the database at `url` to `file` (default .data/backups/<db>-<yyyymmdd-hhmmss>.dump). */
export function backupDatabase(url: string, file?: string): string {
  const db = new URL(url).pathname.slice(1) || "postgres";
  const out = file ?? path.join(BACKUP_DIR, `${db}-${stamp()}.dump`);
  fs.mkdirSync(path.dirname(out), { recursive: true });
  run(tool("pg_dump"), ["-Fc", "--no-owner", "--no-privileges", "-f", out, "-d", url]);
  return out;
}

export function withDatabase(url: string, database: string): string {
  const u = new URL(url);
  u.pathname = `/${database}`;
  return u.toString();
}

async function admin<T>(url: string, fn: (c: pg.Client) => Promise<T>): Promise<T> {
  const c = new pg.Client({ connectionString: withDatabase(url, "postgres") });
  await c.connect();
  try {
    return await fn(c);
  } finally {
    await c.end();
  }
}

/** Tables in the public schema (0 for a missing database). */
export async function tableCount(url: string): Promise<number> {
  const c = new pg.Client({ connectionString: url });
  try {
    await c.connect();
  } catch (e) {
    if ((e as { code?: string }).code === "3D000") return 0; // no such database
    throw e;
  }
  try {
    const r = await c.query(
      "SELECT count(*)::int AS n FROM pg_tables WHERE schemaname NOT IN ('pg_catalog', 'information_schema')",
    );
    return r.rows[0].n as number;
  } finally {
    await c.end();
  }
}

/**
 * Restores `file` into database `database` on the server of `serverUrl`. Refuses a database that
 * already has tables unless `force` (then it is dropped and re-created). Returns the target's URL.
 */
export async function restoreDatabase(
  file: string,
  serverUrl: string,
  database: string,
  opts: { force?: boolean } = {},
): Promise<string> {
  if (!fs.existsSync(file)) throw new Error(`no backup file ${file}`);
  if (!/^[A-Za-z0-9_-]{1,63}$/.test(database))
    throw new Error(`"${database}" is not a database name this tool will touch (letters, digits, _ and - only)`);
  const target = withDatabase(serverUrl, database);
  const tables = await tableCount(target);
  if (tables > 0 && !opts.force) {
    throw new Error(
      `database ${database} is not empty (${tables} tables). Restore into another name, or add --force to replace it.`,
    );
  }
  await admin(serverUrl, async (c) => {
    if (opts.force) await c.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`);
    const exists = await c.query("SELECT 1 FROM pg_database WHERE datname = $1", [database]);
    if (!exists.rowCount) await c.query(`CREATE DATABASE "${database}"`);
  });
  run(tool("pg_restore"), [
    "--no-owner",
    "--no-privileges",
    "--exit-on-error",
    "--single-transaction",
    "-d",
    target,
    file,
  ]);
  return target;
}

function newestBackup(): string {
  const files = fs.existsSync(BACKUP_DIR)
    ? fs
        .readdirSync(BACKUP_DIR)
        .filter((f) => f.endsWith(".dump"))
        .sort()
    : [];
  if (!files.length) throw new Error(`no backups in ${BACKUP_DIR}; run npm run db:backup first`);
  return path.join(BACKUP_DIR, files.at(-1)!);
}

async function serverUrl(): Promise<string> {
  return process.env.DATABASE_URL ?? (await ensureCluster(DEMO_CLUSTER));
}

async function main() {
  const [cmd, ...rest] = process.argv.slice(2);
  const flag = (name: string) => {
    const i = rest.indexOf(`--${name}`);
    return i >= 0 ? rest[i + 1] : undefined;
  };
  if (cmd === "backup") {
    const t = Date.now();
    const file = backupDatabase(await serverUrl(), flag("out"));
    console.log(
      `[backup] ${file} (${(fs.statSync(file).size / 1024).toFixed(0)} KB, ${((Date.now() - t) / 1000).toFixed(1)} s)`,
    );
  } else if (cmd === "restore") {
    const file = rest.find((a, i) => !a.startsWith("--") && !(i > 0 && rest[i - 1] === "--db")) ?? newestBackup();
    const url = await serverUrl();
    const database = flag("db") ?? new URL(url).pathname.slice(1);
    const target = await restoreDatabase(file, url, database, { force: rest.includes("--force") });
    console.log(`[restore] ${file} → ${target.replace(/\/\/[^@]*@/, "//")}`);
  } else {
    console.error("use: backup [--out FILE] | restore [FILE] [--db NAME] [--force]");
    process.exit(2);
  }
}

if (process.argv[1] && /scripts[\\/]backup\.ts$/.test(process.argv[1])) {
  main().then(
    () => process.exit(0),
    (e) => {
      console.error(`[backup] ${e instanceof Error ? e.message : e}`);
      process.exit(1);
    },
  );
}
