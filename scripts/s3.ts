/**
 * A local S3-compatible fake (s3rver) for development and tests, on 127.0.0.1 only
 * (BLOCKYARD_S3_HOST may name another loopback address, never one other machines can reach: its
 * key is the well-known S3RVER; see scripts/loopback.ts).
 *
 *   const s3 = await ensureS3(DEMO_S3);   // → { env: { S3_ENDPOINT, S3_BUCKET, … }, stop() }
 *   Object.assign(process.env, s3.env);   // the seed and the app then use it
 *
 * The fake runs in a small child process (so a caller blocked in spawnSync, like the test runner
 * waiting for vitest, does not stall it) and exits by itself when its parent goes away. Objects
 * live under .data/<name>. When S3_ENDPOINT is already set (a real bucket or a shared fake),
 * nothing is started and the environment is used as is.
 */
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { isLoopback, loopbackHost, urlHost } from "./loopback";

export interface FakeS3Options {
  name: string; // folder under .data/
  port: number; // 0 picks a free one
  bucket?: string;
  /** Start with an empty bucket (tests: the database is recreated too). */
  fresh?: boolean;
}

export const DEMO_S3: FakeS3Options = { name: "s3", port: 54340 };
const SLOT = Number(process.env.TEST_SLOT ?? 0); // see TEST_SLOT in scripts/pg.ts
export const TEST_S3: FakeS3Options = {
  name: SLOT ? `s3-test-${SLOT}` : "s3-test",
  port: SLOT ? 55100 + SLOT : 54349,
  fresh: true,
};

export interface RunningS3 {
  env: Record<string, string>;
  stop(): Promise<void>;
}

const SCRIPT = path.join(process.cwd(), "scripts", "s3.ts");

export async function ensureS3(opts: FakeS3Options): Promise<RunningS3> {
  if (process.env.S3_ENDPOINT) return { env: {}, stop: async () => {} };
  const host = loopbackHost("BLOCKYARD_S3_HOST", process.env.BLOCKYARD_S3_HOST); // throws unless loopback
  const bucket = opts.bucket ?? "blockyard-photos";
  const directory = path.join(process.cwd(), ".data", opts.name);
  if (opts.fresh) fs.rmSync(directory, { recursive: true, force: true });
  fs.mkdirSync(directory, { recursive: true });

  const child = spawn(
    process.execPath,
    ["--import", "tsx", SCRIPT, "--serve", JSON.stringify({ host, port: opts.port, bucket, directory })],
    {
      stdio: ["ignore", "inherit", "inherit", "ipc"],
    },
  );
  const port = await new Promise<number>((resolve, reject) => {
    child.once("message", (m: { port?: number; error?: string }) =>
      m.port ? resolve(m.port) : reject(new Error(m.error)),
    );
    child.once("exit", (code) => reject(new Error(`[s3] the local S3 fake exited during start-up (code ${code})`)));
  });
  // Never keep the caller alive for the fake's sake; it exits when the IPC channel closes.
  child.unref();
  child.channel?.unref();
  process.stderr.write(
    `[s3] local S3 fake on http://${urlHost(host)}:${port} (bucket ${bucket}, data in .data/${opts.name})\n`,
  );
  return {
    env: {
      S3_ENDPOINT: `http://${urlHost(host)}:${port}`,
      S3_REGION: "us-east-1",
      S3_BUCKET: bucket,
      S3_ACCESS_KEY_ID: "S3RVER",
      S3_SECRET_ACCESS_KEY: "S3RVER",
      // The SDK is pinned for Node 20 (see ../shared/toolchain.md); its start-up notice says so each run.
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
    },
    stop() {
      if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
      child.ref(); // keep the caller alive until the fake has gone
      const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
      child.kill("SIGTERM");
      return exited;
    },
  };
}

/** The child: serve until told to stop or until the parent is gone. */
async function serve(o: { host: string; port: number; bucket: string; directory: string }) {
  if (!isLoopback(o.host)) throw new Error(`[s3] refusing to listen on ${o.host}: loopback addresses only`);
  const { default: S3rver } = await import("s3rver");
  const server = new S3rver({
    address: o.host,
    port: o.port,
    silent: true,
    directory: o.directory,
    vhostBuckets: false,
    configureBuckets: [{ name: o.bucket }],
  });
  try {
    const address = await server.run();
    process.send?.({ port: address.port });
  } catch (e) {
    const busy = (e as { code?: string }).code === "EADDRINUSE";
    process.send?.({
      error: busy
        ? `[s3] port ${o.port} is in use (another \`npm start\` or \`npm test\`?); wait for it, or set S3_ENDPOINT to use a running S3 service`
        : `[s3] the local S3 fake did not start: ${(e as Error).message}`,
    });
    process.exit(1);
  }
  const quit = () => void server.close().finally(() => process.exit(0));
  process.on("disconnect", quit);
  process.on("SIGTERM", quit);
  process.on("SIGINT", quit);
}

if (process.argv[2] === "--serve" && process.argv[3]) {
  serve(JSON.parse(process.argv[3])).catch((e) => {
    console.error(e);
    process.exit(1);
  });
}
