/**
 * Slabs of a box-nested plan and the programs made from them (lib/profiles/slabs.ts, program.ts):
 * grouping, placing a turned part, the dialect's words, refusals and the cut time worked by hand.
 */
import { describe, expect, it } from "vitest";
import type { Plan } from "@/lib/nesting";
import type { Machine } from "@/lib/planning/machine";
import { partGeometry, type Point, type Profile } from "@/lib/profiles";
import { ProgramError, profileProgram } from "@/lib/profiles/program";
import { orientation, partSections, planSlabs } from "@/lib/profiles/slabs";
import { chainWalledIn, layerProgram } from "@/lib/profiles/slab-program";
import { ToolpathError } from "@/lib/profiles/toolpath";
import { profileCutter } from "../../support/procedure-fixtures";

const cutter = (over: Partial<Machine> = {}, dialect: Partial<Machine["dialect"]> = {}): Machine =>
  profileCutter({ name: "Bench cutter", ...over }, dialect);

const rect = (w: number, h: number): Point[] => [
  [0, 0],
  [w, 0],
  [w, h],
  [0, h],
];
const plate = (w: number, h: number, extrude: number): Profile => ({
  kind: "polygon",
  points: rect(w, h),
  extrudeMm: extrude,
});

describe("slabs of a plan", () => {
  const letter: Profile = {
    kind: "polygon",
    points: rect(120, 80),
    holes: [
      [
        [30, 20],
        [60, 20],
        [60, 60],
        [30, 60],
      ],
    ],
    extrudeMm: 50,
  };
  const parts = new Map([
    ["jp-1", { size: partGeometry(letter).size, profile: letter }],
    ["jp-2", { size: [50, 60, 40] as [number, number, number], profile: plate(60, 40, 50) }],
    ["jp-3", { size: [300, 200, 100] as [number, number, number], profile: null }],
  ]);
  const plan: Pick<Plan, "placements"> = {
    placements: [
      { part: "jp-1", block: "HF-1", origin: [6, 6, 6], size: [50, 120, 80] },
      { part: "jp-2", block: "HF-1", origin: [6, 127.5, 6], size: [50, 60, 40] },
      // Turned a quarter in the block: its 60 mm across now stands up, its 40 mm lies across.
      { part: "jp-2", block: "HF-1", origin: [6, 189, 6], size: [50, 40, 60] },
      { part: "jp-1", block: "HF-1", origin: [57.5, 6, 6], size: [50, 120, 80] },
      { part: "jp-3", block: "HF-1", origin: [6, 6, 100], size: [300, 200, 100] },
    ],
  };

  it("groups the profile parts of one block by the extent along the wire; plain boxes stay out", () => {
    const slabs = planSlabs(plan, parts);
    expect(slabs.map((s) => [s.block, s.n, s.wire, s.along, s.parts.length])).toEqual([
      ["HF-1", 1, "x", [6, 56], 3],
      ["HF-1", 2, "x", [57.5, 107.5], 1],
    ]);
    expect(slabs[0]!.plane).toEqual(["y", "z"]);
    expect(slabs[0]!.origin).toEqual([6, 6]);
    expect(slabs[0]!.size).toEqual([223, 80]);
  });

  it("splits a layer whose blanks span more than the cutter's face into slabs that fit it", () => {
    // The first layer spans 223 × 80 mm (above). A face of at most 190 × 100: the letter and the
    // upright plate (6 … 187.5 across) share one slab, the turned plate (189 … 229) gets its own.
    const split = planSlabs(plan, parts, [190, 100]);
    expect(split.map((s) => [s.n, s.along, s.parts.map((p) => p.placement), s.origin, s.size])).toEqual([
      [1, [6, 56], [0, 1], [6, 6], [181.5, 80]],
      [2, [6, 56], [2], [189, 6], [40, 60]],
      [3, [57.5, 107.5], [3], [6, 6], [120, 80]],
    ]);
    for (const s of split) expect(s.size[0] <= 190 && s.size[1] <= 100).toBe(true);
    // Every placement is in exactly one slab; a face that takes the layer leaves it whole.
    expect(split.flatMap((s) => s.parts.map((p) => p.placement)).sort()).toEqual([0, 1, 2, 3]);
    expect(planSlabs(plan, parts, [223, 80]).map((s) => s.parts.length)).toEqual([3, 1]);
    // A blank larger than the face by itself (the 120 mm letters) is a slab of its own (its program
    // then names the limit); the two plates span 127.5 … 229 = 101.5 mm and share one.
    expect(planSlabs(plan, parts, [110, 100]).map((s) => s.parts.map((p) => p.placement))).toEqual([[0], [1, 2], [3]]);
  });

  it("places each section where its box sits, a turned part turned (never mirrored)", () => {
    const [first] = planSlabs(plan, parts);
    const [a, b, c] = first!.parts;
    expect(a!.root.outer).toEqual(rect(120, 80));
    expect(b!.root.outer[0]).toEqual([121.5, 0]);
    expect(orientation([50, 60, 40], [50, 40, 60])).toEqual({ wire: "x", plane: ["y", "z"], quarter: true });
    // (u, v) → (h − v, u) with h = 40: the 60 × 40 plate's corners land in the 40 × 60 box at 183.
    expect(c!.root.outer).toEqual([
      [183 + 40, 0],
      [183 + 40, 60],
      [183, 60],
      [183, 0],
    ]);
    expect(c!.blank).toEqual({ min: [183, 0], max: [223, 60] });
  });

  it("NACA sections sit in their box: the root's leading edge at the front, the tip swept back", () => {
    const s = partSections({ kind: "naca", code: "0012", chordMm: 200, tipChordMm: 120, spanMm: 400, sweepMm: 50 });
    expect(s.tapered).toBe(true);
    const minU = (l: Point[]) => Math.min(...l.map((q) => q[0]));
    const maxU = (l: Point[]) => Math.max(...l.map((q) => q[0]));
    expect(minU(s.root.outer)).toBeCloseTo(0, 6);
    expect(maxU(s.root.outer)).toBeCloseTo(200, 3);
    expect(minU(s.tip.outer)).toBeCloseTo(50, 6);
    expect(maxU(s.tip.outer)).toBeCloseTo(170, 3);
  });
});

describe("a box-nested layer whose middle part is walled in", () => {
  // Nine 100 × 60 plates, 50 thick, in a 3 × 3 grid 4 mm apart (kerf 1.5): the middle one touches
  // no face a lead-in may start from (left, right, top), and every straight slot to it crosses a
  // neighbour. Found by the fresh-eyes sweep with 12 DXF brackets: the layer's program was refused.
  const parts = new Map([["jp-9", { size: [50, 100, 60] as [number, number, number], profile: plate(100, 60, 50) }]]);
  const plan: Pick<Plan, "placements"> = {
    placements: Array.from({ length: 9 }, (_, i) => ({
      part: "jp-9",
      block: "HF-9",
      origin: [6, 6 + (i % 3) * 104, 6 + Math.floor(i / 3) * 64] as [number, number, number],
      size: [50, 100, 60] as [number, number, number],
    })),
  };
  const [slab] = planSlabs(plan, parts);
  const input = {
    title: "grid",
    size: slab!.size,
    thickness: slab!.along[1] - slab!.along[0],
    parts: slab!.parts.map((p) => ({ name: "Plate", root: p.root, tip: p.tip, tapered: p.tapered })),
    kerf: 1.5,
    feed: 250,
  };

  it("is refused with face lead-ins only, and cut whole with the middle plate entered by a neighbour's kerf", () => {
    expect(slab!.parts).toHaveLength(9);
    expect(() => profileProgram(input, cutter())).toThrow(ToolpathError);
    const chained = chainWalledIn(input.parts, slab!.size, 1.5)!;
    expect(chained).not.toBeNull();
    // Chained: the middle plate (index 4) and the bottom row's middle one (index 1: no lead-in
    // comes up through the table), each from a plate next to it (a grid step away), over the 4 mm
    // gap less the two half kerfs: bridges 2.5 mm long.
    const vias = chained.flatMap((p, k) => (p.via ? [k] : []));
    expect(vias).toEqual([1, 4]);
    const program = profileProgram({ ...input, parts: chained }, cutter());
    expect(program.parts).toHaveLength(9);
    // What the app calls for a layer: the plain program, and this one where that finds no lead-in.
    expect(layerProgram(input, cutter()).gcode).toBe(program.gcode);
    for (const k of vias) {
      const { via, leadIn } = chained[k]!;
      const [row, col, hostRow, hostCol] = [Math.floor(k / 3), k % 3, Math.floor(via!.part / 3), via!.part % 3];
      expect(Math.abs(row - hostRow) + Math.abs(col - hostCol)).toBe(1);
      expect(Math.hypot(leadIn![0] - via!.from[0], leadIn![1] - via!.from[1])).toBeCloseTo(2.5, 1);
      // Cut after the plate it is entered through, and said so in the program.
      const host = program.parts[via!.part]!;
      expect(program.parts[k]!.order).toBeGreaterThan(host.order);
      expect(program.gcode).toContain(`Entered by a bridge from the cut path of part ${host.order}`.toUpperCase());
    }
  });

  it("leaves a layer alone when every part has a lead-in from a face", () => {
    const two = { ...input, parts: input.parts.slice(0, 2) };
    expect(chainWalledIn(two.parts, slab!.size, 1.5)).toBeNull();
    expect(profileProgram(two, cutter()).parts).toHaveLength(2);
    expect(layerProgram(two, cutter()).gcode).toBe(profileProgram(two, cutter()).gcode);
  });
});

describe("profile programs", () => {
  const part = { name: "Plate", ...partSections(plate(100, 50, 40)) };
  const input = {
    title: "part Plate, job 1",
    size: [100, 50] as Point,
    thickness: 40,
    parts: [part],
    kerf: 2,
    feed: 250,
  };

  // Worked by hand: the plate fills its blank, so the path (1 mm outside) reaches past every face
  // and the lead-in comes from the left (the first face tried), at the middle of that side: from
  // the air at X0 Y35 to X9 Y35, 9 mm; once round, 2·(100 + 50) + 2π·1 = 306.28 mm (the arcs as
  // chords, 0.02 mm shorter); back out 9 mm. Rapids: up from machine zero to Y35 and back, 70 mm.
  // Feed 324.28 mm / 250 = 1.2971 min; rapid 70 / 1500 = 0.0467 min; heat-up 10 s, handling 60 s.
  it("a 100 × 50 mm plate: path length and cut time worked by hand", () => {
    const p = profileProgram(input, cutter());
    expect(p.parts[0]!.root.leadIn).toEqual({ face: "left", from: [9, 35], to: [9, 35] });
    expect(p.feedMm).toBeCloseTo(324.28, 1);
    expect(p.rapidMm).toBeCloseTo(70, 6);
    expect(p.minutes.feed).toBeCloseTo(324.28 / 250, 3);
    expect(p.minutes.rapid).toBeCloseTo(70 / 1500, 6);
    expect(p.minutes.heat).toBeCloseTo(10 / 60, 9);
    expect(p.minutes.handling).toBe(1);
    expect(p.minutes.total).toBeCloseTo(324.28 / 250 + 70 / 1500 + 10 / 60 + 1, 3);
  });

  it("writes the dialect: DIN units, numbered lines, the heat by hand, cautions and the set-up", () => {
    const p = profileProgram(
      input,
      cutter({}, { unitWords: "G70/G71", lineNumbers: true, heatOn: null, heatOff: null }),
    );
    const lines = p.gcode.trim().split("\n");
    expect(lines[0]).toBe("(BLOCKYARD PROFILE PROGRAM: PART PLATE, JOB 1)");
    expect(p.gcode).toMatch(/\(CAUTION: VENTILATE\. NEVER LEAVE A HOT WIRE UNATTENDED\.\)/);
    expect(p.gcode).toMatch(/\(CAUTION: NEVER HOT-WIRE POLYURETHANE, PVC OR PIR FOAMS\.\)/);
    expect(p.gcode).toMatch(/LOWER FACE ON A WASTE SHEET OR SPACERS 10 MM HIGH, ITS LEFT FACE 10 MM FROM X0/);
    const code = lines.filter((l) => !l.startsWith("("));
    expect(code[0]).toBe("N10 G71");
    expect(code.every((l, i) => l.startsWith(`N${(i + 1) * 10} `))).toBe(true);
    expect(code.filter((l) => / M0$/.test(l))).toHaveLength(2);
    expect(code.at(-1)).toMatch(/ M2$/);
  });

  it("in inches on an inch machine", () => {
    const p = profileProgram(input, cutter({}, { inch: true }));
    expect(p.gcode).toMatch(/^G20$/m);
    expect(p.gcode).toMatch(/^G1 X0\.3543 Y1\.378 F9\.8425$/m); // 9 mm, 35 mm, 250 mm/min in inches
  });

  it("refuses a block cutter, a slab longer than the wire or wider than the travel, naming the limit", () => {
    expect(() => profileProgram(input, cutter({ kind: "block" }))).toThrow(
      new ProgramError("Bench cutter is a block cutter: choose a profile cutter."),
    );
    expect(() => profileProgram({ ...input, thickness: 1200 }, cutter())).toThrow(
      "The slab is 1200 mm long along the wire; Bench cutter's wire spans 1000 mm.",
    );
    expect(() => profileProgram(input, cutter({ travel: [110, 600] }))).toThrow(
      "The slab needs 120 mm along X (10 mm of air each side); Bench cutter travels 110 mm.",
    );
    expect(() => profileProgram(input, cutter({ travel: [1200, 60] }))).toThrow(
      "The slab needs 70 mm along Y (10 mm of air above and a 10 mm waste sheet below); Bench cutter travels 60 mm.",
    );
  });

  it("cuts a slab's parts in one program, each from its own lead-in, in the order round the ring", () => {
    const a = partSections(plate(40, 30, 40));
    const p = profileProgram(
      {
        title: "plan 1, block HF-1, slab 1 of 1",
        size: [200, 60],
        thickness: 40,
        parts: [
          {
            name: "Right",
            root: { outer: a.root.outer.map(([u, v]) => [u + 150, v + 10] as Point), holes: [] },
            tip: a.root,
            tapered: false,
          },
          {
            name: "Left",
            root: { outer: a.root.outer.map(([u, v]) => [u + 5, v + 15] as Point), holes: [] },
            tip: a.root,
            tapered: false,
          },
          {
            name: "Middle",
            root: { outer: a.root.outer.map(([u, v]) => [u + 80, v + 5] as Point), holes: [] },
            tip: a.root,
            tapered: false,
          },
        ],
        kerf: 1.5,
        feed: 250,
      },
      cutter(),
    );
    expect(p.parts.map((q) => [q.name, q.root.leadIn.face, q.order])).toEqual([
      ["Right", "right", 3],
      ["Left", "left", 1],
      ["Middle", "top", 2],
    ]);
    const heads = p.gcode.split("\n").filter((l) => l.startsWith("(PART"));
    expect(heads).toEqual([
      "(PART 1: LEFT. LEAD-IN FROM THE LEFT FACE, ANTICLOCKWISE)",
      "(PART 2: MIDDLE. LEAD-IN FROM THE TOP FACE, ANTICLOCKWISE)",
      "(PART 3: RIGHT. LEAD-IN FROM THE RIGHT FACE, ANTICLOCKWISE)",
    ]);
    expect((p.gcode.match(/^M3$/gm) ?? []).length).toBe(1);
    expect(p.svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" width="[\d.]+mm" height="[\d.]+mm"/);
  });
});
