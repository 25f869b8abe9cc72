import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, type Client } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeBlock, makeUser, tableCounts, testDb } from "../support/db";
import { makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

afterAll(closeTestDb);

/** Signed-in clients with their user ids: the cutter who flags, another cutter, a planner, a manager. */
let flagger: Client;
let flaggerId: string;
let otherCutter: Client;
let planner: Client;
let plannerId: string;
let manager: Client;
async function signedIn(roles: Parameters<typeof makeUser>[0]) {
  const u = await makeUser(roles);
  const c = client();
  await c.signIn(u.email, TEST_PASSWORD);
  return { c, id: u.id };
}
beforeAll(async () => {
  ({ c: flagger, id: flaggerId } = await signedIn(["cutter"]));
  ({ c: otherCutter } = await signedIn(["cutter"]));
  ({ c: planner, id: plannerId } = await signedIn(["planner"]));
  ({ c: manager } = await signedIn(["manager"]));
});

async function flagZone(size: [number, number, number] = [2000, 1000, 500]) {
  const block = await makeBlock({ size });
  const res = await flagger.post(`/api/blocks/${block.id}/defects`, {
    kind: "void",
    min: [400, 300, 420],
    max: [460, 380, 500],
    note: "Seen on the top face.",
  });
  expect(res.status).toBe(201);
  return { block, zoneId: res.body.id as number };
}
const zoneRow = (id: number) => testDb()("defect_zones").where({ id }).first();
/** The zone's audit entries; `detail` is the JSON the route wrote (its before and after). */
const audit = async (id: number) =>
  (
    await testDb()("audit_log")
      .whereRaw("detail->>'defect' = ?", [String(id)])
      .whereIn("action", ["defect.update", "defect.remove"])
      .orderBy("id")
  ).map((a) => ({ ...a, detail: a.detail as Record<string, unknown> }));

describe("correcting and removing a defect zone", () => {
  it("lets the cutter who flagged it correct it, kept in the audit trail with who and when", async () => {
    const { block, zoneId } = await flagZone();
    const res = await flagger.patch(`/api/defects/${zoneId}`, { min: [400, 300, 440], kind: "crush" });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.changed).toBe(true);
    expect(res.body.items.find((z: { id: number }) => z.id === zoneId)).toMatchObject({
      kind: "crush",
      min: [400, 300, 440],
      max: [460, 380, 500],
      note: "Seen on the top face.",
    });
    const row = await zoneRow(zoneId);
    expect(row!.updated_by).toBe(flaggerId);
    expect(row!.updated_at).toBeTruthy();
    const [entry] = await audit(zoneId);
    expect(entry).toMatchObject({ actor_id: flaggerId, action: "defect.update", subject: `block:${block.id}` });
    expect(entry!.at).toBeTruthy();
    expect(entry!.detail.before).toMatchObject({ kind: "void", min: [400, 300, 420] });
    expect(entry!.detail.after).toMatchObject({ kind: "crush", min: [400, 300, 440] });
    // The block page shows the correction with who made it.
    const page = await planner.get(`/stock/${encodeURIComponent(block.code)}`);
    const text = page.text.replace(/<!-- -->/g, "");
    expect(text).toContain(`Zone ${zoneId} changed`);
    expect(text).toContain("z 420–500 → 440–500 mm");
  });

  it("lets a planner correct and remove any zone", async () => {
    const { zoneId } = await flagZone();
    const fix = await planner.patch(`/api/defects/${zoneId}`, { max: [470, 380, 500], note: null });
    expect(fix.status, JSON.stringify(fix.body)).toBe(200);
    expect((await zoneRow(zoneId))!.updated_by).toBe(plannerId);
    const gone = await planner.delete(`/api/defects/${zoneId}`);
    expect(gone.status, JSON.stringify(gone.body)).toBe(200);
    expect(gone.body.items.map((z: { id: number }) => z.id)).not.toContain(zoneId);
    const row = await zoneRow(zoneId);
    expect(row!.removed_by).toBe(plannerId);
    expect(row!.removed_at).toBeTruthy();
    expect((await audit(zoneId)).map((a) => [a.action, a.actor_id])).toEqual([
      ["defect.update", plannerId],
      ["defect.remove", plannerId],
    ]);
  });

  it("lets the flagging cutter remove it: no longer listed or planned around, kept for the record", async () => {
    const { block, zoneId } = await flagZone();
    const res = await flagger.delete(`/api/defects/${zoneId}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const listed = await flagger.get(`/api/blocks/${block.id}/defects`);
    expect(listed.body.items).toEqual([]);
    expect((await zoneRow(zoneId))!.removed_by).toBe(flaggerId);
    const [entry] = await audit(zoneId);
    expect(entry).toMatchObject({ action: "defect.remove", actor_id: flaggerId });
    expect(entry!.detail.before).toMatchObject({ kind: "void", max: [460, 380, 500] });
    // Taken back once: a second removal or a correction says so and changes nothing.
    expect((await flagger.delete(`/api/defects/${zoneId}`)).status).toBe(409);
    const again = await flagger.patch(`/api/defects/${zoneId}`, { note: "x" });
    expect(again.status).toBe(409);
    expect(again.body.error).toContain(`zone ${zoneId} on ${block.code} was already removed`);
  });

  it("refuses another cutter (403) and a manager, changing nothing", async () => {
    const { block, zoneId } = await flagZone();
    const before = await tableCounts();
    const row = await zoneRow(zoneId);
    const edit = await otherCutter.patch(`/api/defects/${zoneId}`, { kind: "crush" });
    expect(edit.status).toBe(403);
    expect(edit.body.error).toContain(`zone ${zoneId} on ${block.code}`);
    expect((await otherCutter.delete(`/api/defects/${zoneId}`)).status).toBe(403);
    expect((await manager.patch(`/api/defects/${zoneId}`, { kind: "crush" })).status).toBe(403);
    expect((await manager.delete(`/api/defects/${zoneId}`)).status).toBe(403);
    expect(await zoneRow(zoneId)).toEqual(row);
    expect(await tableCounts()).toEqual(before);
  });

  it("names the field of a bad value, and changes nothing", async () => {
    const { zoneId } = await flagZone();
    const row = await zoneRow(zoneId);
    const cases: [object, string, RegExp][] = [
      [{ max: [460, 380, 400] }, "max.2", /max z must be more than min z/],
      [{ max: [2100, 380, 500] }, "max.0", /Beyond the block's length \(2000 mm\)/],
      [{ min: [400, -5, 420] }, "min.1", /min y cannot be negative/],
      [{ kind: "shadow" }, "kind", /Choose what kind of defect/],
      [{ max: [460, "deep", 500] }, "max.1", /max y must be a number/],
      [{ colour: "red" }, "_", /colour/],
      [{}, "_", /Say what to change/],
    ];
    for (const [body, field, message] of cases) {
      const res = await flagger.patch(`/api/defects/${zoneId}`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.fields?.[field], JSON.stringify(res.body)).toMatch(message);
    }
    expect((await flagger.patch("/api/defects/999999999", { kind: "crush" })).status).toBe(404);
    expect(await zoneRow(zoneId)).toEqual(row);
    expect(await audit(zoneId)).toEqual([]);
  });

  it("a plan made before a zone changed says so, naming the zone and the block", async () => {
    const block = await makeBlock({ size: [2000, 1000, 600] });
    const [zone] = await testDb()("defect_zones")
      .insert({
        block_id: block.id,
        kind: "void",
        min_x: 100,
        min_y: 100,
        min_z: 100,
        max_x: 200,
        max_y: 200,
        max_z: 200,
        found_by: flaggerId,
        found_at: new Date(Date.now() - 60_000),
      })
      .returning("id");
    const { jobId } = await makeJobWithParts([
      { name: "Panel", quantity: 1, size: [900, 400, 200], gradeCode: "EPS-II" },
    ]);
    const { runId } = await makeDoneRun(jobId, [block]);
    expect((await planner.get(`/api/runs/${runId}/plan`)).body.run.zoneChanges).toEqual([]);
    expect((await flagger.patch(`/api/defects/${zone!.id}`, { max: [300, 200, 200] })).status).toBe(200);
    const run = (await planner.get(`/api/runs/${runId}/plan`)).body.run;
    expect(run.zoneChanges).toEqual([
      { zone: zone!.id, blockCode: block.code, change: "changed", at: expect.any(String), by: "Test cutter" },
    ]);
    const page = await planner.get(`/plans/${runId}`);
    const text = page.text.replace(/<!-- -->/g, "").replace(/<[^>]+>/g, "");
    expect(text).toContain(`Zone ${zone!.id} on ${block.code} changed after this plan was made`);
  });
});
