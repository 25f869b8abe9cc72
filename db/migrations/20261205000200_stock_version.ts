import type { Knex } from "knex";

/**
 * A version number of the stock register, for figures over many blocks that the app keeps between
 * requests (the stock list's count and totals per filter, its locations): every transaction that
 * writes `blocks` adds one to it in its own commit, so a figure read in one statement with the
 * version stays right for as long as the version reads the same, in every app process and on
 * every machine sharing the database (db/queries/stock-version.ts).
 * - The bump is a deferred constraint trigger: it runs at commit, after the transaction's other
 *   work, so the counter's row lock is held only for the moment of committing (nothing waits
 *   behind a long import; it comes after all of a transaction's own writes, so it adds no
 *   lock-order deadlock).
 *   Once per transaction: a transaction-local setting remembers that it was done.
 * - TRUNCATE (tests) bumps it at once.
 *
 * And an index for the block page's zone corrections: it reads the audit log by subject
 * (`block:12`), newest first, on every visit; without one that is a pass over the whole log,
 * which only grows.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TABLE stock_version (id smallint PRIMARY KEY CHECK (id = 1), v bigint NOT NULL DEFAULT 0)`);
  await knex.raw(`INSERT INTO stock_version (id, v) VALUES (1, 0)`);
  await knex.raw(`
    CREATE FUNCTION bump_stock_version() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'TRUNCATE' OR current_setting('blockyard.stock_bumped', true) IS DISTINCT FROM txid_current()::text THEN
        UPDATE stock_version SET v = v + 1 WHERE id = 1;
        PERFORM set_config('blockyard.stock_bumped', txid_current()::text, true);
      END IF;
      RETURN NULL;
    END $$`);
  await knex.raw(`
    CREATE CONSTRAINT TRIGGER blocks_stock_version AFTER INSERT OR UPDATE OR DELETE ON blocks
      DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_stock_version()`);
  await knex.raw(`
    CREATE TRIGGER blocks_stock_version_truncate AFTER TRUNCATE ON blocks
      FOR EACH STATEMENT EXECUTE FUNCTION bump_stock_version()`);
  await knex.raw(`CREATE INDEX audit_log_subject_at ON audit_log (subject, at, id)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`DROP INDEX IF EXISTS audit_log_subject_at`);
  await knex.raw(`DROP TRIGGER IF EXISTS blocks_stock_version_truncate ON blocks`);
  await knex.raw(`DROP TRIGGER IF EXISTS blocks_stock_version ON blocks`);
  await knex.raw(`DROP FUNCTION IF EXISTS bump_stock_version()`);
  await knex.raw(`DROP TABLE IF EXISTS stock_version`);
}
