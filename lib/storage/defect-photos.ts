import "server-only";
import { HttpError } from "@/lib/errors";
import { addPhotos } from "@/db/queries/photos";
import type { DefectPhoto } from "@/db/queries/defects";
import { deleteObjects, putObject } from "./client";
import { StorageNotConfigured, storageConfig } from "./config";
import {
  MAX_PHOTO_BYTES,
  MAX_PHOTOS_PER_UPLOAD,
  PhotoTooLarge,
  photoKeys,
  preparePhoto,
  sniffImage,
  type PreparedPhoto,
} from "./images";

/** The most a whole upload may carry (Next's proxy buffers request bodies up to its own limit). */
export const MAX_UPLOAD_BYTES = MAX_PHOTOS_PER_UPLOAD * MAX_PHOTO_BYTES + 1024 * 1024;

const mb = (n: number) => `${(n / (1024 * 1024)).toFixed(1).replace(/\.0$/, "")} MB`;

/** A file name fit to quote back in a message: no folders, no control characters, not too long. */
export function displayName(name: string, index: number): string {
  const base = (name.split(/[\\/]/).pop() ?? "").replace(/[\u0000-\u001f\u007f"]/g, "").trim();
  if (!base) return `photo ${index + 1}`;
  return base.length > 80 ? `${base.slice(0, 77)}…` : base;
}

/** Fails with 503 (not 500) when the server has no bucket configured. */
export function requireStorage() {
  try {
    storageConfig();
  } catch (e) {
    if (e instanceof StorageNotConfigured) {
      console.error(`[photos] ${e.message}`);
      throw new HttpError(503, "Photo storage is not set up on this server; ask the admin to configure it.");
    }
    throw e;
  }
}

/**
 * Checks every file first (type by content, size, pixel count, decodable) and re-encodes it from
 * its pixels alone (see `preparePhoto`), then uploads originals and
 * thumbnails, then records them in one transaction. All or nothing: a refused file stores
 * nothing, and objects already uploaded are deleted again if a later step fails.
 */
export async function saveDefectPhotos(defectId: number, files: File[], actorId: string): Promise<DefectPhoto[]> {
  return storePhotos(
    files,
    (ext) => photoKeys(defectId, ext),
    (rows) => addPhotos(defectId, rows, actorId),
  );
}

/** The objects' keys for one photo, and how a batch of stored photos is recorded. */
type KeysFor = (ext: PreparedPhoto["ext"]) => { objectKey: string; thumbKey: string };
type StoredRow = {
  objectKey: string;
  thumbKey: string;
  contentType: string;
  bytes: number;
  width: number | null;
  height: number | null;
};

/**
 * The checks, re-encoding, upload and clean-up of saveDefectPhotos for photos of any record (a
 * defect zone, a supplier claim): `keysFor` names the objects, `record` writes the rows.
 */
export async function storePhotos<T>(
  files: File[],
  keysFor: KeysFor,
  record: (rows: StoredRow[]) => Promise<T[]>,
): Promise<T[]> {
  requireStorage();
  if (!files.length)
    throw new HttpError(400, "Attach at least one photo.", {
      photos: "Attach at least one photo (JPEG, PNG or WebP).",
    });
  if (files.length > MAX_PHOTOS_PER_UPLOAD) {
    throw new HttpError(400, `At most ${MAX_PHOTOS_PER_UPLOAD} photos at a time.`, {
      photos: `At most ${MAX_PHOTOS_PER_UPLOAD} photos at a time; you chose ${files.length}.`,
    });
  }

  const fields: Record<string, string> = {};
  let status = 400;
  const prepared: PreparedPhoto[] = [];
  for (const [i, file] of files.entries()) {
    const name = displayName(file.name, i);
    const refuse = (code: number, message: string) => {
      if (!Object.keys(fields).length) status = code;
      fields[`photos.${i}`] = message;
    };
    if (file.size > MAX_PHOTO_BYTES) {
      refuse(413, `"${name}" is ${mb(file.size)}; a photo may be at most ${mb(MAX_PHOTO_BYTES)}.`);
      continue;
    }
    if (file.size === 0) {
      refuse(400, `"${name}" is empty.`);
      continue;
    }
    const bytes = new Uint8Array(await file.arrayBuffer());
    const type = sniffImage(bytes);
    if (!type) {
      refuse(415, `"${name}" is not a JPEG, PNG or WebP image.`);
      continue;
    }
    try {
      prepared.push(await preparePhoto(bytes, type));
    } catch (e) {
      if (e instanceof PhotoTooLarge) refuse(413, `"${name}" is ${e.message}.`);
      else refuse(415, `"${name}" looks like a ${type.ext.toUpperCase()} but cannot be read; it may be damaged.`);
    }
  }
  const problems = Object.values(fields);
  if (problems.length) {
    const lead = problems.length === 1 ? problems[0]! : `${problems.length} photos were refused.`;
    throw new HttpError(status, `${lead} Nothing was stored.`, fields);
  }

  const uploaded: string[] = [];
  try {
    const rows = [];
    for (const p of prepared) {
      const keys = keysFor(p.ext);
      await putObject(keys.objectKey, p.bytes, p.contentType);
      uploaded.push(keys.objectKey);
      await putObject(keys.thumbKey, p.thumb, "image/webp");
      uploaded.push(keys.thumbKey);
      rows.push({ ...keys, contentType: p.contentType, bytes: p.bytes.byteLength, width: p.width, height: p.height });
    }
    return await record(rows);
  } catch (e) {
    await deleteObjects(uploaded).catch((err) =>
      console.error("[photos] could not remove objects of a failed upload", uploaded, err),
    );
    if (e instanceof HttpError) throw e;
    if (isStorageDown(e)) {
      console.error("[photos] storage unreachable", e);
      throw new HttpError(
        503,
        "Photo storage cannot be reached. Nothing was stored; try again in a moment.",
        undefined,
        { "Retry-After": "5" },
      );
    }
    throw e;
  }
}

export function isStorageDown(e: unknown): boolean {
  const err = e as { code?: string; name?: string; $metadata?: unknown } | undefined;
  if (!err) return false;
  return (
    ["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "ENOTFOUND"].includes(err.code ?? "") || err.name === "TimeoutError"
  );
}

/**
 * The files of a photo upload (multipart/form-data, field "photos"), refused before reading when
 * the request is not multipart (415) or larger than MAX_UPLOAD_BYTES (413), or unreadable (400).
 * Shared by the defect and claim photo routes.
 */
export async function readPhotoUpload(req: Request): Promise<File[]> {
  if (!(req.headers.get("content-type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    throw new HttpError(415, 'Send the photos as multipart/form-data, in a field named "photos".');
  }
  const length = Number(req.headers.get("content-length") ?? 0);
  if (length > MAX_UPLOAD_BYTES) {
    throw new HttpError(
      413,
      `This upload is ${Math.ceil(length / 1024 / 1024)} MB; send at most ${Math.floor(MAX_UPLOAD_BYTES / 1024 / 1024)} MB at a time.`,
      { photos: "Too much at once: send fewer photos per upload." },
    );
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new HttpError(400, "The upload could not be read as a form; try again.");
  }
  return form.getAll("photos").filter((v): v is File => typeof v !== "string");
}
