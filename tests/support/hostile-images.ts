/**
 * Pictures that carry more than their pixels, for the photo upload tests: EXIF with a GPS position,
 * a JPEG comment, PNG text chunks, bytes appended after the image's end, and a PNG whose header
 * claims a huge size in a few kilobytes.
 */
import zlib from "node:zlib";
import sharp from "sharp";

/** Marks bytes appended after an image's end; never part of a re-encoded picture. */
export const TRAILER = Buffer.from("APPENDED-AFTER-IMAGE-END lat=51.4778 lon=-0.0015 secret-9d41");
export const PNG_TEXT = "Location: 51.4778 N, 0.0015 W (tEXt secret-7c2e)";
export const JPEG_COMMENT = "Shot at 51.4778 N 0.0015 W (COM secret-3b8a)";

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

function crc32(b: Buffer): number {
  let c = 0xffffffff;
  for (const v of b) c = CRC_TABLE[(c ^ v) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

export function pngChunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, "latin1"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}

/** The chunk types of a PNG, in order (stops at IEND). */
export function pngChunkTypes(png: Buffer): string[] {
  const types: string[] = [];
  let at = 8;
  while (at + 8 <= png.length) {
    const len = png.readUInt32BE(at);
    const type = png.subarray(at + 4, at + 8).toString("latin1");
    types.push(type);
    at += 12 + len;
    if (type === "IEND") break;
  }
  return types;
}

/** A JPEG with EXIF (camera, GPS position), a comment segment and bytes after its end (FFD9). */
export async function taggedJpeg(opts: { exif?: boolean } = {}): Promise<Buffer> {
  let img = sharp({ create: { width: 320, height: 240, channels: 3, background: "#b8b2a4" } }).jpeg({ quality: 85 });
  if (opts.exif !== false)
    img = img.withExif({
      IFD0: { Make: "Tablet maker", Model: "Shop tablet" },
      IFD3: { GPSLatitudeRef: "N", GPSLatitude: "51/1 28/1 40/1", GPSLongitudeRef: "W", GPSLongitude: "0/1 0/1 5/1" },
    });
  const jpeg = await img.toBuffer();
  // A COM segment (FFFE) right after SOI.
  const text = Buffer.from(JPEG_COMMENT, "latin1");
  const com = Buffer.alloc(4);
  com.writeUInt16BE(0xfffe, 0);
  com.writeUInt16BE(text.length + 2, 2);
  return Buffer.concat([jpeg.subarray(0, 2), com, text, jpeg.subarray(2), TRAILER]);
}

/** A PNG with a tEXt and an iTXt chunk after IHDR, and bytes after IEND. */
export async function taggedPng(): Promise<Buffer> {
  const png = await sharp({ create: { width: 300, height: 200, channels: 3, background: "#c8c3b8" } })
    .png()
    .toBuffer();
  const ihdrEnd = 8 + 12 + png.readUInt32BE(8);
  const text = pngChunk("tEXt", Buffer.from(`Comment\0${PNG_TEXT}`, "latin1"));
  const itxt = pngChunk("iTXt", Buffer.from(`GPS\0\0\0\0\0${PNG_TEXT}`, "utf8"));
  return Buffer.concat([png.subarray(0, ihdrEnd), text, itxt, png.subarray(ihdrEnd), TRAILER]);
}

/** A valid 1-bit greyscale PNG of `width` × `height`, all black: a few KB for any size. */
export function hugePng(width: number, height: number): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([1, 0, 0, 0, 0], 8); // bit depth 1, greyscale, deflate, adaptive filter, no interlace
  const row = 1 + Math.ceil(width / 8); // filter byte + packed pixels
  const idat = zlib.deflateSync(Buffer.alloc(row * height), { level: 9 });
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk("IHDR", ihdr),
    pngChunk("IDAT", idat),
    pngChunk("IEND", Buffer.alloc(0)),
  ]);
}
