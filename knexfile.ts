import type { Knex } from "knex";
import path from "node:path";
import "./db/types";

// One configuration for the app, the scripts and the tests. DATABASE_URL is set by
// scripts/start.ts and scripts/test.ts (or by you, to use an existing server).
// Scripts run from the repository root (npm sets the working directory there).
const root = process.cwd();

const config: Knex.Config = {
  client: "pg",
  connection: process.env.DATABASE_URL,
  pool: { min: 0, max: Number(process.env.DB_POOL_MAX ?? 10) },
  migrations: {
    directory: path.join(root, "db/migrations"),
    extension: "ts",
    loadExtensions: [".ts"],
    tableName: "knex_migrations",
  },
  seeds: {
    directory: path.join(root, "db/seeds"),
    extension: "ts",
    loadExtensions: [".ts"],
  },
};

export default config;
