import fc from "fast-check";
import { randomPlan } from "../../support/procedure-fixtures";
import { describe, expect, it } from "vitest";
import type { Box } from "@/lib/nesting/geometry";
import { ENTRY_CLEARANCE, type Machine } from "@/lib/planning/machine";
import { procedure, type OkProcedure, type Procedure, type ProcedureInput, type Step } from "@/lib/planning/procedure";
import { cutSegments, cutTime, program, wirePath, type WirePath } from "@/lib/planning/wire-path";

// Invented machines for the tests (no real model's figures).
const machine = (over: Partial<Machine> = {}): Machine => ({
  name: "Test cutter",
  kind: "block",
  wire: "horizontal",
  wireLength: 600,
  travel: [1100, 400],
  maxPiece: [1100, 600, 400],
  turntable: false,
  rapid: 3000,
  heatUpS: 30,
  handlingS: 120,
  dialect: { unitWords: "G20/G21", inch: false, heatOn: "M3", heatOff: "M5", axes: ["X", "Y"], lineNumbers: false },
  ...over,
});
const ok = (p: Procedure): OkProcedure => {
  if (!p.ok) throw new Error(JSON.stringify(p.problems));
  return p;
};
const two = (a: Box, b: Box): ProcedureInput["pieces"] => [
  { kind: "part", part: "P1", ...a },
  { kind: "part", part: "P2", ...b },
];
const c = ENTRY_CLEARANCE;

describe("wire path and cut time, worked by hand", () => {
  // Block 1000 × 500 × 300, kerf 2, one cut across the height at z = 150 (P1 below, P2 above).
  // Wire 600: only the 500 mm width fits along it; travel 1100 × 400 takes the length along X
  // (1000 + 2·10 = 1020) and the height up (300 + 10 = 310).
  const input: ProcedureInput = {
    blockCode: "HF-2001",
    size: [1000, 500, 300],
    trim: 0,
    kerf: 2,
    machine: machine(),
    pieces: two({ origin: [0, 0, 0], size: [1000, 500, 150] }, { origin: [0, 0, 152], size: [1000, 500, 148] }),
  };

  it("cuts the slab in one pass from the zero end and counts the time", () => {
    const p = ok(procedure(input));
    expect(p.steps).toHaveLength(1);
    const step = p.steps[0]!;
    expect(step.orient).toEqual({ x: "x", w: "y", y: "z" });
    // Wire centre at 150 + 2/2 = 151 mm above the table; the cut runs from X = 0 to 1000 + 2·10 = 1020.
    expect(cutSegments(step, input.machine, 2)).toEqual([{ cut: 1, a: [0, 151], b: [1020, 151] }]);
    const path = wirePath(step, input.machine, 2, 200);
    // Start (0, 310) = (0, 300 + 10); down the zero end to the cut, across, then up and back over the top.
    expect(path.moves).toEqual([
      { kind: "rapid", to: [0, 151] },
      { kind: "feed", to: [1020, 151], cut: 1 },
      { kind: "rapid", to: [1020, 310] },
      { kind: "rapid", to: [0, 310] },
    ]);
    // Feed: 1020 mm. Rapid: 310 − 151 = 159 down, then 159 up and 1020 back = 1338 mm.
    expect(path.feedMm).toBe(1020);
    expect(path.rapidMm).toBe(1338);
    // At 200 mm/min feed: 1020 / 200 = 5.1 min; rapids 1338 / 3000 = 0.446 min;
    // heat-up 30 s = 0.5 min; handling 120 s = 2 min for the one placement. Total 8.046 min.
    const t = cutTime(p, input.machine, 200, 2);
    expect(t.feedMin).toBeCloseTo(5.1, 9);
    expect(t.rapidMin).toBeCloseTo(0.446, 9);
    expect(t.heatMin).toBeCloseTo(0.5, 9);
    expect(t.handlingMin).toBeCloseTo(2, 9);
    expect(t.totalMin).toBeCloseTo(8.046, 9);
    expect([t.placements, t.turns]).toEqual([1, 0]);
  });

  it("comes back up its own kerf from a vertical cut that ends on the table", () => {
    // Cut across the length at x = 500 (kerf 500..502): wire centre at X = 10 + 501 = 511,
    // from the air above (Y = 310) down to the table (Y = 0), a dead end.
    const inp = {
      ...input,
      pieces: two({ origin: [0, 0, 0], size: [500, 500, 300] }, { origin: [502, 0, 0], size: [498, 500, 300] }),
    };
    const step = ok(procedure(inp)).steps[0]!;
    const path = wirePath(step, inp.machine, 2, 200);
    expect(path.moves).toEqual([
      { kind: "rapid", to: [511, 310] },
      { kind: "feed", to: [511, 0], cut: 1 },
      { kind: "feed", to: [511, 310] },
      { kind: "rapid", to: [0, 310] },
    ]);
    expect([path.feedMm, path.rapidMm]).toEqual([620, 1022]);
  });

  it("goes round under the piece on a vertical wire", () => {
    // Vertical wire 400 mm: the 300 mm height stands along it; the piece lies at X 10..1010, Y 10..510.
    const m = machine({ wire: "vertical", wireLength: 400, travel: [1100, 600] });
    const inp = {
      ...input,
      machine: m,
      pieces: two({ origin: [0, 0, 0], size: [500, 500, 300] }, { origin: [502, 0, 0], size: [498, 500, 300] }),
    };
    const step = ok(procedure(inp)).steps[0]!;
    expect(step.orient.w).toBe("z");
    const path = wirePath(step, m, 2, 200);
    expect(path.start).toEqual([0, 520]);
    // Across the top to X = 511, down through the piece to Y = 0, back round the bottom-left corner.
    expect(path.moves).toEqual([
      { kind: "rapid", to: [511, 520] },
      { kind: "feed", to: [511, 0], cut: 1 },
      { kind: "rapid", to: [0, 0] },
      { kind: "rapid", to: [0, 520] },
    ]);
  });

  it("counts half the handling for a turn and a heat-up for every step", () => {
    // The slab of the procedure tests: 1 place, 1 turn, 1 place.
    const pieces: ProcedureInput["pieces"] = [];
    for (const [x0, lx] of [
      [0, 499],
      [500, 500],
    ])
      for (const [y0, ly] of [
        [0, 199],
        [200, 199],
        [400, 200],
      ])
        pieces.push({ kind: "part", part: `P${pieces.length}`, origin: [x0!, y0!, 0], size: [lx!, ly!, 50] });
    const m = machine({ wireLength: 1300, travel: [1200, 400], maxPiece: [1200, 1300, 400], turntable: true });
    const p = ok(procedure({ blockCode: "S", size: [1000, 600, 50], trim: 0, kerf: 1, pieces, machine: m }));
    expect(p.steps.map((s) => s.kind)).toEqual(["place", "turn", "place"]);
    const t = cutTime(p, m, 250, 1);
    expect(t.heatMin).toBeCloseTo((3 * 30) / 60, 9);
    expect(t.handlingMin).toBeCloseTo((2.5 * 120) / 60, 9);
    const paths = p.steps.map((s) => wirePath(s, m, 1, 250));
    expect(t.feedMm).toBeCloseTo(
      paths.reduce((s, q) => s + q.feedMm, 0),
      9,
    );
  });
});

/** Checks a path against the step's cuts, worked out here from the block-frame cuts (not from cutSegments). */
function checkPath(step: Step, path: WirePath, m: Machine, kerf: number) {
  const h = m.wire === "horizontal";
  const y0 = h ? 0 : c;
  const AX = { x: 0, y: 1, z: 2 } as const;
  const ax = AX[step.orient.x];
  const ay = AX[step.orient.y];
  const box = { min: [c, y0], max: [c + step.placed[0], y0 + step.placed[2]] };
  // Under a horizontal wire the piece stands on the table: nothing passes beneath it.
  const solid = { min: [c, h ? -Infinity : y0], max: box.max };
  const local = (axis: number, v: number) => (axis === ax ? v - step.origin[ax]! + c : v - step.origin[ay]! + y0);
  const strips = step.cuts.map((cut) => {
    const mAx = cut.machineAxis === "X" ? 0 : 1;
    const o = 1 - mAx;
    const across = o === 0 ? ax : ay;
    const lo = local(across, cut.region.origin[across]!);
    const hi = local(across, cut.region.origin[across]! + cut.region.size[across]!);
    return {
      n: cut.n,
      m: mAx,
      p: local(AX[cut.axis], cut.at) + kerf / 2,
      lo: Math.abs(lo - box.min[o]!) < 1e-9 ? (o === 1 && h ? 0 : lo - c) : lo - kerf / 2,
      hi: Math.abs(hi - box.max[o]!) < 1e-9 ? hi + c : hi + kerf / 2,
    };
  });
  const top = box.max[1]! + c;
  expect(path.start).toEqual([0, top]);
  const made = new Set<number>();
  const seen: number[] = [];
  let at = path.start;
  let feedMm = 0;
  let rapidMm = 0;
  for (const mv of path.moves) {
    const [x, y] = mv.to;
    expect(x).toBeGreaterThanOrEqual(-1e-9);
    expect(y).toBeGreaterThanOrEqual(-1e-9);
    expect(x).toBeLessThanOrEqual(m.travel[0] + 1e-9);
    expect(y).toBeLessThanOrEqual(m.travel[1] + 1e-9);
    const fixed =
      at[0] === x
        ? 0
        : at[1] === y
          ? 1
          : (() => {
              throw new Error(`not along an axis: ${JSON.stringify([at, mv])}`);
            })();
    const w = 1 - fixed;
    const q = mv.to[fixed]!;
    const [a, b] = [Math.min(at[w]!, mv.to[w]!), Math.max(at[w]!, mv.to[w]!)];
    const len = b - a;
    const inside = q > solid.min[fixed]! + 1e-9 && q < solid.max[fixed]! - 1e-9;
    if (mv.kind === "rapid") {
      rapidMm += len;
      // Never across the piece.
      if (inside) expect(b <= solid.min[w]! + 1e-9 || a >= solid.max[w]! - 1e-9, JSON.stringify(mv)).toBe(true);
    } else if (mv.cut !== undefined) {
      feedMm += len;
      const s = strips.find((t) => t.n === mv.cut)!;
      expect(s.m).toBe(fixed);
      expect(q).toBeCloseTo(s.p, 9);
      expect(a).toBeCloseTo(s.lo, 9);
      expect(b).toBeCloseTo(s.hi, 9);
      made.add(s.n);
      seen.push(s.n);
    } else {
      feedMm += len;
      // Only in kerfs already cut, or outside the piece.
      const cover: [number, number][] = [];
      for (const s of strips.filter((t) => made.has(t.n))) {
        if (s.m === fixed && Math.abs(q - s.p) <= kerf / 2 + 1e-9) cover.push([s.lo, s.hi]);
        if (s.m === w && q >= s.lo - 1e-9 && q <= s.hi + 1e-9) cover.push([s.p - kerf / 2, s.p + kerf / 2]);
      }
      if (inside) cover.push([-Infinity, solid.min[w]!], [solid.max[w]!, Infinity]);
      else cover.push([-Infinity, Infinity]);
      cover.sort((u, v) => u[0] - v[0]);
      let reach = a;
      for (const [u, v] of cover) if (u <= reach + 1e-9) reach = Math.max(reach, v);
      expect(reach, `feed move through uncut foam: ${JSON.stringify([at, mv])}`).toBeGreaterThanOrEqual(b - 1e-9);
    }
    at = mv.to;
  }
  expect(at).toEqual(path.start);
  // Every cut once, in wire order.
  expect(seen).toEqual(step.cuts.map((x) => x.n));
  expect(path.feedMm).toBeCloseTo(feedMm, 6);
  expect(path.rapidMm).toBeCloseTo(rapidMm, 6);
}

describe("wire path properties on random plans", () => {
  it("cuts every kerf once, feeds only in kerfs or air, never rapids across the piece, stays in travel", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 2 ** 30 }),
        fc.constantFrom<Machine["wire"]>("horizontal", "vertical"),
        fc.boolean(),
        fc.integer({ min: 100, max: 3500 }),
        fc.integer({ min: 100, max: 3500 }),
        fc.integer({ min: 100, max: 2500 }),
        (seed, wire, turntable, wireLength, tx, ty) => {
          // A random machine; when it cannot make the plan, a large one.
          const plan = randomPlan(seed, { offcuts: false });
          const tight = machine({ wire, turntable, wireLength, travel: [tx, ty], maxPiece: [1e4, 1e4, 1e4] });
          const tried = procedure({ ...plan, machine: tight });
          const m = tried.ok
            ? tight
            : machine({ wire, turntable, wireLength: 1e4, travel: [1e4, 1e4], maxPiece: [1e4, 1e4, 1e4] });
          const p = tried.ok ? tried : ok(procedure({ ...plan, machine: m }));
          let feedMm = 0;
          for (const step of p.steps) {
            const path = wirePath(step, m, plan.kerf, 300);
            checkPath(step, path, m, plan.kerf);
            feedMm += path.feedMm;
          }
          const t = cutTime(p, m, 300, plan.kerf);
          expect(t.feedMm).toBeCloseTo(feedMm, 6);
          expect(t.totalMin).toBeCloseTo(t.feedMin + t.rapidMin + t.heatMin + t.handlingMin, 9);
        },
      ),
      { seed: 4242, numRuns: 60 },
    );
  });

  it("programs name the block, step and piece and keep the cautions", () => {
    const plan = randomPlan(11, { offcuts: false });
    const m = machine({ wireLength: 1e4, travel: [1e4, 1e4], maxPiece: [1e4, 1e4, 1e4] });
    const p = ok(procedure({ ...plan, machine: m }));
    for (const step of p.steps) {
      const text = program(step, wirePath(step, m, plan.kerf, 300), m, {
        blockCode: plan.blockCode,
        kerf: plan.kerf,
        feed: 300,
        grade: "EPS-22",
        steps: p.steps.length,
      });
      expect(text).toContain(`BLOCK ${plan.blockCode}, STEP ${step.n} OF ${p.steps.length}, PIECE ${step.piece})`);
      expect(text).toContain("GRADE EPS-22");
      expect(text).toContain("(CAUTION: STRAIGHT CUTS ONLY. DRY-RUN WITH THE WIRE COLD BEFORE CUTTING.)");
      expect(text).toContain("NEVER LEAVE A HOT WIRE UNATTENDED");
      expect(text).toContain("NEVER HOT-WIRE POLYURETHANE, PVC OR PIR FOAMS");
      expect(text.trim().split("\n").at(-1)).toBe("M2");
      expect(text.match(/^\(CUT \d+:/gm)).toHaveLength(step.cuts.length);
    }
  });
});
