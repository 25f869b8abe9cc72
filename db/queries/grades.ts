import "server-only";
import { db } from "@/db";
import type { GradesRow, GradesInsert } from "@/db/tables";
import type { GradeInput } from "@/lib/validations/stock";
import type { Material } from "@/lib/stock";
import { HttpError } from "@/lib/errors";

export interface Grade {
  id: number;
  code: string;
  material: Material;
  gradeSystem: string;
  grade: string;
  nominalDensity: number | null;
  minDensity: number | null;
  cureDays: number;
  neverHotWire: boolean;
  colour: string;
  priceUnit: "m3" | "bf";
  notes: string | null;
  active: boolean;
}

function toGrade(r: GradesRow): Grade {
  return {
    id: r.id,
    code: r.code,
    material: r.material,
    gradeSystem: r.grade_system,
    grade: r.grade,
    nominalDensity: r.nominal_density_kg_m3,
    minDensity: r.min_density_kg_m3,
    cureDays: r.cure_days,
    neverHotWire: r.never_hot_wire,
    colour: r.colour,
    priceUnit: r.price_unit,
    notes: r.notes,
    active: r.active,
  };
}

function toRow(g: GradeInput): GradesInsert {
  return {
    code: g.code,
    material: g.material,
    grade_system: g.gradeSystem,
    grade: g.grade,
    nominal_density_kg_m3: g.nominalDensity ?? null,
    min_density_kg_m3: g.minDensity ?? null,
    cure_days: g.cureDays,
    never_hot_wire: g.neverHotWire,
    colour: g.colour,
    price_unit: g.priceUnit,
    notes: g.notes ?? null,
  };
}

export async function listGrades(): Promise<Grade[]> {
  return (await db()("grades").orderBy(["material", "code"])).map(toGrade);
}

/** The grades a part may ask for, as form choices: active ones that may be hot-wired. */
export function partGradeChoices(grades: readonly Grade[]): { id: number; code: string }[] {
  return grades.filter((g) => !g.neverHotWire && g.active).map((g) => ({ id: g.id, code: g.code }));
}

export async function getGrade(id: number): Promise<Grade | undefined> {
  const r = await db()("grades").where({ id }).first();
  return r ? toGrade(r) : undefined;
}

async function assertCodeFree(code: string, exceptId?: number) {
  const q = db()("grades").whereRaw("lower(code) = lower(?)", [code]);
  if (exceptId) q.whereNot("id", exceptId);
  if (await q.first("id"))
    throw new HttpError(409, "Some fields need attention.", { code: "A grade with that code already exists." });
}

export async function createGrade(g: GradeInput, actorId: string): Promise<Grade> {
  await assertCodeFree(g.code);
  return db().transaction(async (trx) => {
    const [row] = await trx("grades").insert(toRow(g)).returning("*");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "grade.create",
      subject: `grade:${row!.id}`,
      detail: g,
    });
    return toGrade(row!);
  });
}

export async function updateGrade(id: number, g: GradeInput, actorId: string): Promise<Grade> {
  await assertCodeFree(g.code, id);
  return db().transaction(async (trx) => {
    const [row] = await trx("grades").where({ id }).update(toRow(g)).returning("*");
    if (!row) throw new HttpError(404, "That grade was not found.");
    await trx("audit_log").insert({ actor_id: actorId, action: "grade.update", subject: `grade:${id}`, detail: g });
    return toGrade(row);
  });
}
