import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { MachineGradesRow, MachinesRow } from "@/db/tables";
import { HttpError } from "@/lib/errors";
import type { Machine } from "@/lib/planning/machine";
import type { MachineInput } from "@/lib/validations/machines";

/** A stored machine, with its calibrated kerf and feed per grade. */
export interface StoredMachine extends Machine {
  id: number;
  active: boolean;
  grades: { gradeId: number; kerf: number; feed: number }[];
}

function toMachine(r: MachinesRow, grades: MachineGradesRow[]): StoredMachine {
  return {
    id: r.id,
    name: r.name,
    kind: r.kind as Machine["kind"],
    wire: r.wire as Machine["wire"],
    wireLength: r.wire_length_mm,
    travel: [r.travel_x_mm, r.travel_y_mm],
    maxPiece: [r.max_length_mm, r.max_width_mm, r.max_height_mm],
    turntable: r.turntable,
    rapid: r.rapid_mm_per_min,
    heatUpS: r.heat_up_s,
    handlingS: r.handling_s,
    dialect: {
      unitWords: r.unit_words as Machine["dialect"]["unitWords"],
      inch: r.inch,
      heatOn: r.heat_on,
      heatOff: r.heat_off,
      axes: [r.axis_x, r.axis_y],
      towerAxes: r.four_axis && r.axis_u && r.axis_v ? [r.axis_u, r.axis_v] : null,
      lineNumbers: r.line_numbers,
    },
    fourAxis: r.four_axis,
    active: r.active,
    grades: grades
      .filter((g) => g.machine_id === r.id)
      .map((g) => ({ gradeId: g.grade_id, kerf: g.kerf_mm, feed: g.feed_mm_per_min })),
  };
}

function toRow(m: MachineInput): Partial<MachinesRow> {
  return {
    name: m.name,
    kind: m.kind,
    wire: m.wire,
    wire_length_mm: m.wireLength,
    travel_x_mm: m.travel[0],
    travel_y_mm: m.travel[1],
    max_length_mm: m.maxPiece[0],
    max_width_mm: m.maxPiece[1],
    max_height_mm: m.maxPiece[2],
    turntable: m.turntable,
    rapid_mm_per_min: m.rapid,
    heat_up_s: m.heatUpS,
    handling_s: m.handlingS,
    unit_words: m.dialect.unitWords,
    inch: m.dialect.inch,
    heat_on: m.dialect.heatOn,
    heat_off: m.dialect.heatOff,
    axis_x: m.dialect.axes[0],
    axis_y: m.dialect.axes[1],
    line_numbers: m.dialect.lineNumbers,
    four_axis: m.fourAxis,
    axis_u: m.fourAxis ? (m.dialect.towerAxes?.[0] ?? null) : null,
    axis_v: m.fourAxis ? (m.dialect.towerAxes?.[1] ?? null) : null,
    active: m.active,
  };
}

export async function listMachines(opts: { activeOnly?: boolean } = {}, k: Knex = db()): Promise<StoredMachine[]> {
  const q = k<MachinesRow>("machines").orderBy([{ column: "kind" }, { column: "name" }]);
  if (opts.activeOnly) q.where({ active: true });
  const rows = await q;
  const grades = rows.length
    ? await k<MachineGradesRow>("machine_grades").whereIn(
        "machine_id",
        rows.map((r) => r.id),
      )
    : [];
  return rows.map((r) => toMachine(r, grades));
}

export async function getMachine(id: number, k: Knex = db()): Promise<StoredMachine | undefined> {
  const r = await k<MachinesRow>("machines").where({ id }).first();
  if (!r) return undefined;
  return toMachine(r, await k<MachineGradesRow>("machine_grades").where({ machine_id: id }));
}

const duplicateName = (e: unknown) =>
  (e as { code?: string; constraint?: string }).code === "23505"
    ? new HttpError(409, "A machine of that name exists already.", { name: "Choose another name." })
    : e;

export async function createMachine(m: MachineInput, actorId: string): Promise<StoredMachine> {
  try {
    return await db().transaction(async (trx) => {
      const [row] = await trx<MachinesRow>("machines").insert(toRow(m)).returning("*");
      await trx("audit_log").insert({
        actor_id: actorId,
        action: "machine.create",
        subject: `machine:${row!.id}`,
        detail: m,
      });
      return toMachine(row!, []);
    });
  } catch (e) {
    throw duplicateName(e);
  }
}

export async function updateMachine(id: number, m: MachineInput, actorId: string): Promise<StoredMachine> {
  try {
    return await db().transaction(async (trx) => {
      const [row] = await trx<MachinesRow>("machines")
        .where({ id })
        .update({ ...toRow(m), updated_at: trx.fn.now() as unknown as Date })
        .returning("*");
      if (!row) throw new HttpError(404, "That machine was not found.");
      await trx("audit_log").insert({
        actor_id: actorId,
        action: "machine.update",
        subject: `machine:${id}`,
        detail: m,
      });
      return toMachine(row, await trx<MachineGradesRow>("machine_grades").where({ machine_id: id }));
    });
  } catch (e) {
    throw duplicateName(e);
  }
}

/** Replaces a machine's calibrated kerf and feed per grade (grades not listed take the shop defaults). */
export async function setMachineGrades(
  id: number,
  grades: { gradeId: number; kerf: number; feed: number }[],
  actorId: string,
): Promise<StoredMachine> {
  return db().transaction(async (trx) => {
    const m = await trx<MachinesRow>("machines").where({ id }).forUpdate().first();
    if (!m) throw new HttpError(404, "That machine was not found.");
    const fields: Record<string, string> = {};
    const ids = grades.map((g) => g.gradeId);
    const known = new Set((await trx("grades").whereIn("id", ids).select("id")).map((r: { id: number }) => r.id));
    grades.forEach((g, i) => {
      if (!known.has(g.gradeId)) fields[`grades.${i}.gradeId`] = "No such grade.";
      else if (ids.indexOf(g.gradeId) !== i) fields[`grades.${i}.gradeId`] = "That grade is listed twice.";
    });
    if (Object.keys(fields).length) throw new HttpError(400, "Some grades need attention.", fields);
    await trx("machine_grades").where({ machine_id: id }).delete();
    if (grades.length)
      await trx("machine_grades").insert(
        grades.map((g) => ({ machine_id: id, grade_id: g.gradeId, kerf_mm: g.kerf, feed_mm_per_min: g.feed })),
      );
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "machine.grades",
      subject: `machine:${id}`,
      detail: { grades },
    });
    return toMachine(m, await trx<MachineGradesRow>("machine_grades").where({ machine_id: id }));
  });
}

/**
 * Kerf and feed of a machine for a set of grades: the calibrated values where they exist, the
 * shop's defaults elsewhere. A run takes the widest kerf among its grades (a narrower kerf could
 * make pieces overlap when the wider grade is cut); feed is per grade.
 */
export function kerfAndFeed(
  m: Pick<StoredMachine, "grades">,
  gradeIds: readonly (number | null)[],
  defaults: { kerf: number; feed: number },
): { kerf: number; feedByGrade: Map<number | null, number> } {
  let kerf = 0;
  const feedByGrade = new Map<number | null, number>();
  for (const g of gradeIds.length ? gradeIds : [null]) {
    const cal = g === null ? undefined : m.grades.find((x) => x.gradeId === g);
    kerf = Math.max(kerf, cal?.kerf ?? defaults.kerf);
    feedByGrade.set(g, cal?.feed ?? defaults.feed);
  }
  return { kerf, feedByGrade };
}
