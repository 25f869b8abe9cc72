/**
 * Database chores:  npm run db -- start | stop | status | migrate | seed | reset
 * Works on the demo cluster (.data/pg) unless DATABASE_URL points elsewhere.
 */
import knex from "knex";
import config from "../knexfile";
import { DEMO_CLUSTER, clusterStatus, ensureCluster, stopCluster } from "./pg";

export async function migrateAndSeed(url: string, opts: { seedWhenEmpty: boolean; forceSeed?: boolean }) {
  const k = knex({ ...config, connection: url });
  try {
    const [, applied] = await k.migrate.latest();
    if (applied.length) process.stderr.write(`[db] applied ${applied.length} migration(s)\n`);
    let seed = opts.forceSeed ?? false;
    if (!seed && opts.seedWhenEmpty) {
      const row = await k("users").count<{ count: string }[]>({ count: "*" }).first();
      seed = Number(row?.count ?? 0) === 0;
    }
    if (seed) {
      await k.seed.run();
      process.stderr.write("[db] demo data seeded\n");
    }
  } finally {
    await k.destroy();
  }
}

async function main() {
  const cmd = process.argv[2] ?? "status";
  switch (cmd) {
    case "start":
      console.log(await ensureCluster(DEMO_CLUSTER));
      break;
    case "stop":
      stopCluster(DEMO_CLUSTER);
      break;
    case "status":
      console.log(process.env.DATABASE_URL ? "external (DATABASE_URL)" : clusterStatus(DEMO_CLUSTER));
      break;
    case "migrate":
      await migrateAndSeed(await ensureCluster(DEMO_CLUSTER), { seedWhenEmpty: false });
      break;
    case "seed":
      await migrateAndSeed(await ensureCluster(DEMO_CLUSTER), { seedWhenEmpty: false, forceSeed: true });
      break;
    case "reset": {
      const url = await ensureCluster(DEMO_CLUSTER);
      const k = knex({ ...config, connection: url });
      await k.raw("DROP SCHEMA public CASCADE; CREATE SCHEMA public;");
      await k.destroy();
      await migrateAndSeed(url, { seedWhenEmpty: true });
      break;
    }
    default:
      console.error(`unknown command ${cmd}: use start | stop | status | migrate | seed | reset`);
      process.exit(2);
  }
}

if (process.argv[1] && /scripts[\\/]db\.ts$/.test(process.argv[1])) {
  main().catch((e) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  });
}
