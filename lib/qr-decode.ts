import jsQR from "jsqr";
import { codeFromScan } from "./block-code";

/**
 * Reading a block label's QR code from pixels, for browsers without a BarcodeDetector (most
 * tablets' default browsers, the test browser): jsQR (https://github.com/cozmo/jsQR) on RGBA pixels
 * as a canvas's getImageData gives them. Pure: no DOM, so it runs under Node in the unit tests.
 *
 *   readLabelQr({ data, width, height })   → { kind: "code", code: "HF-1001", text: "HF-1001" }
 *   readLabelQr(photoOfAPosterQr)          → { kind: "other", text: "https://example.test/" }
 *   readLabelQr(blankWall)                 → { kind: "none" }
 */
export interface Pixels {
  /** RGBA, 4 bytes a pixel, row by row (ImageData.data). */
  data: Uint8ClampedArray;
  width: number;
  height: number;
}

export type QrRead = { kind: "code"; code: string; text: string } | { kind: "other"; text: string } | { kind: "none" };

/**
 * `thorough` also tries the image with light and dark swapped (a label photographed under glare,
 * a code printed light on dark): right for one photo, too slow for every camera frame.
 */
export function readLabelQr(image: Pixels, { thorough = false }: { thorough?: boolean } = {}): QrRead {
  const { data, width, height } = image;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) return { kind: "none" };
  if (data.length < width * height * 4) return { kind: "none" };
  const found = jsQR(data, width, height, { inversionAttempts: thorough ? "attemptBoth" : "dontInvert" });
  if (!found) return { kind: "none" };
  const code = codeFromScan(found.data);
  return code ? { kind: "code", code, text: found.data } : { kind: "other", text: found.data };
}

/**
 * The size to draw an image at before decoding: its longer side at most `max` px, never enlarged.
 * A tablet's 12-megapixel photo takes jsQR seconds; a label fills enough of a 1280 px frame.
 *
 *   fitWithin(4032, 3024, 1280) → { width: 1280, height: 960 }
 */
export function fitWithin(width: number, height: number, max: number): { width: number; height: number } {
  const scale = Math.min(1, max / Math.max(width, height));
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) };
}

/** The longer sides tried for one photo, smallest first: quick when the label fills the photo. */
export const PHOTO_SIDES = [1024, 1600, 2400] as const;
