import crypto from "node:crypto";
import sharp from "sharp";
import { testDb } from "./db";
import type { DefectZonesRow } from "@/db/tables";
import { putObject } from "@/lib/storage/client";
import { photoKeys } from "@/lib/storage/images";

const tag = () => crypto.randomBytes(4).toString("hex").toUpperCase();

/** A grade and a ready block of it (2440 × 1220 × 610 mm unless told), straight into the test database. */
export async function makeBlock(opts: { size?: [number, number, number]; code?: string; parentId?: number } = {}) {
  const k = testDb();
  const [grade] = await k("grades")
    .insert({
      code: `T-${tag()}`,
      material: "EPS",
      grade_system: "ASTM C578",
      grade: "Type I",
      min_density_kg_m3: 15,
      cure_days: 0,
      colour: "#8aa5a9",
    })
    .returning(["id", "code"]);
  const [x, y, z] = opts.size ?? [2440, 1220, 610];
  const code = opts.code ?? `TB-${tag()}`;
  const [block] = await k("blocks")
    .insert({
      code,
      grade_id: grade!.id,
      lot: `L-${tag()}`,
      parent_id: opts.parentId ?? null,
      nominal_x: x,
      nominal_y: y,
      nominal_z: z,
      size_x: x,
      size_y: y,
      size_z: z,
      cost: 100,
      location: "Bay 2",
      cut_not_before: "2026-01-01",
    })
    .returning(["id", "code", "volume_m3"]);
  // Received through the ledger like every block in stock, so tests that reconcile the ledger
  // with the stock (run beside these) still find them equal.
  await k("stock_ledger").insert({
    block_id: block!.id,
    kind: "received",
    volume_m3: block!.volume_m3!,
    delta_m3: block!.volume_m3!,
    value: 100,
    delta_value: 100,
    reason: "test fixture",
  });
  return { id: block!.id, code: block!.code, gradeCode: grade!.code };
}

export async function makeDefect(blockId: number, kind: DefectZonesRow["kind"] = "void") {
  const [row] = await testDb()("defect_zones")
    .insert({ block_id: blockId, kind, min_x: 400, min_y: 300, min_z: 100, max_x: 460, max_y: 380, max_z: 150 })
    .returning("id");
  return row!.id;
}

/** A real JPEG (grey foam with a dark spot) made with sharp; `width` controls the pixel size. */
export async function jpegBytes(width = 640, height = 480): Promise<Buffer> {
  const spot = Buffer.from(
    `<svg width="${width}" height="${height}"><circle cx="${width / 2}" cy="${height / 2}" r="${Math.min(width, height) / 5}" fill="#333"/></svg>`,
  );
  return sharp({ create: { width, height, channels: 3, background: "#d9d6cf" } })
    .composite([{ input: spot }])
    .jpeg({ quality: 80 })
    .toBuffer();
}

export async function pngBytes(width = 200, height = 150): Promise<Buffer> {
  return sharp({ create: { width, height, channels: 4, background: "#c8c3b8" } })
    .png()
    .toBuffer();
}

/** A photo already in the bucket and the table, for routes that only read it. */
export async function makePhoto(defectId: number) {
  const bytes = await jpegBytes(320, 240);
  const thumb = await sharp(bytes).resize({ width: 160 }).webp().toBuffer();
  const keys = photoKeys(defectId, "jpg");
  await putObject(keys.objectKey, bytes, "image/jpeg");
  await putObject(keys.thumbKey, thumb, "image/webp");
  const [row] = await testDb()("defect_photos")
    .insert({
      defect_id: defectId,
      object_key: keys.objectKey,
      thumb_key: keys.thumbKey,
      content_type: "image/jpeg",
      bytes: bytes.length,
      width: 320,
      height: 240,
    })
    .returning("id");
  return { id: row!.id as number, ...keys };
}
