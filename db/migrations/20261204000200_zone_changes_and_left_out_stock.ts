import type { Knex } from "knex";

/**
 * Defect zones can be corrected and removed, and plans say which stock they left out:
 * - `defect_zones.updated_at/updated_by`: the last correction of a zone (each one is also in the
 *   audit log, with the zone before and after);
 * - `defect_zones.removed_at/removed_by`: a zone taken back (flagged by mistake) stays in the table
 *   for the record, with its photos, but no longer counts anywhere;
 * - `nesting_runs.left_out`: the chosen blocks a run did not put into its problem, each with the
 *   reason (`[{ id, code, reason }]`), so one unusable block never stops a run and the plan says so.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("defect_zones", (t) => {
    t.timestamp("updated_at", { useTz: true }).nullable();
    t.text("updated_by").nullable().references("users.id");
    t.timestamp("removed_at", { useTz: true }).nullable();
    t.text("removed_by").nullable().references("users.id");
  });
  await knex.schema.alterTable("nesting_runs", (t) => {
    t.jsonb("left_out").notNullable().defaultTo("[]");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("nesting_runs", (t) => {
    t.dropColumn("left_out");
  });
  await knex.schema.alterTable("defect_zones", (t) => {
    t.dropColumn("removed_by");
    t.dropColumn("removed_at");
    t.dropColumn("updated_by");
    t.dropColumn("updated_at");
  });
}
