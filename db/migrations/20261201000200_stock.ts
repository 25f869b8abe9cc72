import type { Knex } from "knex";

/**
 * The stock register: grades, suppliers, deliveries, blocks (and offcuts), defect zones with
 * photos, and an append-only ledger of every movement. Lengths in mm, volumes in m³.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("grades", (t) => {
    t.increments("id");
    t.text("code").notNullable().unique(); // the shop's short name, e.g. "EPS-II"
    t.text("material").notNullable(); // EPS | XPS | EPP | PU
    t.text("grade_system").notNullable(); // "ASTM C578" | "EN 13163" | "shop"
    t.text("grade").notNullable(); // "Type II", "EPS 100", …
    t.decimal("nominal_density_kg_m3", 8, 2).nullable();
    t.decimal("min_density_kg_m3", 8, 2).nullable();
    t.integer("cure_days").notNullable().defaultTo(14);
    t.boolean("never_hot_wire").notNullable().defaultTo(false);
    t.text("colour").notNullable().defaultTo("#8aa5a9");
    t.text("price_unit").notNullable().defaultTo("m3"); // m3 | bf
    t.text("notes").nullable();
    t.boolean("active").notNullable().defaultTo(true);
  });
  await knex.raw(`ALTER TABLE grades ADD CONSTRAINT grades_material CHECK (material IN ('EPS','XPS','EPP','PU'))`);
  await knex.raw(`ALTER TABLE grades ADD CONSTRAINT grades_price_unit CHECK (price_unit IN ('m3','bf'))`);
  await knex.raw(`ALTER TABLE grades ADD CONSTRAINT grades_pu_no_wire CHECK (material <> 'PU' OR never_hot_wire)`);

  await knex.schema.createTable("suppliers", (t) => {
    t.increments("id");
    t.text("name").notNullable();
    t.text("contact").nullable();
    t.text("email").nullable();
    t.text("phone").nullable();
    t.integer("lead_time_days").notNullable().defaultTo(14);
    t.text("notes").nullable();
    t.boolean("active").notNullable().defaultTo(true);
  });
  await knex.raw(`CREATE UNIQUE INDEX suppliers_name_lower ON suppliers (lower(name))`);

  await knex.schema.createTable("deliveries", (t) => {
    t.increments("id");
    t.integer("supplier_id").notNullable().references("suppliers.id");
    t.date("received_on").notNullable();
    t.text("po_ref").nullable();
    t.text("lot").notNullable();
    t.text("received_by").nullable().references("users.id");
    t.text("notes").nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["supplier_id", "received_on"]);
  });

  await knex.schema.createTable("blocks", (t) => {
    t.increments("id");
    t.text("code").notNullable();
    t.integer("grade_id").notNullable().references("grades.id");
    t.text("lot").notNullable();
    t.integer("delivery_id").nullable().references("deliveries.id");
    t.integer("parent_id").nullable().references("blocks.id");
    t.specificType("origin_in_parent", "numeric(10,2)[]").nullable();
    t.decimal("nominal_x", 10, 2).notNullable();
    t.decimal("nominal_y", 10, 2).notNullable();
    t.decimal("nominal_z", 10, 2).notNullable();
    t.decimal("size_x", 10, 2).notNullable();
    t.decimal("size_y", 10, 2).notNullable();
    t.decimal("size_z", 10, 2).notNullable();
    t.decimal("weight_kg", 10, 3).nullable();
    t.decimal("cost", 12, 2).notNullable().defaultTo(0);
    t.text("location").notNullable().defaultTo("Unplaced");
    t.date("moulded_on").nullable();
    t.date("cut_not_before").notNullable();
    t.text("status").notNullable().defaultTo("in_stock");
    t.text("notes").nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`CREATE UNIQUE INDEX blocks_code_upper ON blocks (upper(code))`);
  await knex.raw(`CREATE SEQUENCE block_code_seq START 1001`);
  await knex.raw(
    `ALTER TABLE blocks ADD CONSTRAINT blocks_status CHECK (status IN ('in_stock','earmarked','cut','written_off'))`,
  );
  await knex.raw(
    `ALTER TABLE blocks ADD CONSTRAINT blocks_positive CHECK (size_x > 0 AND size_y > 0 AND size_z > 0 AND nominal_x > 0 AND nominal_y > 0 AND nominal_z > 0 AND cost >= 0 AND (weight_kg IS NULL OR weight_kg > 0))`,
  );
  // Volume in m³, kept by Postgres so sorting, filtering and totals never disagree with the sizes.
  await knex.raw(
    `ALTER TABLE blocks ADD COLUMN volume_m3 numeric GENERATED ALWAYS AS (size_x * size_y * size_z / 1e9) STORED`,
  );
  await knex.raw(`CREATE INDEX blocks_list ON blocks (status, grade_id, cut_not_before, id)`);
  await knex.raw(`CREATE INDEX blocks_location ON blocks (location)`);
  await knex.raw(`CREATE INDEX blocks_parent ON blocks (parent_id)`);
  await knex.raw(`CREATE INDEX blocks_created ON blocks (created_at, id)`);
  await knex.raw(`CREATE INDEX blocks_volume ON blocks (volume_m3)`);
  await knex.raw(`CREATE INDEX blocks_code_trgm ON blocks (upper(code) text_pattern_ops)`);

  await knex.schema.createTable("defect_zones", (t) => {
    t.increments("id");
    t.integer("block_id").notNullable().references("blocks.id");
    t.text("kind").notNullable();
    t.decimal("min_x", 10, 2).notNullable();
    t.decimal("min_y", 10, 2).notNullable();
    t.decimal("min_z", 10, 2).notNullable();
    t.decimal("max_x", 10, 2).notNullable();
    t.decimal("max_y", 10, 2).notNullable();
    t.decimal("max_z", 10, 2).notNullable();
    t.text("found_by").nullable().references("users.id");
    t.timestamp("found_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("note").nullable();
    t.integer("inherited_from").nullable().references("defect_zones.id");
    t.index(["block_id"]);
  });
  await knex.raw(
    `ALTER TABLE defect_zones ADD CONSTRAINT defect_kind CHECK (kind IN ('void','poor_fusion','crush','wet_core','inclusion','off_density','other'))`,
  );
  await knex.raw(
    `ALTER TABLE defect_zones ADD CONSTRAINT defect_box CHECK (min_x >= 0 AND min_y >= 0 AND min_z >= 0 AND max_x > min_x AND max_y > min_y AND max_z > min_z)`,
  );

  await knex.schema.createTable("defect_photos", (t) => {
    t.increments("id");
    t.integer("defect_id").notNullable().references("defect_zones.id");
    t.text("object_key").notNullable().unique();
    t.text("thumb_key").notNullable();
    t.text("content_type").notNullable();
    t.integer("bytes").notNullable();
    t.integer("width").nullable();
    t.integer("height").nullable();
    t.text("uploaded_by").nullable().references("users.id");
    t.timestamp("uploaded_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["defect_id"]);
  });

  // Append-only: every movement of stock. delta_m3 / delta_value are the change to stock on hand
  // (zero for reserve and release, which only change what is free to plan).
  await knex.schema.createTable("stock_ledger", (t) => {
    t.bigIncrements("id");
    t.integer("block_id").notNullable().references("blocks.id");
    t.text("kind").notNullable();
    t.specificType("volume_m3", "numeric").notNullable(); // the volume the entry concerns (≥ 0)
    t.specificType("delta_m3", "numeric").notNullable();
    t.decimal("value", 14, 2).notNullable().defaultTo(0); // the value the entry concerns (≥ 0)
    t.decimal("delta_value", 14, 2).notNullable().defaultTo(0);
    t.text("user_id").nullable().references("users.id");
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("reason").nullable();
    t.text("ref").nullable(); // delivery, plan or import this came from
    t.index(["block_id", "at"]);
    t.index(["at"]);
    t.index(["kind", "at"]);
  });
  await knex.raw(
    `ALTER TABLE stock_ledger ADD CONSTRAINT ledger_kind CHECK (kind IN ('received','reserved','released','consumed','offcut_created','scrapped','adjusted'))`,
  );
  await knex.raw(`
    CREATE FUNCTION stock_ledger_append_only() RETURNS trigger AS $$
    BEGIN
      RAISE EXCEPTION 'stock_ledger is append-only: % refused', TG_OP;
    END $$ LANGUAGE plpgsql;
    CREATE TRIGGER stock_ledger_no_update BEFORE UPDATE OR DELETE ON stock_ledger
      FOR EACH ROW EXECUTE FUNCTION stock_ledger_append_only();
  `);

  await knex.schema.createTable("csv_imports", (t) => {
    t.increments("id");
    t.text("kind").notNullable(); // deliveries | stock_count
    t.text("file_name").nullable();
    t.integer("rows").notNullable();
    t.text("imported_by").nullable().references("users.id");
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("csv_imports");
  await knex.raw("DROP TRIGGER IF EXISTS stock_ledger_no_update ON stock_ledger");
  await knex.raw("DROP FUNCTION IF EXISTS stock_ledger_append_only()");
  await knex.raw("DROP SEQUENCE IF EXISTS block_code_seq");
  for (const t of ["stock_ledger", "defect_photos", "defect_zones", "blocks", "deliveries", "suppliers", "grades"]) {
    await knex.schema.dropTableIfExists(t);
  }
}
