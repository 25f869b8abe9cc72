import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { type Args, cmdOf, type Event, readBack } from "../support/gcode";
import { machine as blockCutter, randomPlan } from "../support/procedure-fixtures";
import type { Vec3 } from "@/lib/nesting";
import { ENTRY_CLEARANCE, type GcodeDialect, type Machine } from "@/lib/planning/machine";
import { procedure, type OkProcedure, type ProcedureInput, type Step } from "@/lib/planning/procedure";
import { program, wirePath } from "@/lib/planning/wire-path";

// Programs are read back with an interpreter that is not ours (cncjs gcode-interpreter 3.0.0) and
// the wire's moves are checked against the procedure's cuts.
//
// Meanings checked, with their sources:
// - NIST RS274/NGC interpreter, version 3 (Kramer, Proctor, Messina, NISTIR 6556, 2000): G20 inch
//   and G21 millimetre units, G90 absolute distances, G0 rapid and G1 linear feed (F the feed rate
//   in units per minute), G4 dwell with P in seconds, M0 program stop, M2 program end. M3 / M5 are
//   spindle on / off there; a hot-wire controller switches the wire heat with them (the machine's
//   dialect names its own codes).
// - DIN 66025 (from memory): G70 inch and G71 metric dimensions in place of G20 / G21; the rest of
//   the words used here (G0, G1, G4, G90, M0, M2) as above. The dwell's address (P) is as in
//   RS274/NGC; a DIN controller may want another (from memory, not checked).

const notAligned = (what: string): never => {
  throw new Error(`${what} not along an axis`);
};

const TOL = 2e-3; // printed to 3 decimals in mm, 4 in inch (0.00005 in = 0.00127 mm)

/** Reads a program back and checks it against the step; returns the wire positions visited (mm). */
function checkProgram(text: string, step: Step, m: Machine, kerf: number, feed: number) {
  const d = m.dialect;
  const { events, lineNumbers } = readBack(text);
  const words = events.filter((e): e is Extract<Event, { kind: "word" }> => e.kind === "word");
  const unit = d.unitWords === "G20/G21" ? (d.inch ? "G20" : "G21") : d.inch ? "G70" : "G71";
  const scale = d.inch ? 25.4 : 1;
  // The dialect's unit word first, no other unit word, G90 before any move, M2 last.
  expect(words[0]!.cmd).toBe(unit);
  expect(words.filter((w) => /^G(20|21|70|71)$/.test(w.cmd)).map((w) => w.cmd)).toEqual([unit]);
  expect(words[1]!.cmd).toBe("G90");
  expect(words.at(-1)!.cmd).toBe("M2");
  if (d.lineNumbers) {
    const ns = lineNumbers.filter((n): n is number => n !== undefined);
    expect(ns.length).toBe(words.length);
    ns.forEach((n, i) => i > 0 && expect(n).toBeGreaterThan(ns[i - 1]!));
  } else expect(lineNumbers.every((n) => n === undefined)).toBe(true);

  // Heat on (and a dwell of the heat-up time) before the first feed, off after the last.
  const idx = (pred: (e: Event) => boolean) => events.findIndex(pred);
  const feeds = events.map((e, i) => (e.kind === "word" && e.cmd === "G1" ? i : -1)).filter((i) => i >= 0);
  const firstFeed = feeds[0]!;
  const lastFeed = feeds.at(-1)!;
  if (d.heatOn && d.heatOff) {
    const on = idx((e) => e.kind === "word" && e.cmd === cmdOf(d.heatOn!));
    const off = events.findLastIndex((e) => e.kind === "word" && e.cmd === cmdOf(d.heatOff!));
    expect(on).toBeGreaterThanOrEqual(0);
    expect(on).toBeLessThan(firstFeed);
    const dwell = idx((e) => e.kind === "word" && e.cmd === "G4");
    expect(dwell).toBeGreaterThan(on);
    expect(dwell).toBeLessThan(firstFeed);
    expect((events[dwell] as { args: Args }).args.P).toBe(m.heatUpS);
    expect(off).toBeGreaterThan(lastFeed);
  } else {
    const stops = events.map((e, i) => (e.kind === "word" && e.cmd === "M0" ? i : -1)).filter((i) => i >= 0);
    expect(stops.length).toBe(2);
    expect(stops[0]!).toBeLessThan(firstFeed);
    expect(stops[1]!).toBeGreaterThan(lastFeed);
    expect((events[stops[0]! - 1] as { text: string }).text).toMatch(/HEAT ON/);
    expect((events[stops[1]! - 1] as { text: string }).text).toMatch(/HEAT OFF/);
  }

  // The moves, against the kerfs of this placement's cuts (worked out here from the block frame).
  const c = ENTRY_CLEARANCE;
  const h = m.wire === "horizontal";
  const y0 = h ? 0 : c;
  const AX = { x: 0, y: 1, z: 2 } as const;
  const [ax, ay] = [AX[step.orient.x], AX[step.orient.y]];
  const box = { min: [c, y0], max: [c + step.placed[0], y0 + step.placed[2]] };
  const solid = { min: [c, h ? -Infinity : y0], max: box.max }; // nothing passes under a piece on the table
  const local = (axis: number, v: number) => (axis === ax ? v - step.origin[ax]! + c : v - step.origin[ay]! + y0);
  const strips = new Map(
    step.cuts.map((cut) => {
      const mAx = cut.machineAxis === "X" ? 0 : 1;
      const o = 1 - mAx;
      const across = o === 0 ? ax : ay;
      const lo = local(across, cut.region.origin[across]!);
      const hi = local(across, cut.region.origin[across]! + cut.region.size[across]!);
      return [
        cut.n,
        {
          m: mAx,
          p: local(AX[cut.axis], cut.at) + kerf / 2,
          lo: Math.abs(lo - box.min[o]!) < 1e-9 ? (o === 1 && h ? 0 : lo - c) : lo - kerf / 2,
          hi: Math.abs(hi - box.max[o]!) < 1e-9 ? hi + c : hi + kerf / 2,
        },
      ] as const;
    }),
  );
  const [X, Y] = d.axes.map((a) => a.toUpperCase()) as [string, string];
  let pos: [number, number] = [0, 0]; // the wire starts at machine zero
  let current: number | undefined;
  const made = new Set<number>();
  const cutsSeen: number[] = [];
  for (const e of events) {
    if (e.kind === "comment") {
      const k = /^CUT (\d+):/.exec(e.text);
      if (k) current = Number(k[1]);
      continue;
    }
    if (e.cmd !== "G0" && e.cmd !== "G1") continue;
    const to: [number, number] = [
      e.args[X] !== undefined ? e.args[X]! * scale : pos[0],
      e.args[Y] !== undefined ? e.args[Y]! * scale : pos[1],
    ];
    // Within the travel, never below the table.
    expect(to[0]).toBeGreaterThanOrEqual(-TOL);
    expect(to[1]).toBeGreaterThanOrEqual(-TOL);
    expect(to[0]).toBeLessThanOrEqual(m.travel[0] + TOL);
    expect(to[1]).toBeLessThanOrEqual(m.travel[1] + TOL);
    const fixed = Math.abs(pos[0] - to[0]) <= TOL ? 0 : Math.abs(pos[1] - to[1]) <= TOL ? 1 : notAligned(e.cmd);
    const w = 1 - fixed;
    const q = to[fixed]!;
    const [a, b] = [Math.min(pos[w]!, to[w]!), Math.max(pos[w]!, to[w]!)];
    const inside = q > solid.min[fixed]! + TOL && q < solid.max[fixed]! - TOL;
    if (e.cmd === "G0") {
      // A rapid never crosses the piece.
      if (inside) expect(b <= solid.min[w]! + TOL || a >= solid.max[w]! - TOL, `rapid across the piece`).toBe(true);
    } else {
      expect(e.args.F! * scale).toBeCloseTo(feed, 1);
      if (current !== undefined) {
        // The cut itself: along its kerf's centre line, across its region to the next kerf, air or table.
        const s = strips.get(current)!;
        expect(s.m).toBe(fixed);
        expect(Math.abs(q - s.p)).toBeLessThanOrEqual(TOL);
        expect(Math.abs(a - s.lo)).toBeLessThanOrEqual(TOL);
        expect(Math.abs(b - s.hi)).toBeLessThanOrEqual(TOL);
        made.add(current);
        cutsSeen.push(current);
        current = undefined;
      } else {
        // Any other feed move: inside kerfs already cut, or outside the piece.
        const cover: [number, number][] = [];
        for (const [n, s] of strips) {
          if (!made.has(n)) continue;
          if (s.m === fixed && Math.abs(q - s.p) <= kerf / 2 + TOL) cover.push([s.lo, s.hi]);
          if (s.m === w && q >= s.lo - TOL && q <= s.hi + TOL) cover.push([s.p - kerf / 2, s.p + kerf / 2]);
        }
        if (inside) cover.push([-Infinity, solid.min[w]!], [solid.max[w]!, Infinity]);
        else cover.push([-Infinity, Infinity]);
        cover.sort((u, v) => u[0] - v[0]);
        let reach = a;
        for (const [u, v] of cover) if (u <= reach + TOL) reach = Math.max(reach, v);
        expect(reach, `feed through uncut foam to ${to}`).toBeGreaterThanOrEqual(b - TOL);
      }
    }
    pos = to;
  }
  expect(cutsSeen).toEqual(step.cuts.map((x) => x.n));
  return { events };
}

// Invented machines and dialects (no real model's figures).
const dialects: Record<string, GcodeDialect> = {
  "RS274/NGC mm": {
    unitWords: "G20/G21",
    inch: false,
    heatOn: "M3",
    heatOff: "M5",
    axes: ["X", "Y"],
    lineNumbers: false,
  },
  "RS274/NGC inch, N words": {
    unitWords: "G20/G21",
    inch: true,
    heatOn: "M3",
    heatOff: "M5",
    axes: ["X", "Y"],
    lineNumbers: true,
  },
  "DIN 66025 mm, U/V axes, heat by hand": {
    unitWords: "G70/G71",
    inch: false,
    heatOn: null,
    heatOff: null,
    axes: ["U", "V"],
    lineNumbers: true,
  },
  "DIN 66025 inch": {
    unitWords: "G70/G71",
    inch: true,
    heatOn: "M03",
    heatOff: "M05",
    axes: ["X", "Y"],
    lineNumbers: false,
  },
};

/** The tests' invented block cutter, with a turntable and the RS274/NGC millimetre dialect. */
const machine = (over: Partial<Machine> = {}): Machine =>
  blockCutter({ turntable: true, heatUpS: 25, dialect: dialects["RS274/NGC mm"]!, ...over });

function programs(p: OkProcedure, m: Machine, feed: number) {
  return p.steps.map((step) => ({
    step,
    text: program(step, wirePath(step, m, p.kerf, feed), m, { blockCode: p.block, kerf: p.kerf, feed }),
  }));
}

const slabs: Omit<ProcedureInput, "machine"> = {
  blockCode: "HF-1001",
  size: [2440, 1220, 610],
  trim: 0,
  kerf: 0.5,
  pieces: Array.from({ length: 12 }, (_, i) => ({
    kind: "part" as const,
    part: `S${i + 1}`,
    origin: [5, 0, 2 + 50.5 * i] as Vec3,
    size: [2430, 1220, 50] as Vec3,
  })),
};
// Halves of a slab cut into rows across the width: place, turn, place (see procedure.test.ts).
const blanks: Omit<ProcedureInput, "machine"> = {
  blockCode: "OC-7",
  size: [1000, 600, 50],
  trim: 0,
  kerf: 1,
  pieces: [0, 500].flatMap((x0) =>
    [0, 200, 400].map((y0) => ({
      kind: "part" as const,
      part: `P${x0}-${y0}`,
      origin: [x0, y0, 0] as Vec3,
      size: [x0 === 0 ? 499 : 500, y0 === 400 ? 200 : 199, 50] as Vec3,
    })),
  ),
};

describe("G-code programs read back with gcode-interpreter", () => {
  for (const [name, dialect] of Object.entries(dialects)) {
    it(`slabs and turned blanks, ${name}`, () => {
      const m1 = machine({ dialect });
      const p1 = procedure({ ...slabs, machine: m1 });
      const m2 = machine({ dialect, travel: [1200, 400], maxPiece: [1200, 1300, 400] });
      const p2 = procedure({ ...blanks, machine: m2 });
      if (!p1.ok || !p2.ok) throw new Error("expected both procedures to be ok");
      expect(p2.steps.map((s) => s.kind)).toEqual(["place", "turn", "place"]);
      for (const [p, m] of [
        [p1, m1],
        [p2, m2],
      ] as const)
        for (const { step, text } of programs(p, m, 280)) {
          checkProgram(text, step, m, p.kerf, 280);
          expect(text).toContain(`STEP ${step.n}, PIECE ${step.piece})`);
          expect(text).toContain("(CAUTION: STRAIGHT CUTS ONLY. DRY-RUN WITH THE WIRE COLD BEFORE CUTTING.)");
        }
    });
  }

  it("a check that can fail: a rapid across the piece is caught", () => {
    const m = machine();
    const p = procedure({ ...slabs, machine: m });
    if (!p.ok) throw new Error("expected ok");
    const { step, text } = programs(p, m, 280)[0]!;
    // Jump straight from the start to the far end at mid-height, through the block.
    const bad = text.replace("G0 X0 Y620\n", "G0 X0 Y620\nG0 X0 Y300\nG0 X2460 Y300\nG0 X0 Y300\nG0 X0 Y620\n");
    expect(() => checkProgram(bad, step, m, p.kerf, 280)).toThrow(/rapid across the piece/);
  });

  it("random guillotine plans, machines and dialects", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 2 ** 30 }),
        fc.constantFrom(...Object.values(dialects)),
        fc.constantFrom<Machine["wire"]>("horizontal", "vertical"),
        (seed, dialect, wire) => {
          const { size, trim, kerf, pieces } = randomPlan(seed, {
            maxSize: [2000, 1200, 800],
            maxLeaves: 25,
            offcuts: false,
          });
          const m = machine({ dialect, wire, wireLength: 3000, travel: [2100, 2100], maxPiece: [3000, 3000, 3000] });
          const p = procedure({ blockCode: `R-${seed}`, size, trim, kerf, pieces, machine: m });
          if (!p.ok) throw new Error(JSON.stringify(p.problems));
          for (const { step, text } of programs(p, m, 320)) checkProgram(text, step, m, kerf, 320);
        },
      ),
      { seed: 1204, numRuns: 25 },
    );
  });
});
