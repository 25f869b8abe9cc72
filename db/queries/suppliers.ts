import "server-only";
import { db } from "@/db";
import type { SuppliersInsert, SuppliersRow } from "@/db/tables";
import type { SupplierInput } from "@/lib/validations/stock";
import { HttpError } from "@/lib/errors";

export interface Supplier {
  id: number;
  name: string;
  contact: string | null;
  email: string | null;
  phone: string | null;
  /** Working days, as the supplier quotes them. */
  leadTimeDays: number;
  /** One standard deviation of its deliveries against the promised date, working days (its own figure). */
  leadTimeSdDays: number;
  notes: string | null;
  active: boolean;
}

const toSupplier = (r: SuppliersRow): Supplier => ({
  id: r.id,
  name: r.name,
  contact: r.contact,
  email: r.email,
  phone: r.phone,
  leadTimeDays: r.lead_time_days,
  leadTimeSdDays: r.lead_time_sd_days,
  notes: r.notes,
  active: r.active,
});

const toRow = (s: SupplierInput): SuppliersInsert => ({
  name: s.name,
  contact: s.contact ?? null,
  email: s.email ?? null,
  phone: s.phone ?? null,
  lead_time_days: s.leadTimeDays,
  ...(s.leadTimeSdDays === undefined ? {} : { lead_time_sd_days: s.leadTimeSdDays }),
  notes: s.notes ?? null,
  ...(s.active === undefined ? {} : { active: s.active }),
});

export async function listSuppliers(): Promise<Supplier[]> {
  return (await db()("suppliers").orderBy([{ column: "active", order: "desc" }, "name"])).map(toSupplier);
}

export async function getSupplier(id: number): Promise<Supplier | undefined> {
  const r = await db()("suppliers").where({ id }).first();
  return r ? toSupplier(r) : undefined;
}

async function assertNameFree(name: string, exceptId?: number) {
  const q = db()("suppliers").whereRaw("lower(name) = lower(?)", [name]);
  if (exceptId) q.whereNot("id", exceptId);
  if (await q.first("id"))
    throw new HttpError(409, "Some fields need attention.", { name: "A supplier with that name already exists." });
}

export async function createSupplier(s: SupplierInput, actorId: string): Promise<Supplier> {
  await assertNameFree(s.name);
  return db().transaction(async (trx) => {
    const [row] = await trx("suppliers").insert(toRow(s)).returning("*");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "supplier.create",
      subject: `supplier:${row!.id}`,
      detail: s,
    });
    return toSupplier(row!);
  });
}

export async function updateSupplier(id: number, s: SupplierInput, actorId: string): Promise<Supplier> {
  await assertNameFree(s.name, id);
  return db().transaction(async (trx) => {
    const [row] = await trx("suppliers").where({ id }).update(toRow(s)).returning("*");
    if (!row) throw new HttpError(404, "That supplier was not found.");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "supplier.update",
      subject: `supplier:${id}`,
      detail: s,
    });
    return toSupplier(row);
  });
}
