/**
 * Writes db/tables.ts: one row type per table, read from a migrated database's catalogue, and the
 * tables in Knex's composite table-type shape.
 *
 *   npm run db:types            # the demo cluster (migrated first)
 *   npm run db:types -- --check # exit 1 when db/tables.ts differs from the migrations (run by the tests)
 *
 * Types follow the parsers of db/types.ts: NUMERIC, BIGINT and REAL are numbers, DATE is a
 * 'YYYY-MM-DD' string (a calendar day has no time zone), timestamps are Dates, JSONB is unknown
 * unless a column is named in JSON_TYPES below.
 *
 * Per table it writes `<Table>Row` (what a select returns) and `<Table>Insert` (what an insert
 * gives: columns without a default that may not be null are required, generated columns are left
 * out, any value may be SQL such as `db.fn.now()`, a JSONB value may be its JSON text), and declares
 * them as Knex's `knex/types/tables` so `db()("blocks")` is typed everywhere; an update takes
 * `Partial<…Insert>`.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import knex from "knex";
import config from "../knexfile";
import { migrateAndSeed } from "./db";
import { DEMO_CLUSTER, ensureCluster } from "./pg";

const OUT = "db/tables.ts";

/** JSONB columns whose shape the code relies on (others are `unknown` and parsed where read). */
const JSON_TYPES: Record<string, string> = {
  "nesting_runs.problem": 'import("@/lib/nesting").Problem',
  "nesting_runs.plan": 'import("@/lib/nesting").Plan | null',
  "nesting_runs.best": 'import("@/lib/planning/plan-figures").RunFigures | null',
  "nesting_runs.summary": 'import("@/lib/planning/plan-figures").PlanFigures | null',
  "nesting_runs.left_out": 'import("@/lib/planning/usable").LeftOut[]',
  "plan_block_steps.rejects": "{ jobPartId: number; count: number; reason: string }[]",
};

function tsType(dataType: string, udt: string): string {
  switch (dataType) {
    case "integer":
    case "smallint":
    case "bigint":
    case "numeric":
    case "real":
    case "double precision":
      return "number";
    case "text":
    case "character varying":
    case "uuid":
    case "date":
      return "string";
    case "boolean":
      return "boolean";
    case "timestamp with time zone":
    case "timestamp without time zone":
      return "Date";
    case "jsonb":
    case "json":
      return "unknown";
    case "ARRAY":
      // As node-pg (pg-types) reads arrays: db/types.ts sets the parsers of single values only, so
      // BIGINT arrays stay text and DATE arrays become Dates; other arrays are left unknown.
      if (["_int2", "_int4", "_float4", "_float8", "_numeric"].includes(udt)) return "number[]";
      if (["_text", "_varchar", "_int8"].includes(udt)) return "string[]";
      if (["_date", "_timestamp", "_timestamptz"].includes(udt)) return "Date[]";
      return "unknown";
    case "bytea":
      return "Buffer";
    default:
      return "unknown";
  }
}

/**
 * The values a CHECK constraint allows a text column, when it is a plain list (`col IN ('a', 'b')`,
 * or the same allowing NULL); undefined for any other check. The row type then says `"a" | "b"`.
 *
 *   checkedValues("status", "CHECK ((status = ANY (ARRAY['open'::text, 'done'::text])))") // ["open", "done"]
 */
export function checkedValues(column: string, def: string): string[] | undefined {
  const col = `"?${column}"?`;
  const m = new RegExp(
    `^CHECK \\(\\(?(?:\\(${col} IS NULL\\) OR \\()?${col} = ANY \\(ARRAY\\[((?:'[^']*'::text(?:, )?)+)\\]\\)\\)+$`,
  ).exec(def);
  return m ? [...m[1]!.matchAll(/'([^']*)'::text/g)].map((v) => v[1]!) : undefined;
}

/** The source as the project's formatter writes it (long unions wrap), so the file and a fresh run compare equal. */
function formatted(src: string): string {
  const biome = path.join("node_modules", ".bin", process.platform === "win32" ? "biome.cmd" : "biome");
  const r = spawnSync(biome, ["format", `--stdin-file-path=${OUT}`], { input: src, encoding: "utf8" });
  if (r.status !== 0) throw new Error(`biome could not format ${OUT}: ${r.stderr || r.error?.message}`);
  return r.stdout;
}

const pascal = (s: string) => s.replace(/(^|_)([a-z0-9])/g, (_, __, c: string) => c.toUpperCase());

export async function tablesSource(url: string): Promise<string> {
  const k = knex({ ...config, connection: url });
  try {
    const cols = (await k("information_schema.columns")
      .where({ table_schema: "public" })
      .whereNotIn("table_name", ["knex_migrations", "knex_migrations_lock"])
      .andWhere("table_name", "not like", "pgboss%")
      .orderBy(["table_name", "ordinal_position"])
      .select(
        "table_name",
        "column_name",
        "data_type",
        "udt_name",
        "is_nullable",
        "column_default",
        "is_identity",
        "is_generated",
      )) as {
      table_name: string;
      column_name: string;
      data_type: string;
      udt_name: string;
      is_nullable: "YES" | "NO";
      column_default: string | null;
      is_identity: "YES" | "NO";
      is_generated: "ALWAYS" | "NEVER";
    }[];
    // Text columns limited to a list of values by a one-column CHECK constraint.
    const checks = (
      await k.raw<{ rows: { table_name: string; column_name: string; def: string }[] }>(
        `select c.conrelid::regclass::text as table_name, a.attname as column_name, pg_get_constraintdef(c.oid) as def
           from pg_constraint c join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
          where c.contype = 'c' and c.connamespace = 'public'::regnamespace and cardinality(c.conkey) = 1
          order by c.conname`,
      )
    ).rows;
    const literal = new Map<string, string>();
    for (const c of checks) {
      const values = checkedValues(c.column_name, c.def);
      if (values) literal.set(`${c.table_name}.${c.column_name}`, values.map((v) => JSON.stringify(v)).join(" | "));
    }
    const tables = new Map<string, typeof cols>();
    for (const c of cols) tables.set(c.table_name, [...(tables.get(c.table_name) ?? []), c]);
    const out: string[] = [
      "// Generated by `npm run db:types` from the migrated schema; do not edit by hand.",
      "// A test checks it against the migrations (tests/api/db-types.test.ts).",
      'import type { Knex } from "knex";',
      "",
      "/** A value as an insert or update writes it: the value itself, or SQL such as `db.fn.now()` (a Knex.Raw). */",
      "type W<T> = T | Knex.Raw;",
      "",
    ];
    for (const [table, list] of tables) {
      const name = pascal(table);
      const types = list.map((c) => {
        const key = `${table}.${c.column_name}`;
        return (
          JSON_TYPES[key] ?? (c.data_type === "text" ? literal.get(key) : undefined) ?? tsType(c.data_type, c.udt_name)
        );
      });
      const nullable = (i: number) => list[i]!.is_nullable === "YES" && !types[i]!.endsWith("| null");
      out.push(`export interface ${name}Row {`);
      list.forEach((c, i) => out.push(`  ${c.column_name}: ${types[i]}${nullable(i) ? " | null" : ""};`));
      out.push("}", "");
      out.push(`export interface ${name}Insert {`);
      list.forEach((c, i) => {
        if (c.is_generated === "ALWAYS") return;
        const optional = c.is_nullable === "YES" || c.column_default !== null || c.is_identity === "YES";
        // JSONB may be written as its JSON text, and a JSON array must be: node-pg would send a JS
        // array as a Postgres array. A timestamp may be written as its ISO text.
        const json = c.data_type === "jsonb" || c.data_type === "json";
        const text = json || types[i] === "Date" ? " | string" : "";
        const base = json && types[i]!.endsWith("[]") ? "string" : `${types[i]}${text}`;
        const t = types[i] === "unknown" ? "unknown" : `${base}${nullable(i) ? " | null" : ""}`;
        out.push(`  ${c.column_name}${optional ? "?" : ""}: W<${t}>;`);
      });
      out.push("}", "");
    }
    // Knex's table-type shape, declared for every query: `db()("blocks")` selects BlocksRow,
    // inserts BlocksInsert and updates Partial<BlocksInsert> (Knex's default for the update type).
    out.push("export interface DbTables {");
    for (const table of tables.keys())
      out.push(`  ${table}: Knex.CompositeTableType<${pascal(table)}Row, ${pascal(table)}Insert>;`);
    out.push("}", "");
    out.push('declare module "knex/types/tables" {', "  interface Tables extends DbTables {}", "}", "");
    return formatted(out.join("\n"));
  } finally {
    await k.destroy();
  }
}

async function main() {
  const url = process.env.DATABASE_URL ?? (await ensureCluster(DEMO_CLUSTER));
  await migrateAndSeed(url, { seedWhenEmpty: false });
  const src = await tablesSource(url);
  if (process.argv.includes("--check")) {
    const strip = (s: string) => s.replace(/\s+/g, "");
    const same = fs.existsSync(OUT) && strip(fs.readFileSync(OUT, "utf8")) === strip(src);
    if (!same) console.error(`${OUT} is out of date: run npm run db:types`);
    process.exit(same ? 0 : 1);
  }
  fs.writeFileSync(OUT, src);
  console.log(`wrote ${OUT}`);
}

if (process.argv[1] && /scripts[\\/]db-types\.ts$/.test(process.argv[1])) {
  main().catch((e) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  });
}
