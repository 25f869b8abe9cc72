import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { db } from "@/db";
import { isRole, type Role } from "@/lib/roles";

import type { UserSummary } from "@/lib/user-types";

export type { UserSummary };

interface UserRow {
  id: string;
  email: string;
  name: string;
  active: boolean;
  must_change_password: boolean;
  created_at: Date;
  roles: string[] | null;
}

function toUser(r: UserRow): UserSummary {
  return {
    id: r.id,
    email: r.email,
    name: r.name,
    active: r.active,
    mustChangePassword: r.must_change_password,
    roles: (r.roles ?? []).filter(isRole),
    createdAt: r.created_at.toISOString(),
  };
}

function usersWithRoles(k: Knex | Knex.Transaction) {
  return k("users as u")
    .leftJoin("user_roles as r", "r.user_id", "u.id")
    .groupBy("u.id")
    .select(
      "u.id",
      "u.email",
      "u.name",
      "u.active",
      "u.must_change_password",
      "u.created_at",
      k.raw("coalesce(array_agg(r.role ORDER BY r.role) FILTER (WHERE r.role IS NOT NULL), '{}') as roles"),
    );
}

export async function listUsers(): Promise<UserSummary[]> {
  const rows: UserRow[] = await usersWithRoles(db()).orderBy([{ column: "u.active", order: "desc" }, "u.name"]);
  return rows.map(toUser);
}

export async function getUser(id: string): Promise<UserSummary | undefined> {
  const row: UserRow | undefined = await usersWithRoles(db()).where("u.id", id).first();
  return row ? toUser(row) : undefined;
}

export async function findUserForSignIn(email: string) {
  return db()("users")
    .whereRaw("lower(email) = lower(?)", [email])
    .first<{ id: string; password_hash: string; active: boolean } | undefined>("id", "password_hash", "active");
}

export async function getPasswordHash(userId: string): Promise<string | undefined> {
  const row = await db()("users").where({ id: userId }).first<{ password_hash: string } | undefined>("password_hash");
  return row?.password_hash;
}

export async function emailTaken(email: string, exceptId?: string): Promise<boolean> {
  const q = db()("users").whereRaw("lower(email) = lower(?)", [email]);
  if (exceptId) q.whereNot("id", exceptId);
  return Boolean(await q.first("id"));
}

export async function createUser(
  input: { email: string; name: string; passwordHash: string; roles: Role[] },
  actorId: string,
): Promise<string> {
  const id = `u-${crypto.randomUUID()}`;
  await db().transaction(async (trx) => {
    await trx("users").insert({
      id,
      email: input.email,
      name: input.name,
      password_hash: input.passwordHash,
      must_change_password: true,
    });
    await trx("user_roles").insert(input.roles.map((role) => ({ user_id: id, role })));
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "user.create",
      subject: id,
      detail: { email: input.email, roles: input.roles },
    });
  });
  return id;
}

export async function updateUser(
  id: string,
  patch: { name?: string; roles?: Role[]; active?: boolean },
  actorId: string,
): Promise<void> {
  await db().transaction(async (trx) => {
    const fields: Record<string, unknown> = {};
    if (patch.name !== undefined) fields.name = patch.name;
    if (patch.active !== undefined) fields.active = patch.active;
    if (Object.keys(fields).length)
      await trx("users")
        .where({ id })
        .update({ ...fields, updated_at: trx.fn.now() });
    if (patch.roles) {
      await trx("user_roles").where({ user_id: id }).delete();
      await trx("user_roles").insert(patch.roles.map((role) => ({ user_id: id, role })));
    }
    if (patch.active === false) await trx("user_sessions").where({ user_id: id }).delete();
    await trx("audit_log").insert({ actor_id: actorId, action: "user.update", subject: id, detail: patch });
  });
}

/** Sets a password and ends every session of that user (the caller opens a new one if it should). */
export async function setPassword(
  id: string,
  passwordHash: string,
  opts: { temporary: boolean; actorId: string },
): Promise<void> {
  await db().transaction(async (trx) => {
    await trx("users")
      .where({ id })
      .update({ password_hash: passwordHash, must_change_password: opts.temporary, updated_at: trx.fn.now() });
    await trx("user_sessions").where({ user_id: id }).delete();
    await trx("audit_log").insert({
      actor_id: opts.actorId,
      action: opts.temporary ? "user.temporary_password" : "user.password_change",
      subject: id,
    });
  });
}

export async function countActiveAdmins(exceptId?: string): Promise<number> {
  const q = db()("users as u")
    .join("user_roles as r", "r.user_id", "u.id")
    .where({ "u.active": true, "r.role": "admin" });
  if (exceptId) q.whereNot("u.id", exceptId);
  const row = await q.countDistinct<{ n: number }[]>({ n: "u.id" }).first();
  return Number(row?.n ?? 0);
}
