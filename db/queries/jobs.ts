import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";
import { cellReader, parseCsv, problemSummary, type CsvProblem } from "@/lib/csv";
import { MIN_SIZE_MM } from "@/lib/units";
import { PART_CSV_COLUMNS, ROTATE_RULES, type JobStatus, type RotateRule } from "@/lib/job-terms";
import { ProfileError, partGeometry, parsePoints, parseNaca, type Profile } from "@/lib/profiles";
import type { ImportReport } from "./imports";
import type { JobInput, JobPartPatch, JobPatch, JobQuery, PartInput } from "@/lib/validations/jobs";
import type { Vec3 } from "@/lib/nesting";

export interface Job {
  id: number;
  name: string;
  customer: string | null;
  dueOn: string | null;
  status: JobStatus;
  notes: string | null;
  createdAt: string;
  createdBy: string | null;
  /** Part lines on the job. */
  lineCount: number;
  /** Pieces to cut: the sum of the lines' quantities. */
  pieceCount: number;
  /** Foam in the finished parts, m³ (profile volume where there is one, else the box). */
  partVolumeM3: number;
}

export interface JobPart {
  id: number;
  jobId: number;
  libraryPartId: number | null;
  name: string;
  quantity: number;
  /** Bounding box for nesting, mm: x along the wire. */
  size: Vec3;
  rotate: RotateRule;
  gradeId: number | null;
  gradeCode: string | null;
  profile: Profile | null;
  /** Foam in one finished part, mm³; null when the part has no profile (its box counts). */
  trueVolumeMm3: number | null;
}

interface JobRow {
  id: number;
  name: string;
  customer: string | null;
  due_on: string | null;
  status: JobStatus;
  notes: string | null;
  created_at: Date;
  created_by: string | null;
  line_count: number;
  piece_count: number | null;
  part_volume_mm3: number | null;
}

interface PartRow {
  id: number;
  job_id: number;
  library_part_id: number | null;
  name: string;
  quantity: number;
  size_x: number;
  size_y: number;
  size_z: number;
  rotate: RotateRule;
  grade_id: number | null;
  grade_code: string | null;
  profile: Profile | null;
  true_volume_mm3: number | null;
}

function toJob(r: JobRow): Job {
  return {
    id: r.id,
    name: r.name,
    customer: r.customer,
    dueOn: r.due_on, // DATE: its 'YYYY-MM-DD' text (db/types.ts)
    status: r.status,
    notes: r.notes,
    createdAt: new Date(r.created_at).toISOString(),
    createdBy: r.created_by,
    lineCount: Number(r.line_count ?? 0),
    pieceCount: Number(r.piece_count ?? 0),
    partVolumeM3: Number(r.part_volume_mm3 ?? 0) / 1e9,
  };
}

function toPart(r: PartRow): JobPart {
  return {
    id: r.id,
    jobId: r.job_id,
    libraryPartId: r.library_part_id,
    name: r.name,
    quantity: r.quantity,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)],
    rotate: r.rotate,
    gradeId: r.grade_id,
    gradeCode: r.grade_code,
    profile: r.profile,
    trueVolumeMm3: r.true_volume_mm3 === null ? null : Number(r.true_volume_mm3),
  };
}

function selectJobs(k: Knex) {
  return k("jobs as j").select(
    "j.*",
    k.raw("(SELECT count(*) FROM job_parts p WHERE p.job_id = j.id) AS line_count"),
    k.raw("(SELECT sum(p.quantity) FROM job_parts p WHERE p.job_id = j.id) AS piece_count"),
    k.raw(
      "(SELECT sum(p.quantity * COALESCE(p.true_volume_mm3, p.size_x * p.size_y * p.size_z)) FROM job_parts p WHERE p.job_id = j.id) AS part_volume_mm3",
    ),
  );
}

function applyFilters(q: Knex.QueryBuilder, f: JobQuery) {
  if (f.status === "active") q.whereIn("j.status", ["open", "planned", "cutting"]);
  else if (f.status !== "all") q.where("j.status", f.status);
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q.where((w) => w.whereILike("j.name", like).orWhereILike("j.customer", like));
  }
  return q;
}

/**
 *   listJobs({ status: "open", page: 1, pageSize: 25 })  // { items, total, page, pageSize }
 * Soonest due first (undated last), then oldest.
 */
export async function listJobs(f: JobQuery): Promise<{ items: Job[]; total: number; page: number; pageSize: number }> {
  const k = db();
  const [count] = await applyFilters(k("jobs as j"), f).count<{ n: number }[]>({ n: "*" });
  const rows = await applyFilters(selectJobs(k), f)
    .orderByRaw("j.due_on ASC NULLS LAST, j.id ASC")
    .limit(f.pageSize)
    .offset((f.page - 1) * f.pageSize);
  return { items: rows.map(toJob), total: Number(count?.n ?? 0), page: f.page, pageSize: f.pageSize };
}

export async function getJob(id: number, k: Knex = db()): Promise<Job | undefined> {
  const r = await selectJobs(k).where("j.id", id).first();
  return r ? toJob(r) : undefined;
}

/**
 *   listJobParts([3, 4])  // every part line of jobs 3 and 4, job by job, in the order added
 * The nesting run reads this: `size` is the box to nest, `trueVolumeMm3` the foam for yield.
 */
export async function listJobParts(jobIds: number[], k: Knex = db()): Promise<JobPart[]> {
  if (!jobIds.length) return [];
  const rows = await k("job_parts as p")
    .leftJoin("grades as g", "g.id", "p.grade_id")
    .whereIn("p.job_id", jobIds)
    .select("p.*", "g.code as grade_code")
    .orderBy([{ column: "p.job_id" }, { column: "p.id" }]);
  return rows.map(toPart);
}

/**
 * The nesting box and true volume of a part: from its profile when it has one (a size sent with a
 * profile is ignored), else the size given. A bad profile is a 400 naming the profile field.
 */
export function resolveGeometry(p: { size?: Vec3 | null; profile?: Profile | null }): {
  size: Vec3;
  trueVolumeMm3: number | null;
} {
  if (p.profile) {
    try {
      const g = partGeometry(p.profile);
      if (g.size.some((v) => v > 30_000)) throw new ProfileError("The part's box would be longer than 30,000 mm.");
      if (g.size.some((v) => v <= 0)) throw new ProfileError("The part's box has no size.");
      return g;
    } catch (e) {
      if (e instanceof ProfileError) throw new HttpError(400, "Some fields need attention.", { profile: e.message });
      throw e;
    }
  }
  if (!p.size)
    throw new HttpError(400, "Some fields need attention.", { size: "Give a size, or a profile to compute it from." });
  return { size: p.size, trueVolumeMm3: null };
}

/** A grade a part may ask for: it exists, and it is not one that must never be hot-wired. */
export async function assertGrade(gradeId: number | null, field = "gradeId"): Promise<void> {
  if (gradeId === null) return;
  const g = await db()("grades").where({ id: gradeId }).first("code", "never_hot_wire");
  if (!g) throw new HttpError(400, "Some fields need attention.", { [field]: "No such grade." });
  if (g.never_hot_wire)
    throw new HttpError(400, "Some fields need attention.", {
      [field]: `${g.code} must never be hot-wired; Blockyard plans hot-wire cuts only.`,
    });
}

async function openJob(trx: Knex, jobId: number): Promise<{ id: number; status: JobStatus }> {
  const job = await trx("jobs").where({ id: jobId }).forUpdate().first("id", "status");
  if (!job) throw new HttpError(404, "That job was not found.");
  if (job.status !== "open")
    throw new HttpError(409, "Parts can change only while the job is still taking parts. Set it back to open first.");
  return job;
}

export async function createJob(input: JobInput, actorId: string): Promise<Job> {
  return db().transaction(async (trx) => {
    const [row] = await trx("jobs")
      .insert({
        name: input.name,
        customer: input.customer,
        due_on: input.dueOn ?? null,
        notes: input.notes,
        created_by: actorId,
      })
      .returning("id");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job.create",
      subject: `job:${row!.id}`,
      detail: input,
    });
    return (await getJob(row!.id, trx))!;
  });
}

export async function updateJob(id: number, patch: JobPatch, actorId: string): Promise<Job> {
  return db().transaction(async (trx) => {
    const job = await trx("jobs").where({ id }).forUpdate().first("id", "status");
    if (!job) throw new HttpError(404, "That job was not found.");
    const changes: Record<string, unknown> = {};
    if (patch.name !== undefined) changes.name = patch.name;
    if (patch.customer !== undefined) changes.customer = patch.customer;
    if (patch.dueOn !== undefined) changes.due_on = patch.dueOn;
    if (patch.notes !== undefined) changes.notes = patch.notes;
    if (patch.status !== undefined) changes.status = patch.status;
    if (Object.keys(changes).length) await trx("jobs").where({ id }).update(changes);
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job.update",
      subject: `job:${id}`,
      detail: { ...patch, from: job.status },
    });
    return (await getJob(id, trx))!;
  });
}

function partRow(
  jobId: number,
  p: {
    name: string;
    quantity: number;
    gradeId: number | null;
    rotate: RotateRule;
    profile: Profile | null;
    libraryPartId?: number | null;
  },
  g: { size: Vec3; trueVolumeMm3: number | null },
) {
  return {
    job_id: jobId,
    library_part_id: p.libraryPartId ?? null,
    name: p.name,
    quantity: p.quantity,
    size_x: g.size[0],
    size_y: g.size[1],
    size_z: g.size[2],
    grade_id: p.gradeId,
    rotate: p.rotate,
    profile: p.profile ? JSON.stringify(p.profile) : null,
    true_volume_mm3: g.trueVolumeMm3,
  };
}

/** Adds one part entered by hand; its box and volume come from its profile when it has one. */
export async function addJobPart(jobId: number, input: PartInput, actorId: string): Promise<JobPart> {
  const g = resolveGeometry(input);
  await assertGrade(input.gradeId ?? null);
  return db().transaction(async (trx) => {
    await openJob(trx, jobId);
    const [row] = await trx("job_parts")
      .insert(partRow(jobId, { ...input, gradeId: input.gradeId ?? null, profile: input.profile ?? null }, g))
      .returning("id");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job_part.add",
      subject: `job:${jobId}`,
      detail: { partId: row!.id, ...input },
    });
    return (await listJobParts([jobId], trx)).find((p) => p.id === row!.id)!;
  });
}

/**
 * Checks several parts entered at once before any is added: each one's box and volume from its
 * profile, and its grade. Every problem is named by the part's index (`parts.2.profile`); one bad
 * part refuses them all. Shared by job parts and library parts.
 */
export async function checkParts(
  inputs: { size?: Vec3 | null; profile?: Profile | null; gradeId?: number | null }[],
): Promise<ReturnType<typeof resolveGeometry>[]> {
  const fields: Record<string, string> = {};
  const geometries = inputs.map((input, i) => {
    try {
      return resolveGeometry(input);
    } catch (e) {
      if (!(e instanceof HttpError) || !e.fields) throw e;
      for (const [k, v] of Object.entries(e.fields)) fields[`parts.${i}.${k}`] ??= v;
      return null;
    }
  });
  if (Object.keys(fields).length) throw new HttpError(400, "Some fields need attention.", fields);
  const grades = new Map<number, number>();
  inputs.forEach((p, i) => {
    if (p.gradeId != null && !grades.has(p.gradeId)) grades.set(p.gradeId, i);
  });
  for (const [gradeId, i] of grades) await assertGrade(gradeId, `parts.${i}.gradeId`);
  return geometries as ReturnType<typeof resolveGeometry>[];
}

/**
 * Adds several parts entered at once (the profiles of one drawing, the letters of a word): every
 * part's box and volume from its profile, all added or none (a bad one is named by its index).
 *
 *   addJobParts(3, [{ name: "Letter O", quantity: 2, profile, rotate: "any" }, …], actorId)
 */
export async function addJobParts(jobId: number, inputs: PartInput[], actorId: string): Promise<JobPart[]> {
  const geometries = await checkParts(inputs);
  return db().transaction(async (trx) => {
    await openJob(trx, jobId);
    const rows: { id: number }[] = await trx("job_parts")
      .insert(
        inputs.map((input, i) =>
          partRow(jobId, { ...input, gradeId: input.gradeId ?? null, profile: input.profile ?? null }, geometries[i]!),
        ),
      )
      .returning("id");
    const ids = rows.map((r) => r.id);
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job_part.add",
      subject: `job:${jobId}`,
      detail: { partIds: ids, names: inputs.map((p) => p.name) },
    });
    const byId = new Map((await listJobParts([jobId], trx)).map((p) => [p.id, p]));
    return ids.map((id) => byId.get(id)!);
  });
}

/** Copies library parts onto a job, each with its own quantity; a retired or unknown part is refused by index. */
export async function addLibraryParts(
  jobId: number,
  items: { libraryPartId: number; quantity: number }[],
  actorId: string,
): Promise<JobPart[]> {
  return db().transaction(async (trx) => {
    await openJob(trx, jobId);
    const lib = new Map<number, Record<string, unknown>>(
      (
        await trx("library_parts").whereIn(
          "id",
          items.map((i) => i.libraryPartId),
        )
      ).map((r: { id: number }) => [r.id, r]),
    );
    const fields: Record<string, string> = {};
    items.forEach((it, i) => {
      const l = lib.get(it.libraryPartId);
      if (!l) fields[`items.${i}.libraryPartId`] = "No such library part.";
      else if (!l.active) fields[`items.${i}.libraryPartId`] = `“${String(l.name)}” is retired from the library.`;
    });
    if (Object.keys(fields).length) throw new HttpError(400, "Some fields need attention.", fields);
    const rows = items.map((it) => {
      const l = lib.get(it.libraryPartId)! as {
        id: number;
        name: string;
        size_x: number;
        size_y: number;
        size_z: number;
        grade_id: number | null;
        rotate: RotateRule;
        profile: Profile | null;
        true_volume_mm3: number | null;
      };
      return partRow(
        jobId,
        {
          name: l.name,
          quantity: it.quantity,
          gradeId: l.grade_id,
          rotate: l.rotate,
          profile: l.profile,
          libraryPartId: l.id,
        },
        {
          size: [Number(l.size_x), Number(l.size_y), Number(l.size_z)],
          trueVolumeMm3: l.true_volume_mm3 === null ? null : Number(l.true_volume_mm3),
        },
      );
    });
    const ids = (await trx("job_parts").insert(rows).returning("id")).map((r: { id: number }) => r.id);
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job_part.add_from_library",
      subject: `job:${jobId}`,
      detail: { items },
    });
    return (await listJobParts([jobId], trx)).filter((p) => ids.includes(p.id));
  });
}

export async function updateJobPart(
  jobId: number,
  partId: number,
  patch: JobPartPatch,
  actorId: string,
): Promise<JobPart> {
  if (patch.gradeId !== undefined) await assertGrade(patch.gradeId);
  return db().transaction(async (trx) => {
    await openJob(trx, jobId);
    const changes: Record<string, unknown> = {};
    if (patch.quantity !== undefined) changes.quantity = patch.quantity;
    if (patch.name !== undefined) changes.name = patch.name;
    if (patch.gradeId !== undefined) changes.grade_id = patch.gradeId;
    if (patch.rotate !== undefined) changes.rotate = patch.rotate;
    const q = trx("job_parts").where({ id: partId, job_id: jobId });
    const n = Object.keys(changes).length ? await q.update(changes) : (await q.clone().first("id")) ? 1 : 0;
    if (!n) throw new HttpError(404, "That part is not on this job.");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job_part.update",
      subject: `job:${jobId}`,
      detail: { partId, ...patch },
    });
    return (await listJobParts([jobId], trx)).find((p) => p.id === partId)!;
  });
}

export async function removeJobPart(jobId: number, partId: number, actorId: string): Promise<void> {
  await db().transaction(async (trx) => {
    await openJob(trx, jobId);
    const [gone] = await trx("job_parts")
      .where({ id: partId, job_id: jobId })
      .delete()
      .returning(["id", "name", "quantity"]);
    if (!gone) throw new HttpError(404, "That part is not on this job.");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job_part.remove",
      subject: `job:${jobId}`,
      detail: gone,
    });
  });
}

const MAX_REPORTED = 500;

/**
 * A part-list CSV onto an open job: every row checked (names the row and the column), then all
 * rows added in one transaction, or none. Preview (commit = false) changes nothing.
 * A row is a box (length_mm, width_mm, height_mm), a NACA panel (naca, chord_mm, span_mm, optional
 * tip_chord_mm and sweep_mm) or a polygon extrusion (polygon "x y; x y; …", extrude_mm).
 */
export async function importJobParts(
  jobId: number,
  bytes: Uint8Array,
  fileName: string | null,
  actorId: string,
  commit: boolean,
): Promise<ImportReport> {
  const job = await db()("jobs").where({ id: jobId }).first("id", "status");
  if (!job) throw new HttpError(404, "That job was not found.");
  if (job.status !== "open")
    throw new HttpError(409, "Parts can change only while the job is still taking parts. Set it back to open first.");
  const { rows, rowNumbers, problems } = parseCsv(bytes, PART_CSV_COLUMNS);
  const done = (committed: boolean, summary: Record<string, number>): ImportReport => {
    problems.sort((a, b) => a.row - b.row);
    return {
      ...(problems.length ? { error: problemSummary(problems) } : {}),
      committed,
      rows: rows.length,
      problems: problems.slice(0, MAX_REPORTED),
      problemCount: problems.length,
      warnings: [],
      summary,
    };
  };
  if (problems.some((p) => p.row === 1) || !rows.length) {
    if (!rows.length && !problems.length) problems.push({ row: 2, message: "The file has a header but no rows." });
    return done(false, {});
  }
  const grades = new Map<string, { id: number; code: string; never: boolean }>(
    (await db()("grades").select("id", "code", "never_hot_wire")).map(
      (g: { id: number; code: string; never_hot_wire: boolean }) => [
        g.code.toLowerCase(),
        { id: g.id, code: g.code, never: g.never_hot_wire },
      ],
    ),
  );
  const parts: ReturnType<typeof partRow>[] = [];
  let pieces = 0;
  let volume = 0;
  rows.forEach((r, i) => {
    const row = rowNumbers[i]!;
    const before = problems.length;
    const add = (column: string, message: string) => problems.push({ row, column, message });
    const c = cellReader(problems, row, r);
    const blank = (column: string) => !(r[column] ?? "");
    const name = c.text("name", { required: true, max: 120 });
    const quantity = c.number("quantity", { required: true, positive: true, max: 100_000 });
    if (quantity !== null && quantity > 0 && !Number.isInteger(quantity)) add("quantity", "Must be a whole number.");
    const gradeCode = c.text("grade", { max: 40 });
    const grade = gradeCode ? grades.get(gradeCode.toLowerCase()) : undefined;
    if (gradeCode && !grade) add("grade", `Unknown grade “${gradeCode.slice(0, 40)}”.`);
    else if (grade?.never) add("grade", `${grade.code} must never be hot-wired; Blockyard plans hot-wire cuts only.`);
    const rotate = (r.rotate ?? "").toLowerCase() || "any";
    if (!(ROTATE_RULES as readonly string[]).includes(rotate))
      add("rotate", `“${rotate.slice(0, 20)}” is not any, z or none.`);

    const naca = c.text("naca", { max: 20 });
    const polygon = c.text("polygon", { max: 20_000 });
    const box = [
      c.number("length_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("width_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("height_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
    ];
    const chord = c.number("chord_mm", { positive: true, min: MIN_SIZE_MM, max: 10_000 });
    const tip = c.number("tip_chord_mm", { positive: true, min: MIN_SIZE_MM, max: 10_000 });
    const span = c.number("span_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 });
    const sweep = c.number("sweep_mm", { min: -10_000, max: 10_000 });
    const extrude = c.number("extrude_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 });
    const hasBox = box.some((v) => v !== null);
    if ([naca, polygon, hasBox ? "box" : null].filter(Boolean).length > 1) {
      add(
        naca ? "naca" : "polygon",
        "Give one shape per row: a size (length, width, height), a NACA section or a polygon.",
      );
      return;
    }

    let profile: Profile | null = null;
    let size: Vec3 | null = null;
    if (naca) {
      try {
        parseNaca(naca);
      } catch (e) {
        add("naca", (e as Error).message);
      }
      if (blank("chord_mm")) add("chord_mm", "Required with a NACA section.");
      if (blank("span_mm")) add("span_mm", "Required with a NACA section.");
      if (problems.length > before) return;
      profile = {
        kind: "naca",
        code: parseNaca(naca).code,
        chordMm: chord!,
        tipChordMm: tip,
        spanMm: span!,
        sweepMm: sweep,
      };
    } else if (polygon) {
      try {
        profile = { kind: "polygon", points: parsePoints(polygon), extrudeMm: extrude ?? 0 };
      } catch (e) {
        add("polygon", (e as Error).message);
      }
      if (blank("extrude_mm")) add("extrude_mm", "Required with a polygon.");
      if (problems.length > before) return;
    } else {
      const names = ["length_mm", "width_mm", "height_mm"];
      // A cell that holds something unreadable is named once, by the reader, not also as missing.
      names.forEach(
        (col) => blank(col) && add(col, "Required for a plain part (or give a NACA section or a polygon)."),
      );
      if (problems.length > before) return;
      size = box as Vec3;
    }
    for (const [col, v] of [
      ["tip_chord_mm", tip],
      ["span_mm", span],
      ["chord_mm", chord],
      ["sweep_mm", sweep],
    ] as const) {
      if (v !== null && !naca) add(col, "Only used with a NACA section; leave it empty.");
    }
    if (extrude !== null && !polygon) add("extrude_mm", "Only used with a polygon; leave it empty.");
    if (problems.length > before) return;

    let g: { size: Vec3; trueVolumeMm3: number | null } = { size: size!, trueVolumeMm3: null };
    if (profile) {
      try {
        g = partGeometry(profile);
        if (g.size.some((v) => v > 30_000)) throw new ProfileError("The part's box would be longer than 30,000 mm.");
      } catch (e) {
        add(profile.kind === "naca" ? "naca" : "polygon", (e as Error).message);
        return;
      }
    }
    pieces += quantity!;
    volume += quantity! * (g.trueVolumeMm3 ?? g.size[0] * g.size[1] * g.size[2]);
    parts.push(
      partRow(
        jobId,
        { name: name!, quantity: quantity!, gradeId: grade?.id ?? null, rotate: rotate as RotateRule, profile },
        g,
      ),
    );
  });
  const summary = { parts: problems.length ? 0 : parts.length, pieces, volumeM3: volume / 1e9 };
  if (problems.length || !commit) return done(false, summary);

  await db().transaction(async (trx) => {
    await openJob(trx, jobId);
    const [imp] = await trx("csv_imports")
      .insert({ kind: "job_parts", file_name: fileName, rows: rows.length, imported_by: actorId })
      .returning("id");
    for (let i = 0; i < parts.length; i += 500) await trx("job_parts").insert(parts.slice(i, i + 500));
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "job_parts.import",
      subject: `job:${jobId}`,
      detail: { import: imp!.id, rows: parts.length, fileName },
    });
  });
  return done(true, summary);
}

export type { CsvProblem };
