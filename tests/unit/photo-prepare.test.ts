import { describe, expect, it } from "vitest";
import sharp from "sharp";
import { MAX_PHOTO_PIXELS, PhotoTooLarge, preparePhoto, sniffImage } from "@/lib/storage/images";
import {
  JPEG_COMMENT,
  PNG_TEXT,
  TRAILER,
  hugePng,
  pngChunkTypes,
  taggedJpeg,
  taggedPng,
} from "../support/hostile-images";

const prepare = (b: Buffer) => preparePhoto(new Uint8Array(b), sniffImage(b)!);
const has = (b: Uint8Array, s: string) => Buffer.from(b).includes(Buffer.from(s, "latin1"));

describe("preparePhoto keeps the pixels only", () => {
  it("re-encodes a JPEG without EXIF, GPS, comment or appended bytes", async () => {
    for (const exif of [true, false]) {
      const input = await taggedJpeg({ exif });
      expect(has(input, JPEG_COMMENT) && input.includes(TRAILER)).toBe(true);
      const out = Buffer.from((await prepare(input)).bytes);
      const meta = await sharp(out).metadata();
      expect(meta).toMatchObject({ format: "jpeg", width: 320, height: 240 });
      expect(meta.exif).toBeUndefined();
      expect(meta.comments).toBeUndefined();
      for (const s of ["Exif", "GPS", "Shop tablet", JPEG_COMMENT, "secret"]) expect(has(out, s), s).toBe(false);
      expect(out.includes(TRAILER)).toBe(false);
      expect([...out.subarray(-2)]).toEqual([0xff, 0xd9]); // ends where the image ends
    }
  });

  it("re-encodes a PNG without text chunks or appended bytes", async () => {
    const input = await taggedPng();
    expect(pngChunkTypes(input)).toContain("tEXt");
    const out = Buffer.from((await prepare(input)).bytes);
    // Pixels and their layout only (pHYs is the pixel density libvips writes).
    const pixelChunks = ["IHDR", "PLTE", "tRNS", "pHYs", "IDAT", "IEND"];
    expect(pngChunkTypes(out).filter((t) => !pixelChunks.includes(t))).toEqual([]);
    for (const s of ["tEXt", "iTXt", "zTXt", "eXIf", PNG_TEXT, "secret"]) expect(has(out, s), s).toBe(false);
    expect(out.subarray(-12).subarray(4, 8).toString("latin1")).toBe("IEND");
    expect((await sharp(out).metadata()).comments).toBeUndefined();
  });

  it(`refuses a picture over ${MAX_PHOTO_PIXELS / 1e6} megapixels from its header, without decoding it`, async () => {
    const huge = hugePng(8900, 8900);
    expect(huge.length).toBeLessThan(80_000);
    const err = await prepare(huge).catch((e) => e);
    expect(err).toBeInstanceOf(PhotoTooLarge);
    expect(err.message).toBe(
      "8900 × 8900 pixels (79.2 megapixels); a photo may be at most 50 megapixels and 16,383 pixels a side",
    );
    expect(await prepare(hugePng(20_000, 100)).catch((e) => e)).toBeInstanceOf(PhotoTooLarge);
    // Just under the cap is fine.
    expect((await prepare(hugePng(5000, 4000))).width).toBe(5000);
  });
});
