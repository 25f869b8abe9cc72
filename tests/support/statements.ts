import type { Knex } from "knex";

/**
 * The SQL of every statement `run` sends through a Knex instance (the app's, read in the test
 * process with "server-only" mocked), in order.
 *
 *   await sqlSent(db(), () => getBlockPage("HF-1047")) // → ["select … from \"blocks\" as \"b\" …"]
 */
export async function sqlSent(k: Knex, run: () => Promise<unknown>): Promise<string[]> {
  const sql: string[] = [];
  const on = (q: { sql: string }) => sql.push(q.sql);
  k.on("query", on);
  try {
    await run();
  } finally {
    k.off("query", on);
  }
  return sql;
}
