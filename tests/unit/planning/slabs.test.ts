/**
 * The app's reading of true-shape plans (lib/planning/slabs.ts): a real version-2 plan, made by
 * `nestSync` from profile parts built with the app's own code (buildProblem with
 * `settings.trueShape`), walked through every helper the plan's readers use — naming, counting for
 * approval and owed parts, the block cutter's steps, and recording — so no reader meets a slab key
 * as a part (partIdFromKey("slab-1") used to give NaN).
 */
import { describe, expect, it } from "vitest";
import { nestSync, parseProblem, type Plan, type Problem, validatePlan, type Vec3 } from "@/lib/nesting";
import { blockProcedure } from "@/lib/planning/block-steps";
import { lossBreakdown } from "@/lib/planning/losses";
import { buildProblem, partIdFromKey, type PartForPlan } from "@/lib/planning/problem";
import { countParts, cutState, partLine, rejectedSizes, tallyRejects } from "@/lib/planning/recording";
import {
  boxProblem,
  compareShapes,
  countByPart,
  expandKeys,
  foamUsed,
  isSlabKey,
  keyNamer,
  memberList,
  memberPieces,
  pieceName,
  placedByPart,
  profileOutline,
  slabIndex,
  slabMembers,
} from "@/lib/planning/slabs";
import { partGeometry, type Profile } from "@/lib/profiles/part";
import { machine } from "../../support/procedure-fixtures";
import { lProfile } from "../../support/shapes";

/** The hand-drawn L of tests/support/shapes.ts, extruded 60 mm. */
const L: Profile = lProfile(60);
/** A straight NACA 0012 panel, chord 150 mm, span 60 mm (the L's thickness, so both share slabs). */
const WING: Profile = { kind: "naca", code: "0012", chordMm: 150, spanMm: 60 };

const part = (id: number, name: string, profile: Profile | null, quantity: number, size?: Vec3): PartForPlan => ({
  id,
  name,
  size: size ?? partGeometry(profile!).size,
  quantity,
  gradeCode: "EPS-70",
  rotate: "any",
  profile,
});

const PARTS = [part(11, "L", L, 6), part(12, "Wing 0012", WING, 2), part(13, "Plain box", null, 2, [100, 100, 100])];
const SETTINGS = {
  kerf: 2,
  trim: 5,
  defectMargin: 10,
  minOffcut: [50, 50, 25] as Vec3,
  layout: "guillotine" as const,
  timeLimitMs: 1000,
};
const STOCK = [
  {
    id: 1,
    code: "HF-1",
    size: [500, 600, 400] as Vec3,
    gradeCode: "EPS-70",
    cost: 40,
    isOffcut: false,
    defects: [],
  },
];

function problemOf(trueShape: boolean): Problem {
  const r = parseProblem(buildProblem(PARTS, STOCK, { ...SETTINGS, trueShape }));
  if (!r.ok) throw new Error(r.errors.join("\n"));
  return r.problem;
}

const problem = problemOf(true);
const plan: Plan = nestSync(problem, { seed: 2 });
const names = new Map(PARTS.map((p) => [p.id, p.name]));

describe("a true-shape run's problem (buildProblem with settings.trueShape)", () => {
  it("gives each profile part its outline and leaves the plain part a box", () => {
    expect(problem.settings.trueShape).toBe(true);
    const byId = new Map(problem.parts.map((p) => [p.id, p]));
    expect(byId.get("jp-11")!.outline!.outer).toHaveLength(6);
    expect(byId.get("jp-12")!.outline!.outer.length).toBeGreaterThan(100);
    expect(byId.get("jp-13")!.outline).toBeUndefined();
  });

  it("stays exactly the box problem when trueShape is off (no trueShape key, no outlines)", () => {
    const off = problemOf(false);
    expect("trueShape" in off.settings).toBe(false);
    expect(off.parts.every((p) => !("outline" in p))).toBe(true);
    expect(boxProblem(problem)).toEqual(off);
  });

  it("leaves a profile that does not fit its part's box out (the part stays a box)", () => {
    expect(profileOutline(L, [60, 100, 90])).toBeUndefined();
    expect(profileOutline(L, [60, 120, 90])?.outer).toHaveLength(6);
    // A tapered panel carries its tip section.
    const tapered: Profile = { kind: "naca", code: "2412", chordMm: 200, tipChordMm: 120, spanMm: 300 };
    expect(profileOutline(tapered, partGeometry(tapered).size)?.tip?.outer.length).toBeGreaterThan(100);
  });
});

describe("the slab helpers on a real true-shape plan", () => {
  const slabs = slabIndex(plan);
  const slabPlacements = plan.placements.filter((p) => p.slab);

  it("is a valid version-2 plan with slabs holding every profile piece", () => {
    expect(validatePlan(problem, plan)).toEqual([]);
    expect(plan.version).toBe(2);
    expect(slabPlacements.length).toBeGreaterThan(0);
    expect(plan.unplaced).toEqual([]);
    expect(Object.keys(slabs).every(isSlabKey)).toBe(true);
  });

  it("never turns a slab key into a part id: partIdFromKey refuses it", () => {
    expect(() => partIdFromKey(slabPlacements[0]!.part)).toThrow(/slab/);
    expect(partIdFromKey("jp-11")).toBe(11);
  });

  it("counts every piece by its job part, slabs by their members (what approval and owed use)", () => {
    // 6 L + 2 wings + 2 boxes ordered; all placed.
    expect(placedByPart(plan.placements)).toEqual(
      new Map([
        [11, 6],
        [12, 2],
        [13, 2],
      ]),
    );
    const keys = plan.placements.map((p) => p.part);
    expect(countByPart(keys, slabs)).toEqual(placedByPart(plan.placements));
    expect(countParts(keys, slabs)).toEqual(placedByPart(plan.placements));
    expect(expandKeys(keys, slabs).every((k) => /^jp-\d+$/.test(k))).toBe(true);
    expect(() => expandKeys(["slab-99"], slabs)).toThrow(/not a slab of this plan/);
    expect(() => countParts(keys)).toThrow(/slab/);
  });

  it("names a slab for people with its members", () => {
    const name = keyNamer(plan, names);
    const s = slabPlacements[0]!;
    const n = s.slab!.members.length;
    expect(name(s.part)).toBe(`slab for ${n} part${n === 1 ? "" : "s"}`);
    expect(name("jp-11")).toBe("L");
    expect(name("jp-99")).toBe("jp-99");
    expect(pieceName("slab-1", { "slab-1": ["jp-11", "jp-11", "jp-12"] }, name)).toBe("slab for 3 parts");
    expect(memberList(["jp-11", "jp-11", "jp-12"], name)).toBe("2 × L, Wing 0012");
    expect(slabMembers(s)).toEqual(s.slab!.members.map((m) => m.part));
  });

  it("gives the block cutter one blank per slab, and a full cut frees every member", () => {
    const proc = blockProcedure(problem, plan, "HF-1", machine(), problem.settings.kerf);
    expect(proc?.ok).toBe(true);
    if (!proc?.ok) return;
    const state = cutState(proc, new Set(proc.steps.map((s) => s.n)));
    const freed = state.parts.map((p) => p.part);
    // The slabs come off whole, as pieces of their own.
    for (const s of slabPlacements) expect(freed).toContain(s.part);
    expect(countParts(freed, slabs)).toEqual(placedByPart(plan.placements));
  });

  it("records a slab by its members: a member rejected, the rest good, on their true volumes", () => {
    const proc = blockProcedure(problem, plan, "HF-1", machine(), problem.settings.kerf);
    if (!proc?.ok) throw new Error("no procedure");
    const state = cutState(proc, new Set(proc.steps.map((s) => s.n)));
    const came = countParts(
      state.parts.map((p) => p.part),
      slabs,
    );
    const placed = placedByPart(plan.placements);
    const { rejects, fields } = tallyRejects(
      [{ reject: { jobPartId: 11, count: 1, reason: "nick in the corner" }, field: "rejects.0" }],
      came,
      placed,
    );
    expect(fields).toEqual({});
    // The slab's blank is shared among its members: the shares add up to the slab exactly.
    const sizeOf = (k: string) => problem.parts.find((p) => p.id === k)?.size;
    const pieces = memberPieces(state.parts, slabs, sizeOf);
    const vol = (s: readonly number[]) => s[0]! * s[1]! * s[2]!;
    const total = (xs: { box: { size: Vec3 } }[]) => xs.reduce((v, p) => v + vol(p.box.size), 0);
    expect(total(pieces)).toBeCloseTo(total(state.parts), 3);
    expect(pieces.every((p) => /^jp-\d+$/.test(p.part))).toBe(true);
    const rejected = rejectedSizes(pieces, rejects);
    expect(rejected).toHaveLength(1);
    expect(vol(rejected[0]!)).toBeLessThan(vol(slabPlacements.find((s) => slabMembers(s).includes("jp-11"))!.size));
    // The loss breakdown still balances with the slab's blank among the blanks.
    const losses = lossBreakdown({
      size: [500, 600, 400],
      trim: 5,
      kerf: 2,
      cuts: state.cuts,
      blanks: state.parts.map((p) => p.box.size),
      rejected,
      offcuts: state.offcuts.map((o) => o.box),
      defects: [],
    });
    expect(losses.goodBlanks).toBeGreaterThan(0);
    expect(losses.rejects).toBeCloseTo(vol(rejected[0]!) / 1e9, 9);
    // Each member's line counts its true profile volume (the L, hand-worked: area 120·40 + 40·50 = 6800 mm² × 60 mm).
    const line = partLine({ size: [60, 120, 90], trueVolumeMm3: 6800 * 60 }, { placed: 6, came: 6, rejected: 1 });
    expect(line).toMatchObject({ good: 5, rejected: 1, notCut: 0, basis: "profile" });
    expect(line.volumeM3).toBeCloseTo((5 * 6800 * 60) / 1e9, 12);
  });

  it("compares the true-shape plan with box nesting of the same parts", () => {
    const box = nestSync(boxProblem(problem), { seed: 2 });
    expect(box.version).toBe(1);
    expect(box.placements.some((p) => p.slab)).toBe(false);
    const c = compareShapes(plan, box);
    expect(c.trueShapeM3).toBeCloseTo(foamUsed(plan) / 1e9, 12);
    expect(c.boxM3).toBeCloseTo(foamUsed(box) / 1e9, 12);
    expect(c.savedPct).toBeCloseTo(((c.boxM3 - c.trueShapeM3) / c.boxM3) * 100, 9);
    expect(c.slabs).toBe(slabPlacements.length);
    expect(c.unplaced).toEqual({ trueShape: 0, box: 0 });
  });
});
