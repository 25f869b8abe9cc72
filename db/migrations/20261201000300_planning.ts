import type { Knex } from "knex";

/**
 * Cut planning: a part library, jobs and their parts, nesting runs (done by background workers),
 * the blocks an approved plan reserves, and what really happened at the machine.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("library_parts", (t) => {
    t.increments("id");
    t.text("kit").nullable(); // e.g. "Swift 1.2 m glider"
    t.text("name").notNullable();
    t.decimal("size_x", 10, 2).notNullable();
    t.decimal("size_y", 10, 2).notNullable();
    t.decimal("size_z", 10, 2).notNullable();
    t.integer("grade_id").nullable().references("grades.id");
    t.text("rotate").notNullable().defaultTo("any");
    t.jsonb("profile").nullable();
    t.specificType("true_volume_mm3", "numeric").nullable();
    t.integer("default_quantity").notNullable().defaultTo(1);
    t.text("notes").nullable();
    t.boolean("active").notNullable().defaultTo(true);
  });

  await knex.schema.createTable("jobs", (t) => {
    t.increments("id");
    t.text("name").notNullable();
    t.text("customer").nullable();
    t.date("due_on").nullable();
    t.text("status").notNullable().defaultTo("open");
    t.text("notes").nullable();
    t.text("created_by").nullable().references("users.id");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(
    `ALTER TABLE jobs ADD CONSTRAINT jobs_status CHECK (status IN ('open','planned','cutting','done','cancelled'))`,
  );

  await knex.schema.createTable("job_parts", (t) => {
    t.increments("id");
    t.integer("job_id").notNullable().references("jobs.id").onDelete("CASCADE");
    t.integer("library_part_id").nullable().references("library_parts.id");
    t.text("name").notNullable();
    t.integer("quantity").notNullable();
    t.decimal("size_x", 10, 2).notNullable();
    t.decimal("size_y", 10, 2).notNullable();
    t.decimal("size_z", 10, 2).notNullable();
    t.integer("grade_id").nullable().references("grades.id");
    t.text("rotate").notNullable().defaultTo("any");
    t.jsonb("profile").nullable(); // polygon + extrusion, or NACA 4-digit section
    t.specificType("true_volume_mm3", "numeric").nullable(); // null: no profile, the bounding box counts
    t.index(["job_id"]);
  });
  await knex.raw(`ALTER TABLE job_parts ADD CONSTRAINT job_parts_rotate CHECK (rotate IN ('any','z','none'))`);
  await knex.raw(
    `ALTER TABLE job_parts ADD CONSTRAINT job_parts_positive CHECK (quantity > 0 AND size_x > 0 AND size_y > 0 AND size_z > 0)`,
  );

  await knex.schema.createTable("nesting_runs", (t) => {
    t.increments("id");
    t.text("status").notNullable().defaultTo("queued");
    t.specificType("job_ids", "integer[]").notNullable();
    t.specificType("block_ids", "integer[]").notNullable();
    t.jsonb("settings").notNullable();
    t.jsonb("problem").notNullable();
    t.jsonb("plan").nullable();
    t.jsonb("best").nullable(); // figures of the best plan so far, for the progress view
    t.float("progress").notNullable().defaultTo(0);
    t.text("error").nullable();
    t.integer("attempts").notNullable().defaultTo(0);
    t.integer("parent_run_id").nullable().references("nesting_runs.id");
    t.text("created_by").nullable().references("users.id");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("started_at", { useTz: true }).nullable();
    t.timestamp("finished_at", { useTz: true }).nullable();
    t.text("approved_by").nullable().references("users.id");
    t.timestamp("approved_at", { useTz: true }).nullable();
    t.timestamp("heartbeat_at", { useTz: true }).nullable();
  });
  await knex.raw(
    `ALTER TABLE nesting_runs ADD CONSTRAINT runs_status CHECK (status IN ('queued','running','done','failed','cancelled','approved','closed'))`,
  );

  await knex.schema.createTable("plan_blocks", (t) => {
    t.increments("id");
    t.integer("run_id").notNullable().references("nesting_runs.id");
    t.integer("block_id").notNullable().references("blocks.id");
    t.text("status").notNullable().defaultTo("reserved");
    t.timestamp("cut_at", { useTz: true }).nullable();
    t.text("cut_by").nullable().references("users.id");
    t.specificType("block_volume_m3", "numeric").nullable();
    t.specificType("part_volume_m3", "numeric").nullable();
    t.specificType("offcut_volume_m3", "numeric").nullable();
    t.specificType("loss_trim_m3", "numeric").nullable();
    t.specificType("loss_kerf_m3", "numeric").nullable();
    t.specificType("loss_defect_m3", "numeric").nullable();
    t.specificType("loss_unusable_m3", "numeric").nullable();
    t.specificType("loss_reject_m3", "numeric").nullable();
    t.text("volume_basis").nullable(); // profile | box | mixed
    t.index(["run_id"]);
  });
  await knex.raw(
    `ALTER TABLE plan_blocks ADD CONSTRAINT plan_blocks_status CHECK (status IN ('reserved','cut','released'))`,
  );
  // A block can be held by one approved plan at a time: the database says no to a second.
  await knex.raw(`CREATE UNIQUE INDEX plan_blocks_one_reservation ON plan_blocks (block_id) WHERE status = 'reserved'`);

  await knex.schema.createTable("cut_parts", (t) => {
    t.increments("id");
    t.integer("run_id").notNullable().references("nesting_runs.id");
    t.integer("block_id").notNullable().references("blocks.id");
    t.integer("job_part_id").notNullable().references("job_parts.id");
    t.integer("good_count").notNullable();
    t.integer("rejected_count").notNullable().defaultTo(0);
    t.text("reject_reason").nullable();
    t.specificType("part_volume_m3", "numeric").notNullable(); // of the good parts
    t.text("volume_basis").notNullable(); // profile | box
    t.text("recorded_by").nullable().references("users.id");
    t.timestamp("recorded_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["run_id"]);
    t.index(["job_part_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const t of ["cut_parts", "plan_blocks", "nesting_runs", "job_parts", "jobs", "library_parts"]) {
    await knex.schema.dropTableIfExists(t);
  }
}
