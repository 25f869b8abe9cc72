/**
 * How many Postgres connections one process keeps (its Knex pool's `max`).
 *
 * - **App process** (`scripts/serve.mjs` runs one per core): 10. A page reads several things at
 *   once (the block page five, with Promise.all) and a process has tens of requests in flight at
 *   saturation, so a pool much under twice a page's parallel reads makes requests wait for a
 *   connection while the cores idle: with 5, `npm run bench:load` served the block page at 16–25
 *   requests/s against 26–34 for the old code in the same run; with 10, 13–36 against 17–33 (a
 *   shared, loaded 2-core machine). More than that only queues inside Postgres, which on 2 cores
 *   runs two statements at a time anyway. With one process per core: 20 here, within Postgres's
 *   default `max_connections` of 100 with workers and pg-boss; on a machine of more than about 6
 *   cores lower `DB_POOL_MAX` or raise `max_connections` (README, "Connection pool").
 * - **Nesting worker** (`npm run worker`): 2. It does one run at a time (its progress, heartbeat
 *   and plan writes, none in a transaction) and sweeps stale runs; pg-boss keeps its own 4 beside
 *   it (lib/jobs/boss.ts). It used to open up to 10 like an app process.
 *
 * `DB_POOL_MAX` overrides the app's size and `WORKER_DB_POOL_MAX` the worker's (a whole number
 * from 1 to 100; anything else is refused when the pool opens, naming the variable).
 *
 *   poolMax("app", {})                              // 10
 *   poolMax("worker", { WORKER_DB_POOL_MAX: "3" })  // 3
 */
export function poolMax(role: "app" | "worker", env: Record<string, string | undefined>): number {
  const name = role === "worker" ? "WORKER_DB_POOL_MAX" : "DB_POOL_MAX";
  const raw = env[name];
  if (raw === undefined || raw === "") return role === "worker" ? 2 : 10;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 100)
    throw new Error(`${name} must be a whole number from 1 to 100 (got "${raw}").`);
  return n;
}
