import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, type Client } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeUser, tableCounts, testDb } from "../support/db";
import { jpegBytes, makeBlock, makeDefect, pngBytes } from "../support/defect-fixtures";
import { getObject, listKeys } from "@/lib/storage/client";
import sharp from "sharp";
import {
  JPEG_COMMENT,
  PNG_TEXT,
  TRAILER,
  hugePng,
  pngChunkTypes,
  taggedJpeg,
  taggedPng,
} from "../support/hostile-images";

let cutter: Client;
let defectId: number;

beforeAll(async () => {
  const u = await makeUser(["cutter"]);
  cutter = client();
  await cutter.signIn(u.email, TEST_PASSWORD);
  defectId = await makeDefect((await makeBlock()).id);
});
afterAll(closeTestDb);

const upload = (c: Client, id: number, files: { name: string; content: Buffer; type?: string }[]) => {
  let r = c.call("post", `/api/defects/${id}/photos`);
  for (const f of files)
    r = r.attach("photos", f.content, { filename: f.name, contentType: f.type ?? "application/octet-stream" });
  return r;
};

/** An object's bytes exactly as the bucket holds them (not through the app). */
async function streamBytes(obj: Awaited<ReturnType<typeof getObject>>): Promise<Buffer> {
  if (!obj) throw new Error("object missing from the bucket");
  return Buffer.from(await new Response(obj.body).arrayBuffer());
}

/** Everything a refused upload must leave alone: every table and the bucket. */
async function snapshot() {
  return { tables: await tableCounts(), keys: (await listKeys()).sort() };
}

describe("defect photos: upload", () => {
  it("stores a real JPEG and PNG with thumbnails and serves them to signed-in people only", async () => {
    const jpg = await jpegBytes(800, 600);
    const png = await pngBytes(300, 200);
    const res = await upload(cutter, defectId, [
      { name: "void-on-end-face.jpg", content: jpg, type: "image/jpeg" },
      { name: "close-up.png", content: png, type: "image/png" },
    ]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.items).toHaveLength(2);
    const [a, b] = res.body.items as {
      id: number;
      contentType: string;
      width: number;
      height: number;
      bytes: number;
    }[];
    expect(a).toMatchObject({ contentType: "image/jpeg", width: 800, height: 600 });
    expect(b).toMatchObject({ contentType: "image/png", width: 300, height: 200 });

    const thumb = await cutter.get(`/api/photos/${a!.id}?size=thumb`).buffer(true);
    expect(thumb.status).toBe(200);
    expect(thumb.headers["content-type"]).toBe("image/webp");
    expect(thumb.headers["x-content-type-options"]).toBe("nosniff");
    expect(thumb.headers["cache-control"]).toMatch(/^private/);
    expect((thumb.body as Buffer).subarray(8, 12).toString("latin1")).toBe("WEBP");

    const full = await cutter.get(`/api/photos/${a!.id}`).buffer(true);
    expect(full.status).toBe(200);
    expect(full.headers["content-type"]).toBe("image/jpeg");
    // Always re-encoded from the pixels (never stored byte for byte), the size recorded as stored.
    expect((full.body as Buffer).length).toBe(a!.bytes);
    expect(await sharp(full.body as Buffer).metadata()).toMatchObject({ format: "jpeg", width: 800, height: 600 });

    // Anyone signed in may look (a planner checks defects too); strangers may not.
    const planner = client();
    await planner.signIn((await makeUser(["planner"])).email, TEST_PASSWORD);
    expect((await planner.get(`/api/photos/${b!.id}?size=thumb`)).status).toBe(200);
    const stranger = await client().get(`/api/photos/${a!.id}?size=thumb`);
    expect(stranger.status).toBe(401);
    expect(stranger.headers["content-type"]).toMatch(/json/);
  });

  it("stores a tablet photo without its EXIF (GPS position, camera), turned upright as EXIF said", async () => {
    // A 400 x 300 picture taken with the tablet turned (EXIF orientation 6: rotate 90° to view).
    const tagged = await sharp({ create: { width: 400, height: 300, channels: 3, background: "#b8b2a4" } })
      .jpeg({ quality: 85 })
      .withExif({
        IFD0: { Make: "Tablet maker", Model: "Shop tablet" },
        IFD3: { GPSLatitudeRef: "N", GPSLatitude: "51/1 28/1 40/1", GPSLongitudeRef: "W", GPSLongitude: "0/1 0/1 5/1" },
      })
      .withMetadata({ orientation: 6 })
      .toBuffer();
    const before = await sharp(tagged).metadata();
    expect(before.exif, "the fixture really carries EXIF").toBeDefined();
    expect(before.orientation).toBe(6);
    const res = await upload(cutter, defectId, [{ name: "IMG_2041.jpg", content: tagged, type: "image/jpeg" }]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const [item] = res.body.items as { id: number; width: number; height: number }[];
    expect(item).toMatchObject({ width: 300, height: 400 });
    const full = await cutter.get(`/api/photos/${item!.id}`).buffer(true);
    const meta = await sharp(full.body as Buffer).metadata();
    expect(meta.format).toBe("jpeg");
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation ?? 1).toBe(1);
    expect([meta.width, meta.height]).toEqual([300, 400]);
    expect((full.body as Buffer).includes(Buffer.from("Shop tablet"))).toBe(false);
  });

  it("stores a JPEG with EXIF GPS, a comment and appended bytes, and a PNG with text chunks, as pixels only", async () => {
    const files = [
      { name: "gps-and-trailer.jpg", content: await taggedJpeg(), type: "image/jpeg" },
      { name: "comment-and-trailer.jpg", content: await taggedJpeg({ exif: false }), type: "image/jpeg" },
      { name: "texted.png", content: await taggedPng(), type: "image/png" },
    ];
    for (const f of files) expect(f.content.includes(TRAILER), "the fixture carries appended bytes").toBe(true);
    expect(pngChunkTypes(files[2]!.content)).toEqual(expect.arrayContaining(["tEXt", "iTXt"]));
    const res = await upload(cutter, defectId, files);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const items = res.body.items as { id: number; bytes: number }[];
    expect(items).toHaveLength(3);
    const has = (b: Buffer, s: string) => b.includes(Buffer.from(s, "latin1"));
    for (const [i, item] of items.entries()) {
      const row = await testDb()("defect_photos").where({ id: item.id }).first();
      const [stored, thumb] = await Promise.all([
        getObject(row!.object_key).then(streamBytes),
        getObject(row!.thumb_key).then(streamBytes),
      ]);
      const name = files[i]!.name;
      expect(stored.length, name).toBe(item.bytes);
      for (const b of [stored, thumb]) {
        expect(b.includes(TRAILER), name).toBe(false);
        for (const s of ["Exif", "GPS", "Shop tablet", JPEG_COMMENT, PNG_TEXT, "tEXt", "iTXt", "secret-"])
          expect(has(b, s), `${name}: ${s}`).toBe(false);
        const meta = await sharp(b).metadata();
        expect(meta.exif ?? meta.comments ?? meta.xmp ?? null, name).toBeNull();
      }
      if (row!.content_type === "image/jpeg") expect([...stored.subarray(-2)], name).toEqual([0xff, 0xd9]);
      else {
        expect(
          pngChunkTypes(stored).filter((t) => !["IHDR", "PLTE", "tRNS", "pHYs", "IDAT", "IEND"].includes(t)),
        ).toEqual([]);
        expect(stored.subarray(-8, -4).toString("latin1"), name).toBe("IEND");
      }
    }
  });

  it("refuses an 8,900 × 8,900 PNG of a few KB with 413 naming the file and its size, and stores nothing", async () => {
    const before = await snapshot();
    const huge = hugePng(8900, 8900);
    expect(huge.length).toBeLessThan(80_000);
    const res = await upload(cutter, defectId, [
      { name: "fine.jpg", content: await jpegBytes(), type: "image/jpeg" },
      { name: "bomb.png", content: huge, type: "image/png" },
    ]);
    expect(res.status).toBe(413);
    expect(res.body.error).toBe(
      '"bomb.png" is 8900 × 8900 pixels (79.2 megapixels); a photo may be at most 50 megapixels and 16,383 pixels a side. Nothing was stored.',
    );
    expect(res.body.fields["photos.1"]).toMatch(/^"bomb\.png" is 8900 × 8900 pixels/);
    expect(res.body.fields["photos.0"]).toBeUndefined();
    expect(await snapshot()).toEqual(before);
  });

  it("refuses a text file renamed .jpg with 415 and stores nothing, not even the good photo beside it", async () => {
    const before = await snapshot();
    const res = await upload(cutter, defectId, [
      { name: "fine.jpg", content: await jpegBytes(), type: "image/jpeg" },
      {
        name: "notes.jpg",
        content: Buffer.from("Block HF-1001: void near the top, 40 mm deep.\n"),
        type: "image/jpeg",
      },
    ]);
    expect(res.status).toBe(415);
    expect(res.body.error).toMatch(/notes\.jpg/);
    expect(res.body.fields["photos.1"]).toMatch(/"notes\.jpg" is not a JPEG, PNG or WebP image/);
    expect(res.body.fields["photos.0"]).toBeUndefined();
    expect(await snapshot()).toEqual(before);
  });

  it("refuses a photo over 10 MB with 413 naming the file, and stores nothing", async () => {
    const before = await snapshot();
    const big = Buffer.alloc(11 * 1024 * 1024, 0x5a);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    const res = await upload(cutter, defectId, [{ name: "huge-void.jpg", content: big, type: "image/jpeg" }]);
    expect(res.status).toBe(413);
    expect(res.body.error).toMatch(/"huge-void\.jpg" is 11 MB; a photo may be at most 10 MB/);
    expect(await snapshot()).toEqual(before);
  });

  it("refuses bytes that only start like a JPEG (sharp cannot read them)", async () => {
    const before = await snapshot();
    const fake = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.from("not really an image".repeat(20))]);
    const res = await upload(cutter, defectId, [{ name: "broken.jpg", content: fake, type: "image/jpeg" }]);
    expect(res.status).toBe(415);
    expect(res.body.fields["photos.0"]).toMatch(/broken\.jpg/);
    expect(await snapshot()).toEqual(before);
  });

  it("judges the type by the bytes: JPEG bytes sent as image/png named .png are stored as image/jpeg", async () => {
    const res = await upload(cutter, defectId, [
      { name: "looks-like.png", content: await jpegBytes(320, 240), type: "image/png" },
    ]);
    expect(res.status).toBe(201);
    const id = res.body.items[0].id as number;
    const row = await testDb()("defect_photos").where({ id }).first();
    expect(row!.content_type).toBe("image/jpeg");
    expect(row!.object_key).toMatch(/\.jpg$/);
    const full = await cutter.get(`/api/photos/${id}`);
    expect(full.headers["content-type"]).toBe("image/jpeg");
  });

  it("makes object keys on the server, never from the uploaded file name", async () => {
    const res = await upload(cutter, defectId, [
      { name: "..%2F..%2Fsecret-name-7731.jpg", content: await jpegBytes(200, 150), type: "image/jpeg" },
    ]);
    expect(res.status).toBe(201);
    const row = await testDb()("defect_photos").where({ id: res.body.items[0].id }).first();
    for (const key of [row!.object_key, row!.thumb_key]) {
      expect(key).toMatch(new RegExp(`^defects/${defectId}/[0-9a-f-]{36}\\.(jpg|thumb\\.webp)$`));
      expect(key).not.toMatch(/secret-name|\.\./);
    }
    expect((await listKeys()).filter((k) => k.includes("secret-name"))).toEqual([]);
  });

  it("answers bad requests plainly", async () => {
    const none = await cutter.call("post", `/api/defects/${defectId}/photos`).field("note", "no files");
    expect(none.status).toBe(400);
    expect(none.body.fields.photos).toMatch(/Attach at least one photo/);
    const json = await cutter.post(`/api/defects/${defectId}/photos`, { photos: [] });
    expect(json.status).toBe(415);
    const unknown = await upload(cutter, 999_999_999, [
      { name: "a.jpg", content: await jpegBytes(), type: "image/jpeg" },
    ]);
    expect(unknown.status).toBe(404);
    const tooMany = await upload(
      cutter,
      defectId,
      Array.from({ length: 7 }, (_, i) => ({ name: `p${i}.png`, content: Buffer.from([0x89]), type: "image/png" })),
    );
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.fields.photos).toMatch(/At most 6/);
  });
});

describe("defect photos: reading", () => {
  it("answers 404 for ids that are not photo ids, including path-traversal lookalikes", async () => {
    for (const path of [
      "/api/photos/../x",
      "/api/photos/..%2Fx",
      "/api/photos/1%2F..",
      "/api/photos/abc",
      "/api/photos/999999999",
      "/api/photos/1e3",
    ]) {
      const res = await cutter.get(path);
      expect(res.status, path).toBe(404);
    }
  });

  it("refuses an unknown size", async () => {
    const res = await cutter.get("/api/photos/1?size=huge");
    expect(res.status).toBe(400);
    expect(res.body.fields.size).toMatch(/size=thumb or size=full/);
  });
});
