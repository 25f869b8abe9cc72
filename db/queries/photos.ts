import "server-only";
import { db } from "@/db";
import type { DefectPhoto } from "./defects";

export interface StoredPhoto {
  id: number;
  defectId: number;
  objectKey: string;
  thumbKey: string;
  contentType: string;
  bytes: number;
}

export interface NewPhoto {
  objectKey: string;
  thumbKey: string;
  contentType: string;
  bytes: number;
  width: number | null;
  height: number | null;
}

/** Where a photo's bytes live; the route streams them from there. */
export async function getPhoto(id: number): Promise<StoredPhoto | undefined> {
  const r = await db()("defect_photos")
    .where({ id })
    .first("id", "defect_id", "object_key", "thumb_key", "content_type", "bytes");
  return r
    ? {
        id: r.id,
        defectId: r.defect_id,
        objectKey: r.object_key,
        thumbKey: r.thumb_key,
        contentType: r.content_type,
        bytes: r.bytes,
      }
    : undefined;
}

/**
 *   addPhotos(12, [{ objectKey, thumbKey, contentType: "image/jpeg", bytes, width, height }], userId)
 * Records photos already in the bucket, all in one transaction (with an audit entry).
 */
export async function addPhotos(defectId: number, photos: NewPhoto[], actorId: string | null): Promise<DefectPhoto[]> {
  return db().transaction(async (trx) => {
    const rows = await trx("defect_photos")
      .insert(
        photos.map((p) => ({
          defect_id: defectId,
          object_key: p.objectKey,
          thumb_key: p.thumbKey,
          content_type: p.contentType,
          bytes: p.bytes,
          width: p.width,
          height: p.height,
          uploaded_by: actorId,
        })),
      )
      .returning(["id", "content_type", "bytes", "width", "height", "uploaded_at"]);
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "defect.photos",
      subject: `defect:${defectId}`,
      detail: { photos: rows.map((r: { id: number }) => r.id) },
    });
    return rows.map(
      (r: {
        id: number;
        content_type: string;
        bytes: number;
        width: number | null;
        height: number | null;
        uploaded_at: Date;
      }) => ({
        id: r.id,
        contentType: r.content_type,
        bytes: r.bytes,
        width: r.width,
        height: r.height,
        uploadedAt: r.uploaded_at.toISOString(),
      }),
    );
  });
}
