import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";
import type { LibraryPart, RotateRule } from "@/lib/job-terms";
import type { Profile } from "@/lib/profiles";
import type { LibraryPartInput, LibraryPatch } from "@/lib/validations/jobs";
import { assertGrade, checkParts, resolveGeometry } from "./jobs";

export type { LibraryPart };

interface Row {
  id: number;
  kit: string | null;
  name: string;
  size_x: number;
  size_y: number;
  size_z: number;
  grade_id: number | null;
  grade_code: string | null;
  rotate: RotateRule;
  profile: Profile | null;
  true_volume_mm3: number | null;
  default_quantity: number;
  notes: string | null;
  active: boolean;
}

function toPart(r: Row): LibraryPart {
  return {
    id: r.id,
    kit: r.kit,
    name: r.name,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)],
    gradeId: r.grade_id,
    gradeCode: r.grade_code,
    rotate: r.rotate,
    profile: r.profile,
    trueVolumeMm3: r.true_volume_mm3 === null ? null : Number(r.true_volume_mm3),
    defaultQuantity: r.default_quantity,
    notes: r.notes,
    active: r.active,
  };
}

const select = (k: Knex) =>
  k("library_parts as l").leftJoin("grades as g", "g.id", "l.grade_id").select("l.*", "g.code as grade_code");

/**
 *   listLibraryParts({ kit: "Kestrel 1.6 m glider" })
 *   listLibraryParts({ q: "wing root" })  // every word in the name, the kit or the grade code
 * Library parts grouped by kit (kit, then name); retired parts only when asked for.
 */
export async function listLibraryParts(
  f: { kit?: string; q?: string; includeRetired?: boolean } = {},
): Promise<LibraryPart[]> {
  const q = select(db()).orderByRaw("l.kit NULLS LAST, l.name, l.id");
  if (f.kit) q.where("l.kit", f.kit);
  for (const word of (f.q ?? "").split(/\s+/).filter(Boolean).slice(0, 8)) {
    const like = `%${word.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q.where((w) => w.whereILike("l.name", like).orWhereILike("l.kit", like).orWhereILike("g.code", like));
  }
  if (!f.includeRetired) q.where("l.active", true);
  return (await q).map(toPart);
}

export async function getLibraryPart(id: number): Promise<LibraryPart | undefined> {
  const r = await select(db()).where("l.id", id).first();
  return r ? toPart(r) : undefined;
}

export async function createLibraryPart(input: LibraryPartInput, actorId: string): Promise<LibraryPart> {
  const geometry = resolveGeometry(input);
  await assertGrade(input.gradeId ?? null);
  return db().transaction(async (trx) => {
    const [row] = await trx("library_parts")
      .insert({
        kit: input.kit,
        name: input.name,
        size_x: geometry.size[0],
        size_y: geometry.size[1],
        size_z: geometry.size[2],
        grade_id: input.gradeId ?? null,
        rotate: input.rotate,
        profile: input.profile ? JSON.stringify(input.profile) : null,
        true_volume_mm3: geometry.trueVolumeMm3,
        default_quantity: input.defaultQuantity,
        notes: input.notes,
        active: input.active ?? true,
      })
      .returning("id");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "library_part.create",
      subject: `library_part:${row!.id}`,
      detail: input,
    });
    return toPart(await select(trx).where("l.id", row!.id).first());
  });
}

const profileSummary = (p: Profile | null) =>
  p?.kind === "polygon" ? { kind: p.kind, source: p.source, points: p.points.length, holes: p.holes?.length ?? 0 } : p;

/**
 * Adds several library parts at once (the profiles of one drawing, the letters of a word): all or
 * none, a bad one named by its index.
 */
export async function createLibraryParts(inputs: LibraryPartInput[], actorId: string): Promise<LibraryPart[]> {
  const geometries = await checkParts(inputs);
  return db().transaction(async (trx) => {
    const rows: { id: number }[] = await trx("library_parts")
      .insert(
        inputs.map((input, i) => ({
          kit: input.kit,
          name: input.name,
          size_x: geometries[i]!.size[0],
          size_y: geometries[i]!.size[1],
          size_z: geometries[i]!.size[2],
          grade_id: input.gradeId ?? null,
          rotate: input.rotate,
          profile: input.profile ? JSON.stringify(input.profile) : null,
          true_volume_mm3: geometries[i]!.trueVolumeMm3,
          default_quantity: input.defaultQuantity,
          notes: input.notes,
          active: input.active ?? true,
        })),
      )
      .returning("id");
    const ids = rows.map((r) => r.id);
    await trx("audit_log").insert(
      ids.map((id, i) => ({
        actor_id: actorId,
        action: "library_part.create",
        subject: `library_part:${id}`,
        // The outline itself is on the part; the log keeps what it was and where it came from.
        detail: { ...inputs[i]!, profile: profileSummary(inputs[i]!.profile ?? null) },
      })),
    );
    const made = await select(trx).whereIn("l.id", ids);
    const byId = new Map(made.map((r: Row) => [r.id, toPart(r)]));
    return ids.map((id) => byId.get(id)!);
  });
}

export async function updateLibraryPart(id: number, patch: LibraryPatch, actorId: string): Promise<LibraryPart> {
  const current = await getLibraryPart(id);
  if (!current) throw new HttpError(404, "That library part was not found.");
  const changes: Record<string, unknown> = {};
  if (patch.kit !== undefined) changes.kit = patch.kit;
  if (patch.name !== undefined) changes.name = patch.name;
  if (patch.rotate !== undefined) changes.rotate = patch.rotate;
  if (patch.defaultQuantity !== undefined) changes.default_quantity = patch.defaultQuantity;
  if (patch.notes !== undefined) changes.notes = patch.notes;
  if (patch.active !== undefined) changes.active = patch.active;
  if (patch.gradeId !== undefined) {
    await assertGrade(patch.gradeId);
    changes.grade_id = patch.gradeId;
  }
  if (patch.profile !== undefined || patch.size !== undefined) {
    const profile = patch.profile !== undefined ? patch.profile : current.profile;
    const size = patch.size !== undefined ? patch.size : current.size;
    const g = resolveGeometry({ profile, size });
    Object.assign(changes, {
      size_x: g.size[0],
      size_y: g.size[1],
      size_z: g.size[2],
      profile: profile ? JSON.stringify(profile) : null,
      true_volume_mm3: g.trueVolumeMm3,
    });
  }
  return db().transaction(async (trx) => {
    if (Object.keys(changes).length) await trx("library_parts").where({ id }).update(changes);
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "library_part.update",
      subject: `library_part:${id}`,
      detail: patch,
    });
    return toPart(await select(trx).where("l.id", id).first());
  });
}
