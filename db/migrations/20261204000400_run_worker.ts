import type { Knex } from "knex";

/**
 * Which worker holds a run (host:pid, or NESTING_WORKER_NAME): with several workers on one or more
 * machines, a run is claimed by one, its progress and plan are written only by that one, and a
 * run whose worker stopped is swept (or, when its heartbeat is stale, claimed again) — never done
 * twice. Runs claimed before this column existed keep null.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("nesting_runs", (t) => {
    t.text("worker").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("nesting_runs", (t) => {
    t.dropColumn("worker");
  });
}
