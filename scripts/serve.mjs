/**
 * Serves the built app with one Node process per core: node:cluster workers, each running Next's
 * own request handler (Next's custom-server recipe), sharing one port. `next start` is a single
 * process, so on a 2-core machine it leaves a core idle while requests queue behind each other.
 * Nothing the app keeps is per process (sessions, throttles and jobs live in Postgres).
 *
 *   node scripts/serve.mjs --port 3000 [--hostname 127.0.0.1]
 *   WEB_WORKERS=1 node scripts/serve.mjs …   (one process, like next start)
 *
 * Needs a production build (next build); NEXT_DIST_DIR picks the build folder as next.config does.
 * Plain JavaScript run by plain node, so the workers carry no TypeScript loader (tsx) hooks.
 */
import cluster from "node:cluster";
import http from "node:http";
import os from "node:os";

/** @param {string} name @param {string} fallback */
const arg = (name, fallback) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
};
const port = Number(arg("port", process.env.PORT ?? "3000"));
const hostname = arg("hostname", ""); // none: every interface, as next start does
const workers = Math.max(1, Number(process.env.WEB_WORKERS ?? os.availableParallelism()));

if (cluster.isPrimary && workers > 1) {
  let stopping = false;
  const born = new Map();
  const fork = () => born.set(cluster.fork().id, Date.now());
  const stopWorkers = () => {
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill("SIGTERM");
  };
  for (let i = 0; i < workers; i++) fork();
  // A worker that dies on its own is replaced; one that was told to stop is not, and one that dies
  // while starting (no build, a bad environment) stops everything rather than looping.
  cluster.on("exit", (worker, code, signal) => {
    if (stopping) return;
    if (Date.now() - (born.get(worker.id) ?? 0) < 10_000) {
      process.stderr.write(
        `[serve] worker ${worker.process.pid} failed while starting (${signal ?? code}); stopping\n`,
      );
      stopWorkers();
      process.exitCode = 1;
      return;
    }
    process.stderr.write(`[serve] worker ${worker.process.pid} exited (${signal ?? code}); starting another\n`);
    fork();
  });
  const stop = () => {
    stopWorkers();
    setTimeout(() => process.exit(0), 3_000).unref();
    cluster.on("exit", () => {
      if (!Object.keys(cluster.workers ?? {}).length) process.exit(0);
    });
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
  process.stderr.write(`[serve] ${workers} workers on http://${hostname || "localhost"}:${port}\n`);
} else {
  void serve();
}

async function serve() {
  // As Next's own bin does for `next start`: React and Next pick their production builds from
  // NODE_ENV when first loaded, and the server code branches on NEXT_RUNTIME.
  process.env.NODE_ENV = "production";
  process.env.NEXT_RUNTIME = "nodejs";
  const { default: next } = await import("next");
  const app = next({ dev: false, dir: process.cwd(), hostname: hostname || "localhost", port });
  await app.prepare();
  const handle = app.getRequestHandler();
  // Without a proxy of our own in front, a client-sent X-Forwarded-For is dropped, so Next fills
  // in the socket address and sign-in throttling keys on the real client (lib/auth/sign-in.ts).
  const trustProxy = ["true", "1"].includes(process.env.TRUST_PROXY ?? "");
  const server = http.createServer((req, res) => {
    if (!trustProxy) delete req.headers["x-forwarded-for"];
    void handle(req, res);
  });
  server.listen(port, hostname || undefined, () => {
    if (!cluster.isWorker) process.stderr.write(`[serve] ready on http://${hostname || "localhost"}:${port}\n`);
  });
  const stop = () => {
    server.close();
    void app.close().finally(() => process.exit(0));
    setTimeout(() => process.exit(0), 2_000).unref();
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}
