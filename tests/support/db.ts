import knex, { type Knex } from "knex";
import crypto from "node:crypto";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/roles";
// Rows arrive as the app reads them (NUMERIC as numbers, DATE as 'YYYY-MM-DD'), as db/tables.ts says.
import "@/db/types";

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
  await testDb()("users").insert({
    id,
    email,
    name: `Test ${roles.join("+") || "nobody"}`,
    password_hash: await hashed,
    active: opts.active ?? true,
  });
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
    const row = await testDb()(tablename).count<{ n: number }[]>({ n: "*" }).first();
    out[tablename] = Number(row?.n ?? 0);
  }
  return out;
}

let blockSeq = 0;

/** A block in stock (with its "received" ledger row, so ledger totals still reconcile). */
/**
 * A grade of the test's own (EPS, cured in a day, no reorder point): stock received in a demo grade
 * lifts it over its reorder point for the buyer's tests, and parts of a grade are offered only that
 * grade's blocks (the new-plan form offers the oldest 500 ready blocks, and the suite's database
 * holds more than that of the demo grades by the end).
 */
export async function makeGrade(prefix = "TG"): Promise<{ id: number; code: string }> {
  const code = `${prefix}-${process.pid}-${Date.now().toString(36)}-${++blockSeq}`.toUpperCase();
  const [g] = await testDb()("grades")
    .insert({ code, material: "EPS", grade_system: "shop", grade: "test", cure_days: 1 })
    .returning(["id", "code"]);
  return g!;
}

export async function makeBlock(
  opts: {
    size?: [number, number, number];
    gradeCode?: string;
    location?: string;
    cutNotBefore?: string;
    cost?: number;
    /** A code of the test's own (default: a unique one). */
    code?: string;
  } = {},
) {
  const k = testDb();
  const grade = (await k("grades")
    .where({ code: opts.gradeCode ?? "EPS-II" })
    .first("id"))!;
  const size = opts.size ?? [2000, 1000, 500];
  const code = opts.code ?? `T-${process.pid}-${Date.now().toString(36)}-${++blockSeq}`.toUpperCase();
  const [b] = await k("blocks")
    .insert({
      code,
      grade_id: grade.id,
      lot: "TEST-LOT",
      nominal_x: size[0],
      nominal_y: size[1],
      nominal_z: size[2],
      size_x: size[0],
      size_y: size[1],
      size_z: size[2],
      cost: opts.cost ?? 100,
      location: opts.location ?? "Test bay",
      cut_not_before: opts.cutNotBefore ?? "2020-01-01",
      status: "in_stock",
    })
    .returning(["id", "code", "volume_m3"]);
  await k("stock_ledger").insert({
    block_id: b!.id,
    kind: "received",
    volume_m3: b!.volume_m3!,
    delta_m3: b!.volume_m3!,
    value: opts.cost ?? 100,
    delta_value: opts.cost ?? 100,
    reason: "test fixture",
  });
  return { id: b!.id, code: b!.code };
}

/**
 * Ledger on hand minus the volume of blocks in the yard (in stock, earmarked or on hold: a hold
 * moves nothing): zero when every movement was recorded.
 */
export async function ledgerGap(): Promise<{ m3: number; value: number }> {
  // One statement, so one snapshot: a delivery committed by a test running beside this one (the
  // browser tests) between two separate reads would show as a gap.
  const { rows } = await testDb().raw(
    `SELECT (SELECT coalesce(sum(delta_m3), 0) FROM stock_ledger) - (SELECT coalesce(sum(volume_m3), 0) FROM blocks WHERE status IN ('in_stock', 'earmarked', 'on_hold')) AS m3,
            (SELECT coalesce(sum(delta_value), 0) FROM stock_ledger) - (SELECT coalesce(sum(cost), 0) FROM blocks WHERE status IN ('in_stock', 'earmarked', 'on_hold')) AS value`,
  );
  return { m3: Number(rows[0].m3), value: Number(rows[0].value) };
}
