import type { Knex } from "knex";

/**
 * Reorder sums in working days (lib/purchasing/calendar.ts):
 * - `reorder_settings.working_days`: the shop calendar, ISO weekdays (1 Monday … 7 Sunday) that
 *   are working days, Monday to Friday unless the buyer says otherwise. Daily use is measured per
 *   working day and lead times are counted in working days, as suppliers quote them
 *   (`suppliers.lead_time_days` and `grade_reorder.lead_time_days` now mean working days).
 * - `suppliers.lead_time_sd_days`: how far a supplier's deliveries stray from the promised date, one
 *   standard deviation in working days, for the safety stock z·√(L·σd² + d²·σL²). Used until the
 *   supplier has three orders with a promised date and a delivery; after that σL comes from them.
 * - an index on stock_ledger (at, id): the ledger pages by keyset, (at, id) < (that entry's), newest first.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("reorder_settings", (t) => {
    t.specificType("working_days", "smallint[]").notNullable().defaultTo(knex.raw("'{1,2,3,4,5}'::smallint[]"));
  });
  await knex.raw(
    `ALTER TABLE reorder_settings ADD CONSTRAINT reorder_settings_working_days CHECK (cardinality(working_days) BETWEEN 1 AND 7 AND working_days <@ '{1,2,3,4,5,6,7}'::smallint[])`,
  );
  await knex.schema.alterTable("suppliers", (t) => {
    t.decimal("lead_time_sd_days", 6, 2).notNullable().defaultTo(0);
  });
  await knex.raw(`ALTER TABLE suppliers ADD CONSTRAINT suppliers_lead_time_sd CHECK (lead_time_sd_days >= 0)`);
  await knex.raw(`CREATE INDEX stock_ledger_at_id ON stock_ledger (at, id)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`DROP INDEX IF EXISTS stock_ledger_at_id`);
  await knex.schema.alterTable("suppliers", (t) => {
    t.dropColumn("lead_time_sd_days");
  });
  await knex.schema.alterTable("reorder_settings", (t) => {
    t.dropColumn("working_days");
  });
}
