import type { Knex } from "knex";

/**
 * Purchasing: reorder settings (shop-wide and per grade), purchase orders with their lines and
 * receipts, deliveries linked to the order they fill, and the outbox of every e-mail sent.
 * Quantities of foam in m³; block sizes in mm.
 */
export async function up(knex: Knex): Promise<void> {
  // One row: the shop's reorder defaults. Every one can be overridden per grade.
  await knex.schema.createTable("reorder_settings", (t) => {
    t.integer("id").primary().defaultTo(1);
    t.decimal("service_level", 6, 4).notNullable().defaultTo(0.95);
    t.integer("history_days").notNullable().defaultTo(90);
    t.decimal("order_cost", 12, 2).notNullable().defaultTo(75); // S: cost of placing one order
    t.decimal("holding_cost_m3_year", 12, 2).notNullable().defaultTo(18); // H: per m³ held for a year
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("updated_by").nullable().references("users.id");
  });
  await knex.raw(`ALTER TABLE reorder_settings ADD CONSTRAINT reorder_settings_single CHECK (id = 1)`);
  await knex.raw(
    `ALTER TABLE reorder_settings ADD CONSTRAINT reorder_settings_ranges CHECK (service_level > 0.5 AND service_level < 1 AND history_days BETWEEN 7 AND 730 AND order_cost >= 0 AND holding_cost_m3_year > 0)`,
  );
  await knex("reorder_settings").insert({ id: 1 });

  // Per-grade overrides; null means "work it out" (from the ledger, the supplier, the settings).
  await knex.schema.createTable("grade_reorder", (t) => {
    t.integer("grade_id").primary().references("grades.id");
    t.integer("supplier_id").nullable().references("suppliers.id");
    t.integer("lead_time_days").nullable();
    t.decimal("service_level", 6, 4).nullable();
    t.specificType("daily_demand_m3", "numeric").nullable();
    t.specificType("demand_sd_m3", "numeric").nullable();
    t.decimal("order_cost", 12, 2).nullable();
    t.decimal("holding_cost_m3_year", 12, 2).nullable();
    t.specificType("reorder_point_m3", "numeric").nullable();
    t.specificType("order_qty_m3", "numeric").nullable();
    t.text("note").nullable();
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("updated_by").nullable().references("users.id");
  });

  await knex.schema.createTable("purchase_orders", (t) => {
    t.increments("id");
    t.text("number").notNullable().unique(); // PO-2026-0007
    t.integer("supplier_id").notNullable().references("suppliers.id");
    t.text("status").notNullable().defaultTo("draft");
    t.date("expected_on").nullable();
    t.text("notes").nullable();
    t.text("created_by").nullable().references("users.id");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("sent_at", { useTz: true }).nullable();
    t.timestamp("closed_at", { useTz: true }).nullable();
    t.text("cancel_reason").nullable();
    t.index(["status"]);
  });
  await knex.raw(
    `ALTER TABLE purchase_orders ADD CONSTRAINT purchase_orders_status CHECK (status IN ('draft','sent','part_received','closed','cancelled'))`,
  );
  await knex.raw(`CREATE SEQUENCE purchase_order_seq START 1`);

  await knex.schema.createTable("purchase_order_lines", (t) => {
    t.increments("id");
    t.integer("purchase_order_id").notNullable().references("purchase_orders.id").onDelete("CASCADE");
    t.integer("grade_id").notNullable().references("grades.id");
    t.decimal("size_x", 10, 2).notNullable();
    t.decimal("size_y", 10, 2).notNullable();
    t.decimal("size_z", 10, 2).notNullable();
    t.integer("quantity").notNullable(); // blocks
    t.decimal("price", 12, 4).notNullable(); // per price_unit
    t.text("price_unit").notNullable(); // m3 | bf, the grade's unit when the line was written
    t.text("note").nullable();
    t.index(["purchase_order_id"]);
  });
  await knex.raw(
    `ALTER TABLE purchase_order_lines ADD CONSTRAINT po_lines_positive CHECK (quantity > 0 AND size_x > 0 AND size_y > 0 AND size_z > 0 AND price >= 0)`,
  );
  await knex.raw(`ALTER TABLE purchase_order_lines ADD CONSTRAINT po_lines_unit CHECK (price_unit IN ('m3','bf'))`);
  await knex.raw(
    `ALTER TABLE purchase_order_lines ADD COLUMN volume_m3 numeric GENERATED ALWAYS AS (quantity * size_x * size_y * size_z / 1e9) STORED`,
  );

  await knex.schema.alterTable("deliveries", (t) => {
    t.integer("purchase_order_id").nullable().references("purchase_orders.id");
    t.index(["purchase_order_id"]);
  });

  // What each delivery brought against each line, and whether it went past the ±10 % terms.
  await knex.schema.createTable("purchase_order_receipts", (t) => {
    t.increments("id");
    t.integer("purchase_order_id").notNullable().references("purchase_orders.id");
    t.integer("line_id").notNullable().references("purchase_order_lines.id");
    t.integer("delivery_id").notNullable().references("deliveries.id");
    t.integer("blocks").notNullable();
    t.specificType("volume_m3", "numeric").notNullable();
    t.boolean("over_tolerance").notNullable().defaultTo(false);
    t.text("over_reason").nullable();
    t.text("received_by").nullable().references("users.id");
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["purchase_order_id"]);
    t.index(["line_id"]);
  });

  await knex.schema.createTable("mail_outbox", (t) => {
    t.bigIncrements("id");
    t.text("kind").notNullable(); // purchase_order | low_stock | other
    t.text("to_address").notNullable();
    t.text("subject").notNullable();
    t.text("transport").notNullable(); // outbox | smtp
    t.text("status").notNullable(); // sent | failed
    t.text("message_id").nullable();
    t.text("file").nullable(); // .eml under .data/outbox when the outbox transport wrote it
    t.jsonb("attachments").notNullable().defaultTo("[]");
    t.text("error").nullable();
    t.text("ref").nullable(); // po:12
    t.text("sent_by").nullable().references("users.id");
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["at"]);
  });
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_status CHECK (status IN ('sent','failed'))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("mail_outbox");
  await knex.schema.dropTableIfExists("purchase_order_receipts");
  await knex.schema.alterTable("deliveries", (t) => {
    t.dropColumn("purchase_order_id");
  });
  await knex.schema.dropTableIfExists("purchase_order_lines");
  await knex.raw("DROP SEQUENCE IF EXISTS purchase_order_seq");
  await knex.schema.dropTableIfExists("purchase_orders");
  await knex.schema.dropTableIfExists("grade_reorder");
  await knex.schema.dropTableIfExists("reorder_settings");
}
