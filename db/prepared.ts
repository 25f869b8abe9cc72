import { createHash } from "node:crypto";
import type { Knex } from "knex";

/**
 *   const rows = await prepared(db()("blocks").where({ parent_id: 7 }).select("id", "code"));
 *   const { rows } = await prepared(db().raw("SELECT … WHERE s.id = ?", [id]));
 *
 * Runs a query as a named server-side prepared statement (node-postgres `name`, passed by Knex's
 * `options`): each pooled connection parses and plans it once, and Postgres reuses the statement
 * after that (its generic plan once that costs no more than planning each time). For the small
 * statements every request makes (the session check, a page's rows), planning was most of
 * Postgres' time: 0.1 ms to plan against 0.05 ms to run the session check, 0.7 against 0.4 ms for
 * a stock list page (EXPLAIN ANALYZE on a warm connection).
 *
 * The name is a hash of the SQL text, so a different text (other filters, another sort) is another
 * statement, and node-postgres refuses outright a name reused for a different text. Values are
 * still bound, never written into the text. Only for statements that name their columns: Postgres
 * refuses to run a prepared `SELECT *` once a migration has added a column ("cached plan must not
 * change result type") until the app restarts. Not for a connection pooler in transaction mode
 * (PgBouncer), which cannot keep a statement on one connection: point DATABASE_URL at Postgres or a
 * pooler in session mode.
 */
export function prepared<Q extends Knex.QueryBuilder | Knex.Raw>(query: Q): Q {
  const { sql } = query.toSQL();
  let name = NAMES.get(sql);
  if (!name) {
    name = `by_${createHash("sha1").update(sql).digest("base64url").slice(0, 24)}`;
    if (NAMES.size < MAX_NAMES) NAMES.set(sql, name);
  }
  return query.options({ name }) as Q;
}

/** SQL text → statement name, so a statement seen before is not hashed again (bounded). */
const NAMES = new Map<string, string>();
const MAX_NAMES = 1000;
