/**
 * True-shape nesting for the shop (settings.trueShape, lib/nesting/true-shape.ts and slab.ts):
 * profile parts nested by their outlines in slabs that enter the block nesting as boxes. Overlaps
 * and containment are checked again with polygon-clipping (scripts/lib-bench/shop-case.ts), not
 * the library the planner uses.
 */
import polygonClipping, { type Polygon } from "polygon-clipping";
import { describe, expect, it } from "vitest";
import {
  type FacePoint,
  nestSync,
  type Plan,
  parseProblem,
  type Problem,
  type SlabLayout,
  type SlabMember,
  validatePlan,
} from "@/lib/nesting";
import { findLeadIn, leadIns, memberLoop, occupiedOutline, type PlacedMember } from "@/lib/nesting/slab";
import { nestTrueShapeSync } from "@/lib/nesting/true-shape";
import { loopDistance } from "@/lib/nesting/irregular/geometry";
import { bboxOf } from "@/lib/nesting/irregular/geometry";
import { type Machine, slabMaxFor } from "@/lib/planning/machine";
import { slabFaceDrawing } from "@/lib/planning/slab-face";
import { partGeometry } from "@/lib/profiles/part";
import { profileProgram } from "@/lib/profiles/program";
import { slabProgramInput } from "@/lib/profiles/slab-program";
import { partSections } from "@/lib/profiles/slabs";
import { checkSlabsIndependently } from "@/scripts/lib-bench/shop-case";
import { profileCutter } from "../../support/procedure-fixtures";
import { closedRing } from "../../support/plane";
import { L_OUTLINE } from "../../support/shapes";

const parse = (json: unknown): Problem => {
  const r = parseProblem(json);
  if (!r.ok) throw new Error(r.errors.join("\n"));
  return r.problem;
};

/** The hand-drawn L of tests/support/shapes.ts, in its box 120 × 90. */
const L = L_OUTLINE;

const lProblem = (extra: Record<string, unknown> = {}) => ({
  settings: { kerf: 2, trueShape: true, timeLimitMs: 1000, ...extra },
  blocks: [{ id: "B1", size: [500, 600, 400], grade: "EPS" }],
  parts: [
    { id: "L", size: [60, 120, 90], quantity: 6, grade: "EPS", outline: { outer: L } },
    { id: "box", size: [100, 100, 100], quantity: 2, grade: "EPS" },
  ],
});

const ring = closedRing;

describe("settings.trueShape and part outlines (optional fields)", () => {
  const v1 = {
    settings: { kerf: 1.5, timeLimitMs: 500 },
    blocks: [{ id: "B", size: [800, 600, 400] }],
    parts: [
      { id: "a", size: [300, 200, 100], quantity: 3 },
      { id: "b", size: [150, 150, 150], quantity: 4, rotate: "z" },
    ],
  };

  it("reads a v1 problem without them to the same problem as before (no new keys)", () => {
    const p = parse(v1);
    expect("trueShape" in p.settings).toBe(false);
    expect(p.parts.every((q) => !("outline" in q))).toBe(true);
  });

  it("plans a v1 problem exactly as before: trueShape without outlines, or outlines without trueShape, change nothing", () => {
    const plain = nestSync(parse(v1), { seed: 4, iterations: 30 });
    const flagged = nestSync(parse({ ...v1, settings: { ...v1.settings, trueShape: true } }), {
      seed: 4,
      iterations: 30,
    });
    const outlined = nestSync(
      parse({
        ...v1,
        parts: v1.parts.map((q) => ({
          ...q,
          outline: {
            outer: [
              [0, 0],
              [q.size[1], 0],
              [0, q.size[2]],
            ],
          },
        })),
      }),
      { seed: 4, iterations: 30 },
    );
    const strip = (p: Plan) => ({ ...p, stats: { ...p.stats, elapsedMs: 0 } });
    expect(strip(flagged)).toEqual(strip(plain));
    expect(strip(outlined)).toEqual(strip(plain));
    expect(plain.placements.some((x) => x.slab)).toBe(false);
  });

  it("refuses bad values naming their path", () => {
    const bad = parseProblem({
      settings: { trueShape: "yes" },
      blocks: [{ id: "B", size: [100, 100, 100] }],
      parts: [
        {
          id: "p",
          size: [10, 50, 50],
          outline: {
            outer: [
              [0, 0],
              [60, 0],
              [0, 40],
            ],
          },
        },
        {
          id: "q",
          size: [10, 50, 50],
          outline: {
            outer: [
              [0, 0],
              [40, 40],
              [40, 0],
              [0, 40],
            ],
          },
        },
        {
          id: "r",
          size: [10, 50, 50],
          outline: {
            outer: [
              [0, 0],
              [40, 0],
              [0, 40],
            ],
            holes: [
              [
                [45, 45],
                [48, 45],
                [45, 48],
              ],
            ],
          },
        },
      ],
    });
    expect(bad.ok).toBe(false);
    const errors = bad.ok ? [] : bad.errors;
    expect(errors).toContain("settings.trueShape: must be true or false");
    expect(errors.some((e) => e.startsWith("parts[0].outline.outer: reaches past the part's face"))).toBe(true);
    expect(errors.some((e) => e.startsWith("parts[1].outline.outer: edges"))).toBe(true);
    expect(errors).toContain("parts[2].outline.holes[0]: must lie inside the outer loop");
  });
});

describe("slabs of profile parts", () => {
  const problem = parse(lProblem());
  const plan = nestSync(problem, { seed: 1 });

  it("makes a valid, cuttable plan whose slabs hold every L, kerf apart, with clear lead-ins", () => {
    expect(validatePlan(problem, plan)).toEqual([]);
    const slabs = plan.placements.filter((p) => p.slab);
    expect(slabs.length).toBeGreaterThan(0);
    expect(slabs.reduce((n, p) => n + p.slab!.members.length, 0)).toBe(6);
    expect(plan.placements.filter((p) => p.part === "box")).toHaveLength(2);
    expect(checkSlabsIndependently(problem, plan).errors).toEqual([]);
    // Thickness along the wire: the parts' 60 mm.
    for (const s of slabs) expect(s.slab!.size[0]).toBe(60);
  });

  it("uses less face than the parts' boxes: two Ls interlock", () => {
    const face = plan.placements.filter((p) => p.slab).reduce((a, p) => a + p.slab!.size[1] * p.slab!.size[2], 0);
    expect(face).toBeLessThan(6 * 120 * 90);
  });

  it("is deterministic for a seed", () => {
    const again = nestSync(problem, { seed: 1 });
    expect(JSON.stringify({ ...again.placements })).toBe(JSON.stringify({ ...plan.placements }));
  });

  it("never puts a part in another part's hole (the shop rule): the holes stay the host's", () => {
    const frame = parse({
      settings: { kerf: 1, trueShape: true, timeLimitMs: 1000 },
      blocks: [{ id: "B1", size: [400, 400, 300] }],
      parts: [
        {
          id: "frame",
          size: [50, 200, 200],
          outline: {
            outer: [
              [0, 0],
              [200, 0],
              [200, 200],
              [0, 200],
            ],
            holes: [
              [
                [20, 20],
                [20, 180],
                [180, 180],
                [180, 20],
              ],
            ],
          },
        },
        {
          id: "tile",
          size: [50, 40, 40],
          quantity: 4,
          outline: {
            outer: [
              [0, 0],
              [40, 0],
              [40, 40],
              [0, 40],
            ],
          },
        },
      ],
    });
    const p = nestSync(frame, { seed: 2 });
    expect(validatePlan(frame, p)).toEqual([]);
    for (const pl of p.placements.filter((x) => x.slab)) {
      const parts = new Map(frame.parts.map((q) => [q.id, q]));
      const hostM = pl.slab!.members.find((m) => m.part === "frame");
      if (!hostM) continue;
      const host: Polygon = [ring(memberLoop(occupiedOutline(parts.get("frame")!.outline!), hostM.rotation, hostM.at))];
      for (const m of pl.slab!.members.filter((x) => x.part === "tile")) {
        const tile: Polygon = [ring(memberLoop(occupiedOutline(parts.get("tile")!.outline!), m.rotation, m.at))];
        expect(polygonClipping.intersection(host, tile)).toEqual([]);
      }
    }
  });

  it("nests a tapered part by the union of its root and tip sections", () => {
    const root: FacePoint[] = [
      [0, 0],
      [100, 0],
      [100, 20],
      [0, 20],
    ];
    const tip: FacePoint[] = [
      [30, 0],
      [90, 0],
      [90, 30],
      [30, 30],
    ];
    const occ = occupiedOutline({ outer: root, tip: { outer: tip } });
    const u: Polygon = [ring(occ)];
    for (const s of [root, tip]) expect(polygonClipping.difference([ring(s)], u)).toEqual([]);
    // 100 × 20 + the tip's 60 × 10 above it (hand-worked).
    const area = Math.abs(
      occ.reduce((a, p, i) => a + p[0] * occ[(i + 1) % occ.length]![1] - occ[(i + 1) % occ.length]![0] * p[1], 0) / 2,
    );
    expect(area).toBeCloseTo(2600, 6);
  });

  it("turns the parts only as their rotate rule allows (rotate z: never in the face)", () => {
    const p = parse(lProblem());
    p.parts[0]!.rotate = "z";
    const got = nestSync(p, { seed: 3 });
    expect(validatePlan(p, got)).toEqual([]);
    const slabs = got.placements.filter((x) => x.slab);
    for (const s of slabs) {
      expect(s.slab!.rotate).toBe("z");
      for (const m of s.slab!.members) expect(m.rotation).toBe(0);
    }
  });
});

describe("lead-in corridors", () => {
  const sq = (x: number, y: number, w: number, h: number): PlacedMember => {
    const loop: FacePoint[] = [
      [x, y],
      [x + w, y],
      [x + w, y + h],
      [x, y + h],
    ];
    return { loop, bb: bboxOf([loop]), area: w * h };
  };

  it("finds none for a part boxed in on the left, right and top (the bottom is never a lead-in face)", () => {
    // A cup upside down over a small square: walls left and right, a roof above.
    const members = [sq(40, 0, 20, 20), sq(0, 0, 30, 100), sq(70, 0, 30, 100), sq(0, 30, 100, 70)];
    expect(findLeadIn(members, 0, [100, 100], 2)).toBeNull();
    // Take the roof away: a slot from the top, straight down to the wire's path 1 mm above the square.
    const open = findLeadIn(members.slice(0, 3), 0, [100, 100], 2);
    expect(open?.face).toBe("top");
    expect(open!.to[1]).toBeCloseTo(21, 6);
  });
});

describe("the validator on slab members", () => {
  const problem = parse(lProblem());
  const plan = nestSync(problem, { seed: 1 });
  const idx = plan.placements.findIndex((p) => p.slab && p.slab.members.length >= 2);

  const mutate = (f: (p: Plan) => void): string[] => {
    const copy = structuredClone(plan);
    f(copy);
    return validatePlan(problem, copy);
  };

  it("refuses two overlapping members, naming the path", () => {
    expect(idx).toBeGreaterThanOrEqual(0);
    const errs = mutate((p) => {
      const m = p.placements[idx]!.slab!.members;
      m[1]!.at = [...m[0]!.at];
      m[1]!.rotation = m[0]!.rotation;
    });
    expect(errs.some((e) => e.startsWith(`placements[${idx}].slab.members[0]`) && e.includes("overlap"))).toBe(true);
  });

  it("refuses a member outside its slab", () => {
    const errs = mutate((p) => {
      p.placements[idx]!.slab!.members[0]!.at = [-30, 0];
    });
    expect(
      errs.some((e) => e.startsWith(`placements[${idx}].slab.members[0]: part L lies outside the slab's face`)),
    ).toBe(true);
  });

  it("refuses a rotation not in the list", () => {
    const errs = mutate((p) => {
      p.placements[idx]!.slab!.members[0]!.rotation = 45;
    });
    expect(errs).toContain(
      `placements[${idx}].slab.members[0]: rotation 45° is not allowed for part L (allowed 0, 90, 180, 270)`,
    );
  });

  it("refuses a blocked lead-in corridor", () => {
    // Two squares one above the other; the lower one's lead-in from the top runs through the upper one.
    const sqProblem = parse({
      settings: { kerf: 2, trueShape: true },
      blocks: [{ id: "B1", size: [500, 500, 500] }],
      parts: [
        {
          id: "s",
          size: [40, 50, 50],
          quantity: 2,
          outline: {
            outer: [
              [0, 0],
              [50, 0],
              [50, 50],
              [0, 50],
            ],
          },
        },
      ],
    });
    const bad: Plan = {
      version: 2,
      placements: [
        {
          part: "slab-1",
          block: "B1",
          origin: [0, 0, 0],
          size: [40, 50, 102],
          slab: {
            size: [40, 50, 102],
            rotate: "any",
            members: [
              { part: "s", rotation: 0, at: [0, 0], leadIn: { face: "top", to: [25, 51] } },
              { part: "s", rotation: 0, at: [0, 52], leadIn: { face: "top", to: [25, 103] } },
            ],
          },
        },
      ],
      unplaced: [],
      offcuts: [],
      cuts: {},
      stats: {
        blocksUsed: 1,
        partVolume: 40 * 50 * 102,
        stockVolume: 0,
        offcutVolume: 0,
        yield: 0,
        elapsedMs: 0,
        lowerBoundBlocks: 1,
      },
    };
    const errs = validatePlan(sqProblem, bad);
    expect(
      errs.some(
        (e) =>
          e.startsWith("placements[0].slab.members[0]: the lead-in corridor from the top face") &&
          e.includes("blocked by members[1] (s)"),
      ),
    ).toBe(true);
    expect(errs.filter((e) => e.includes("members[1]:"))).toEqual([]);
    // The same slab with the lower square entered from the left is valid.
    bad.placements[0]!.slab!.members[0]!.leadIn = { face: "left", to: [-1, 25] };
    expect(validatePlan(sqProblem, bad)).toEqual([]);
  });
});

describe("chained lead-ins (a walled-in member entered through an earlier member's kerf)", () => {
  // Slab face 100 × 100, kerf 2: a 20 mm square "a" at the bottom between two walls, under a roof.
  // The walls reach the left and right faces, the roof the top; "a" reaches no face.
  const rect = (w: number, h: number): FacePoint[] => [
    [0, 0],
    [w, 0],
    [w, h],
    [0, h],
  ];
  const problem = parse({
    settings: { kerf: 2, trueShape: true },
    blocks: [{ id: "B1", size: [300, 300, 300] }],
    parts: [
      { id: "roof", size: [40, 100, 70], quantity: 1, outline: { outer: rect(100, 70) } },
      { id: "wall", size: [40, 30, 28], quantity: 2, outline: { outer: rect(30, 28) } },
      { id: "a", size: [40, 20, 20], quantity: 1, outline: { outer: rect(20, 20) } },
    ],
  });
  // The same with a small part "c" to stand in the waste.
  const withC = parse({
    ...problem,
    version: undefined,
    parts: [
      ...problem.parts,
      { id: "c", size: [40, 4, 10], quantity: 1, rotate: "any", outline: { outer: rect(4, 10) } },
    ],
  });
  const parts = new Map(problem.parts.map((p) => [p.id, p]));
  const layout = [
    { part: "a", rotation: 0, at: [40, 0] as FacePoint },
    { part: "wall", rotation: 0, at: [0, 0] as FacePoint },
    { part: "roof", rotation: 0, at: [0, 30] as FacePoint },
    { part: "wall", rotation: 0, at: [70, 0] as FacePoint },
  ];
  const placedOf = (ms: { part: string; rotation: number; at: FacePoint }[]): PlacedMember[] =>
    ms.map((m) => {
      const loop = memberLoop(occupiedOutline(parts.get(m.part)!.outline!), m.rotation, m.at);
      return { loop, bb: bboxOf([loop]), area: 0 };
    });
  const planOf = (members: SlabMember[]): Plan => ({
    version: 2,
    placements: [
      {
        part: "slab-1",
        block: "B1",
        origin: [0, 0, 0],
        size: [40, 100, 100],
        slab: { size: [40, 100, 100], rotate: "any", members },
      },
    ],
    unplaced: [],
    offcuts: [],
    cuts: {},
    stats: {
      blocksUsed: 1,
      partVolume: 40 * 100 * 100,
      stockVolume: 0,
      offcutVolume: 0,
      yield: 0,
      elapsedMs: 0,
      lowerBoundBlocks: 1,
    },
  });
  // What the planner makes of the layout: members in cutting order, each with its lead-in.
  const planned = () => {
    const placed = placedOf(layout);
    const got = leadIns(placed, [100, 100], 2);
    const members = got.order.map((k, i): SlabMember => ({ ...layout[k]!, leadIn: got.leads[i]! }));
    return { placed, got, members };
  };

  it("gives a walled-in part a bridge from a member reached before it, and the plan is valid", () => {
    const { placed, got, members } = planned();
    expect(findLeadIn(placed, 0, [100, 100], 2)).toBeNull();
    expect(got.blocked).toEqual([]);
    // The square comes last in cutting order, entered through the kerf of a member cut before it.
    expect(got.order.at(-1)).toBe(0);
    const li = got.leads.at(-1)!;
    expect(li.via).toBeGreaterThanOrEqual(0);
    expect(li.via).toBeLessThan(members.length - 1);
    const host = placed[got.order[li.via!]!]!;
    // Both ends on the wire's paths (kerf / 2 off each part), the bridge across the 10 mm of waste.
    expect(loopDistance([li.from!, li.from!], host.loop)).toBeCloseTo(1, 1);
    expect(loopDistance([li.to, li.to], placed[0]!.loop)).toBeCloseTo(1, 1);
    expect(Math.hypot(li.to[0] - li.from![0], li.to[1] - li.from![1])).toBeCloseTo(8, 1);
    expect(validatePlan(problem, planOf(members))).toEqual([]);
    expect(checkSlabsIndependently(problem, planOf(members)).errors).toEqual([]);
  });

  it("refuses a bridge that crosses another member, naming both", () => {
    // A small part "c" stands in the waste between the left wall and the square.
    const members: SlabMember[] = [
      { part: "roof", rotation: 0, at: [0, 30], leadIn: { face: "top", to: [50, 101] } },
      { part: "wall", rotation: 0, at: [0, 0], leadIn: { face: "left", to: [-1, 14] } },
      { part: "wall", rotation: 0, at: [70, 0], leadIn: { face: "right", to: [101, 14] } },
      { part: "c", rotation: 0, at: [33, 5], leadIn: { face: "left", to: [32, 10], via: 1, from: [31, 10] } },
      { part: "a", rotation: 0, at: [40, 0], leadIn: { face: "left", to: [39, 10], via: 1, from: [31, 10] } },
    ];
    const errs = validatePlan(withC, planOf(members));
    expect(errs).toEqual([
      "placements[0].slab.members[4]: the bridge from members[1] at 31, 10 to 39, 10 is blocked by members[3] (c): 0 from it, kerf / 2 = 1",
    ]);
    // Bridged from the roof instead (straight down across the waste above it), the slab is valid.
    members[4]!.leadIn = { face: "top", to: [50, 21], via: 0, from: [50, 29] };
    expect(validatePlan(withC, planOf(members))).toEqual([]);
  });

  it("refuses a chain through a member cut later (or itself), and a bridge start off that member's path", () => {
    const { members } = planned();
    const last = members.length - 1;
    const later = structuredClone(members);
    // The square first in the list: its host is cut after it.
    const [sq] = later.splice(last, 1);
    later.unshift(sq!);
    const hostAt = sq!.leadIn.via! + 1;
    later[0]!.leadIn.via = hostAt;
    expect(validatePlan(problem, planOf(later))).toContain(
      `placements[0].slab.members[0]: leadIn.via: must be the index of an earlier member (one cut before this one, 0 to -1), not ${hostAt}`,
    );
    const self = structuredClone(members);
    self[last]!.leadIn.via = last;
    expect(validatePlan(problem, planOf(self)).some((e) => e.includes(`members[${last}]: leadIn.via: must be`))).toBe(
      true,
    );
    const off = structuredClone(members);
    off[last]!.leadIn.from = [off[last]!.leadIn.from![0] + 5, off[last]!.leadIn.from![1] + 5];
    expect(
      validatePlan(problem, planOf(off)).some((e) => e.startsWith(`placements[0].slab.members[${last}]: leadIn.from`)),
    ).toBe(true);
  });

  it("cuts the host first, then follows its cut path to the bridge, cuts the chained part, and leaves the same way", () => {
    const { members } = planned();
    const slab: SlabLayout = { size: [40, 100, 100], rotate: "any", members };
    const input = slabProgramInput("slab-1", slab, parts, (id, k) => `${id} ${k + 1}`, { kerf: 2, feed: 250 });
    const prog = profileProgram(input, profileCutter());
    const a = members.length - 1;
    const host = members[a]!.leadIn.via!;
    expect(prog.parts[a]!.via?.part).toBe(host);
    // Visited right after its host.
    expect(prog.parts[a]!.order).toBe(prog.parts[host]!.order + 1);
    const idx = (k: number) => prog.moves.flatMap((m, i) => (m.part === k ? [i] : []));
    const hostMoves = idx(host);
    const aMoves = idx(a);
    expect(aMoves[0]!).toBeGreaterThan(hostMoves[0]!);
    // The host's lead-out to the air comes after the chained part, and the wire stays in the foam's kerf between.
    expect(hostMoves.at(-1)!).toBeGreaterThan(aMoves.at(-1)!);
    expect(prog.moves.slice(hostMoves[0]!, hostMoves.at(-1)! + 1).every((m) => m.kind === "feed")).toBe(true);
    // The bridge: a move from the planned start on the host's path straight to the square's entry (frame 10 mm off).
    const at = (p: FacePoint) => [p[0] + 10, p[1] + 10];
    const [fx = 0, fy = 0] = at(members[a]!.leadIn.from!);
    const [tx = 0, ty = 0] = at(members[a]!.leadIn.to);
    const bridge = prog.moves.findIndex(
      (m, i) =>
        i > 0 &&
        Math.hypot(m.root[0] - tx, m.root[1] - ty) < 0.05 &&
        Math.hypot(prog.moves[i - 1]!.root[0] - fx, prog.moves[i - 1]!.root[1] - fy) < 0.05,
    );
    expect(bridge).toBeGreaterThan(hostMoves[0]!);
    expect(prog.gcode).toContain(
      `PART ${prog.parts[a]!.order}: A ${a + 1}. ENTERED BY A BRIDGE FROM THE CUT PATH OF PART ${prog.parts[host]!.order}`,
    );
    // The drawing of the face shows the bridge, numbered by the host.
    const face = slabFaceDrawing(slab, new Map(problem.parts.map((p) => [p.id, p.outline!])));
    expect(face.members[a]!.via).toBe(host + 1);
    expect(face.members[a]!.corridor).toEqual([members[a]!.leadIn.from, members[a]!.leadIn.to]);
  });
});

describe("the block nesting of the slabs", () => {
  it("tries further seeds while they stop at their bound, and keeps the plan that consumes the least stock", () => {
    const problem = parse(lProblem());
    const seeds: number[] = [];
    // The box nesting as `nestSync` runs it; the plan of seed 10 is made to return one more offcut (less consumed).
    const plan = nestTrueShapeSync(problem, { seed: 7 }, (p, o) => {
      seeds.push(o.seed ?? 0);
      const got = nestSync(p, o);
      if (o.seed !== 10) return got;
      return { ...got, offcuts: [...got.offcuts, { block: "B1", origin: [0, 0, 0], size: [1, 1, 1] }] };
    });
    expect(seeds).toEqual(Array.from({ length: 16 }, (_, k) => 7 + k));
    expect(plan.offcuts.some((o) => o.size[0] === 1 && o.size[1] === 1 && o.size[2] === 1)).toBe(true);
  });
});

describe("one program per true-shape slab", () => {
  const cutter = (over: Partial<Machine> = {}): Machine =>
    profileCutter(
      { fourAxis: true, travel: [1500, 1500], maxPiece: [1500, 1500, 1000], ...over },
      { towerAxes: ["U", "V"] },
    );

  it("cuts every member of a slab in one program, each entered at its planned corridor without cutting another", () => {
    const problem = parse(lProblem());
    const plan = nestSync(problem, { seed: 1 });
    const parts = new Map(problem.parts.map((p) => [p.id, p]));
    const slabs = plan.placements.filter((p) => p.slab);
    expect(slabs.length).toBeGreaterThan(0);
    for (const pl of slabs) {
      const input = slabProgramInput(pl.part, pl.slab!, parts, (id, k) => `${id} ${k + 1}`, { kerf: 2, feed: 250 });
      const prog = profileProgram(input, cutter({ fourAxis: false }));
      expect(prog.parts).toHaveLength(pl.slab!.members.length);
      for (const [k, m] of pl.slab!.members.entries()) {
        const made = prog.parts.find((p) => p.name === `${m.part} ${k + 1}`)!;
        // The program frame puts the slab 10 mm (ENTRY_CLEARANCE) from machine zero.
        const entry = made.root.leadIn.to;
        expect(Math.hypot(entry[0] - 10 - m.leadIn.to[0], entry[1] - 10 - m.leadIn.to[1])).toBeLessThan(0.05);
        expect(made.root.leadIn.face).not.toBe("bottom");
      }
      expect(prog.gcode).toContain("M3");
    }
  });

  it("cuts a slab of tapered wing cores on a 4-axis cutter", () => {
    const root = partSections({ kind: "naca", code: "2412", chordMm: 300, tipChordMm: 180, spanMm: 500 });
    const size = partGeometry({ kind: "naca", code: "2412", chordMm: 300, tipChordMm: 180, spanMm: 500 }).size;
    const problem = parse({
      settings: { kerf: 1.5, trueShape: true, timeLimitMs: 1000 },
      blocks: [{ id: "B1", size: [600, 700, 400] }],
      parts: [{ id: "core", size, quantity: 4, outline: { outer: root.root.outer, tip: { outer: root.tip.outer } } }],
    });
    const plan = nestSync(problem, { seed: 1 });
    expect(validatePlan(problem, plan)).toEqual([]);
    const parts = new Map(problem.parts.map((p) => [p.id, p]));
    for (const pl of plan.placements.filter((p) => p.slab)) {
      const prog = profileProgram(
        slabProgramInput(pl.part, pl.slab!, parts, (id, k) => `${id} ${k + 1}`, { kerf: 1.5, feed: 250 }),
        cutter(),
      );
      expect(prog.parts.every((p) => p.root !== p.tip)).toBe(true);
      expect(prog.frame.fourAxis).toBe(true);
    }
  });
});

describe("the plan's version (nesting-format.md, 'Extending the format', rules 4 and 6)", () => {
  const problem = parse(lProblem());
  const plan = nestSync(problem, { seed: 1 });
  const plainProblem = parse({ ...lProblem(), settings: { kerf: 2, timeLimitMs: 1000 } });
  const plain = nestSync(plainProblem, { seed: 1 });

  it("is 2 for a plan with a slab placement (a v1 reader would meet a slab id not in the problem)", () => {
    expect(plan.placements.some((p) => p.slab)).toBe(true);
    expect(plan.version).toBe(2);
    expect(validatePlan(problem, plan)).toEqual([]);
  });

  it("stays 1 for a plan without slabs, and the validator still reads it", () => {
    expect(plain.placements.some((p) => p.slab)).toBe(false);
    expect(plain.version).toBe(1);
    expect(validatePlan(plainProblem, plain)).toEqual([]);
  });

  it("refuses a plan with slabs that says version 1, and any version but 1 or 2", () => {
    expect(validatePlan(problem, { ...plan, version: 1 })).toContain(
      "version: must be 2 when a placement is a slab (a v1 reader does not know slab ids)",
    );
    expect(validatePlan(plainProblem, { ...plain, version: 3 } as unknown as Plan)).toContain(
      "version: must be 1 or 2",
    );
  });
});

describe("members of a slab that found no room", () => {
  it("are reported unplaced with the slab's size to 0.1 mm and no slab id (the slab has no placement to find it by)", () => {
    // 300 right triangles of 90 × 60 × 80 mm (hand-drawn) and one 400 × 300 × 300 block: their boxes alone are 0.13 m³
    // against 0.036 m³ of block, so slabs are left over.
    const p = parse({
      settings: { kerf: 1.5, trueShape: true, timeLimitMs: 1000 },
      blocks: [{ id: "B1", size: [400, 300, 300], grade: "EPS" }],
      parts: [
        {
          id: "tri",
          size: [80, 90, 60],
          quantity: 300,
          grade: "EPS",
          rotate: "any",
          outline: {
            outer: [
              [0, 0],
              [90, 0],
              [0, 60],
            ],
          },
        },
      ],
    });
    const plan = nestSync(p, { seed: 1, iterations: 20 });
    expect(validatePlan(p, plan)).toEqual([]);
    const reasons = plan.unplaced.map((u) => u.reason).filter((r) => r.startsWith("its slab"));
    expect(reasons.length).toBeGreaterThan(0);
    for (const r of reasons) {
      expect(r).toMatch(/^its slab \(\d+(\.\d)? × \d+(\.\d)? × \d+(\.\d)? mm\) found no room: /);
      expect(r).not.toMatch(/slab-\d/);
    }
  });
});

describe("slabs within the profile cutter (settings.slabMax)", () => {
  // 16 Ls of 120 × 90 into one large block: without a limit the slab face runs to the block's.
  const many = (extra: Record<string, unknown> = {}) =>
    parse({
      settings: { kerf: 2, trueShape: true, timeLimitMs: 1000, ...extra },
      blocks: [{ id: "B1", size: [400, 1000, 800], grade: "EPS" }],
      parts: [{ id: "L", size: [60, 120, 90], quantity: 16, grade: "EPS", outline: { outer: L } }],
    });
  const placedLs = (plan: Plan) =>
    plan.placements.reduce((n, p) => n + (p.slab ? p.slab.members.length : p.part === "L" ? 1 : 0), 0);

  it("keeps every slab's face within slabMax [thickness, u, v], and still places every part", () => {
    const free = nestSync(many(), { seed: 2 });
    const faces = free.placements.filter((p) => p.slab).map((p) => p.slab!.size);
    // The check can fail: without the limit some slab is wider or taller than the limit below.
    expect(faces.some((s) => s[1] > 300 || s[2] > 200)).toBe(true);

    const problem = many({ slabMax: [80, 300, 200] });
    const plan = nestSync(problem, { seed: 2 });
    expect(validatePlan(problem, plan)).toEqual([]);
    const slabs = plan.placements.filter((p) => p.slab);
    expect(slabs.length).toBeGreaterThan(0);
    for (const s of slabs) {
      expect(s.slab!.size[1]).toBeLessThanOrEqual(300);
      expect(s.slab!.size[2]).toBeLessThanOrEqual(200);
    }
    expect(placedLs(plan)).toBe(16);
    expect(checkSlabsIndependently(problem, plan).errors).toEqual([]);
  });

  it("makes no slab for parts thicker than the wire spans: they are nested as boxes", () => {
    const problem = many({ slabMax: [50, 1000, 1000] });
    const plan = nestSync(problem, { seed: 2 });
    expect(plan.placements.some((p) => p.slab)).toBe(false);
    expect(placedLs(plan)).toBe(16);
    expect(validatePlan(problem, plan)).toEqual([]);
  });

  it("refuses, naming the path, a slab larger than slabMax and a slabMax that is not 3 numbers > 0", () => {
    const plan = nestSync(many(), { seed: 2 });
    const slabAt = plan.placements.findIndex((p) => p.slab);
    const [t, u, v] = plan.placements[slabAt]!.slab!.size;
    const tight = many({ slabMax: [t, u - 1, v] });
    expect(validatePlan(tight, plan).join("\n")).toMatch(
      new RegExp(`placements\\[${slabAt}\\]\\.slab\\.size: .* larger than the profile cutter takes .*face u`),
    );
    const bad = parseProblem({ ...lProblem({ slabMax: [60, 0, "x"] }) });
    expect(bad.ok).toBe(false);
    if (!bad.ok) {
      expect(bad.errors.join("\n")).toMatch(/settings\.slabMax\[1\]/);
      expect(bad.errors.join("\n")).toMatch(/settings\.slabMax\[2\]/);
    }
  });

  it("is taken from a profile cutter: its wire, its travel less 10 mm of air each side, its table", () => {
    // The shared profile cutter fixture: see tests/support/procedure-fixtures.ts.
    const m = profileCutter();
    expect(slabMaxFor(m)).toEqual([
      Math.min(m.wireLength, m.maxPiece[1]),
      Math.min(m.travel[0] - 20, m.maxPiece[0]),
      Math.min(m.travel[1] - 20, m.maxPiece[2]),
    ]);
    expect(slabMaxFor({ wireLength: 1000, travel: [1250, 650], maxPiece: [1200, 1000, 600] })).toEqual([
      1000, 1200, 600,
    ]);
  });
});
