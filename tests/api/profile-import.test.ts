/**
 * POST /api/profiles/import: drawings, paths and text to profiles, a preview that stores nothing;
 * each bad file is a 422 naming the entity or element. Then the profiles go onto a job and into
 * the library in one request, all or none.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, tableCounts, testDb } from "../support/db";
import { makeJob } from "../support/job-fixtures";

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
});

const g = (code: number, value: string | number) => `${code}\n${value}`;
function dxf(entities: string[], insunits: number | null = 4): string {
  const header =
    insunits === null ? [] : [g(0, "SECTION"), g(2, "HEADER"), g(9, "$INSUNITS"), g(70, insunits), g(0, "ENDSEC")];
  return [...header, g(0, "SECTION"), g(2, "ENTITIES"), ...entities, g(0, "ENDSEC"), g(0, "EOF")].join("\n");
}
const lwpoly = (h: string, pts: [number, number][], closed = true) =>
  [
    g(0, "LWPOLYLINE"),
    g(5, h),
    g(8, "0"),
    g(90, pts.length),
    g(70, closed ? 1 : 0),
    ...pts.flatMap(([x, y]) => [g(10, x), g(20, y)]),
  ].join("\n");
const line = (h: string, x1: number, y1: number, x2: number, y2: number) =>
  [g(0, "LINE"), g(5, h), g(8, "0"), g(10, x1), g(20, y1), g(11, x2), g(21, y2)].join("\n");
const circle = (h: string, cx: number, cy: number, r: number) =>
  [g(0, "CIRCLE"), g(5, h), g(8, "0"), g(10, cx), g(20, cy), g(40, r)].join("\n");
const square = (h: string, x: number, y: number, s: number) =>
  lwpoly(h, [
    [x, y],
    [x + s, y],
    [x + s, y + s],
    [x, y + s],
  ]);

/** Posts a form: files as [field, name, text|bytes], other fields as strings. */
function post(c: Client, files: [string, string, string | Buffer][], fields: Record<string, string> = {}) {
  let r = c.call("post", "/api/profiles/import");
  for (const [k, v] of Object.entries(fields)) r = r.field(k, v);
  for (const [field, name, content] of files) r = r.attach(field, Buffer.from(content), { filename: name });
  return r;
}

describe("POST /api/profiles/import", () => {
  it("a good DXF: a 200 mm frame with a 100 mm window and a 40 mm disc in it → two profiles; nothing stored", async () => {
    const before = await tableCounts();
    const res = await post(planner, [
      ["file", "frame.dxf", dxf([square("10", 0, 0, 200), square("11", 50, 50, 100), circle("12", 100, 100, 20)])],
    ]);
    expect(res.status).toBe(200);
    expect(res.body.unit).toEqual({ name: "mm", mmPerUnit: 1, from: "file" });
    expect(res.body.profiles.map((p: { name: string }) => p.name)).toEqual([
      "frame.dxf, shape 1",
      "frame.dxf, shape 2",
    ]);
    const [frame, disc] = res.body.profiles;
    expect(frame.holes).toHaveLength(1);
    expect(frame.areaMm2).toBe(200 * 200 - 100 * 100);
    expect(frame.boxMm).toEqual([200, 200]);
    expect(frame.source).toBe("frame.dxf");
    // πr² less at most the sagitta band 2πr × 0.05 mm.
    expect(Math.PI * 400 - disc.areaMm2).toBeGreaterThan(0);
    expect(Math.PI * 400 - disc.areaMm2).toBeLessThan(2 * Math.PI * 20 * 0.05);
    expect(await tableCounts()).toEqual(before);
  });

  it.each([
    [
      "an open loop",
      dxf([line("A1", 0, 0, 100, 0), line("A2", 100, 0, 100, 50), line("A3", 100, 50, 0, 50)]),
      /^Open outline: LINE \(handle A1\), LINE \(handle A2\) and LINE \(handle A3\) do not close — its ends are 50\.00 mm apart/,
    ],
    [
      "crossing edges",
      dxf([
        lwpoly("B7", [
          [0, 0],
          [10, 10],
          [10, 0],
          [0, 6],
        ]),
      ]),
      /^LWPOLYLINE \(handle B7\) crosses or touches itself near \(3\.75, 3\.75\) mm/,
    ],
    [
      "zero area",
      dxf([
        lwpoly("C4", [
          [0, 0],
          [10, 0],
          [20, 0],
        ]),
      ]),
      /^LWPOLYLINE \(handle C4\) encloses no area/,
    ],
    [
      "no closed shape",
      dxf([[g(0, "TEXT"), g(5, "D1"), g(10, 0), g(20, 0), g(1, "hi")].join("\n")]),
      /holds no closed shape/,
    ],
    ["no SECTION at its start", "just some words", /^This is not a DXF drawing: it does not begin with a SECTION/],
  ])("refuses a DXF with %s: 422 naming it, nothing stored", async (_what, file, message) => {
    const before = await tableCounts();
    const res = await post(planner, [["file", "bad.dxf", file]]);
    expect(res.status).toBe(422);
    expect(res.body.error).toMatch(message);
    expect(res.body.errors[0].message).toMatch(message);
    expect(res.body.fields.file).toMatch(message);
    expect(await tableCounts()).toEqual(before);
  });

  it("a DXF without a unit asks for it on the unit field; given inches it is read × 25.4", async () => {
    const file = dxf([square("1", 0, 0, 2)], null);
    const asked = await post(planner, [["file", "inch.dxf", file]]);
    expect(asked.status).toBe(422);
    expect(asked.body.needsUnit).toBe(true);
    expect(asked.body.fields.unit).toMatch(/does not say its unit/);
    const given = await post(planner, [["file", "inch.dxf", file]], { unit: "in" });
    expect(given.status).toBe(200);
    expect(given.body.profiles[0].boxMm).toEqual([50.8, 50.8]);
    expect(given.body.unit).toMatchObject({ name: "in", from: "given" });
    const bad = await post(planner, [["file", "inch.dxf", file]], { unit: "furlong" });
    expect(bad.status).toBe(400);
    expect(bad.body.fields.unit).toMatch(/one of mm, cm, m, in, ft/);
  });

  it("lists unsupported entities in a note and takes the rest", async () => {
    const hatch = [g(0, "HATCH"), g(5, "F9"), g(8, "0"), g(2, "SOLID")].join("\n");
    const res = await post(planner, [["file", "hatched.dxf", dxf([square("F1", 0, 0, 10), hatch])]]);
    expect(res.status).toBe(200);
    expect(res.body.notes.join(" ")).toMatch(/1 HATCH \(handle F9\)/);
  });

  it("an SVG file: units from width and viewBox, y up; a bad path named by number and id", async () => {
    const good = `<svg xmlns="http://www.w3.org/2000/svg" width="4in" height="2in" viewBox="0 0 400 200"><rect x="0" y="0" width="400" height="200"/></svg>`;
    const res = await post(planner, [["file", "plate.svg", good]]);
    expect(res.status).toBe(200);
    expect(res.body.profiles[0].boxMm).toEqual([101.6, 50.8]);
    const bad = `<svg width="10mm" height="10mm" viewBox="0 0 10 10"><path id="swoosh" d="M0 0 C 1 2"/></svg>`;
    const refused = await post(planner, [["file", "logo.svg", bad]]);
    expect(refused.status).toBe(422);
    expect(refused.body.errors[0].message).toMatch(/^Path 1 \(id “swoosh”\): its path data cannot be read/);
  });

  it("a bare SVG path asks for its unit, then reads it", async () => {
    const asked = await post(planner, [], { svgPath: "M0 0 H100 V50 H0 Z" });
    expect(asked.status).toBe(422);
    expect(asked.body.fields.unit).toMatch(/choose the unit/);
    const res = await post(planner, [], { svgPath: "M0 0 H100 V50 H0 Z", unit: "mm" });
    expect(res.status).toBe(200);
    expect(res.body.profiles[0]).toMatchObject({ boxMm: [100, 50], areaMm2: 5000, source: "SVG path" });
  });

  it("text in the shipped font: “OPEN” letter by letter, or joined; the licence is named", async () => {
    const each = await post(planner, [], { text: "OPEN", heightMm: "300", spacingMm: "15" });
    expect(each.status).toBe(200);
    expect(each.body.profiles.map((p: { name: string; holes: unknown[] }) => [p.name, p.holes.length])).toEqual([
      ["Letter O", 1],
      ["Letter P", 1],
      ["Letter E", 0],
      ["Letter N", 0],
    ]);
    expect(each.body.notes.join(" ")).toMatch(/Inter Bold \(SIL Open Font License 1\.1\)/);
    const joined = await post(planner, [], { text: "OPEN", heightMm: "300", spacingMm: "15", joined: "1" });
    expect(joined.status).toBe(200);
    expect(joined.body.profiles).toHaveLength(1);
  });

  it("text: bad fields are named; a letter the font lacks, a WOFF2 or a broken font upload is a 422 on its field", async () => {
    const noHeight = await post(planner, [], { text: "OPEN" });
    expect(noHeight.status).toBe(400);
    expect(noHeight.body.fields.heightMm).toMatch(/letter height/);
    const missing = await post(planner, [], { text: "日本", heightMm: "100" });
    expect(missing.status).toBe(422);
    expect(missing.body.fields.text).toBe("Inter Bold has no letters for “日”, “本”.");
    const woff2 = await post(planner, [["font", "shop.woff2", Buffer.from("wOF2\0\0\0\0junk")]], {
      text: "A",
      heightMm: "50",
    });
    expect(woff2.status).toBe(422);
    expect(woff2.body.fields.font).toMatch(/WOFF2 fonts are not read/);
    const broken = await post(planner, [["font", "shop.ttf", Buffer.from("\0\x01\0\0broken")]], {
      text: "A",
      heightMm: "50",
    });
    expect(broken.status).toBe(422);
    expect(broken.body.fields.font).toMatch(/could not be read/);
  });

  it("refuses a file that is neither a DXF, an SVG nor (for drawings) a font", async () => {
    const words = await post(planner, [["file", "notes.txt", "just some words"]]);
    expect(words.status).toBe(422);
    expect(words.body.fields.file).toBe("This file is neither a DXF nor an SVG drawing.");
    const font = await post(planner, [["file", "shop.woff", Buffer.from("wOFF\0\x01\0\0rest")]]);
    expect(font.status).toBe(422);
    expect(font.body.fields.file).toMatch(/This is a font file: choose the Text shape/);
  });

  it("refuses an empty form, JSON, a file over 5 MB, and anyone but a planner", async () => {
    const empty = await post(planner, [], { unit: "mm" });
    expect(empty.status).toBe(400);
    expect(empty.body.fields.file).toMatch(/Choose a DXF or SVG file/);
    const json = await planner.post("/api/profiles/import", { svgPath: "M0 0 H1 V1 Z" });
    expect(json.status).toBe(415);
    const big = await post(planner, [["file", "huge.dxf", Buffer.alloc(5 * 1024 * 1024 + 10, 0x20)]]);
    expect(big.status).toBe(413);
    expect(big.body.fields.file).toMatch(/At most 5 MB/);
    const asCutter = await post(cutter, [["file", "frame.dxf", dxf([square("1", 0, 0, 10)])]]);
    expect(asCutter.status).toBe(403);
  });
});

describe("adding imported profiles: one request, all or none", () => {
  it("adds a drawing's profiles to a job with their true areas; one bad part adds none", async () => {
    const jobId = await makeJob();
    const preview = await post(planner, [
      ["file", "frame.dxf", dxf([square("10", 0, 0, 200), square("11", 50, 50, 100)])],
    ]);
    const [frame] = preview.body.profiles;
    const part = (name: string, profile: unknown) => ({ name, quantity: 2, rotate: "any", profile });
    const good = { kind: "polygon", points: frame.points, holes: frame.holes, source: frame.source, extrudeMm: 25 };
    const bad = await planner.post(`/api/jobs/${jobId}/parts`, {
      parts: [
        part("Frame", good),
        part("Broken", {
          ...good,
          points: [
            [0, 0],
            [1, 1],
            [1, 0],
            [0, 1],
          ],
        }),
      ],
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fields)[0]).toMatch(/^parts\.1\.profile/);
    const counted = await testDb()("job_parts").where({ job_id: jobId }).count<{ n: string }[]>({ n: "*" });
    expect(Number(counted[0]!.n)).toBe(0);

    const res = await planner.post(`/api/jobs/${jobId}/parts`, {
      parts: [part("Frame A", good), part("Frame B", good)],
    });
    expect(res.status).toBe(201);
    expect(res.body.parts.map((p: { name: string }) => p.name)).toEqual(["Frame A", "Frame B"]);
    // (200² − 100²) mm² × 25 mm = 750,000 mm³; box: 25 along the wire, 200 × 200 across.
    expect(res.body.parts[0].trueVolumeMm3).toBe(750_000);
    expect(res.body.parts[0].size).toEqual([25, 200, 200]);
    expect(res.body.parts[0].profile.holes).toHaveLength(1);
  });

  it("adds the letters of a word to the library in one request", async () => {
    const letters = await post(planner, [], { text: "AB", heightMm: "200" });
    const parts = letters.body.profiles.map((p: { name: string; points: unknown; holes: unknown; source: string }) => ({
      kit: "Test letters",
      name: p.name,
      profile: { kind: "polygon", points: p.points, holes: p.holes, source: p.source, extrudeMm: 50 },
    }));
    const res = await planner.post("/api/library", { parts });
    expect(res.status).toBe(201);
    expect(
      res.body.parts.map((p: { name: string; profile: { holes: unknown[] } }) => [p.name, p.profile.holes.length]),
    ).toEqual([
      ["Letter A", 1],
      ["Letter B", 2],
    ]);
  });
});
