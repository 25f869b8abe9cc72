import { type ChildProcess, spawn } from "node:child_process";
import fs from "node:fs";

/** Background processes a test starts itself (workers, app servers): killed with their group. */
export function killGroup(child: ChildProcess | undefined, signal: NodeJS.Signals = "SIGKILL") {
  if (child?.pid && child.exitCode === null && child.signalCode === null) {
    try {
      process.kill(-child.pid, signal);
    } catch {
      /* gone */
    }
  }
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Polls `probe` until it gives something truthy, or fails naming `what` after `ms`. */
export async function until<T>(
  what: string,
  probe: () => Promise<T | undefined | false>,
  ms = 60_000,
  every = 200,
): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await probe().catch(() => undefined);
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await sleep(every);
  }
}

/**
 * The shared test worker (started by `npm test`, its process group in TEST_WORKER_PGID) competes
 * for runs: a test that needs runs to go to its own workers pauses it, and resumes it after.
 * False when there is none to pause (tests run against an outside server).
 */
export function pauseSharedWorker(paused: boolean): boolean {
  const group = Number(process.env.TEST_WORKER_PGID) || undefined;
  if (!group) return false;
  try {
    process.kill(-group, paused ? "SIGSTOP" : "SIGCONT");
    return true;
  } catch {
    return false;
  }
}

/** Starts `npm run worker` with `env` added, logging to `log`, and waits for its "ready" line. */
export async function startWorker(
  log: string,
  env: Record<string, string>,
  children: Set<ChildProcess>,
): Promise<ChildProcess> {
  const from = fs.existsSync(log) ? fs.statSync(log).size : 0;
  const fd = fs.openSync(log, "a");
  const child = spawn("npm", ["run", "--silent", "worker"], {
    env: { ...process.env, ...env },
    detached: true,
    stdio: ["ignore", fd, fd],
  });
  children.add(child);
  const state = await until(
    "the worker to be ready",
    async () => {
      if (child.exitCode !== null) return "exited";
      return fs.readFileSync(log, "utf8").slice(from).includes("[worker] ready") && "ready";
    },
    120_000,
    100,
  );
  if (state === "exited") throw new Error(`the worker exited (${child.exitCode}); see ${log}`);
  return child;
}
