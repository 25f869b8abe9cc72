import type { Knex } from "knex";
import { hashPassword } from "../../lib/auth/password";

/**
 * The demo shop: Hollowfield Foamworks, an invented three-bay shop that cuts model-aircraft cores,
 * sign letters and stage props. Every person and company in the demo data is invented.
 */
export const DEMO_PASSWORD = "blockyard-demo";

export const DEMO_USERS = [
  { id: "u-admin", email: "admin@demo.blockyard.test", name: "Noor Okafor", roles: ["admin"] },
  { id: "u-buyer", email: "buyer@demo.blockyard.test", name: "Tobias Wren", roles: ["buyer"] },
  { id: "u-cutter", email: "cutter@demo.blockyard.test", name: "Ilse Marrow", roles: ["cutter"] },
  { id: "u-planner", email: "planner@demo.blockyard.test", name: "Dev Castellan", roles: ["planner"] },
  { id: "u-manager", email: "manager@demo.blockyard.test", name: "Ruth Penhallow", roles: ["manager"] },
] as const;

export async function seed(knex: Knex): Promise<void> {
  await knex.raw("TRUNCATE users, user_roles, user_sessions, sign_in_failures, shop_settings, audit_log CASCADE");
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const u of DEMO_USERS) {
    await knex("users").insert({ id: u.id, email: u.email, name: u.name, password_hash: passwordHash });
    await knex("user_roles").insert(u.roles.map((role) => ({ user_id: u.id, role })));
  }
  await knex("shop_settings").insert({
    id: 1,
    shop_name: "Hollowfield Foamworks",
    display_units: "mm",
    kerf_mm: 1.5,
    trim_mm: 6,
    defect_margin_mm: 10,
    min_offcut_x_mm: 150,
    min_offcut_y_mm: 150,
    min_offcut_z_mm: 25,
    layout: "guillotine",
    feed_mm_per_min: 300,
    nesting_time_limit_ms: 3000,
  });
}
