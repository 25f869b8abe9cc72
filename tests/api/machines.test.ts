import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, tableCounts, testDb } from "../support/db";
import { machineBody } from "./route-examples";

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
});

describe("machines", () => {
  it("a planner adds a cutter; everyone signed in reads it back as entered", async () => {
    const name = `Bay 9 ${Date.now().toString(36)}`;
    const res = await planner.post("/api/machines", machineBody(name));
    expect(res.status).toBe(201);
    const id = res.body.machine.id;
    const read = await cutter.get(`/api/machines/${id}`);
    expect(read.status).toBe(200);
    expect(read.body.machine).toMatchObject({
      name,
      kind: "block",
      wire: "horizontal",
      wireLength: 1300,
      travel: [5200, 1300],
      maxPiece: [5000, 1300, 1250],
      turntable: true,
      rapid: 2400,
      dialect: { unitWords: "G20/G21", heatOn: "M3", heatOff: "M5", axes: ["X", "Y"], lineNumbers: false },
      grades: [],
    });
    // A second of the same name is refused, naming the field.
    const again = await planner.post("/api/machines", machineBody(name));
    expect(again.status).toBe(409);
    expect(again.body.fields.name).toMatch(/another name/);
  });

  it("refuses bad fields by name and saves nothing", async () => {
    const before = await tableCounts();
    const body = machineBody("");
    const res = await planner.post("/api/machines", {
      ...body,
      wireLength: -5,
      travel: [5200, "far"],
      dialect: { ...body.dialect, heatOn: "heat please", heatOff: null, axes: ["X", "X"] },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fields).sort()).toEqual(
      expect.arrayContaining(["name", "wireLength", "travel.1", "dialect.heatOn"]),
    );
    expect(res.body.fields.wireLength).toMatch(/Wire length must be more than 0 mm/);
    expect(await tableCounts()).toEqual(before);
  });

  it("a cutter may read machines but not add or change them", async () => {
    expect((await cutter.post("/api/machines", machineBody(`Nope ${Date.now()}`))).status).toBe(403);
    const [m] = await testDb()("machines").select("id").limit(1);
    expect((await cutter.put(`/api/machines/${m!.id}/grades`, { grades: [] })).status).toBe(403);
  });

  it("calibrates kerf and feed per grade, naming a grade listed twice", async () => {
    const res = await planner.post("/api/machines", machineBody(`Cal ${Date.now().toString(36)}`));
    const id = res.body.machine.id;
    const grades = (await testDb()("grades").orderBy("id").limit(2).select("id")) as { id: number }[];
    const twice = await planner.put(`/api/machines/${id}/grades`, {
      grades: [
        { gradeId: grades[0]!.id, kerf: 1.2, feed: 250 },
        { gradeId: grades[0]!.id, kerf: 1.3, feed: 260 },
      ],
    });
    expect(twice.status).toBe(400);
    expect(twice.body.fields["grades.1.gradeId"]).toMatch(/twice/);
    expect(await testDb()("machine_grades").where({ machine_id: id })).toHaveLength(0);
    const ok = await planner.put(`/api/machines/${id}/grades`, {
      grades: [
        { gradeId: grades[0]!.id, kerf: 1.2, feed: 250 },
        { gradeId: grades[1]!.id, kerf: 1.6, feed: 320 },
      ],
    });
    expect(ok.status).toBe(200);
    expect(ok.body.machine.grades).toEqual([
      { gradeId: grades[0]!.id, kerf: 1.2, feed: 250 },
      { gradeId: grades[1]!.id, kerf: 1.6, feed: 320 },
    ]);
  });
});
