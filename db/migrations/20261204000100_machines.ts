import type { Knex } from "knex";

/**
 * The shop's hot-wire cutters and what happens at them:
 * - `machines`: a block cutter (through cuts) or a profile cutter, its wire, travel, table, rates
 *   and program dialect (see lib/planning/machine.ts for the meaning of each field);
 * - `machine_grades`: kerf and feed calibrated per machine and grade (the shop setting is the default);
 * - `nesting_runs.machine_id`: the block machine a run is planned for (its kerf for the run's grades);
 * - `plan_offcut_codes`: offcut codes fixed when a plan is approved, so the sheet, the labels and
 *   the recording always agree;
 * - `plan_block_steps`: the cutting steps checked off at the machine, so work can stop and go on
 *   later on another tablet or by another cutter, with the rejects found at each step;
 * - a block recorded part-cut (`plan_blocks.partial`), the parts it did not give
 *   (`cut_parts.not_cut_count`, owed again), and recordings undone by reversing ledger entries
 *   (ledger kind `reversed`, its sign in its volume like `adjusted`; `plan_blocks.undone_count`).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("machines", (t) => {
    t.increments("id");
    t.text("name").notNullable().unique();
    t.text("kind").notNullable().defaultTo("block");
    t.text("wire").notNullable().defaultTo("horizontal");
    t.decimal("wire_length_mm", 10, 2).notNullable();
    t.decimal("travel_x_mm", 10, 2).notNullable();
    t.decimal("travel_y_mm", 10, 2).notNullable();
    t.decimal("max_length_mm", 10, 2).notNullable();
    t.decimal("max_width_mm", 10, 2).notNullable();
    t.decimal("max_height_mm", 10, 2).notNullable();
    t.boolean("turntable").notNullable().defaultTo(false);
    t.decimal("rapid_mm_per_min", 10, 2).notNullable().defaultTo(2000);
    t.decimal("heat_up_s", 8, 2).notNullable().defaultTo(20);
    t.decimal("handling_s", 8, 2).notNullable().defaultTo(90);
    t.text("unit_words").notNullable().defaultTo("G20/G21");
    t.boolean("inch").notNullable().defaultTo(false);
    t.text("heat_on").nullable();
    t.text("heat_off").nullable();
    t.text("axis_x").notNullable().defaultTo("X");
    t.text("axis_y").notNullable().defaultTo("Y");
    t.boolean("line_numbers").notNullable().defaultTo(false);
    t.boolean("active").notNullable().defaultTo(true);
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE machines ADD CONSTRAINT machines_kind CHECK (kind IN ('block','profile'))`);
  await knex.raw(`ALTER TABLE machines ADD CONSTRAINT machines_wire CHECK (wire IN ('horizontal','vertical'))`);
  await knex.raw(`ALTER TABLE machines ADD CONSTRAINT machines_units CHECK (unit_words IN ('G20/G21','G70/G71'))`);
  await knex.raw(
    `ALTER TABLE machines ADD CONSTRAINT machines_positive CHECK (wire_length_mm > 0 AND travel_x_mm > 0 AND travel_y_mm > 0
      AND max_length_mm > 0 AND max_width_mm > 0 AND max_height_mm > 0 AND rapid_mm_per_min > 0 AND heat_up_s >= 0 AND handling_s >= 0)`,
  );

  await knex.schema.createTable("machine_grades", (t) => {
    t.integer("machine_id").notNullable().references("machines.id").onDelete("CASCADE");
    t.integer("grade_id").notNullable().references("grades.id");
    t.decimal("kerf_mm", 8, 2).notNullable();
    t.decimal("feed_mm_per_min", 10, 2).notNullable();
    t.primary(["machine_id", "grade_id"]);
  });
  await knex.raw(
    `ALTER TABLE machine_grades ADD CONSTRAINT machine_grades_positive CHECK (kerf_mm > 0 AND feed_mm_per_min > 0)`,
  );

  await knex.schema.alterTable("nesting_runs", (t) => {
    t.integer("machine_id").nullable().references("machines.id");
  });

  await knex.schema.createTable("plan_offcut_codes", (t) => {
    t.integer("run_id").notNullable().references("nesting_runs.id");
    t.integer("block_id").notNullable().references("blocks.id");
    t.integer("offcut_index").notNullable(); // index among the plan's offcuts of this block
    t.text("code").notNullable().unique();
    t.primary(["run_id", "block_id", "offcut_index"]);
  });

  await knex.schema.createTable("plan_block_steps", (t) => {
    t.integer("run_id").notNullable().references("nesting_runs.id");
    t.integer("block_id").notNullable().references("blocks.id");
    t.integer("step").notNullable();
    t.text("done_by").nullable().references("users.id");
    t.timestamp("done_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.jsonb("rejects").notNullable().defaultTo("[]"); // [{ jobPartId, count, reason }]
    t.primary(["run_id", "block_id", "step"]);
  });

  await knex.schema.alterTable("plan_blocks", (t) => {
    t.boolean("partial").notNullable().defaultTo(false);
    t.integer("undone_count").notNullable().defaultTo(0);
  });
  await knex.schema.alterTable("cut_parts", (t) => {
    t.integer("not_cut_count").notNullable().defaultTo(0);
  });
  await knex.raw(`ALTER TABLE stock_ledger DROP CONSTRAINT ledger_kind`);
  await knex.raw(
    `ALTER TABLE stock_ledger ADD CONSTRAINT ledger_kind CHECK (kind IN ('received','reserved','released','consumed','offcut_created','scrapped','adjusted','reversed'))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE stock_ledger DROP CONSTRAINT ledger_kind`);
  await knex.raw(
    `ALTER TABLE stock_ledger ADD CONSTRAINT ledger_kind CHECK (kind IN ('received','reserved','released','consumed','offcut_created','scrapped','adjusted'))`,
  );
  await knex.schema.alterTable("cut_parts", (t) => t.dropColumn("not_cut_count"));
  await knex.schema.alterTable("plan_blocks", (t) => {
    t.dropColumn("partial");
    t.dropColumn("undone_count");
  });
  await knex.schema.dropTableIfExists("plan_block_steps");
  await knex.schema.dropTableIfExists("plan_offcut_codes");
  await knex.schema.alterTable("nesting_runs", (t) => t.dropColumn("machine_id"));
  await knex.schema.dropTableIfExists("machine_grades");
  await knex.schema.dropTableIfExists("machines");
}
