import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, tableCounts, testDb } from "../support/db";
import { makeJob, makeJobPart, makeLibraryPart } from "../support/job-fixtures";
import { parseNaca, sectionArea } from "@/lib/profiles";

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
let manager: Client;
let buyer: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
  manager = client();
  await manager.signIn(demoEmail("manager"));
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
});

const gradeId = async (code: string) => (await testDb()("grades").where({ code }).first("id"))!.id as number;
const postCsv = (c: Client, path: string, body: string) =>
  c.call("post", path).set("content-type", "text/csv").send(body);

describe("jobs", () => {
  it("creates, reads, lists and updates a job", async () => {
    const created = await planner.post("/api/jobs", {
      name: "Gull kits — batch 1",
      customer: "Larkspur Model Flyers",
      dueOn: "2026-12-20",
      notes: "Rush",
    });
    expect(created.status).toBe(201);
    const id = created.body.job.id;
    expect(created.body.job).toMatchObject({
      name: "Gull kits — batch 1",
      customer: "Larkspur Model Flyers",
      dueOn: "2026-12-20",
      status: "open",
      lineCount: 0,
    });

    const read = await cutter.get(`/api/jobs/${id}`);
    expect(read.status).toBe(200);
    expect(read.body.parts).toEqual([]);

    const patched = await planner.patch(`/api/jobs/${id}`, { dueOn: "2026-12-22", status: "planned" });
    expect(patched.status).toBe(200);
    expect(patched.body.job).toMatchObject({ dueOn: "2026-12-22", status: "planned" });

    const listed = await manager.get("/api/jobs?status=planned&pageSize=200");
    expect(listed.status).toBe(200);
    expect(listed.body.items.map((j: { id: number }) => j.id)).toContain(id);
    for (const j of listed.body.items) expect(j.status).toBe("planned");
    expect(
      await testDb()("audit_log")
        .where({ subject: `job:${id}` })
        .pluck("action"),
    ).toEqual(expect.arrayContaining(["job.create", "job.update"]));
  });

  it("answers { items, total } with paging, soonest due first", async () => {
    for (let i = 0; i < 3; i++) await makeJob();
    const all = await planner.get("/api/jobs?status=all&pageSize=200");
    const p1 = await planner.get("/api/jobs?status=all&pageSize=2&page=1");
    const p2 = await planner.get("/api/jobs?status=all&pageSize=2&page=2");
    expect(p1.body.total).toBe(all.body.items.length);
    expect(p1.body.items).toHaveLength(2);
    const ids1 = p1.body.items.map((j: { id: number }) => j.id);
    expect(p2.body.items.filter((j: { id: number }) => ids1.includes(j.id))).toEqual([]);
    const dues = all.body.items.map((j: { dueOn: string | null }) => j.dueOn).filter(Boolean);
    expect([...dues].sort()).toEqual(dues);
    const found = await planner.get("/api/jobs?status=all&q=larkspur");
    expect(found.body.total).toBeGreaterThan(0);
    for (const j of found.body.items) expect(`${j.name} ${j.customer}`.toLowerCase()).toContain("larkspur");
  });

  it("refuses bad input by field and saves nothing", async () => {
    const before = await tableCounts();
    const res = await planner.post("/api/jobs", { name: "", dueOn: "2026-02-30", customer: 7 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fields).sort()).toEqual(["customer", "dueOn", "name"]);
    const q = await planner.get("/api/jobs?status=finished&page=0");
    expect(q.status).toBe(400);
    expect(Object.keys(q.body.fields).sort()).toEqual(["page", "status"]);
    const patch = await planner.patch(`/api/jobs/${await makeJob()}`, { status: "shipped" });
    expect(patch.status).toBe(400);
    expect(patch.body.fields).toHaveProperty("status");
    expect({ ...(await tableCounts()), jobs: before.jobs! + 1 }).toEqual({ ...before, jobs: before.jobs! + 1 });
    expect((await planner.get("/api/jobs/99999999")).status).toBe(404);
    expect((await planner.get("/api/jobs/abc")).status).toBe(404);
  });

  it("lets the planner write and the cutter and manager only read; the buyer does not see jobs", async () => {
    const id = await makeJob();
    expect((await cutter.post("/api/jobs", { name: "Not mine" })).status).toBe(403);
    expect((await manager.patch(`/api/jobs/${id}`, { status: "done" })).status).toBe(403);
    expect((await cutter.post(`/api/jobs/${id}/parts`, { name: "Rib", quantity: 1, size: [1, 1, 1] })).status).toBe(
      403,
    );
    expect((await cutter.delete(`/api/jobs/${id}/parts/${await makeJobPart(id)}`)).status).toBe(403);
    expect(
      (
        await postCsv(
          cutter,
          `/api/jobs/${id}/parts/import?commit=1`,
          "name,quantity,length_mm,width_mm,height_mm\nA,1,1,1,1\n",
        )
      ).status,
    ).toBe(403);
    expect((await cutter.post("/api/library", { name: "x", size: [1, 1, 1] })).status).toBe(403);
    expect((await buyer.get("/api/jobs")).status).toBe(403);
    expect((await cutter.get(`/api/jobs/${id}`)).status).toBe(200);
    expect((await manager.get("/api/library")).status).toBe(200);
  });
});

describe("job parts", () => {
  it("computes the nesting box and the true volume of a tapered NACA panel", async () => {
    const id = await makeJob();
    const res = await planner.post(`/api/jobs/${id}/parts`, {
      name: "Outer wing panel",
      quantity: 8,
      profile: { kind: "naca", code: "NACA 2412", chordMm: 250, tipChordMm: 160, spanMm: 700 },
      gradeId: await gradeId("EPS-I"),
      rotate: "none",
      size: [1, 1, 1],
    });
    expect(res.status).toBe(201);
    const p = res.body.part;
    const a1 = sectionArea(parseNaca("2412"), 1);
    expect(p.profile.code).toBe("2412");
    expect(p.size[0]).toBe(700); // x along the wire: the span
    expect(p.size[1]).toBeGreaterThanOrEqual(250);
    expect(p.size[1]).toBeLessThan(250.5);
    expect(p.size[2]).toBeGreaterThan(0.12 * 250);
    expect(p.size[2]).toBeLessThan(0.125 * 250);
    expect(p.trueVolumeMm3).toBeCloseTo((a1 * 700 * (250 ** 2 + 250 * 160 + 160 ** 2)) / 3, 0);
    expect(p.gradeCode).toBe("EPS-I");
    expect(p.rotate).toBe("none");
  });

  it("computes a polygon extrusion's box and volume, and keeps a box part's volume null", async () => {
    const id = await makeJob();
    const poly = await planner.post(`/api/jobs/${id}/parts`, {
      name: "Gusset",
      quantity: 3,
      profile: {
        kind: "polygon",
        points: [
          [0, 0],
          [300, 0],
          [0, 400],
        ],
        extrudeMm: 50,
      },
    });
    expect(poly.status).toBe(201);
    expect(poly.body.part).toMatchObject({
      size: [50, 300, 400],
      trueVolumeMm3: 3_000_000,
      rotate: "any",
      gradeId: null,
    });
    const box = await planner.post(`/api/jobs/${id}/parts`, {
      name: "Plinth",
      quantity: 2,
      size: [600, 400, 300],
      rotate: "z",
    });
    expect(box.body.part).toMatchObject({ size: [600, 400, 300], trueVolumeMm3: null, rotate: "z" });
    const job = await planner.get(`/api/jobs/${id}`);
    expect(job.body.job).toMatchObject({ lineCount: 2, pieceCount: 5 });
    expect(job.body.job.partVolumeM3).toBeCloseTo((3 * 3_000_000 + 2 * 600 * 400 * 300) / 1e9, 9);
  });

  it("refuses a self-intersecting polygon, a bad NACA code and a missing size by field, saving nothing", async () => {
    const id = await makeJob();
    const before = await tableCounts();
    const bow = await planner.post(`/api/jobs/${id}/parts`, {
      name: "Bow",
      quantity: 1,
      profile: {
        kind: "polygon",
        points: [
          [0, 0],
          [100, 100],
          [100, 0],
          [0, 100],
        ],
        extrudeMm: 10,
      },
    });
    expect(bow.status).toBe(400);
    expect(bow.body.fields["profile.points"]).toMatch(/cross/);
    const naca = await planner.post(`/api/jobs/${id}/parts`, {
      name: "Wing",
      quantity: 1,
      profile: { kind: "naca", code: "23012", chordMm: 200, spanMm: 500 },
    });
    expect(naca.status).toBe(400);
    expect(naca.body.fields["profile.code"]).toMatch(/4-digit/);
    const none = await planner.post(`/api/jobs/${id}/parts`, { name: "", quantity: 0 });
    expect(none.status).toBe(400);
    expect(Object.keys(none.body.fields).sort()).toEqual(["name", "quantity", "size"]);
    const sizeless = await planner.post(`/api/jobs/${id}/parts`, { name: "Block", quantity: 1 });
    expect(sizeless.body.fields.size).toMatch(/Give a size/);
    const pu = await planner.post(`/api/jobs/${id}/parts`, {
      name: "Letter",
      quantity: 1,
      size: [100, 100, 100],
      gradeId: await gradeId("PU-SIGN-15"),
    });
    expect(pu.status).toBe(400);
    expect(pu.body.fields.gradeId).toMatch(/never be hot-wired/);
    expect(await tableCounts()).toEqual(before);
  });

  it("adds library parts with quantities, refusing a retired one", async () => {
    const id = await makeJob();
    const lib = await planner.post("/api/library", {
      kit: "Test glider",
      name: "Tailplane",
      profile: { kind: "naca", code: "0009", chordMm: 120, tipChordMm: 90, spanMm: 320 },
      defaultQuantity: 1,
    });
    expect(lib.status).toBe(201);
    const res = await planner.post(`/api/jobs/${id}/parts`, {
      items: [
        { libraryPartId: lib.body.part.id, quantity: 12 },
        { libraryPartId: await makeLibraryPart(), quantity: 3 },
      ],
    });
    expect(res.status).toBe(201);
    expect(res.body.parts).toHaveLength(2);
    expect(res.body.parts[0]).toMatchObject({
      name: "Tailplane",
      quantity: 12,
      libraryPartId: lib.body.part.id,
      size: lib.body.part.size,
      trueVolumeMm3: lib.body.part.trueVolumeMm3,
    });
    const before = await tableCounts();
    const retired = await planner.post(`/api/jobs/${id}/parts`, {
      items: [{ libraryPartId: await makeLibraryPart({ active: false }), quantity: 1 }],
    });
    expect(retired.status).toBe(400);
    expect(retired.body.fields["items.0.libraryPartId"]).toMatch(/retired/);
    expect({ ...(await tableCounts()), library_parts: before.library_parts }).toEqual(before);
  });

  it("edits a quantity and removes a part while the job is open, and refuses both once it is planned", async () => {
    const id = await makeJob();
    const partId = await makeJobPart(id, { quantity: 2 });
    const edited = await planner.patch(`/api/jobs/${id}/parts/${partId}`, { quantity: 9 });
    expect(edited.status).toBe(200);
    expect(edited.body.part.quantity).toBe(9);
    expect((await planner.patch(`/api/jobs/${id}/parts/${partId}`, { quantity: 1.5 })).body.fields.quantity).toMatch(
      /whole/,
    );
    const other = await makeJobPart(await makeJob());
    expect((await planner.delete(`/api/jobs/${id}/parts/${other}`)).status).toBe(404);
    expect((await planner.delete(`/api/jobs/${id}/parts/${partId}`)).status).toBe(200);
    expect(await testDb()("job_parts").where({ id: partId }).first()).toBeUndefined();

    const planned = await makeJob({ status: "planned" });
    const kept = await makeJobPart(planned);
    expect((await planner.patch(`/api/jobs/${planned}/parts/${kept}`, { quantity: 3 })).status).toBe(409);
    expect((await planner.delete(`/api/jobs/${planned}/parts/${kept}`)).status).toBe(409);
    expect(
      (await planner.post(`/api/jobs/${planned}/parts`, { name: "Late", quantity: 1, size: [1, 1, 1] })).status,
    ).toBe(409);
  });
});

describe("part-list CSV import", () => {
  const header =
    "name,quantity,length_mm,width_mm,height_mm,grade,rotate,naca,chord_mm,tip_chord_mm,span_mm,polygon,extrude_mm";
  const good = [
    "Plinth,2,600,400,300,EPS-II,z,,,,,,",
    "Inner wing,4,,,,EPS-I,none,NACA 2412,230,200,420,,",
    "Letter L,3,,,,EPS-II,,,,,,0 0; 320 0; 320 100; 100 100; 100 600; 0 600,100",
  ];

  it("previews without saving, then imports every row with computed boxes", async () => {
    const id = await makeJob();
    const before = await tableCounts();
    const preview = await postCsv(
      planner,
      `/api/jobs/${id}/parts/import?commit=0&name=parts.csv`,
      `${[header, ...good].join("\n")}\n`,
    );
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      committed: false,
      rows: 3,
      problemCount: 0,
      summary: { parts: 3, pieces: 9 },
    });
    expect(await tableCounts()).toEqual(before);

    const done = await postCsv(
      planner,
      `/api/jobs/${id}/parts/import?commit=1&name=parts.csv`,
      `${[header, ...good].join("\n")}\n`,
    );
    expect(done.status).toBe(201);
    const parts = (await planner.get(`/api/jobs/${id}`)).body.parts;
    expect(parts.map((p: { name: string }) => p.name)).toEqual(["Plinth", "Inner wing", "Letter L"]);
    expect(parts[0]).toMatchObject({ size: [600, 400, 300], rotate: "z", gradeCode: "EPS-II", trueVolumeMm3: null });
    expect(parts[1].size[0]).toBe(420);
    expect(parts[1].profile).toMatchObject({ kind: "naca", code: "2412", chordMm: 230, tipChordMm: 200 });
    expect(parts[2]).toMatchObject({ size: [100, 320, 600], rotate: "any" });
    expect(parts[2].trueVolumeMm3).toBeCloseTo((320 * 100 + 100 * 500) * 100, 6);
  });

  it("refuses a file with one bad row among many, naming the row and column, and imports nothing", async () => {
    const id = await makeJob();
    const rows = Array.from({ length: 40 }, (_, i) => `Rib ${i + 1},2,400,120,20,EPS-I,any,,,,,,`);
    rows[26] = "Rib 27,2,400,-5,20,EPS-I,any,,,,,,"; // file row 28
    const before = await tableCounts();
    const res = await postCsv(planner, `/api/jobs/${id}/parts/import?commit=1`, `${[header, ...rows].join("\n")}\n`);
    expect(res.status).toBe(422);
    expect(res.body.committed).toBe(false);
    expect(res.body.problems).toEqual([{ row: 28, column: "width_mm", message: "Must be more than 0." }]);
    expect(res.body.error).toMatch(/row 28, column “width_mm”/);
    expect(await tableCounts()).toEqual(before);
  });

  it("names each kind of bad cell", async () => {
    const id = await makeJob();
    const res = await postCsv(
      planner,
      `/api/jobs/${id}/parts/import?commit=0`,
      `${[
        header,
        ",1.5,100,100,100,,,,,,,,",
        "A,1,,,,EPS-XX,sideways,,,,,,",
        "B,1,,,,,,24123,200,,500,,",
        "C,1,,,,,,2412,,,,,",
        "D,1,,,,,,,,,,0 0; 10 10; 10 0; 0 10,5",
        "E,1,100,100,100,,,2412,200,,500,,",
        "F,1,100,100,,,,,,,,,",
        "G,1,,,,PU-SIGN-15,,,,,,0 0; 10 0; 0 10,",
      ].join("\n")}\n`,
    );
    expect(res.status).toBe(422);
    const at = (row: number) =>
      res.body.problems
        .filter((p: { row: number }) => p.row === row)
        .map((p: { column: string; message: string }) => `${p.column}: ${p.message}`);
    expect(at(2)).toEqual(["name: Required.", "quantity: Must be a whole number."]);
    expect(at(3)).toEqual(
      expect.arrayContaining([expect.stringMatching(/^grade: Unknown grade/), expect.stringMatching(/^rotate: /)]),
    );
    expect(at(4)).toEqual([expect.stringMatching(/^naca: .*5 digits/)]);
    expect(at(5)).toEqual(["chord_mm: Required with a NACA section.", "span_mm: Required with a NACA section."]);
    expect(at(6)).toEqual([expect.stringMatching(/^polygon: .*cross/)]);
    expect(at(7)).toEqual([expect.stringMatching(/^naca: Give one shape per row/)]);
    expect(at(8)).toEqual(["height_mm: Required for a plain part (or give a NACA section or a polygon)."]);
    expect(at(9)).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^grade: .*never be hot-wired/),
        "extrude_mm: Required with a polygon.",
      ]),
    );
  });

  it("refuses unknown columns on row 1 and an import onto a job that is no longer open", async () => {
    const id = await makeJob();
    const res = await postCsv(planner, `/api/jobs/${id}/parts/import?commit=0`, "name,qty,colour\nA,1,red\n");
    expect(res.status).toBe(422);
    expect(res.body.problems.map((p: { row: number; column: string }) => `${p.row}:${p.column}`).sort()).toEqual([
      "1:colour",
      "1:qty",
      "1:quantity",
    ]);
    const done = await makeJob({ status: "done" });
    expect((await postCsv(planner, `/api/jobs/${done}/parts/import?commit=1`, `${header}\n${good[0]}\n`)).status).toBe(
      409,
    );
  });
});

describe("part library", () => {
  it("lists by kit, edits and retires a part, recomputing its box when the profile changes", async () => {
    const created = await planner.post("/api/library", {
      kit: "Test signs",
      name: "Letter I",
      profile: {
        kind: "polygon",
        points: [
          [0, 0],
          [100, 0],
          [100, 600],
          [0, 600],
        ],
        extrudeMm: 100,
      },
    });
    expect(created.status).toBe(201);
    const id = created.body.part.id;
    expect(created.body.part).toMatchObject({ size: [100, 100, 600], trueVolumeMm3: 6_000_000 });
    const edited = await planner.patch(`/api/library/${id}`, {
      profile: {
        kind: "polygon",
        points: [
          [0, 0],
          [100, 0],
          [100, 600],
          [0, 600],
        ],
        extrudeMm: 75,
      },
      defaultQuantity: 4,
    });
    expect(edited.body.part).toMatchObject({ size: [75, 100, 600], trueVolumeMm3: 4_500_000, defaultQuantity: 4 });
    expect((await planner.patch(`/api/library/${id}`, { active: false })).body.part.active).toBe(false);
    const list = await cutter.get("/api/library?kit=Test%20signs");
    expect(list.body.items.map((p: { id: number }) => p.id)).not.toContain(id);
    const all = await planner.get("/api/library?kit=Test%20signs&includeRetired=1");
    expect(all.body.items.map((p: { id: number }) => p.id)).toContain(id);
    const bad = await planner.patch(`/api/library/${id}`, { colour: "red" });
    expect(bad.status).toBe(400);
    expect((await planner.patch("/api/library/99999999", { defaultQuantity: 2 })).status).toBe(404);
  });

  it("serves the seeded glider kit with NACA wing panels and polygon formers", async () => {
    const res = await manager.get("/api/library");
    const kestrel = res.body.items.filter((p: { kit: string }) => p.kit === "Kestrel 1.6 m glider");
    expect(kestrel.some((p: { profile: { kind: string } | null }) => p.profile?.kind === "naca")).toBe(true);
    expect(kestrel.some((p: { profile: { kind: string } | null }) => p.profile?.kind === "polygon")).toBe(true);
  });
});
