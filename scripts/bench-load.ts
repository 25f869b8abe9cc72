/**
 * `npm run bench:load`: autocannon against the built app on loopback, 50 signed-in users at once
 * (one session each, one per connection) on the stock list (API and page), a block page and a plan
 * view. Prints p50/p95/p99 and error counts per scenario. Target: p95 under 150 ms, 0 errors.
 * Starts its own cluster, S3 fake and app (TEST_SLOT, default 5), stops them when done; each
 * scenario runs for a fixed time (default 20 s).
 *
 *   npm run bench:load
 *   npm run bench:load -- --duration 10 --connections 50
 */
import fs from "node:fs";
import os from "node:os";
import autocannon from "autocannon";
import { BENCH_SLOT, ms, percentile, signIn, startBenchStack } from "./bench-stack";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const DURATION = arg("duration", 20);
const CONNECTIONS = arg("connections", 50);
const USERS = arg("users", 50);

interface Fixtures {
  emails: string[];
  password: string;
  blockCode: string;
  runId: number;
}

/** 50 planners and a finished plan, straight into the bench database (the test fixtures' helpers). */
async function arrange(databaseUrl: string): Promise<Fixtures> {
  process.env.DATABASE_URL = databaseUrl; // the fixtures' knex reads it
  const { makeUser, TEST_PASSWORD, testDb, closeTestDb } = await import("../tests/support/db");
  const { makePlannedBlock } = await import("../tests/support/planning-fixtures");
  try {
    const emails: string[] = [];
    for (let i = 0; i < USERS; i++) emails.push((await makeUser(["planner"])).email);
    const existing = await testDb()("nesting_runs").whereNotNull("plan").orderBy("id").first("id");
    const runId = (existing?.id as number | undefined) ?? (await makePlannedBlock()).runId;
    const block = await testDb()("blocks").where({ status: "in_stock" }).orderBy("id").first("code");
    return { emails, password: TEST_PASSWORD, blockCode: block.code as string, runId };
  } finally {
    await closeTestDb();
    delete process.env.DATABASE_URL;
  }
}

interface Figures {
  name: string;
  /** One user, one request at a time: the service time the 50 connections queue behind. */
  alone: number;
  path: string;
  requests: number;
  rps: number;
  p50: number;
  p95: number;
  p99: number;
  non2xx: number;
  errors: number;
  timeouts: number;
}

async function alone(url: string, cookie: string): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < 25; i++) {
    const t = performance.now();
    await fetch(url, { headers: { cookie } }).then((r) => r.arrayBuffer());
    times.push(performance.now() - t);
  }
  return percentile(times.sort((a, b) => a - b), 50);
}

async function scenario(url: string, name: string, path: string, cookies: string[]): Promise<Figures> {
  const single = await alone(`${url}${path}`, cookies[0]!);
  const times: number[] = [];
  let next = 0;
  const instance = autocannon({
    url: `${url}${path}`,
    connections: CONNECTIONS,
    duration: DURATION,
    timeout: 10,
    // One signed-in user per connection, rotating through the 50 sessions.
    setupClient: (client: autocannon.Client) => client.setHeaders({ cookie: cookies[next++ % cookies.length]!, "x-forwarded-for": `10.60.0.${next % 250}` }),
  });
  instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTime: number) => times.push(responseTime));
  const result = await instance;
  times.sort((a, b) => a - b);
  return {
    name,
    alone: single,
    path,
    requests: result.requests.total,
    rps: result.requests.average,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    non2xx: result.non2xx,
    errors: result.errors,
    timeouts: result.timeouts,
  };
}

async function main() {
  let fixtures: Fixtures | undefined;
  const stack = await startBenchStack("bench-load", {
    beforeServe: async (databaseUrl) => {
      fixtures = await arrange(databaseUrl);
    },
  });
  try {
    const f = fixtures!;
    const t = performance.now();
    const cookies: string[] = [];
    for (const [i, email] of f.emails.entries()) cookies.push(await signIn(stack.url, email, f.password, `10.61.${Math.floor(i / 200)}.${i % 200}`));
    process.stderr.write(`[bench] ${cookies.length} users signed in in ${((performance.now() - t) / 1000).toFixed(1)} s\n`);
    const scenarios: [string, string][] = [
      ["stock list API", "/api/blocks?status=available&sort=received"],
      ["stock list page", "/stock"],
      ["block page", `/stock/${encodeURIComponent(f.blockCode)}`],
      ["plan view", `/plans/${f.runId}`],
    ];
    const rows: Figures[] = [];
    const load = os.loadavg().map((l) => l.toFixed(1)).join(" ");
    for (const [name, path] of scenarios) {
      // A short warm-up so the first compile of each route is not counted.
      for (let i = 0; i < 3; i++) await fetch(`${stack.url}${path}`, { headers: { cookie: cookies[0]! } }).then((r) => r.arrayBuffer());
      rows.push(await scenario(stack.url, name, path, cookies));
      process.stderr.write(`[bench] ${name} done\n`);
    }
    const lines = [
      `bench:load — ${new Date().toISOString()} — ${CONNECTIONS} connections, ${cookies.length} signed-in users, ${DURATION} s per scenario, slot ${BENCH_SLOT}, ${os.cpus().length} cores, load average before ${load}, after ${os.loadavg().map((l) => l.toFixed(1)).join(" ")}`,
      "",
      "| scenario | path | alone p50 | requests | req/s | p50 | p95 | p99 | non-2xx | errors | timeouts |",
      "| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |",
      ...rows.map((r) => `| ${r.name} | \`${r.path}\` | ${ms(r.alone)} | ${r.requests} | ${r.rps.toFixed(0)} | ${ms(r.p50)} | ${ms(r.p95)} | ${ms(r.p99)} | ${r.non2xx} | ${r.errors} | ${r.timeouts} |`),
      "",
      "alone p50: one user, one request at a time. With 50 connections and no think time, latency ≈ 50 / (requests per second).",
      "",
      `target: p95 < 150 ms and 0 errors — ${rows.every((r) => r.p95 < 150 && r.non2xx + r.errors + r.timeouts === 0) ? "met" : "NOT met"}`,
    ];
    console.log(lines.join("\n"));
    fs.mkdirSync("bench-results", { recursive: true });
    fs.writeFileSync(`bench-results/load-${new Date().toISOString().slice(0, 10)}.md`, lines.join("\n") + "\n");
  } finally {
    await stack.stop();
  }
}

main().then(
  () => process.exit(0),
  (e) => {
    console.error(e instanceof Error ? e.stack : e);
    process.exit(1);
  },
);
