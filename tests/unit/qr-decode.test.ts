import QRCode from "qrcode";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { labelPayload } from "@/lib/block-code";
import { fitWithin, readLabelQr, type Pixels } from "@/lib/qr-decode";

/**
 * A QR code drawn the way a label prints it (lib/block-code.ts labelPayload, error correction M,
 * the label page's ink #1c2a2e on white), made by the `qrcode` package and rendered module by
 * module to RGBA pixels: what a canvas's getImageData gives the decoder in the browser.
 */
function qrPixels(
  text: string,
  { scale = 6, quiet = 4, dark = [0x1c, 0x2a, 0x2e], light = [255, 255, 255] } = {},
): Pixels {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
  const n = qr.modules.size;
  const side = (n + 2 * quiet) * scale;
  const data = new Uint8ClampedArray(side * side * 4);
  for (let y = 0; y < side; y++) {
    for (let x = 0; x < side; x++) {
      const r = Math.floor(y / scale) - quiet;
      const c = Math.floor(x / scale) - quiet;
      const on = r >= 0 && c >= 0 && r < n && c < n && qr.modules.get(r, c) === 1;
      const [R, G, B] = on ? dark : light;
      const i = (y * side + x) * 4;
      data[i] = R!;
      data[i + 1] = G!;
      data[i + 2] = B!;
      data[i + 3] = 255;
    }
  }
  return { data, width: side, height: side };
}

describe("reading a label's QR code from pixels (jsQR, where the browser has no BarcodeDetector)", () => {
  it("reads the block code a label holds", () => {
    expect(readLabelQr(qrPixels(labelPayload("HF-1001")))).toEqual({ kind: "code", code: "HF-1001", text: "HF-1001" });
  });

  it("reads an offcut's code and a link to a block page as the code", () => {
    expect(readLabelQr(qrPixels("HF-1047.2"))).toMatchObject({ kind: "code", code: "HF-1047.2" });
    expect(readLabelQr(qrPixels("https://yard.example.test/stock/hf-2001"))).toMatchObject({
      kind: "code",
      code: "HF-2001",
    });
  });

  it("says a QR code that is not a Blockyard label is something else, with its text", () => {
    expect(readLabelQr(qrPixels("https://example.test/about"))).toEqual({
      kind: "other",
      text: "https://example.test/about",
    });
  });

  it("finds nothing in a blank image and in nonsense dimensions", () => {
    const blank = new Uint8ClampedArray(200 * 200 * 4).fill(255);
    expect(readLabelQr({ data: blank, width: 200, height: 200 })).toEqual({ kind: "none" });
    expect(readLabelQr({ data: blank, width: 0, height: 200 })).toEqual({ kind: "none" });
    expect(readLabelQr({ data: blank, width: 300, height: 300 })).toEqual({ kind: "none" });
  });

  it("reads a code printed light on dark only when asked to be thorough (one photo, not every frame)", () => {
    const inverted = qrPixels("HF-3003", { dark: [255, 255, 255], light: [0x1c, 0x2a, 0x2e] });
    expect(readLabelQr(inverted)).toEqual({ kind: "none" });
    expect(readLabelQr(inverted, { thorough: true })).toMatchObject({ kind: "code", code: "HF-3003" });
  });

  it("reads a photo-like JPEG: the label small on a grey background, decoded from the file's pixels", async () => {
    const png = await QRCode.toBuffer("HF-1234", { errorCorrectionLevel: "M", margin: 2, scale: 5 });
    const jpeg = await sharp({ create: { width: 1400, height: 1000, channels: 3, background: "#8a8f90" } })
      .composite([{ input: png, left: 520, top: 330 }])
      .jpeg({ quality: 80 })
      .toBuffer();
    const { data, info } = await sharp(jpeg).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
    const pixels = { data: new Uint8ClampedArray(data), width: info.width, height: info.height };
    expect(readLabelQr(pixels)).toMatchObject({ kind: "code", code: "HF-1234" });
  });
});

describe("the size a photo is decoded at", () => {
  it("shrinks the longer side to the limit, keeping the shape, and never enlarges", () => {
    expect(fitWithin(4032, 3024, 1280)).toEqual({ width: 1280, height: 960 });
    expect(fitWithin(3024, 4032, 1280)).toEqual({ width: 960, height: 1280 });
    expect(fitWithin(640, 480, 1280)).toEqual({ width: 640, height: 480 });
    expect(fitWithin(10_000, 1, 1000)).toEqual({ width: 1000, height: 1 });
  });
});
