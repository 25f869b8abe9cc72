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
 * The most pixels a photo may have, and the longest side. A shop tablet or phone takes 8–48
 * megapixels (a 48 MP sensor: 8000 × 6000), so 50 MP refuses no real photo, while decoding one
 * costs up to 200 MB of memory (4 bytes a pixel) in an app process serving everyone else: the
 * header is read before any pixel is decoded, so an 8,900 × 8,900 picture squeezed into 77 KB is
 * refused without decoding it. 16,383 px a side is the most a WebP may have (thumbnails and WebP
 * originals), and keeps a thin sliver of a picture from passing under the pixel count.
 */
export const MAX_PHOTO_PIXELS = 50_000_000;
export const MAX_PHOTO_SIDE = 16_383;

/** Thrown by `preparePhoto` for a picture over `MAX_PHOTO_PIXELS` or `MAX_PHOTO_SIDE`. */
export class PhotoTooLarge extends Error {
  constructor(
    readonly width: number,
    readonly height: number,
  ) {
    super(
      `${width} × ${height} pixels (${(Math.floor((width * height) / 100_000) / 10).toLocaleString("en")} megapixels); ` +
        `a photo may be at most ${MAX_PHOTO_PIXELS / 1_000_000} megapixels and ${MAX_PHOTO_SIDE.toLocaleString("en")} pixels a side`,
    );
    this.name = "PhotoTooLarge";
  }
}

/**
 * Decodes the image (refusing what sharp cannot read, and anything over the pixel cap before it is
 * decoded) and always re-encodes the original from its pixels alone, turned upright by its EXIF
 * orientation: no EXIF, XMP, IPTC, ICC, PNG text chunks, comments or bytes appended after the
 * image survive (a tablet's photo often says where and when it was taken), and makes a WebP
 * thumbnail. Throws `PhotoTooLarge` for too many pixels, `Error("unreadable")` for bytes that only
 * look like an image.
 */
export async function preparePhoto(bytes: Uint8Array, type: PhotoType): Promise<PreparedPhoto> {
  // The header alone is read first, so a picture over the cap is refused with its size (sharp's own
  // limit would only say "unreadable"); libvips checks the limit again as it decodes.
  const image = sharp(bytes, { limitInputPixels: MAX_PHOTO_PIXELS });
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    throw new Error("unreadable");
  }
  const declared =
    meta.format === "jpeg"
      ? "image/jpeg"
      : meta.format === "png"
        ? "image/png"
        : meta.format === "webp"
          ? "image/webp"
          : null;
  if (declared !== type.contentType || !meta.width || !meta.height) throw new Error("unreadable");
  // Of an animated WebP or PNG only the first frame is read and kept: pageHeight is its height.
  const height = meta.pageHeight ?? meta.height;
  if (meta.width * height > MAX_PHOTO_PIXELS || Math.max(meta.width, height) > MAX_PHOTO_SIDE)
    throw new PhotoTooLarge(meta.width, height);
  try {
    // sharp writes no metadata unless asked (withMetadata/keep*): the output is the pixels only.
    const upright = image.clone().rotate();
    const out = await (type.ext === "jpg"
      ? upright.jpeg({ quality: 92 })
      : type.ext === "png"
        ? upright.png()
        : upright.webp({ quality: 92 })
    ).toBuffer({ resolveWithObject: true });
    const thumb = new Uint8Array(
      await image
        .clone()
        .rotate()
        .resize({ width: THUMB_WIDTH, withoutEnlargement: true })
        .webp({ quality: 78 })
        .toBuffer(),
    );
    return { ...type, bytes: new Uint8Array(out.data), width: out.info.width, height: out.info.height, thumb };
  } catch {
    throw new Error("unreadable");
  }
}

/** Object keys are made here, from the defect id and a random id: never from anything the client sent. */
export function photoKeys(defectId: number, ext: PhotoType["ext"]): { objectKey: string; thumbKey: string } {
  const id = crypto.randomUUID();
  return { objectKey: `defects/${defectId}/${id}.${ext}`, thumbKey: `defects/${defectId}/${id}.thumb.webp` };
}
