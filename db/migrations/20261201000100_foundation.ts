import type { Knex } from "knex";

export const ROLES = ["admin", "buyer", "cutter", "planner", "manager"] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("users", (t) => {
    t.text("id").primary();
    t.text("email").notNullable();
    t.text("name").notNullable();
    t.text("password_hash").notNullable();
    t.boolean("active").notNullable().defaultTo(true);
    t.boolean("must_change_password").notNullable().defaultTo(false);
    t.text("display_units").nullable(); // null: follow the shop setting
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`CREATE UNIQUE INDEX users_email_lower ON users (lower(email))`);
  await knex.raw(`ALTER TABLE users ADD CONSTRAINT users_display_units CHECK (display_units IN ('mm','in'))`);

  await knex.schema.createTable("user_roles", (t) => {
    t.text("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("role").notNullable();
    t.primary(["user_id", "role"]);
  });
  await knex.raw(
    `ALTER TABLE user_roles ADD CONSTRAINT user_roles_role CHECK (role IN (${ROLES.map((r) => `'${r}'`).join(",")}))`,
  );

  // Lucia's session table: id, user_id, expires_at are what its adapter reads and writes.
  await knex.schema.createTable("user_sessions", (t) => {
    t.text("id").primary();
    t.text("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["user_id"]);
  });

  await knex.schema.createTable("sign_in_failures", (t) => {
    t.bigIncrements("id");
    t.text("account").notNullable(); // lower-cased e-mail as typed
    t.text("client").notNullable();
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["account", "at"]);
    t.index(["client", "at"]);
  });

  await knex.schema.createTable("shop_settings", (t) => {
    t.integer("id").primary().defaultTo(1);
    t.text("shop_name").notNullable();
    t.text("display_units").notNullable().defaultTo("mm");
    t.decimal("kerf_mm", 8, 2).notNullable().defaultTo(1.5);
    t.decimal("trim_mm", 8, 2).notNullable().defaultTo(6);
    t.decimal("defect_margin_mm", 8, 2).notNullable().defaultTo(10);
    t.decimal("min_offcut_x_mm", 10, 2).notNullable().defaultTo(150);
    t.decimal("min_offcut_y_mm", 10, 2).notNullable().defaultTo(150);
    t.decimal("min_offcut_z_mm", 10, 2).notNullable().defaultTo(25);
    t.text("layout").notNullable().defaultTo("guillotine");
    t.decimal("feed_mm_per_min", 10, 2).notNullable().defaultTo(300);
    t.integer("nesting_time_limit_ms").notNullable().defaultTo(3000);
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("updated_by").nullable().references("users.id");
  });
  await knex.raw(`ALTER TABLE shop_settings ADD CONSTRAINT shop_settings_single CHECK (id = 1)`);
  await knex.raw(`ALTER TABLE shop_settings ADD CONSTRAINT shop_settings_units CHECK (display_units IN ('mm','in'))`);
  await knex.raw(
    `ALTER TABLE shop_settings ADD CONSTRAINT shop_settings_layout CHECK (layout IN ('guillotine','layers','free'))`,
  );

  // Who changed what: every admin action and stock movement writes one row.
  await knex.schema.createTable("audit_log", (t) => {
    t.bigIncrements("id");
    t.text("actor_id").nullable().references("users.id");
    t.text("action").notNullable();
    t.text("subject").nullable();
    t.jsonb("detail").nullable();
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("audit_log");
  await knex.schema.dropTableIfExists("shop_settings");
  await knex.schema.dropTableIfExists("sign_in_failures");
  await knex.schema.dropTableIfExists("user_sessions");
  await knex.schema.dropTableIfExists("user_roles");
  await knex.schema.dropTableIfExists("users");
}
