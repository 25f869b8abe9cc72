import type { Knex } from "knex";

/**
 * A step checked off at the machine remembers the request ids it was checked with: a tablet that
 * lost its answer sends the same check again with the same id, and the rejects sent with it are
 * not added twice (a step freeing four of a part once took one reject as two).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE plan_block_steps ADD COLUMN request_ids text[] NOT NULL DEFAULT '{}'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE plan_block_steps DROP COLUMN IF EXISTS request_ids`);
}
