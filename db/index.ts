import "server-only";
import knex, { type Knex } from "knex";
import { env } from "@/lib/env";
import { poolMax } from "./pool-size";
import "./types";

// The one Knex instance for the app, kept on globalThis so dev reloads do not open new pools.
const globalForDb = globalThis as unknown as { blockyardDb?: Knex };

export function db(): Knex {
  if (!globalForDb.blockyardDb) {
    globalForDb.blockyardDb = knex({
      client: "pg",
      connection: env().DATABASE_URL,
      // Sized per process: app processes and nesting workers need different numbers (pool-size.ts).
      pool: { min: 0, max: poolMax(process.env.BLOCKYARD_PROCESS === "worker" ? "worker" : "app", process.env) },
      acquireConnectionTimeout: 5_000,
    });
  }
  return globalForDb.blockyardDb;
}
