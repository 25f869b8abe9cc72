import "server-only";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";
import type { DefectKind } from "@/lib/stock";
import type { DefectInput } from "@/lib/validations/stock";
import type { Size } from "./blocks";

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
  min: Size;
  max: Size;
  foundBy: string | null;
  foundAt: string;
  note: string | null;
  inheritedFrom: number | null;
  photos: DefectPhoto[];
}

interface Row {
  id: number;
  block_id: number;
  kind: DefectKind;
  min_x: string;
  min_y: string;
  min_z: string;
  max_x: string;
  max_y: string;
  max_z: string;
  found_by_name: string | null;
  found_at: Date;
  note: string | null;
  inherited_from: number | null;
}

/**
 *   listDefects(blockId) → the block's defect zones (boxes in the block's frame, mm) with photos
 */
export async function listDefects(blockId: number): Promise<Defect[]> {
  const rows = (await db()("defect_zones as z")
    .leftJoin("users as u", "u.id", "z.found_by")
    .where("z.block_id", blockId)
    .orderBy("z.id")
    .select("z.*", "u.name as found_by_name")) as Row[];
  const photos = rows.length
    ? await db()("defect_photos")
        .whereIn(
          "defect_id",
          rows.map((r) => r.id),
        )
        .orderBy("id")
    : [];
  return rows.map((r) => ({
    id: r.id,
    blockId: r.block_id,
    kind: r.kind,
    min: [Number(r.min_x), Number(r.min_y), Number(r.min_z)],
    max: [Number(r.max_x), Number(r.max_y), Number(r.max_z)],
    foundBy: r.found_by_name,
    foundAt: r.found_at.toISOString(),
    note: r.note,
    inheritedFrom: r.inherited_from,
    photos: photos
      .filter((p: { defect_id: number }) => p.defect_id === r.id)
      .map(
        (p: {
          id: number;
          content_type: string;
          bytes: number;
          width: number | null;
          height: number | null;
          uploaded_at: Date;
        }) => ({
          id: p.id,
          contentType: p.content_type,
          bytes: p.bytes,
          width: p.width,
          height: p.height,
          uploadedAt: p.uploaded_at.toISOString(),
        }),
      ),
  }));
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
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "defect.create",
      subject: `block:${blockId}`,
      detail: { defect: row.id, ...d },
    });
    return row.id as number;
  });
}

export async function getDefect(id: number): Promise<{ id: number; blockId: number } | undefined> {
  const r = await db()("defect_zones").where({ id }).first("id", "block_id");
  return r ? { id: r.id, blockId: r.block_id } : undefined;
}
