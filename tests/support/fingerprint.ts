import { testDb } from "./db";

/** Tables a refused request may still touch: sessions and sign-in throttling, and Knex's own. */
const IGNORED = ["knex_migrations", "knex_migrations_lock", "sign_in_failures", "user_sessions"];

let query: Promise<string> | undefined;

/**
 * The whole public schema in one round trip: every table's row count, the latest `updated_at` of
 * tables that have one, and the ledger's totals. Two equal fingerprints mean no row was added,
 * removed or updated (through the app's own writes, which always stamp `updated_at`) in between.
 * Cheap enough (one query) to take after every refused request.
 *
 *   const before = await fingerprint(); …refused request…; expect(await fingerprint()).toEqual(before)
 */
export async function fingerprint(): Promise<Record<string, string>> {
  query ??= (async () => {
    const cols = (await testDb()
      .select("c.table_name", "c.column_name")
      .from("information_schema.columns as c")
      .join("pg_tables as t", function () {
        this.on("t.tablename", "c.table_name").andOn("t.schemaname", "c.table_schema");
      })
      .where("c.table_schema", "public")
      .whereNotIn("c.table_name", IGNORED)) as { table_name: string; column_name: string }[];
    const tables = [...new Set(cols.map((c) => c.table_name))].sort();
    const parts: string[] = [];
    for (const t of tables) {
      // Table names come from the catalogue, not from input; quoted as identifiers all the same.
      const id = `"${t.replace(/"/g, '""')}"`;
      parts.push(`(SELECT count(*)::text FROM ${id}) AS "${t}"`);
      if (cols.some((c) => c.table_name === t && c.column_name === "updated_at")) {
        parts.push(`(SELECT coalesce(max(updated_at)::text, '') FROM ${id}) AS "${t}.updated_at"`);
      }
    }
    parts.push(
      `(SELECT coalesce(sum(delta_m3), 0)::text || '/' || coalesce(sum(delta_value), 0)::text FROM stock_ledger) AS "ledger.totals"`,
    );
    return `SELECT ${parts.join(", ")}`;
  })();
  const r = await testDb().raw(await query);
  return r.rows[0] as Record<string, string>;
}

/** The keys whose values differ, for a readable failure message. */
export function diff(a: Record<string, string>, b: Record<string, string>): string[] {
  return Object.keys({ ...a, ...b })
    .filter((k) => a[k] !== b[k])
    .map((k) => `${k}: ${a[k]} → ${b[k]}`);
}
