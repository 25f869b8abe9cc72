import type { Knex } from "knex";
import sharp from "sharp";
import { ensureS3, DEMO_S3, type RunningS3 } from "../../scripts/s3";
import { deleteObjects, listKeys, putObject } from "../../lib/storage/client";
import { photoKeys, preparePhoto, sniffImage } from "../../lib/storage/images";

/**
 * Demo photos: one invented picture per seeded defect zone (grey foam beads with a blotch that
 * suits the kind), stored through the same bucket, keys and thumbnails as an upload.
 * Needs photo storage: `npm start` and `npm test` provide it; on its own this starts the demo fake.
 */

// How each kind of defect looks on a cut face, roughly: colour, size and softness of the blotch.
const LOOK: Record<string, { fill: string; r: number; blur: number; opacity: number }> = {
  void: { fill: "#2b2a27", r: 0.2, blur: 2, opacity: 0.85 },
  poor_fusion: { fill: "#8c8576", r: 0.3, blur: 6, opacity: 0.55 },
  crush: { fill: "#5e594f", r: 0.26, blur: 4, opacity: 0.6 },
  wet_core: { fill: "#7a6a4c", r: 0.34, blur: 10, opacity: 0.55 },
  inclusion: { fill: "#1e1c1a", r: 0.07, blur: 1, opacity: 0.9 },
  off_density: { fill: "#9b9585", r: 0.36, blur: 12, opacity: 0.45 },
  other: { fill: "#4a463f", r: 0.18, blur: 3, opacity: 0.7 },
};

function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A 640 × 480 JPEG of foam with a blotch; the same defect id gives the same picture. */
export async function demoPhoto(defectId: number, kind: string): Promise<Buffer> {
  const W = 640,
    H = 480;
  const r = rng(defectId * 7919 + 17);
  const look = LOOK[kind] ?? LOOK.other!;
  const beads: string[] = [];
  for (let i = 0; i < 900; i++) {
    const x = r() * W,
      y = r() * H,
      rad = 7 + r() * 9;
    const shade = Math.round(214 + r() * 22);
    beads.push(
      `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="${rad.toFixed(1)}" fill="rgb(${shade},${shade - 2},${shade - 7})" stroke="#c9c4b8" stroke-width="0.8"/>`,
    );
  }
  const cx = W * (0.35 + r() * 0.3),
    cy = H * (0.35 + r() * 0.3);
  const rx = W * look.r * (0.8 + r() * 0.4),
    ry = H * look.r * (0.6 + r() * 0.5);
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}">
    <defs><filter id="soft"><feGaussianBlur stdDeviation="${look.blur}"/></filter>
    <linearGradient id="light" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#fff" stop-opacity="0.18"/><stop offset="1" stop-color="#000" stop-opacity="0.12"/></linearGradient></defs>
    <rect width="${W}" height="${H}" fill="#d8d4ca"/>
    ${beads.join("")}
    <ellipse cx="${cx.toFixed(0)}" cy="${cy.toFixed(0)}" rx="${rx.toFixed(0)}" ry="${ry.toFixed(0)}" transform="rotate(${(r() * 60 - 30).toFixed(0)} ${cx.toFixed(0)} ${cy.toFixed(0)})" fill="${look.fill}" fill-opacity="${look.opacity}" filter="url(#soft)"/>
    <rect width="${W}" height="${H}" fill="url(#light)"/>
  </svg>`;
  return sharp(Buffer.from(svg)).jpeg({ quality: 82 }).toBuffer();
}

export async function seed(knex: Knex): Promise<void> {
  let fake: RunningS3 | undefined;
  if (!process.env.S3_ENDPOINT && !process.env.S3_BUCKET) {
    fake = await ensureS3({ ...DEMO_S3, port: 0 });
    Object.assign(process.env, fake.env);
  }
  try {
    // The stock seed emptied defect_photos: whatever is still in the bucket belongs to nobody.
    const left = await knex("defect_photos").count<{ n: number }[]>({ n: "*" }).first();
    if (Number(left?.n ?? 0) === 0) await deleteObjects(await listKeys("defects/"));

    const zones = (await knex("defect_zones as z")
      .leftJoin("defect_photos as p", "p.defect_id", "z.id")
      .whereNull("p.id")
      .orderBy("z.id")
      .select("z.id", "z.kind", "z.found_by", "z.found_at")) as {
      id: number;
      kind: string;
      found_by: string | null;
      found_at: Date;
    }[];
    for (const z of zones) {
      const bytes = new Uint8Array(await demoPhoto(z.id, z.kind));
      const photo = await preparePhoto(bytes, sniffImage(bytes)!);
      const keys = photoKeys(z.id, photo.ext);
      await putObject(keys.objectKey, photo.bytes, photo.contentType);
      await putObject(keys.thumbKey, photo.thumb, "image/webp");
      await knex("defect_photos").insert({
        defect_id: z.id,
        object_key: keys.objectKey,
        thumb_key: keys.thumbKey,
        content_type: photo.contentType,
        bytes: photo.bytes.byteLength,
        width: photo.width,
        height: photo.height,
        uploaded_by: z.found_by,
        uploaded_at: z.found_at,
      });
    }
    if (zones.length) process.stderr.write(`[seed] ${zones.length} demo defect photo(s) stored\n`);
  } finally {
    await fake?.stop();
  }
}
