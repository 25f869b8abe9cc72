import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { DefectZonesRow } from "@/db/tables";
import { allows } from "@/lib/auth/policy";
import { HttpError } from "@/lib/errors";
import type { Role } from "@/lib/roles";
import { DEFECT_LABELS, type DefectKind } from "@/lib/stock";
import type { DefectInput, DefectPatch } from "@/lib/validations/stock";
import type { Vec3 } from "@/lib/nesting";

export interface DefectPhoto {
  id: number;
  contentType: string;
  bytes: number;
  width: number | null;
  height: number | null;
  uploadedAt: string;
}

export interface Defect {
  id: number;
  blockId: number;
  kind: DefectKind;
  min: Vec3;
  max: Vec3;
  foundBy: string | null;
  /** The user id of who flagged it (they may correct or remove it, as may a planner). */
  foundById: string | null;
  foundAt: string;
  note: string | null;
  inheritedFrom: number | null;
  /** The last correction: when and by whom (null: as flagged). */
  updatedAt: string | null;
  updatedBy: string | null;
  photos: DefectPhoto[];
}

/**
 * A zone with the names of who flagged it and who last corrected it, and its photos: as listDefects
 * reads it, or as JSON inside the block page's one statement (timestamps then arrive as ISO text).
 */
export type DefectRow = Pick<
  DefectZonesRow,
  | "id"
  | "block_id"
  | "kind"
  | "min_x"
  | "min_y"
  | "min_z"
  | "max_x"
  | "max_y"
  | "max_z"
  | "found_by"
  | "note"
  | "inherited_from"
> & {
  found_at: Date | string;
  updated_at: Date | string | null;
  found_by_name: string | null;
  updated_by_name: string | null;
  photo_list: DefectPhoto[];
};

const iso = (t: Date | string) => new Date(t).toISOString();

/** A zone row (DefectRow) as the app's Defect. */
export function toDefect(r: DefectRow): Defect {
  return {
    id: r.id,
    blockId: r.block_id,
    kind: r.kind,
    min: [Number(r.min_x), Number(r.min_y), Number(r.min_z)],
    max: [Number(r.max_x), Number(r.max_y), Number(r.max_z)],
    foundBy: r.found_by_name,
    foundById: r.found_by,
    foundAt: iso(r.found_at),
    note: r.note,
    inheritedFrom: r.inherited_from,
    updatedAt: r.updated_at ? iso(r.updated_at) : null,
    updatedBy: r.updated_by_name,
    // JSON writes a timestamptz with its offset; the page shows photos' times as ISO UTC.
    photos: r.photo_list.map((p) => ({ ...p, uploadedAt: iso(p.uploadedAt) })),
  };
}

/**
 *   listDefects(blockId) → the block's defect zones (boxes in the block's frame, mm) with photos;
 *   zones taken back (removed) are kept for the record but not listed.
 */
export async function listDefects(blockId: number): Promise<Defect[]> {
  // The zones with their photos in one statement.
  const rows = (await db()("defect_zones as z")
    .leftJoin("users as u", "u.id", "z.found_by")
    .leftJoin("users as e", "e.id", "z.updated_by")
    .where("z.block_id", blockId)
    .whereNull("z.removed_at")
    .orderBy("z.id")
    .select(
      "z.*",
      "u.name as found_by_name",
      "e.name as updated_by_name",
      db().raw(
        `coalesce((SELECT json_agg(json_build_object('id', p.id, 'contentType', p.content_type, 'bytes', p.bytes,
                    'width', p.width, 'height', p.height, 'uploadedAt', p.uploaded_at) ORDER BY p.id)
                     FROM defect_photos p WHERE p.defect_id = z.id), '[]') AS photo_list`,
      ),
    )) as DefectRow[];
  return rows.map(toDefect);
}

const AXES = ["length", "width", "height"] as const;

/** Flags a defect zone; the box must lie inside the block (a field error names the axis otherwise). */
export async function createDefect(blockId: number, d: DefectInput, actorId: string): Promise<number> {
  return db().transaction(async (trx) => {
    const b = await trx("blocks").where({ id: blockId }).first("id", "code", "size_x", "size_y", "size_z", "status");
    if (!b) throw new HttpError(404, "That block was not found.");
    const size = [Number(b.size_x), Number(b.size_y), Number(b.size_z)];
    const fields: Record<string, string> = {};
    d.max.forEach((v, i) => {
      if (v > size[i]! + 1e-6) fields[`max.${i}`] = `Beyond the block's ${AXES[i]} (${size[i]} mm).`;
    });
    if (Object.keys(fields).length) throw new HttpError(400, "The zone must lie inside the block.", fields);
    const [row] = await trx("defect_zones")
      .insert({
        block_id: blockId,
        kind: d.kind,
        min_x: d.min[0],
        min_y: d.min[1],
        min_z: d.min[2],
        max_x: d.max[0],
        max_y: d.max[1],
        max_z: d.max[2],
        found_by: actorId,
        note: d.note ?? null,
      })
      .returning("id");
    if (!row) throw new Error("The defect zone was not saved.");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "defect.create",
      subject: `block:${blockId}`,
      detail: { defect: row.id, ...d },
    });
    return row.id;
  });
}

/** A zone still in force (a removed one is not found: no photos go onto it). */
export async function getDefect(id: number): Promise<{ id: number; blockId: number } | undefined> {
  const r = await db()("defect_zones").where({ id }).whereNull("removed_at").first("id", "block_id");
  return r ? { id: r.id, blockId: r.block_id } : undefined;
}

/**
 * Who may correct or remove a zone: the cutter who flagged it, or a planner (admin always, as in
 * the API policy). The policy admits cutters and planners to the routes; this narrows cutters to
 * their own zones.
 */
export function mayChangeZone(zone: { foundById: string | null }, user: { id: string; roles: readonly Role[] }) {
  if (allows(["planner"], user.roles)) return true;
  return zone.foundById !== null && zone.foundById === user.id && user.roles.includes("cutter");
}

type ZoneRow = Record<string, unknown> & { id: number; block_id: number; found_by: string | null };
const boxOf = (r: ZoneRow) => ({
  kind: r.kind as DefectKind,
  min: [Number(r.min_x), Number(r.min_y), Number(r.min_z)] as Vec3,
  max: [Number(r.max_x), Number(r.max_y), Number(r.max_z)] as Vec3,
  note: (r.note as string | null) ?? null,
});

/** The zone, locked for a change, once the caller is known to be allowed to change it. */
async function zoneForChange(
  trx: Knex.Transaction,
  id: number,
  user: { id: string; roles: readonly Role[] },
): Promise<ZoneRow & { code: string; size: Vec3 }> {
  const z = (await trx("defect_zones as z")
    .join("blocks as b", "b.id", "z.block_id")
    .where("z.id", id)
    .forUpdate()
    .first("z.*", "b.code", "b.size_x", "b.size_y", "b.size_z")) as
    | (ZoneRow & { code: string; size_x: string; size_y: string; size_z: string; removed_at: Date | null })
    | undefined;
  if (!z) throw new HttpError(404, `Defect zone ${id} was not found.`);
  if (z.removed_at) throw new HttpError(409, `Defect zone ${id} on ${z.code} was already removed.`);
  if (!mayChangeZone({ foundById: z.found_by }, user))
    throw new HttpError(403, `Only the cutter who flagged zone ${id} on ${z.code}, or a planner, may change it.`);
  return { ...z, size: [Number(z.size_x), Number(z.size_y), Number(z.size_z)] };
}

/**
 * Corrects a zone (kind, box, note): the box as it ends up must lie inside the block with each max
 * above its min (a field error names the axis otherwise). Kept in the audit log with the zone before
 * and after, who and when; the zone remembers its last correction.
 */
export async function updateDefect(
  id: number,
  patch: DefectPatch,
  user: { id: string; roles: readonly Role[] },
): Promise<{ blockId: number; changed: boolean }> {
  return db().transaction(async (trx) => {
    const z = await zoneForChange(trx, id, user);
    const before = boxOf(z);
    const after = {
      kind: patch.kind ?? before.kind,
      min: patch.min ?? before.min,
      max: patch.max ?? before.max,
      note: patch.note === undefined ? before.note : patch.note?.trim() || null,
    };
    const fields: Record<string, string> = {};
    after.max.forEach((hi, i) => {
      const axis = "xyz"[i];
      if (hi <= after.min[i]!) fields[`max.${i}`] = `max ${axis} must be more than min ${axis} (${after.min[i]} mm).`;
      else if (hi > z.size[i]! + 1e-6) fields[`max.${i}`] = `Beyond the block's ${AXES[i]} (${z.size[i]} mm).`;
    });
    if (Object.keys(fields).length)
      throw new HttpError(400, `Zone ${id} on ${z.code} must lie inside the block. Nothing was changed.`, fields);
    const changed = JSON.stringify(before) !== JSON.stringify(after);
    if (!changed) return { blockId: z.block_id, changed };
    await trx("defect_zones").where({ id }).update({
      kind: after.kind,
      min_x: after.min[0],
      min_y: after.min[1],
      min_z: after.min[2],
      max_x: after.max[0],
      max_y: after.max[1],
      max_z: after.max[2],
      note: after.note,
      updated_at: trx.fn.now(),
      updated_by: user.id,
    });
    await trx("audit_log").insert({
      actor_id: user.id,
      action: "defect.update",
      subject: `block:${z.block_id}`,
      detail: { defect: id, block: z.code, before, after },
    });
    return { blockId: z.block_id, changed };
  });
}

/**
 * Takes a zone back (flagged by mistake): it stays in the table with who removed it and when (and
 * in the audit log with what it was), but no longer shows, counts or keeps parts away.
 */
export async function removeDefect(id: number, user: { id: string; roles: readonly Role[] }): Promise<number> {
  return db().transaction(async (trx) => {
    const z = await zoneForChange(trx, id, user);
    await trx("defect_zones").where({ id }).update({ removed_at: trx.fn.now(), removed_by: user.id });
    await trx("audit_log").insert({
      actor_id: user.id,
      action: "defect.remove",
      subject: `block:${z.block_id}`,
      detail: { defect: id, block: z.code, before: boxOf(z) },
    });
    return z.block_id;
  });
}

export interface ZoneEvent {
  /** The audit log entry. */
  id: number;
  action: "flagged" | "changed" | "removed";
  zone: number;
  by: string | null;
  at: string;
  /** What changed, in words: "x 400–460 → 400–480 mm", "kind Void → Crush". */
  what: string[];
}

const span = (b: { min: number[]; max: number[] }, i: number) => `${b.min[i]}–${b.max[i]}`;
type Box = { kind?: DefectKind; min: number[]; max: number[]; note?: string | null };

/** The differences between two states of a zone, in words. */
function zoneDiff(before: Box, after: Box): string[] {
  const out: string[] = [];
  if (before.kind && after.kind && before.kind !== after.kind)
    out.push(`kind ${DEFECT_LABELS[before.kind] ?? before.kind} → ${DEFECT_LABELS[after.kind] ?? after.kind}`);
  for (let i = 0; i < 3; i++)
    if (span(before, i) !== span(after, i)) out.push(`${"xyz"[i]} ${span(before, i)} → ${span(after, i)} mm`);
  if ((before.note ?? null) !== (after.note ?? null)) out.push("note changed");
  return out;
}

/** An audit log entry about a zone (`defect.create`, `defect.update`, `defect.remove`) with who made it. */
export interface ZoneHistoryRow {
  id: string | number;
  action: string;
  detail: { defect: number; before?: Box; after?: Box; kind?: DefectKind; min?: number[]; max?: number[] } | null;
  /** A Date, or ISO text when read as JSON. */
  at: Date | string;
  name: string | null;
}

/** One entry of a block's zone history (flagged, changed, removed), with what changed in words. */
export function toZoneEvent(r: ZoneHistoryRow): ZoneEvent {
  const d = r.detail ?? { defect: 0 };
  const action = r.action === "defect.create" ? "flagged" : r.action === "defect.update" ? "changed" : "removed";
  let what: string[] = [];
  if (action === "changed" && d.before && d.after) what = zoneDiff(d.before, d.after);
  else if (action === "flagged" && d.min && d.max)
    what = [
      `${d.kind ? `${DEFECT_LABELS[d.kind] ?? d.kind} ` : ""}x ${span(d as Box, 0)}, y ${span(d as Box, 1)}, z ${span(d as Box, 2)} mm`,
    ];
  else if (action === "removed" && d.before)
    what = [
      `was ${DEFECT_LABELS[d.before.kind!] ?? "a zone"} x ${span(d.before, 0)}, y ${span(d.before, 1)}, z ${span(d.before, 2)} mm`,
    ];
  return { id: Number(r.id), action, zone: Number(d.defect), by: r.name, at: iso(r.at), what };
}

export interface ZoneChangeAfterPlan {
  zone: number;
  blockCode: string;
  change: "flagged" | "changed" | "removed";
  at: string;
  by: string | null;
}

/**
 * Zones of these blocks flagged, changed or removed after `since` (when a plan was made): the plan
 * kept clear of the zones as they were then, so it says which ones no longer match.
 */
export async function zoneChangesSince(blockIds: number[], since: Date): Promise<ZoneChangeAfterPlan[]> {
  if (!blockIds.length) return [];
  const rows = (await db()("defect_zones as z")
    .join("blocks as b", "b.id", "z.block_id")
    .leftJoin("users as f", "f.id", "z.found_by")
    .leftJoin("users as e", "e.id", "z.updated_by")
    .leftJoin("users as r", "r.id", "z.removed_by")
    .whereIn("z.block_id", blockIds)
    .where((q) =>
      q.where("z.found_at", ">", since).orWhere("z.updated_at", ">", since).orWhere("z.removed_at", ">", since),
    )
    .orderBy("z.id")
    .select(
      "z.id",
      "b.code",
      "z.found_at",
      "z.updated_at",
      "z.removed_at",
      "f.name as found_name",
      "e.name as updated_name",
      "r.name as removed_name",
    )) as {
    id: number;
    code: string;
    found_at: Date;
    updated_at: Date | null;
    removed_at: Date | null;
    found_name: string | null;
    updated_name: string | null;
    removed_name: string | null;
  }[];
  // A zone flagged and taken back since the plan was made leaves the plan as it was.
  const relevant = rows.filter((r) => !(r.removed_at && r.found_at > since));
  return relevant.map((r) => {
    const [change, at, by]: [ZoneChangeAfterPlan["change"], Date, string | null] = r.removed_at
      ? ["removed", r.removed_at, r.removed_name]
      : r.found_at > since
        ? ["flagged", r.found_at, r.found_name]
        : ["changed", r.updated_at!, r.updated_name];
    return { zone: r.id, blockCode: r.code, change, at: at.toISOString(), by };
  });
}
