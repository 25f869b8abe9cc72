import type { Knex } from "knex";

/**
 * Indexes for a stock list of tens of thousands of blocks (found with EXPLAIN ANALYZE under
 * `npm run bench:stock`, 50,000 blocks):
 * - the list's count and totals read every matching row: a covering index lets Postgres answer
 *   them from the index alone instead of the table; the size filter (longest side) gets the same
 *   from an index on that expression;
 * - FIFO positions ranked every ready block of a grade with a sort on each request: a stored FIFO
 *   date (moulding date, else the UTC day it was received) indexed per grade gives that order
 *   ready-made, and the ranking stops at the page's latest block.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE INDEX blocks_totals ON blocks (status, grade_id, cut_not_before) INCLUDE (volume_m3, cost)`);
  await knex.raw(
    `CREATE INDEX blocks_longest ON blocks ((GREATEST(size_x, size_y, size_z))) INCLUDE (status, volume_m3, cost)`,
  );
  await knex.raw(
    `ALTER TABLE blocks ADD COLUMN fifo_on date GENERATED ALWAYS AS (coalesce(moulded_on, (created_at AT TIME ZONE 'UTC')::date)) STORED`,
  );
  await knex.raw(
    `CREATE INDEX blocks_fifo ON blocks (grade_id, fifo_on, id) INCLUDE (cut_not_before) WHERE status = 'in_stock'`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`DROP INDEX IF EXISTS blocks_fifo`);
  await knex.raw(`ALTER TABLE blocks DROP COLUMN IF EXISTS fifo_on`);
  await knex.raw(`DROP INDEX IF EXISTS blocks_longest`);
  await knex.raw(`DROP INDEX IF EXISTS blocks_totals`);
}
