/**
 * The shop floor as a new shop meets it, with inputs nobody tuned on: sizes at the edge of what
 * the forms take, a cutter tapping "done" twice with a reject, a planner releasing a plan while
 * the block is half cut. Each case once failed: a generic "value cannot be stored" naming no field
 * (sizes under 0.01 mm), two rejects stored for the one part a step frees (and the block then
 * impossible to finish), and a half-cut block returned to stock whole.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, makeGrade, tableCounts, testDb } from "../support/db";
import { makeDoneRun, makeJobWithParts, SETTINGS } from "../support/planning-fixtures";
import { makeJob } from "../support/job-fixtures";

afterAll(closeTestDb);

let buyer: Client;
let planner: Client;
let cutter: Client;
let otherTablet: Client;
beforeAll(async () => {
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
  otherTablet = client();
  await otherTablet.signIn(demoEmail("cutter"));
});

const tag = () => Date.now().toString(36).toUpperCase();

interface Step {
  n: number;
  next: { what: { kind: string; part?: string } }[];
}

/** A one-part job planned into a fresh block and approved through the API, as a planner does. */
async function approvedOnePart() {
  const block = await makeBlock({ size: [1200, 1000, 600] });
  const { jobId, partIds } = await makeJobWithParts([
    { name: "Lone plinth ⛰", quantity: 1, size: [500, 400, 300], gradeCode: "EPS-II" },
  ]);
  const { runId } = await makeDoneRun(jobId, [block]);
  expect((await planner.post(`/api/runs/${runId}/approve`)).status).toBe(200);
  const steps = (await cutter.get(`/api/runs/${runId}/blocks/${block.id}/steps`)).body.procedure.steps as Step[];
  const partStep = steps.find((s) => s.next.some((n) => n.what.kind === "part"))!.n;
  return { runId, block, jobId, partId: partIds[0]!, steps, partStep };
}

describe("sizes at the edge of what the forms take", () => {
  it("refuses a block, a part and CSV rows under 0.01 mm by field (row and column), and changes nothing", async () => {
    const grade = (await testDb()("grades").where({ code: "EPS-II" }).first("id"))!;
    const supplier = (await testDb()("suppliers").orderBy("id").first("id", "name"))!;
    const jobId = await makeJob();
    const held = await makeBlock({ size: [1000, 500, 400] });
    const before = await tableCounts();

    // Receiving: 0.004 mm passes "more than 0" but the register keeps 0.01 mm (it would store 0).
    const delivery = await buyer.post("/api/deliveries", {
      supplierId: supplier.id,
      receivedOn: "2026-12-01",
      lot: "Lot Ω",
      blocks: [{ code: `TINY-${tag()}`, gradeId: grade.id, size: [0.004, 500, 400], cost: 1, location: "Bay ✓" }],
    });
    expect(delivery.status).toBe(400);
    expect(delivery.body.fields["blocks.0.size.0"]).toMatch(/Length must be at least 0\.01 mm/);
    const light = await buyer.post("/api/deliveries", {
      supplierId: supplier.id,
      receivedOn: "2026-12-01",
      lot: "Lot Ω",
      blocks: [{ gradeId: grade.id, size: [10, 10, 10], weightKg: 0.0004, cost: 1, location: "Bay ✓" }],
    });
    expect(light.status).toBe(400);
    expect(light.body.fields["blocks.0.weightKg"]).toMatch(/at least 0\.001 kg/);

    // A void mapped thinner than the register keeps would be stored with max = min.
    const thin = await cutter.post(`/api/blocks/${held.id}/defects`, {
      kind: "void",
      min: [0.001, 10, 10],
      max: [0.004, 20, 20],
    });
    expect(thin.status).toBe(400);
    expect(thin.body.fields["max.0"]).toMatch(/at least 0\.01 mm more than min x/);

    // A part typed by hand, and the same in a part-list CSV (BOM, CRLF, a quoted comma, a blank line).
    const part = await planner.post(`/api/jobs/${jobId}/parts`, { name: "Shim", quantity: 1, size: [0.001, 10, 10] });
    expect(part.status).toBe(400);
    expect(part.body.fields["size.0"]).toMatch(/Length must be at least 0\.01 mm/);
    const csv =
      "\uFEFFname,quantity,length_mm,width_mm,height_mm\r\n" +
      '"Shim, left",1,100,100,25\r\n' +
      "\r\n" +
      '"Shim, right",1,0.001,100,25\r\n';
    for (const commit of ["0", "1"]) {
      const r = await planner
        .call("post", `/api/jobs/${jobId}/parts/import?commit=${commit}&name=parts.csv`)
        .set("Content-Type", "text/csv")
        .send(csv);
      expect(r.status).toBe(422);
      expect(r.body.problems).toEqual([{ row: 4, column: "length_mm", message: "Must be at least 0.01." }]);
    }
    // A decimal comma is named once, as ambiguous, not also as a missing size.
    const comma = await planner
      .call("post", `/api/jobs/${jobId}/parts/import?commit=0&name=parts.csv`)
      .set("Content-Type", "text/csv")
      .send('name;quantity;length_mm;width_mm;height_mm\nWedge;2;"1,5";100;25\n');
    expect(comma.status).toBe(422);
    expect(comma.body.problems).toEqual([
      { row: 2, column: "length_mm", message: '"1,5" is ambiguous — write 1.5 (decimal point) or 15.' },
    ]);

    // A delivery CSV: the preview and the import agree, naming the cell.
    const rows =
      "supplier,received_on,lot,grade,length_mm,width_mm,height_mm,cost,location\n" +
      `"${supplier.name}",2026-12-01,"Lot, 7",EPS-II,1000,500,400,"1,234.50","Bay A, rack 2"\n` +
      `"${supplier.name}",2026-12-01,"Lot, 7",EPS-II,1000,500,0.004,12,Bay B\n`;
    for (const commit of ["0", "1"]) {
      const r = await buyer
        .call("post", `/api/imports/deliveries?commit=${commit}&name=blocks.csv`)
        .set("Content-Type", "text/csv")
        .send(rows);
      expect(r.status).toBe(422);
      expect(r.body.problems).toEqual([{ row: 3, column: "height_mm", message: "Must be at least 0.01." }]);
    }
    expect(await tableCounts()).toEqual(before);

    // The smallest size the register keeps, and the largest the form takes, go in — in a grade of
    // their own: 27,000 m³ of a demo grade would lift it over its reorder point for later tests.
    const own = await makeGrade("EDGE");
    const edges = await buyer.post("/api/deliveries", {
      supplierId: supplier.id,
      receivedOn: "2026-12-01",
      lot: "Lot Ω",
      blocks: [
        { gradeId: own.id, size: [0.01, 0.01, 0.01], cost: 0, location: "Bay ✓" },
        { gradeId: own.id, size: [30_000, 30_000, 30_000], cost: 10_000_000, location: "Bay ✓" },
      ],
    });
    expect(edges.status).toBe(201);
    expect(await ledgerGap()).toEqual({ m3: expect.closeTo(0, 6), value: expect.closeTo(0, 2) });
  });
});

describe("a NUL character (pasted from a binary file or a badly exported sheet)", () => {
  const NUL = "Holds a NUL character (code 0), which cannot be stored: remove it.";
  it("is refused naming the field, the part's row or the CSV cell, and changes nothing", async () => {
    const jobId = await makeJob();
    const before = await tableCounts();
    // A job's name: once a generic "A value cannot be stored…" naming no field.
    const job = await planner.post("/api/jobs", { name: "Sign\u0000 letters", customer: "Hill\u0000 Co" });
    expect(job.status).toBe(400);
    expect(job.body.fields).toEqual({ name: NUL, customer: NUL });
    // The second of three parts added at once.
    const part = { quantity: 1, size: [400, 300, 200] };
    const parts = await planner.post(`/api/jobs/${jobId}/parts`, {
      parts: [
        { ...part, name: "Plinth" },
        { ...part, name: "Plin\u0000th" },
        { ...part, name: "Cap" },
      ],
    });
    expect(parts.status).toBe(400);
    expect(parts.body.fields).toEqual({ "parts.1.name": NUL });
    // A stock filter in the address.
    const list = await buyer.get("/api/blocks?q=BN%00");
    expect(list.status).toBe(400);
    expect(list.body.fields).toEqual({ q: NUL });
    // A CSV cell: row and column, preview and import alike.
    for (const commit of ["0", "1"]) {
      const r = await planner
        .call("post", `/api/jobs/${jobId}/parts/import?commit=${commit}&name=parts.csv`)
        .set("Content-Type", "text/csv")
        .send("name,quantity,length_mm,width_mm,height_mm\nWedge,2,300,100,25\nWed\u0000ge,1,300,100,25\n");
      expect(r.status).toBe(422);
      expect(r.body.problems).toEqual([{ row: 3, column: "name", message: NUL }]);
    }
    expect(await tableCounts()).toEqual(before);
  });
});

describe("at the machine, with fingers and tablets nobody planned for", () => {
  it("a double-tapped step with a reject stores it once; the block can still be finished", async () => {
    const { runId, block, partId, partStep } = await approvedOnePart();
    for (let n = 1; n < partStep; n++)
      expect((await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/${n}`, { done: true })).status).toBe(200);
    const body = { done: true, rejects: [{ jobPartId: partId, count: 1, reason: "crushed corner" }] };
    const url = `/api/runs/${runId}/blocks/${block.id}/steps/${partStep}`;
    // The same tap from two tablets at once, then once more: one part comes off, so one reject.
    const taps = await Promise.all([cutter.put(url, body), otherTablet.put(url, body)]);
    expect(taps.map((t) => t.status).sort()).toEqual([200, 400]);
    const again = await cutter.put(url, body);
    expect(again.status).toBe(400);
    expect(again.body.fields["rejects.0.count"]).toMatch(/Only 1 of that part come off in step \d+, and 1 is already/);
    const stored = await testDb()("plan_block_steps").where({ run_id: runId, block_id: block.id, step: partStep });
    expect(stored).toHaveLength(1);
    expect(stored[0]!.rejects).toEqual([{ jobPartId: partId, count: 1, reason: "crushed corner" }]);
    // Checking the step again without rejects changes nothing.
    expect((await cutter.put(url, { done: true })).status).toBe(200);

    const cut = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { confirm: true, rejects: [] });
    expect(cut.status).toBe(200);
    const parts = await testDb()("cut_parts").where({ run_id: runId, block_id: block.id });
    expect(parts.reduce((s, p) => s + p.rejected_count, 0)).toBe(1);
    expect(parts.reduce((s, p) => s + p.good_count, 0)).toBe(0);
    expect(await ledgerGap()).toEqual({ m3: expect.closeTo(0, 6), value: expect.closeTo(0, 2) });
  });

  it("a check sent again with its request id (its answer lost) adds its rejects once; a new check adds them", async () => {
    // Four slabs of one part stacked in the block: one step frees several of them.
    const block = await makeBlock({ size: [1200, 1000, 600] });
    const { jobId, partIds } = await makeJobWithParts([
      { name: "Stacked slab", quantity: 4, size: [1180, 980, 120], gradeCode: "EPS-II" },
    ]);
    const { runId } = await makeDoneRun(jobId, [block]);
    expect((await planner.post(`/api/runs/${runId}/approve`)).status).toBe(200);
    const steps = (await cutter.get(`/api/runs/${runId}/blocks/${block.id}/steps`)).body.procedure.steps as Step[];
    const many = steps.find((st) => st.next.filter((n) => n.what.kind === "part").length >= 2);
    expect(many, "a step that frees two or more of the part").toBeDefined();
    for (const st of steps.filter((x) => x.n < many!.n))
      expect((await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/${st.n}`, { done: true })).status).toBe(
        200,
      );
    const url = `/api/runs/${runId}/blocks/${block.id}/steps/${many!.n}`;
    const reject = { done: true, rejects: [{ jobPartId: partIds[0]!, count: 1, reason: "void in the face" }] };
    const stored = async () => {
      const row = await testDb()("plan_block_steps")
        .where({ run_id: runId, block_id: block.id, step: many!.n })
        .first();
      return (row?.rejects ?? []).reduce((s: number, r: { count: number }) => s + r.count, 0);
    };
    expect((await cutter.put(url, { ...reject, requestId: "check-7f3a-0001" })).status).toBe(200);
    expect(await stored()).toBe(1);
    const before = await tableCounts();
    // The same check again (and from another tablet with the same id): still one reject.
    for (const who of [cutter, otherTablet])
      expect((await who.put(url, { ...reject, requestId: "check-7f3a-0001" })).status).toBe(200);
    expect(await stored()).toBe(1);
    // A second reject, found afterwards and sent as a check of its own: added.
    expect((await cutter.put(url, { ...reject, requestId: "check-7f3a-0002" })).status).toBe(200);
    expect(await stored()).toBe(2);
    // An id that is not one: refused by field, nothing added.
    const bad = await cutter.put(url, { ...reject, requestId: "x" });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fields)).toEqual(["requestId"]);
    expect(await stored()).toBe(2);
    expect(await tableCounts()).toEqual(before);
  });

  it("a planner cannot release a plan while its block is half cut; a new session records it part-cut instead", async () => {
    const { runId, block, steps } = await approvedOnePart();
    expect(steps.length).toBeGreaterThan(1);
    expect((await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/1`, { done: true })).status).toBe(200);
    const before = await tableCounts();
    const release = await planner.post(`/api/runs/${runId}/release`);
    expect(release.status).toBe(409);
    expect(release.body.error).toContain(`Cutting has started on ${block.code} (1 step done)`);
    expect(release.body.error).toMatch(/record it part-cut/);
    expect(await tableCounts()).toEqual(before);
    expect((await testDb()("blocks").where({ id: block.id }).first("status"))!.status).toBe("earmarked");
    expect((await testDb()("nesting_runs").where({ id: runId }).first("status"))!.status).toBe("approved");

    // A new session at the machine finds the step still checked and records the half block.
    const fresh = client();
    await fresh.signIn(demoEmail("cutter"));
    const resumed = await fresh.get(`/api/runs/${runId}/blocks/${block.id}/steps`);
    expect(resumed.body.done.map((d: { step: number }) => d.step)).toEqual([1]);
    const part = await fresh.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { confirm: true, partial: true });
    expect(part.status).toBe(200);
    expect(part.body.remainderCodes.length).toBeGreaterThan(0);
    const rest = await testDb()("blocks").whereIn("code", part.body.remainderCodes);
    expect(rest.every((b) => b.status === "in_stock")).toBe(true);
    expect((await testDb()("blocks").where({ id: block.id }).first("status"))!.status).toBe("cut");
    expect(await ledgerGap()).toEqual({ m3: expect.closeTo(0, 6), value: expect.closeTo(0, 2) });

    // A step checked by mistake and unchecked again leaves the block whole: that plan releases.
    const other = await approvedOnePart();
    const url = `/api/runs/${other.runId}/blocks/${other.block.id}/steps/1`;
    expect((await cutter.put(url, { done: true })).status).toBe(200);
    expect((await cutter.put(url, { done: false })).status).toBe(200);
    expect((await planner.post(`/api/runs/${other.runId}/release`)).status).toBe(200);
    expect((await testDb()("blocks").where({ id: other.block.id }).first("status"))!.status).toBe("in_stock");
    expect(await ledgerGap()).toEqual({ m3: expect.closeTo(0, 6), value: expect.closeTo(0, 2) });
  });
});

describe("planning a job as a new shop first does", () => {
  it("a job with no parts yet is told so, not that every part has been cut; nothing is started", async () => {
    const job = await planner.post("/api/jobs", { name: `Empty job ${tag()}`, customer: "Test customer" });
    expect(job.status).toBe(201);
    const block = await makeBlock({ size: [1000, 600, 400] });
    const before = await tableCounts();
    const res = await planner.post("/api/runs", {
      jobIds: [job.body.job.id],
      blockIds: [block.id],
      settings: SETTINGS,
    });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(/This job has no parts yet/);
    expect(res.body.error).not.toMatch(/every part has been cut/);
    expect(await tableCounts()).toEqual(before);
  });
});
