/**
 * A true-shape plan through the app (issue #20, item 2): a job of profile parts made through the
 * API, a run with `settings.trueShape`, its version-2 plan with slabs and the comparison with box
 * nesting in its summary, approval reserving the slabs' members, the cut list, cut sheet, plan
 * page and one profile program per slab, and a slab recorded at the machine member by member, so
 * the job's owed quantities fall by the members cut good.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, testDb } from "../support/db";
import { SETTINGS, waitForRun } from "../support/planning-fixtures";
import { L_OUTLINE } from "../support/shapes";
import { validatePlan, type Plan, type Problem } from "@/lib/nesting";
import { slabMaxFor } from "@/lib/planning/machine";

afterAll(closeTestDb);

let planner: Client;
let cutter: Client;
beforeAll(async () => {
  planner = client();
  await planner.signIn(demoEmail("planner"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
});

const waitFor = async (runId: number, statuses: string[], ms?: number) =>
  (await waitForRun(planner, runId, statuses, ms)).run;

const gradeId = async (code: string) => (await testDb()("grades").where({ code }).first("id"))!.id as number;

/** The hand-drawn L of tests/support/shapes.ts (area 6,800 mm²): two interlock, where their boxes cannot. */
const L_POINTS = L_OUTLINE;

/** Starts a true-shape run of a job on one block (3 s), waits for it to finish and reads its problem and plan. */
const trueShapeRun = async (jobId: number, blockId: number) => {
  const started = await planner.post("/api/runs", {
    jobIds: [jobId],
    blockIds: [blockId],
    settings: { ...SETTINGS, timeLimitMs: 3000, trueShape: true },
  });
  expect(started.status, JSON.stringify(started.body)).toBe(201);
  const runId = started.body.id as number;
  const run = await waitFor(runId, ["done", "failed"]);
  expect(run.status, run.error).toBe("done");
  const full = (await planner.get(`/api/runs/${runId}/plan`)).body.run;
  return { runId, run, problem: full.problem as Problem, plan: full.plan as Plan };
};

describe("a true-shape run in the app", () => {
  it("nests profiles in slabs, compares with boxes, reserves and records the slabs' members", async () => {
    const job = await planner.post("/api/jobs", { name: "Shop sign — true-shape trial", customer: "Test customer" });
    expect(job.status).toBe(201);
    const jobId = job.body.job.id as number;
    const eps = await gradeId("EPS-II");
    const addPart = async (body: Record<string, unknown>) => {
      const res = await planner.post(`/api/jobs/${jobId}/parts`, {
        gradeId: eps,
        rotate: "any",
        size: [1, 1, 1],
        ...body,
      });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      return res.body.part as { id: number; trueVolumeMm3: number | null; size: number[] };
    };
    const ell = await addPart({
      name: "Letter L",
      quantity: 6,
      profile: { kind: "polygon", points: L_POINTS, extrudeMm: 60 },
    });
    const wing = await addPart({
      name: "Wing 0012",
      quantity: 2,
      profile: { kind: "naca", code: "0012", chordMm: 200, spanMm: 60 },
    });
    const plain = await addPart({ name: "Spacer box", quantity: 1, size: [100, 100, 100] });
    expect(ell.trueVolumeMm3).toBeCloseTo(6800 * 60, 3); // hand-worked: 120·40 + 40·50 = 6800 mm², × 60 mm
    expect(plain.trueVolumeMm3).toBeNull();
    const block = await makeBlock({ size: [800, 700, 500], gradeCode: "EPS-II" });

    // A bad flag is named by its field and starts nothing.
    const bad = await planner.post("/api/runs", {
      jobIds: [jobId],
      blockIds: [block.id],
      settings: { ...SETTINGS, trueShape: "yes" },
    });
    expect(bad.status).toBe(400);
    expect(bad.body.fields["settings.trueShape"]).toMatch(/true/);

    const { runId, run, problem, plan } = await trueShapeRun(jobId, block.id);

    // The plan: version 2, slabs of the profile parts, the plain part a box; valid by the core's check.
    expect(problem.settings.trueShape).toBe(true);
    expect(problem.parts.find((p) => p.id === `jp-${ell.id}`)!.outline!.outer).toHaveLength(6);
    expect(problem.parts.find((p) => p.id === `jp-${plain.id}`)!.outline).toBeUndefined();
    expect(validatePlan(problem, plan)).toEqual([]);
    expect(plan.version).toBe(2);
    expect(plan.unplaced).toEqual([]);
    const slabs = plan.placements.filter((p) => p.slab);
    expect(slabs.length).toBeGreaterThan(0);
    const members = slabs.flatMap((s) => s.slab!.members.map((m) => m.part));
    expect(members.filter((k) => k === `jp-${ell.id}`)).toHaveLength(6);
    expect(members.filter((k) => k === `jp-${wing.id}`)).toHaveLength(2);
    expect(plan.placements.filter((p) => p.part === `jp-${plain.id}`)).toHaveLength(1);

    // Both figures in the summary: foam used by true shape and by boxes, the difference in %.
    const shapes = run.shapes as {
      trueShapeM3: number;
      boxM3: number;
      savedPct: number;
      slabs: number;
      unplaced: { trueShape: number; box: number };
    };
    expect(shapes.slabs).toBe(slabs.length);
    expect(shapes.trueShapeM3).toBeCloseTo((plan.stats.stockVolume - plan.stats.offcutVolume) / 1e9, 9);
    expect(shapes.boxM3).toBeGreaterThan(0);
    expect(shapes.savedPct).toBeCloseTo(((shapes.boxM3 - shapes.trueShapeM3) / shapes.boxM3) * 100, 6);
    expect(shapes.unplaced).toEqual({ trueShape: 0, box: 0 });

    // Approval reserves the members: nothing is left to plan for this job, and it says which plan holds them.
    const approved = await planner.post(`/api/runs/${runId}/approve`);
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    const spare = await makeBlock({ size: [800, 700, 500], gradeCode: "EPS-II" });
    const again = await planner.post("/api/runs", { jobIds: [jobId], blockIds: [spare.id], settings: SETTINGS });
    expect(again.status).toBe(409);
    expect(again.body.error).toContain(`plan #${runId}`);

    // The cut list: one row per slab, "slab for N parts", its members in the last column.
    const csv = await planner.get(`/api/runs/${runId}/cut-list`);
    expect(csv.status).toBe(200);
    const lines = csv.text.replace(/^\uFEFF/, "").split(/\r\n/);
    expect(lines).toHaveLength(plan.placements.length + 1);
    expect(lines[0]).toMatch(/,members$/);
    const slabLines = lines.filter((l) => /slab for \d+ parts/.test(l));
    expect(slabLines).toHaveLength(slabs.length);
    expect(slabLines.join("\n")).toContain("Letter L");
    expect(csv.text).not.toContain("NaN");

    // The plan page and the cut sheet render the slabs with their members (no NaN anywhere).
    for (const path of [`/plans/${runId}`, `/plans/${runId}/sheet`, `/plans/${runId}/cut`]) {
      const page = await (path.endsWith("/cut") ? cutter : planner).get(path);
      expect(page.status, path).toBe(200);
      expect(/slab for \d+ parts/.test(page.text), path).toBe(true);
      // No part key or NaN shown as a name (the keys are in the page's data for its drawings, not in its text).
      expect(/NaN|>\s*(jp|slab)-\d+\s*</.test(page.text), path).toBe(false);
    }
    const planPage = (await planner.get(`/plans/${runId}`)).text;
    expect(planPage).toContain('data-testid="shape-comparison"');
    expect(planPage).toMatch(/m³ with the same parts as boxes: [\d.]+ % (less|more) by true shape/);

    // One profile program per slab (the seeded profile cutter), and a slab's G-code.
    const progs = await planner.get(`/api/runs/${runId}/profile-programs`);
    expect(progs.status, JSON.stringify(progs.body)).toBe(200);
    const listed = progs.body.slabs as {
      slab: string;
      parts: string[];
      problem: string | null;
      lengthMm: number | null;
    }[];
    expect(listed).toHaveLength(slabs.length);
    expect(listed.flatMap((s) => s.parts).sort()).toEqual(
      [...Array(6).fill("Letter L"), ...Array(2).fill("Wing 0012")].sort(),
    );
    const cuttable = listed.find((s) => !s.problem);
    expect(cuttable, JSON.stringify(listed)).toBeTruthy();
    expect(cuttable!.lengthMm).toBeGreaterThan(0);
    const gcode = await cutter
      .get(`/api/runs/${runId}/profile-programs?slab=${encodeURIComponent(cuttable!.slab)}`)
      .buffer(true);
    expect(gcode.status).toBe(200);
    expect(gcode.text).toMatch(/true shape/i);
    expect(gcode.text).toMatch(/CAUTION/);

    // At the machine: the slab comes off the block cutter whole; a bad L is rejected in the step that frees it.
    const steps = await cutter.get(`/api/runs/${runId}/blocks/${block.id}/steps`);
    expect(steps.status).toBe(200);
    expect(steps.body.procedure.ok).toBe(true);
    expect(Object.keys(steps.body.slabs).sort()).toEqual(slabs.map((s) => s.part).sort());
    const stepList = steps.body.procedure.steps as { n: number; next: { what: { kind: string; part?: string } }[] }[];
    const ellSlab = slabs.find((s) => s.slab!.members.some((m) => m.part === `jp-${ell.id}`))!;
    const freesSlab = stepList.find((s) => s.next.some((n) => n.what.kind === "part" && n.what.part === ellSlab.part))!;
    expect(freesSlab).toBeTruthy();
    const wrongStep = stepList.find((s) => s.n !== freesSlab.n && !s.next.some((n) => n.what.part === ellSlab.part));
    if (wrongStep) {
      const refused = await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/${wrongStep.n}`, {
        done: true,
        rejects: [{ jobPartId: ell.id, count: 1, reason: "nick" }],
      });
      expect(refused.status).toBe(400);
      expect(refused.body.fields["rejects.0.jobPartId"]).toMatch(/does not come off/);
    }
    const tooMany = await cutter.put(`/api/runs/${runId}/blocks/${block.id}/steps/${freesSlab.n}`, {
      done: true,
      rejects: [{ jobPartId: ell.id, count: 99, reason: "nick" }],
    });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.fields["rejects.0.count"]).toMatch(/Only \d+ of that part/);

    const gap = await ledgerGap();
    const cut = await cutter.post(`/api/runs/${runId}/blocks/${block.id}/cut`, {
      rejects: [{ jobPartId: ell.id, count: 1, reason: "corner broke off at the lead-in" }],
      confirm: true,
    });
    expect(cut.status, JSON.stringify(cut.body)).toBe(200);
    const l = cut.body.losses;
    expect(l.goodBlanks + l.rejects + l.offcuts + l.trim + l.kerf + l.defect + l.unusable).toBeCloseTo(l.block, 9);
    expect(l.rejects).toBeGreaterThan(0);
    expect((await ledgerGap()).m3).toBeCloseTo(gap.m3, 9);
    const rows = await testDb()("cut_parts").where({ run_id: runId });
    const byPart = new Map(rows.map((r) => [r.job_part_id, r]));
    expect(byPart.get(ell.id)).toMatchObject({
      good_count: 5,
      rejected_count: 1,
      not_cut_count: 0,
      volume_basis: "profile",
    });
    expect(Number(byPart.get(ell.id)!.part_volume_m3)).toBeCloseTo((5 * 6800 * 60) / 1e9, 9);
    expect(byPart.get(wing.id)).toMatchObject({ good_count: 2, rejected_count: 0, volume_basis: "profile" });
    expect(Number(byPart.get(wing.id)!.part_volume_m3)).toBeCloseTo((2 * wing.trueVolumeMm3!) / 1e9, 9);
    expect(byPart.get(plain.id)).toMatchObject({ good_count: 1, volume_basis: "box" });

    // Owed falls by the members cut good: one L is owed again (the reject), nothing else.
    const progress = (await planner.get(`/api/jobs/${jobId}`)).body.progress as {
      partId: number;
      owed: number;
      cut: number;
    }[];
    const owed = new Map(progress.map((p) => [p.partId, p.owed]));
    expect(owed.get(ell.id)).toBe(1);
    expect(owed.get(wing.id)).toBe(0);
    expect(owed.get(plain.id)).toBe(0);
    const runNow = (await planner.get(`/api/runs/${runId}`)).body.run;
    expect(runNow.status).toBe("closed");
  });

  it("sizes every slab for the shop's profile cutter: its wire, travel and table bound the slab's face", async () => {
    // The shop's first active profile cutter, as the plan page and its programs use it.
    const m = await testDb()("machines").where({ kind: "profile", active: true }).orderBy("name").first();
    if (!m) throw new Error("The test shop has no profile cutter (the demo seeds one).");
    const cutterMax = slabMaxFor({
      wireLength: Number(m.wire_length_mm),
      travel: [Number(m.travel_x_mm), Number(m.travel_y_mm)],
      maxPiece: [Number(m.max_length_mm), Number(m.max_width_mm), Number(m.max_height_mm)],
    });
    const job = await planner.post("/api/jobs", { name: "Tall letters — slab size trial", customer: "Test customer" });
    const jobId = job.body.job.id as number;
    // Ls of 300 × 225 mm: 14 of them fill far more than one slab face of the cutter.
    const big = L_POINTS.map(([u, v]) => [u * 2.5, v * 2.5]);
    const part = await planner.post(`/api/jobs/${jobId}/parts`, {
      gradeId: await gradeId("EPS-II"),
      rotate: "any",
      size: [1, 1, 1],
      name: "Tall L",
      quantity: 14,
      profile: { kind: "polygon", points: big, extrudeMm: 100 },
    });
    expect(part.status, JSON.stringify(part.body)).toBe(201);
    // A block whose faces are larger than the cutter takes every way (1600 × 1400 and more).
    const block = await makeBlock({ size: [1600, 1400, 1200], gradeCode: "EPS-II" });
    const { runId, problem, plan } = await trueShapeRun(jobId, block.id);
    expect(problem.settings.slabMax).toEqual(cutterMax);
    expect(validatePlan(problem, plan)).toEqual([]);
    const slabs = plan.placements.filter((p) => p.slab);
    expect(slabs.length).toBeGreaterThan(0);
    for (const s of slabs)
      for (let i = 0; i < 3; i++) expect(s.slab!.size[i]).toBeLessThanOrEqual(cutterMax[i]! + 1e-6);
    // Every slab has its program on that cutter: none "cannot be cut there".
    const progs = await planner.get(`/api/runs/${runId}/profile-programs`);
    expect(progs.status, JSON.stringify(progs.body)).toBe(200);
    const listed = progs.body.slabs as { problem: string | null }[];
    expect(listed.length).toBeGreaterThan(0);
    expect(listed.filter((x) => x.problem)).toEqual([]);
    // A box run's problem carries no limit (it makes no slab).
    const boxRun = await planner.post("/api/runs", { jobIds: [jobId], blockIds: [block.id], settings: SETTINGS });
    expect(boxRun.status).toBe(201);
    await waitFor(boxRun.body.id as number, ["done", "failed"]);
    const boxProblem = (await planner.get(`/api/runs/${boxRun.body.id}/plan`)).body.run.problem as Problem;
    expect("slabMax" in boxProblem.settings).toBe(false);
  });
});
