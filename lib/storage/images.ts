/**
 * What a photo really is, judged by its bytes (never by the name or the type the browser claims),
 * and its thumbnail. Free of `server-only` so the demo seed can use it.
 *
 *   sniffImage(bytes)  // → { contentType: "image/jpeg", ext: "jpg" } | null
 */
import crypto from "node:crypto";
import sharp, { type Metadata } from "sharp";

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
export const MAX_PHOTOS_PER_UPLOAD = 6;
export const THUMB_WIDTH = 320;

export type PhotoType = { contentType: "image/jpeg" | "image/png" | "image/webp"; ext: "jpg" | "png" | "webp" };

const startsWith = (b: Uint8Array, sig: number[], at = 0) =>
  b.length >= at + sig.length && sig.every((v, i) => b[at + i] === v);

/** JPEG, PNG or WebP by magic bytes; anything else is null. */
export function sniffImage(b: Uint8Array): PhotoType | null {
  if (startsWith(b, [0xff, 0xd8, 0xff])) return { contentType: "image/jpeg", ext: "jpg" };
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { contentType: "image/png", ext: "png" };
  // RIFF....WEBP
  if (startsWith(b, [0x52, 0x49, 0x46, 0x46]) && startsWith(b, [0x57, 0x45, 0x42, 0x50], 8))
    return { contentType: "image/webp", ext: "webp" };
  return null;
}

export interface PreparedPhoto extends PhotoType {
  bytes: Uint8Array;
  width: number | null;
  height: number | null;
  thumb: Uint8Array;
}

/**
 * Decodes the image (refusing what sharp cannot read) and makes a WebP thumbnail, turned upright
 * by the photo's EXIF orientation; strips EXIF/XMP/IPTC from the original (re-encoded upright).
 * Throws `Error("unreadable")` for bytes that only look like an image.
 */
export async function preparePhoto(bytes: Uint8Array, type: PhotoType): Promise<PreparedPhoto> {
  const image = sharp(bytes, { limitInputPixels: 80_000_000 });
  try {
    const meta: Metadata = await image.metadata();
    const declared =
      meta.format === "jpeg"
        ? "image/jpeg"
        : meta.format === "png"
          ? "image/png"
          : meta.format === "webp"
            ? "image/webp"
            : null;
    if (declared !== type.contentType) throw new Error("unreadable");
    const thumb = new Uint8Array(
      await image
        .clone()
        .rotate()
        .resize({ width: THUMB_WIDTH, withoutEnlargement: true })
        .webp({ quality: 78 })
        .toBuffer(),
    );
    // A tablet's photo carries EXIF/XMP/IPTC (often where and when it was taken): the original is
    // stored without it, turned upright as EXIF said; a photo without such metadata is kept byte for byte.
    if (meta.exif || meta.xmp || meta.iptc) {
      const upright = image.clone().rotate();
      const out = await (type.ext === "jpg"
        ? upright.jpeg({ quality: 92 })
        : type.ext === "png"
          ? upright.png()
          : upright.webp({ quality: 92 })
      ).toBuffer({ resolveWithObject: true });
      return { ...type, bytes: new Uint8Array(out.data), width: out.info.width, height: out.info.height, thumb };
    }
    const sideways = (meta.orientation ?? 1) >= 5;
    const w = meta.width ?? null;
    const h = meta.height ?? null;
    return { ...type, bytes, width: sideways ? h : w, height: sideways ? w : h, thumb };
  } catch {
    throw new Error("unreadable");
  }
}

/** Object keys are made here, from the defect id and a random id: never from anything the client sent. */
export function photoKeys(defectId: number, ext: PhotoType["ext"]): { objectKey: string; thumbKey: string } {
  const id = crypto.randomUUID();
  return { objectKey: `defects/${defectId}/${id}.${ext}`, thumbKey: `defects/${defectId}/${id}.thumb.webp` };
}
