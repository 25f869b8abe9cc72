import type { Knex } from "knex";

/**
 * What a profile cutter's programs need (issue "Profiles to the wire"): whether it is a 4-axis
 * machine (two towers moving apart, for tapered parts) and its second tower's axis letters (U V or
 * the machine's own). The towers stand the usable wire length apart (`wire_length_mm`); the first
 * tower moves on `axis_x` / `axis_y`, both towers over the same travel.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("machines", (t) => {
    t.boolean("four_axis").notNullable().defaultTo(false);
    t.text("axis_u").nullable();
    t.text("axis_v").nullable();
  });
  await knex.raw(
    `ALTER TABLE machines ADD CONSTRAINT machines_four_axis CHECK (NOT four_axis OR (kind = 'profile' AND axis_u IS NOT NULL AND axis_v IS NOT NULL))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE machines DROP CONSTRAINT machines_four_axis`);
  await knex.schema.alterTable("machines", (t) => {
    t.dropColumn("four_axis");
    t.dropColumn("axis_u");
    t.dropColumn("axis_v");
  });
}
