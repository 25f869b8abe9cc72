import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, tableCounts, testDb } from "../support/db";
import { makePlannedBlock } from "../support/planning-fixtures";
import { machineBody } from "./route-examples";

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
let cutter2: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
  cutter2 = client(); // the same cutter on another tablet
  await cutter2.signIn(demoEmail("cutter"));
});

/** A planned block approved through the API, so offcut codes are fixed as in real use. */
async function approved(size: [number, number, number] = [2000, 1000, 600]) {
  const made = await makePlannedBlock(size);
  const res = await planner.post(`/api/runs/${made.runId}/approve`);
  expect(res.status).toBe(200);
  return made;
}

describe("at the machine", () => {
  it("finishing a block needs the cutter's confirmation; without it nothing changes", async () => {
    const { runId, block } = await approved();
    const before = await tableCounts();
    const res = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { rejects: [] });
    expect(res.status).toBe(400);
    expect(res.body.fields.confirm).toMatch(/Confirm that the whole block is cut/);
    expect(await tableCounts()).toEqual(before);
    expect((await testDb()("blocks").where({ id: block.id }).first("status"))!.status).toBe("earmarked");
  });

  it("stores checked steps, so another tablet carries on from them", async () => {
    const { runId, block } = await approved();
    const first = await cutter.get(`/api/runs/${runId}/blocks/${block.id}/steps`);
    expect(first.status).toBe(200);
    expect(first.body.procedure.ok).toBe(true);
    const steps = first.body.procedure.steps as { n: number; cuts: unknown[] }[];
    expect(steps.length).toBeGreaterThan(0);
    expect(first.body.done).toEqual([]);

    expect((await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: true })).status).toBe(200);
    const other = await cutter2.get(`/api/runs/${runId}/blocks/${block.id}/steps`);
    expect(other.body.done).toEqual([{ step: 1, by: "Ilse Marrow", at: expect.any(String), rejects: [] }]);
    // Checking it twice keeps one record; unchecking removes it.
    await cutter2.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: true });
    expect(await testDb()("plan_block_steps").where({ run_id: runId, block_id: block.id })).toHaveLength(1);
    await cutter2.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: false });
    expect(await testDb()("plan_block_steps").where({ run_id: runId, block_id: block.id })).toHaveLength(0);

    // A step that does not exist, a bad body, and a planner checking steps are refused.
    const missing = await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/${steps.length + 1}`, {
      done: true,
    });
    expect(missing.status).toBe(404);
    expect(missing.body.error).toContain(`has ${steps.length} step`);
    expect((await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: "yes" })).status).toBe(400);
    expect((await planner.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: true })).status).toBe(403);
  });

  it("fixes offcut codes at approval: the sheet, the recording and the stock agree", async () => {
    // A block whose code already has an offcut ".1" in stock (typed by hand): the plan must not reuse it.
    const { runId, block, plan } = await makePlannedBlock();
    await makeBlock({ code: `${block.code}.1`, size: [300, 300, 300] });
    expect((await planner.post(`/api/runs/${runId}/approve`)).status).toBe(200);
    const kept = plan.offcuts.filter((o) => o.block === block.code).length;
    expect(kept).toBeGreaterThan(0);
    const fixed = (await testDb()("plan_offcut_codes")
      .where({ run_id: runId, block_id: block.id })
      .orderBy("offcut_index")
      .pluck("code")) as string[];
    expect(fixed).toHaveLength(kept);
    expect(fixed).not.toContain(`${block.code}.1`);
    expect(fixed[0]).toBe(`${block.code}.2`);

    const steps = await cutter.get(`/api/runs/${runId}/blocks/${block.id}/steps`);
    expect(steps.body.offcutCodes).toEqual(fixed);
    const sheet = await cutter.get(`/plans/${runId}/sheet`);
    expect(sheet.status).toBe(200);
    for (const c of fixed) expect(sheet.text).toContain(c);

    const cut = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { rejects: [], confirm: true });
    expect(cut.status).toBe(200);
    expect(cut.body.offcutCodes).toEqual(fixed);
    const inStock = (await testDb()("blocks").where({ parent_id: block.id }).orderBy("code").pluck("code")) as string[];
    expect(inStock).toEqual([...fixed].sort());
    // Reprinted after the cut, the sheet still shows the same codes.
    const again = await cutter.get(`/plans/${runId}/sheet`);
    for (const c of fixed) expect(again.text).toContain(c);
  });

  it("a run made for a machine takes that machine's calibrated kerf for its grades", async () => {
    const block = await makeBlock({ size: [1500, 1000, 500] });
    const grade = (await testDb()("grades").where({ code: "EPS-II" }).first("id", "code")) as {
      id: number;
      code: string;
    };
    const m = await planner.post("/api/machines", {
      ...machineBody(`Kerf test ${Date.now().toString(36)}`),
      turntable: false,
    });
    expect(m.status).toBe(201);
    await planner.put(`/api/machines/${m.body.machine.id}/grades`, {
      grades: [{ gradeId: grade.id, kerf: 2.4, feed: 150 }],
    });
    const [job] = await testDb()("jobs")
      .insert({ name: `Kerf job ${Date.now()}` })
      .returning("id");
    await testDb()("job_parts").insert({
      job_id: job!.id,
      name: "Kerf panel",
      quantity: 1,
      size_x: 500,
      size_y: 400,
      size_z: 200,
      grade_id: grade.id,
    });
    const res = await planner.post("/api/runs", {
      jobIds: [job!.id],
      blockIds: [block.id],
      machineId: m.body.machine.id,
      settings: {
        kerf: 1.5,
        trim: 6,
        defectMargin: 10,
        minOffcut: [150, 150, 25],
        layout: "guillotine",
        timeLimitMs: 800,
      },
    });
    expect(res.status).toBe(201);
    const run = await testDb()("nesting_runs").where({ id: res.body.id }).first("settings", "problem", "machine_id");
    expect(run!.machine_id).toBe(m.body.machine.id);
    expect((run!.settings as { kerf: number }).kerf).toBe(2.4);
    expect(run!.problem.settings.kerf).toBe(2.4);
    // A profile cutter is refused, naming the field.
    const profile = await planner.post("/api/machines", {
      ...machineBody(`Profile ${Date.now().toString(36)}`),
      kind: "profile",
    });
    const bad = await planner.post("/api/runs", {
      jobIds: [job!.id],
      blockIds: [block.id],
      machineId: profile.body.machine.id,
      settings: run!.settings,
    });
    expect(bad.status).toBe(400);
    expect(bad.body.fields.machineId).toMatch(/profile cutter/);
  });

  it("records a block part-cut, then undoes it within the window by reversing, never deleting", async () => {
    const { runId, block, jobId } = await approved();
    const k = testDb();
    const steps = (await cutter.get(`/api/runs/${runId}/blocks/${block.id}/steps`)).body;
    expect(steps.procedure.steps.length).toBeGreaterThanOrEqual(2); // trims on all six faces need two placements
    // Nothing checked off: part-cut recording is refused, naming what to do.
    const none = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { confirm: true, partial: true });
    expect(none.status).toBe(409);
    expect(none.body.error).toMatch(/No step of .* is checked off/);

    await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: true });
    const ledgerRowsBefore = Number((await k("stock_ledger").count({ n: "*" }).first())!.n);
    const res = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { confirm: true, partial: true });
    expect(res.status).toBe(200);
    expect(res.body.partial).toBe(true);
    expect(res.body.remainderCodes.length).toBeGreaterThan(0);
    // The uncut pieces are stock with the true sizes of the pieces waiting for later steps.
    const waiting = (steps.procedure.steps[0].next as { box: { size: number[] }; what: { kind: string } }[])
      .filter((n) => n.what.kind === "step")
      .map((n) => n.box.size.map(Number).join("x"))
      .sort();
    const rest = await k("blocks").whereIn("code", res.body.remainderCodes);
    expect(rest.map((b) => [b.size_x, b.size_y, b.size_z].map(Number).join("x")).sort()).toEqual(waiting);
    expect(rest.every((b) => b.status === "in_stock" && b.parent_id === block.id && b.lot === "TEST-LOT")).toBe(true);
    // Parts not freed by step 1 are owed again.
    const placed = (await k("nesting_runs").where({ id: runId }).first("plan"))!.plan!.placements.length;
    const sums = await k("cut_parts")
      .where({ run_id: runId, block_id: block.id })
      .select<{ good: number; not_cut: number }[]>(
        k.raw("sum(good_count)::int AS good"),
        k.raw("sum(not_cut_count)::int AS not_cut"),
      )
      .first();
    expect(sums!.good + sums!.not_cut).toBe(placed);
    expect((await k("jobs").where({ id: jobId }).first("status"))!.status).not.toBe("done");
    expect(await ledgerGap()).toEqual({ m3: expect.closeTo(0, 6), value: expect.closeTo(0, 2) });

    // Undo: the block is back in the plan, its pieces written off, every sum back where it was.
    const undo = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/undo`);
    expect(undo.status).toBe(200);
    expect(undo.body.writtenOff.sort()).toEqual([...res.body.remainderCodes].sort());
    expect((await k("blocks").where({ id: block.id }).first("status"))!.status).toBe("earmarked");
    expect((await k("plan_blocks").where({ run_id: runId, block_id: block.id }).first("status"))!.status).toBe(
      "reserved",
    );
    const after = await k("cut_parts")
      .where({ run_id: runId, block_id: block.id })
      .select<{ good: number; not_cut: number }[]>(
        k.raw("sum(good_count)::int AS good"),
        k.raw("sum(not_cut_count)::int AS not_cut"),
      )
      .first();
    expect(after).toEqual({ good: 0, not_cut: 0 });
    // Nothing deleted: the ledger only grew, with a reversal per movement.
    const ledgerRowsAfter = Number((await k("stock_ledger").count({ n: "*" }).first())!.n);
    expect(ledgerRowsAfter).toBe(ledgerRowsBefore + 2 * (1 + res.body.remainderCodes.length));
    expect(await k("stock_ledger").where({ kind: "reversed", ref: `run:${runId}` })).toHaveLength(
      1 + res.body.remainderCodes.length,
    );
    expect(await ledgerGap()).toEqual({ m3: expect.closeTo(0, 6), value: expect.closeTo(0, 2) });

    // Recorded again, whole this time; past the window the undo is refused.
    const whole = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { rejects: [], confirm: true });
    expect(whole.status).toBe(200);
    await k("plan_blocks")
      .where({ run_id: runId, block_id: block.id })
      .update({ cut_at: k.raw("now() - interval '31 minutes'") });
    const late = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/undo`);
    expect(late.status).toBe(409);
    expect(late.body.error).toMatch(/can be undone for 30 minutes/);
  });
});
