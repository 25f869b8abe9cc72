/**
 * Builds the app when .next is missing or older than any source file (so `npm start` after a
 * `git pull` serves the new code, and a second start does not rebuild for nothing).
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const SOURCES = [
  "app",
  "components",
  "lib",
  "db",
  "public",
  "proxy.ts",
  "instrumentation.ts",
  "next.config.mjs",
  "tailwind.config.ts",
  "postcss.config.mjs",
  "package-lock.json",
  "tsconfig.json",
];

function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0;
  const st = fs.statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

export function buildIfNeeded(): void {
  const stamp = path.join(process.env.NEXT_DIST_DIR || ".next", "BUILD_ID");
  const built = fs.existsSync(stamp) ? fs.statSync(stamp).mtimeMs : 0;
  const newest = Math.max(...SOURCES.map(newestMtime));
  if (built && built >= newest) {
    process.stderr.write("[build] the build is up to date\n");
    return;
  }
  process.stderr.write("[build] building the app (next build)…\n");
  // A side-by-side build (its own dist folder) writes its type paths into a tsconfig of its own,
  // never into the checked-in tsconfig.json.
  const dist = process.env.NEXT_DIST_DIR || ".next";
  const env: NodeJS.ProcessEnv = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };
  if (dist !== ".next") {
    env.NEXT_TSCONFIG = `${dist}.tsconfig.json`;
    fs.writeFileSync(env.NEXT_TSCONFIG, `${JSON.stringify({ extends: "./tsconfig.json" }, null, 2)}\n`);
  }
  const r = spawnSync("npx", ["next", "build"], { stdio: "inherit", env });
  if (r.status !== 0) {
    process.stderr.write("[build] next build failed\n");
    process.exit(r.status ?? 1);
  }
}
