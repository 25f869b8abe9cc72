import knex, { type Knex } from "knex";
import crypto from "node:crypto";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/roles";

let k: Knex | undefined;

/** Direct access to the test database, for arranging fixtures and checking what changed. */
export function testDb(): Knex {
  k ??= knex({ client: "pg", connection: process.env.DATABASE_URL, pool: { min: 0, max: 4 } });
  return k;
}

export async function closeTestDb() {
  await k?.destroy();
  k = undefined;
}

export const TEST_PASSWORD = "test-password-123";
let hashed: Promise<string> | undefined;

/** A throwaway user holding `roles`, signed-in-able with TEST_PASSWORD. */
export async function makeUser(roles: Role[], opts: { active?: boolean } = {}) {
  hashed ??= hashPassword(TEST_PASSWORD);
  const id = `u-test-${crypto.randomUUID()}`;
  const email = `${id}@test.blockyard.test`;
  await testDb()("users").insert({ id, email, name: `Test ${roles.join("+") || "nobody"}`, password_hash: await hashed, active: opts.active ?? true });
  if (roles.length) await testDb()("user_roles").insert(roles.map((role) => ({ user_id: id, role })));
  return { id, email };
}

/** Row counts of every table: a refused request must leave them all as they were. */
export async function tableCounts(): Promise<Record<string, number>> {
  const tables = await testDb()
    .select("tablename")
    .from("pg_tables")
    .where({ schemaname: "public" })
    .whereNotIn("tablename", ["knex_migrations", "knex_migrations_lock", "sign_in_failures", "user_sessions"]);
  const out: Record<string, number> = {};
  for (const { tablename } of tables as { tablename: string }[]) {
    const row = await testDb()(tablename).count<{ n: string }[]>({ n: "*" }).first();
    out[tablename] = Number(row?.n ?? 0);
  }
  return out;
}
