import "server-only";
import knex, { type Knex } from "knex";
import { env } from "@/lib/env";
import "./types";

// The one Knex instance for the app, kept on globalThis so dev reloads do not open new pools.
const globalForDb = globalThis as unknown as { blockyardDb?: Knex };

export function db(): Knex {
  if (!globalForDb.blockyardDb) {
    globalForDb.blockyardDb = knex({
      client: "pg",
      connection: env().DATABASE_URL,
      pool: { min: 0, max: Number(process.env.DB_POOL_MAX ?? 10) },
      acquireConnectionTimeout: 5_000,
    });
  }
  return globalForDb.blockyardDb;
}
