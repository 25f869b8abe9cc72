import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, tableCounts, testDb } from "../support/db";
import { makeJob, makeJobPart } from "../support/job-fixtures";
import { makePlannedBlock } from "../support/planning-fixtures";
import { LETTER_O, WING, makeProfilePart, makeProfileRun, profileCutterId } from "../support/profile-fixtures";
import { machineBody } from "./route-examples";

let planner: Client;
let cutter: Client;
let buyer: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
});
afterAll(closeTestDb);

/** A 2-axis profile cutter with a small travel, straight in the database. */
async function smallCutter(over: Record<string, unknown> = {}): Promise<number> {
  const [m] = await testDb()("machines")
    .insert({
      name: `Small profile cutter ${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 6)}`,
      kind: "profile",
      wire: "horizontal",
      wire_length_mm: 800,
      travel_x_mm: 600,
      travel_y_mm: 400,
      max_length_mm: 800,
      max_width_mm: 600,
      max_height_mm: 400,
      ...over,
    })
    .returning("id");
  return m!.id;
}

describe("a part's profile program", () => {
  it("downloads as G-code in the machine's dialect and axis letters, and as a drawing to scale", async () => {
    const jobId = await makeJob();
    const partId = await makeProfilePart(jobId, LETTER_O, { name: "Letter O", gradeCode: "EPS-II" });
    const machineId = await profileCutterId();
    const url = `/api/jobs/${jobId}/parts/${partId}/program?machineId=${machineId}`;
    const res = await cutter.get(url).buffer(true);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/plain/);
    expect(res.headers["content-disposition"]).toMatch(/^attachment; filename="job-\d+-part-\d+-letter-o\.nc"$/);
    const text = res.text;
    // The seeded profile cutter: DIN mm words, numbered lines, M64 P0 / M65 P0 heat, two towers X Y and U V.
    expect(text).toMatch(/^N10 G71$/m);
    expect(text).toMatch(/^N\d+ M64 P0$/m);
    expect(text).toMatch(/^N\d+ M65 P0$/m);
    expect(text).toMatch(/^N\d+ G1 X[\d.]+ Y[\d.]+ U[\d.]+ V[\d.]+ F[\d.]+$/m);
    expect(text).toMatch(/\(PART 1: LETTER O\. LEAD-IN FROM THE \w+ FACE, ANTICLOCKWISE, 1 HOLE SLIT\)/);
    expect(text).toMatch(/\(CAUTION: NEVER HOT-WIRE POLYURETHANE/);
    const svg = await planner.get(`${url}&format=svg`).buffer(true);
    expect(svg.status).toBe(200);
    expect(svg.headers["content-type"]).toMatch(/^image\/svg\+xml/);
    expect(String(svg.body)).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" width="[\d.]+mm"/);
  });

  it("takes the planner's choices: way round, dwell, lead-in point and slit point", async () => {
    const jobId = await makeJob();
    const partId = await makeProfilePart(jobId, LETTER_O);
    const res = await planner
      .get(`/api/jobs/${jobId}/parts/${partId}/program?direction=cw&dwell=0.5&dwellAngle=60&leadIn=60,160&slits=60,160`)
      .buffer(true);
    expect(res.status).toBe(200);
    expect(res.text).toMatch(/LEAD-IN FROM THE TOP FACE, CLOCKWISE, 1 HOLE SLIT/);
    expect(res.text).toMatch(/^N\d+ G4 P0\.5$/m);
  });

  it("answers 409 for a part with no profile and for a block cutter, 404 for no such machine, 400 for a bad choice", async () => {
    const jobId = await makeJob();
    const box = await makeJobPart(jobId);
    const partId = await makeProfilePart(jobId, LETTER_O);
    const before = await tableCounts();
    const plain = await planner.get(`/api/jobs/${jobId}/parts/${box}/program`);
    expect(plain.status).toBe(409);
    expect(plain.body.error).toMatch(/^Test part \d+ is a plain box: it has no profile to cut\./);
    const block = await testDb()("machines").where({ kind: "block" }).first("id", "name");
    const wrong = await planner.get(`/api/jobs/${jobId}/parts/${partId}/program?machineId=${block!.id}`);
    expect(wrong.status).toBe(409);
    expect(wrong.body.error).toBe(
      `${block!.name} is a block cutter: profiles are cut on a profile cutter. Choose one.`,
    );
    expect((await planner.get(`/api/jobs/${jobId}/parts/${partId}/program?machineId=99999999`)).status).toBe(404);
    const bad = await planner.get(`/api/jobs/${jobId}/parts/${partId}/program?format=pdf&leadIn=top`);
    expect(bad.status).toBe(400);
    expect(bad.body.fields.format).toBe("format: gcode (the program) or svg (its drawing).");
    expect(bad.body.fields.leadIn).toMatch(/^leadIn: write it as "x,y"/);
    expect((await planner.get(`/api/jobs/${jobId + 1_000_000}/parts/${partId}/program`)).status).toBe(404);
    expect(await tableCounts()).toEqual(before);
  });

  it("refuses a tapered wing on a 2-axis cutter and on towers that cannot reach, naming the limit", async () => {
    const jobId = await makeJob();
    const wing = await makeProfilePart(jobId, WING, { name: "Wing panel" });
    const flat = await smallCutter();
    const res = await planner.get(`/api/jobs/${jobId}/parts/${wing}/program?machineId=${flat}`);
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(
      /^Wing panel has different root and tip sections: it needs a 4-axis profile cutter, and Small profile cutter .+ moves both ends of the wire together\.$/,
    );
    const short = await smallCutter({ four_axis: true, axis_u: "U", axis_v: "V", wire_length_mm: 400 });
    const tooLong = await planner.get(`/api/jobs/${jobId}/parts/${wing}/program?machineId=${short}`);
    expect(tooLong.status).toBe(409);
    expect(tooLong.body.error).toMatch(/^The slab is 450 mm long along the wire; .+ wire spans 400 mm\.$/);
    const narrow = await smallCutter({ four_axis: true, axis_u: "U", axis_v: "V", travel_x_mm: 245 });
    const reach = await planner.get(`/api/jobs/${jobId}/parts/${wing}/program?machineId=${narrow}`);
    expect(reach.status).toBe(409);
    expect(reach.body.error).toMatch(
      /cannot cut this: the [XU] axis would have to reach [\d.]+ mm; its travel is 0–245 mm\.$/,
    );
  });

  it("is for who plans and who cuts", async () => {
    const jobId = await makeJob();
    const partId = await makeProfilePart(jobId, LETTER_O);
    expect((await buyer.get(`/api/jobs/${jobId}/parts/${partId}/program`)).status).toBe(403);
  });
});

describe("a plan's profile programs, per slab", () => {
  it("lists the slabs and downloads each slab's G-code and drawing", async () => {
    const { runId } = await makeProfileRun();
    const list = await cutter.get(`/api/runs/${runId}/profile-programs`);
    expect(list.status).toBe(200);
    expect(list.body.machine.fourAxis).toBe(true);
    const slabs = list.body.slabs as { slab: string; parts: string[]; lengthMm: number; problem: string | null }[];
    expect(slabs.length).toBeGreaterThanOrEqual(2); // the letters' layer(s) and the wing's
    expect(slabs.flatMap((s) => s.parts).sort()).toEqual(["Letter O", "Letter O", "Letter O", "Wing panel"]);
    for (const s of slabs) {
      expect(s.problem).toBeNull();
      expect(s.lengthMm).toBeGreaterThan(0);
      const g = await planner
        .get(`/api/runs/${runId}/profile-programs?slab=${encodeURIComponent(s.slab)}`)
        .buffer(true);
      expect(g.status).toBe(200);
      expect(g.headers["content-disposition"]).toMatch(/^attachment; filename="plan-\d+-.+\.nc"$/);
      expect((g.text.match(/^\(PART \d+: /gm) ?? []).length).toBe(s.parts.length);
      const svg = await planner.get(
        `/api/runs/${runId}/profile-programs?slab=${encodeURIComponent(s.slab)}&format=svg`,
      );
      expect(svg.status).toBe(200);
    }
    const none = await planner.get(`/api/runs/${runId}/profile-programs?slab=${encodeURIComponent("HF-0 slab 9")}`);
    expect(none.status).toBe(404);
    expect(none.body.error).toMatch(/^This plan has no slab “HF-0 slab 9”; its slabs are /);
  });

  it("answers 409 for a plan of plain boxes, 403 for a buyer", async () => {
    const { runId } = await makePlannedBlock();
    const res = await planner.get(`/api/runs/${runId}/profile-programs`);
    expect(res.status).toBe(409);
    expect(res.body.error).toBe("This plan has no profile parts: every part is a plain box.");
    expect((await buyer.get(`/api/runs/${runId}/profile-programs`)).status).toBe(403);
  });
});

describe("4-axis profile cutters on the machines API", () => {
  it("keeps whether a cutter is 4-axis and its second tower's letters; refuses a 4-axis block cutter and repeated letters", async () => {
    const body = {
      ...machineBody(`Tower cutter ${Date.now().toString(36)}`),
      kind: "profile",
      fourAxis: true,
      dialect: { ...machineBody("x").dialect, towerAxes: ["U", "V"] },
    };
    const res = await planner.post("/api/machines", body);
    expect(res.status).toBe(201);
    expect(res.body.machine.fourAxis).toBe(true);
    expect(res.body.machine.dialect.towerAxes).toEqual(["U", "V"]);
    const before = await tableCounts();
    const block = await planner.post("/api/machines", { ...body, name: `${body.name} B`, kind: "block" });
    expect(block.status).toBe(400);
    expect(block.body.fields.fourAxis).toBe("Only a profile cutter cuts on 4 axes.");
    const same = await planner.post("/api/machines", {
      ...body,
      name: `${body.name} C`,
      dialect: { ...body.dialect, towerAxes: ["U", "X"] },
    });
    expect(same.status).toBe(400);
    expect(same.body.fields["dialect.towerAxes.1"]).toBe("The four axis letters must all differ.");
    const missing = await planner.post("/api/machines", {
      ...body,
      name: `${body.name} D`,
      dialect: { ...body.dialect, towerAxes: null },
    });
    expect(missing.status).toBe(400);
    expect(missing.body.fields["dialect.towerAxes.0"]).toBe(
      "Give the second tower's two axis letters, such as U and V.",
    );
    expect(await tableCounts()).toEqual(before);
  });
});
