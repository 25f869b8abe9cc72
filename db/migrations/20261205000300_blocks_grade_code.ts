import type { Knex } from "knex";

/**
 * The stock list sorted by grade, at any depth: each block carries its grade's code
 * (`blocks.grade_code`), indexed with the id, so a keyset page of `sort=grade` reads the index from
 * the cursor onwards instead of joining grades and sorting every matching block (~250 ms at 50,000
 * blocks; the other sorts already had their index).
 * - Kept by triggers, so no writer has to remember it: set from `grades` whenever a block is
 *   inserted or its grade (or the copy itself) is written; a grade's new code is copied to its blocks.
 * - The default '' only keeps the column optional for inserts; the trigger always fills it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE blocks ADD COLUMN grade_code text NOT NULL DEFAULT ''`);
  await knex.raw(`UPDATE blocks b SET grade_code = g.code FROM grades g WHERE g.id = b.grade_id`);
  await knex.raw(`
    CREATE FUNCTION blocks_grade_code() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      NEW.grade_code := (SELECT code FROM grades WHERE id = NEW.grade_id);
      RETURN NEW;
    END $$`);
  await knex.raw(`
    CREATE TRIGGER blocks_grade_code BEFORE INSERT OR UPDATE OF grade_id, grade_code ON blocks
      FOR EACH ROW EXECUTE FUNCTION blocks_grade_code()`);
  await knex.raw(`
    CREATE FUNCTION grades_code_to_blocks() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE blocks SET grade_code = NEW.code WHERE grade_id = NEW.id;
      RETURN NULL;
    END $$`);
  await knex.raw(`
    CREATE TRIGGER grades_code_to_blocks AFTER UPDATE OF code ON grades
      FOR EACH ROW WHEN (OLD.code IS DISTINCT FROM NEW.code) EXECUTE FUNCTION grades_code_to_blocks()`);
  await knex.raw(`CREATE INDEX blocks_grade_sort ON blocks (grade_code, id)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`DROP INDEX IF EXISTS blocks_grade_sort`);
  await knex.raw(`DROP TRIGGER IF EXISTS grades_code_to_blocks ON grades`);
  await knex.raw(`DROP FUNCTION IF EXISTS grades_code_to_blocks()`);
  await knex.raw(`DROP TRIGGER IF EXISTS blocks_grade_code ON blocks`);
  await knex.raw(`DROP FUNCTION IF EXISTS blocks_grade_code()`);
  await knex.raw(`ALTER TABLE blocks DROP COLUMN IF EXISTS grade_code`);
}
