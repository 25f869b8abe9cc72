import type { Knex } from "knex";

/**
 * A finished run's figures (plan stats, stock cost, wire travel) kept beside its plan, so lists of
 * runs (the plans page, a job's runs, the runs side by side on a plan) read a few hundred bytes per
 * run instead of its whole problem and plan (hundreds of KB for a 1,000-part order). Runs finished
 * before this column existed get their figures the first time a list shows them.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("nesting_runs", (t) => {
    t.jsonb("summary").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("nesting_runs", (t) => {
    t.dropColumn("summary");
  });
}
