/**
 * `npm run bench:load`: autocannon against the built app on loopback (scripts/serve.mjs, as `npm
 * start` serves it), 50 signed-in users (one session each, one connection each) on the stock list
 * (API and page), a block page, a plan view and the shop frame floor (an unknown block code: the
 * signed-in layout with a one-line page, what every shop page costs at least). Two load models per scenario:
 *
 * - **50 users, ~1 s think time** (the target is judged here): each user sends a request, waits for
 *   the answer and sends the next one a second after the last began (autocannon `connectionRate:
 *   1` per connection; users start spread over the first second, so they do not fire in step).
 * - **saturation, 50 connections, no think time**: every connection sends its next request the
 *   moment an answer arrives. Its requests/s is the capacity; its latency is a queue by
 *   construction (Little's law: mean latency = 50 / throughput), never below 50 / (req/s).
 *
 * Prints p50/p95/p99 and error counts for both. Target: p95 under 150 ms and 0 errors with 50
 * users thinking ~1 s. Starts its own cluster, S3 fake and app (TEST_SLOT, default 5) and stops
 * them when done; each run lasts a fixed time (default 20 s) after a short warm-up.
 *
 * With `--before DIR` (a checkout of an older commit, see scripts/bench-stack.ts) both are served
 * and each scenario's saturation run is repeated `--rounds` times (default 3), old and new
 * alternately (the order swapped every round), so both sides meet the same load from the rest of
 * the machine; the report gives each side's median req/s with the load average beside each run.
 *
 *   npm run bench:load
 *   npm run bench:load -- --duration 10 --connections 50
 *   npm run bench:load -- --before /tmp/before --only "stock list API,block page" --duration 10
 *   WEB_WORKERS=1 npm run bench:load    # one app process, like `next start`
 */
import os from "node:os";
import autocannon from "autocannon";
import { BENCH_SLOT, beforeDirArg, ms, percentile, runBench, saveReport, signIn, startBenchStack } from "./bench-stack";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const DURATION = arg("duration", 20);
const CONNECTIONS = arg("connections", 50);
const USERS = arg("users", 50);
const RATE = arg("rate", 1); // requests per second per user in the think-time model
const BEFORE = beforeDirArg();
const ROUNDS = arg("rounds", BEFORE ? 3 : 1);
const ONLY = (() => {
  const i = process.argv.indexOf("--only");
  return i > 0 ? new Set(process.argv[i + 1]!.split(",").map((s) => s.trim())) : null;
})();
const loadavg = () =>
  os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join(" ");

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
    const runId = existing?.id ?? (await makePlannedBlock()).runId;
    const block = await testDb()("blocks").where({ status: "in_stock" }).orderBy("id").first("code");
    if (!block) throw new Error("The bench needs a block in stock.");
    return { emails, password: TEST_PASSWORD, blockCode: block.code, runId };
  } finally {
    await closeTestDb();
    delete process.env.DATABASE_URL;
  }
}

interface Run {
  requests: number;
  rps: number;
  p50: number;
  p95: number;
  p99: number;
  non2xx: number;
  errors: number;
  timeouts: number;
}

interface Figures {
  name: string;
  path: string;
  /** One user, one request at a time: the service time everything else queues behind. */
  alone: number;
  users: Run;
  saturation: Run;
}

async function alone(url: string, cookie: string): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < 25; i++) {
    const t = performance.now();
    await fetch(url, { headers: { cookie } }).then((r) => r.arrayBuffer());
    times.push(performance.now() - t);
  }
  return percentile(
    times.sort((a, b) => a - b),
    50,
  );
}

const client = (i: number) => `10.60.0.${i % 250}`;

function summarise(
  times: number[],
  seconds: number,
  counts: { non2xx: number; errors: number; timeouts: number },
): Run {
  times.sort((a, b) => a - b);
  return {
    requests: times.length,
    rps: times.length / seconds,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    ...counts,
  };
}

/** No think time: CONNECTIONS connections, each sending its next request as soon as one returns. */
async function saturation(url: string, cookies: string[], duration = DURATION): Promise<Run> {
  const times: number[] = [];
  let next = 0;
  const instance = autocannon({
    url,
    connections: CONNECTIONS,
    duration,
    timeout: 10,
    // One signed-in user per connection, rotating through the sessions.
    setupClient: (c: autocannon.Client) => {
      const i = next++;
      c.setHeaders({ cookie: cookies[i % cookies.length]!, "x-forwarded-for": client(i) });
    },
  });
  instance.on("response", (_c: unknown, _status: number, _bytes: number, responseTime: number) =>
    times.push(responseTime),
  );
  const r = await instance;
  return summarise(times, duration, { non2xx: r.non2xx, errors: r.errors, timeouts: r.timeouts });
}

/**
 * Think time: each user on a connection of its own, at most RATE requests a second
 * (autocannon `connectionRate`), the users' starts spread evenly over the first second.
 */
async function withThinkTime(url: string, cookies: string[]): Promise<Run> {
  const times: number[] = [];
  const counts = { non2xx: 0, errors: 0, timeouts: 0 };
  const started = performance.now();
  await Promise.all(
    cookies.map(
      (cookie, i) =>
        new Promise<void>((resolve, reject) => {
          setTimeout(
            () => {
              const instance = autocannon({
                url,
                connections: 1,
                connectionRate: RATE,
                duration: DURATION,
                timeout: 10,
                headers: { cookie, "x-forwarded-for": client(i) },
              });
              instance.on("response", (_c: unknown, _status: number, _bytes: number, responseTime: number) =>
                times.push(responseTime),
              );
              instance.then((r) => {
                counts.non2xx += r.non2xx;
                counts.errors += r.errors;
                counts.timeouts += r.timeouts;
                resolve();
              }, reject);
            },
            (i * 1000) / cookies.length,
          );
        }),
    ),
  );
  return summarise(times, (performance.now() - started) / 1000, counts);
}

/** One side of the comparison: an app, its users' cookies and its fixtures. */
interface Side {
  label: "before" | "after";
  url: string;
  cookies: string[];
  fixtures: Fixtures;
}

async function signInAll(url: string, f: Fixtures): Promise<string[]> {
  const t = performance.now();
  const cookies: string[] = [];
  for (const [i, email] of f.emails.entries())
    cookies.push(await signIn(url, email, f.password, `10.61.${Math.floor(i / 200)}.${i % 200}`));
  process.stderr.write(
    `[bench] ${cookies.length} users signed in in ${((performance.now() - t) / 1000).toFixed(1)} s\n`,
  );
  return cookies;
}

const scenarioPaths = (f: Fixtures): [string, string][] =>
  (
    [
      ["stock list API", "/api/blocks?status=available&sort=received"],
      ["stock list page", "/stock"],
      ["block page", `/stock/${encodeURIComponent(f.blockCode)}`],
      // The floor under any shop page: session, shop settings, the layout and its menu, one lookup by
      // code and the short "no block with that code" message in the frame (answered 200: the stock
      // segment's loading boundary has already sent the frame).
      ["shop frame floor", "/stock/NO-SUCH-BLOCK"],
      ["plan view", `/plans/${f.runId}`],
    ] as [string, string][]
  ).filter(([name]) => !ONLY || ONLY.has(name));

async function warm(url: string, cookies: string[]) {
  // Not counted: the first compile of each route, and enough requests for every app process's JIT
  // to settle (a server that has been running a while).
  for (let i = 0; i < 3; i++) await fetch(url, { headers: { cookie: cookies[0]! } }).then((r) => r.arrayBuffer());
  await saturation(url, cookies.slice(0, 10), 3);
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)]!;

async function main() {
  const fixtures = new Map<string, Fixtures>();
  const stack = await startBenchStack("bench-load", {
    before: BEFORE,
    beforeServe: async (databaseUrl) => {
      fixtures.set(databaseUrl, await arrange(databaseUrl));
    },
  });
  try {
    const sides: Side[] = [];
    if (stack.before) {
      const f = fixtures.get(stack.before.databaseUrl)!;
      sides.push({
        label: "before",
        url: stack.before.url,
        cookies: await signInAll(stack.before.url, f),
        fixtures: f,
      });
    }
    const f = fixtures.get(stack.databaseUrl)!;
    sides.push({ label: "after", url: stack.url, cookies: await signInAll(stack.url, f), fixtures: f });
    const after = sides.at(-1)!;
    const load = loadavg();
    const rows: Figures[] = [];
    /** Saturation rounds per scenario and side: req/s, errors and the 1-minute load average at its end. */
    const rounds: { name: string; side: Side["label"]; run: Run; load: string }[] = [];
    for (const [i, [name]] of scenarioPaths(after.fixtures).entries()) {
      const paths = new Map(sides.map((s) => [s.label, `${s.url}${scenarioPaths(s.fixtures)[i]![1]}`]));
      for (const s of sides) await warm(paths.get(s.label)!, s.cookies);
      const url = paths.get("after")!;
      const single = await alone(url, after.cookies[0]!);
      const users = await withThinkTime(url, after.cookies);
      let sat: Run | undefined;
      for (let r = 0; r < ROUNDS; r++) {
        // Old and new alternately, the order swapped every round.
        for (const s of r % 2 ? [...sides].reverse() : sides) {
          const run = await saturation(paths.get(s.label)!, s.cookies);
          rounds.push({ name, side: s.label, run, load: loadavg() });
          if (s.label === "after") sat = run;
        }
      }
      rows.push({ name, path: new URL(url).pathname + new URL(url).search, alone: single, users, saturation: sat! });
      process.stderr.write(`[bench] ${name} done\n`);
    }
    const ok = (r: Run) => r.non2xx + r.errors + r.timeouts === 0;
    const met = rows.every((r) => r.users.p95 < 150 && ok(r.users));
    const int = (n: number) => Math.round(n).toLocaleString("en");
    const workers = process.env.WEB_WORKERS ?? String(os.availableParallelism());
    const lines = [
      `bench:load — ${new Date().toISOString()} — ${after.cookies.length} signed-in users, ${DURATION} s per run, app processes ${workers}, slot ${BENCH_SLOT}, ${os.cpus().length} cores, load average before ${load}, after ${loadavg()}`,
      "",
      `Target model — ${after.cookies.length} users, each one request at a time with ~${(1 / RATE).toFixed(1)} s think time (${RATE} request/s per user, autocannon connectionRate):`,
      "",
      "| scenario | path | alone p50 | requests | req/s | p50 | p95 | p99 | non-2xx | errors | timeouts |",
      "| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |",
      ...rows.map(
        (r) =>
          `| ${r.name} | \`${r.path}\` | ${ms(r.alone)} | ${int(r.users.requests)} | ${r.users.rps.toFixed(0)} | ${ms(r.users.p50)} | ${ms(r.users.p95)} | ${ms(r.users.p99)} | ${r.users.non2xx} | ${r.users.errors} | ${r.users.timeouts} |`,
      ),
      "",
      `Saturation — ${CONNECTIONS} connections, no think time (capacity: requests/s; latency is queueing, Little's law floor = ${CONNECTIONS} / req/s):`,
      "",
      "| scenario | requests | req/s (capacity) | Little's-law floor | p50 | p95 | p99 | non-2xx | errors | timeouts |",
      "| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |",
      ...rows.map(
        (r) =>
          `| ${r.name} | ${int(r.saturation.requests)} | ${r.saturation.rps.toFixed(0)} | ${ms((CONNECTIONS / r.saturation.rps) * 1000)} | ${ms(r.saturation.p50)} | ${ms(r.saturation.p95)} | ${ms(r.saturation.p99)} | ${r.saturation.non2xx} | ${r.saturation.errors} | ${r.saturation.timeouts} |`,
      ),
      "",
      "alone p50: one user, one request at a time. With no think time every connection always has a request queued, so",
      `latency ≈ ${CONNECTIONS} / throughput: a p95 under 150 ms there would need more than ${int(CONNECTIONS / 0.15)} requests/s.`,
      "",
      `target (judged on the ${after.cookies.length}-users-with-think-time model): p95 < 150 ms and 0 errors — ${met ? "met" : "NOT met"}; saturation errors: ${rows.every((r) => ok(r.saturation)) ? "none" : "SOME"}`,
    ];
    if (stack.before) {
      lines.push(
        "",
        `Before (${stack.before.dir}) and after (this tree), saturation rounds alternated in one run (${ROUNDS} rounds × ${DURATION} s per side; errors = non-2xx + errors + timeouts; load = 1-minute load average at the end of the run):`,
        "",
        "| scenario | round | side | req/s | p50 | errors | load |",
        "| --- | --- | --- | --- | --- | --- | --- |",
        ...rounds.map(
          (r, i) =>
            `| ${r.name} | ${Math.floor((i % (2 * ROUNDS)) / 2) + 1} | ${r.side} | ${r.run.rps.toFixed(0)} | ${ms(r.run.p50)} | ${r.run.non2xx + r.run.errors + r.run.timeouts} | ${r.load} |`,
        ),
        "",
        "| scenario | before req/s (median) | after req/s (median) | after / before | errors before, after |",
        "| --- | --- | --- | --- | --- |",
        ...rows.map((row) => {
          const of = (side: Side["label"]) => rounds.filter((r) => r.name === row.name && r.side === side);
          const b = median(of("before").map((r) => r.run.rps));
          const a = median(of("after").map((r) => r.run.rps));
          const errs = (side: Side["label"]) =>
            of(side).reduce((n, r) => n + r.run.non2xx + r.run.errors + r.run.timeouts, 0);
          return `| ${row.name} | ${b.toFixed(0)} | ${a.toFixed(0)} | ${(a / b).toFixed(2)} × | ${errs("before")}, ${errs("after")} |`;
        }),
        "",
        "Target: after / before ≥ 1.5 on the stock API and the block page, 0 errors. Absolute figures are from a shared, loaded 2-core machine.",
      );
    }
    console.log(lines.join("\n"));
    saveReport(stack.before ? "load-before-after" : "load", lines);
  } finally {
    await stack.stop();
  }
}

runBench(main);
