import polygonClipping, { type MultiPolygon, type Polygon, type Ring } from "polygon-clipping";
import { describe, expect, it } from "vitest";
import type { Plan } from "@/lib/nesting";
import type { GcodeDialect, Machine } from "@/lib/planning/machine";
import { partGeometry, type Point, type Profile } from "@/lib/profiles";
import { type ProfileProgramInput, profileProgram } from "@/lib/profiles/program";
import { partSections, planSlabs, type Section } from "@/lib/profiles/slabs";
import { type Args, cmdOf, type Event, readBack } from "../support/gcode";
import { loopDistance } from "../support/plane";
import { profileCutter } from "../support/procedure-fixtures";

// Profile programs read back with an interpreter that is not ours (cncjs gcode-interpreter 3.0.0),
// and the wire's replayed path checked against the parts with a second, independent polygon
// library (polygon-clipping 0.15.7, not Clipper2, which made the path) and plain distance geometry.
//
// Meanings checked, with their sources (as in gcode-readback.test.ts):
// - NIST RS274/NGC interpreter, version 3 (Kramer, Proctor, Messina, NISTIR 6556, 2000): G20 inch /
//   G21 mm, G90 absolute, G0 rapid, G1 feed with F in units per minute, G4 dwell P seconds, M0 stop,
//   M2 end. U V (and A B) as further axis words of the same block.
// - DIN 66025 (from memory): G70 inch / G71 mm in place of G20 / G21.
// - The feed word on a 4-axis move: F governs the first tower's X Y when it moves (LinuxCNC's rule
//   for moves of XYZ with UVW, from memory, not checked); the check below is that the faster foam
//   face then moves at the grade's feed.
//
// The path's own rule (hand-worked geometry): the wire's centre runs half the kerf off the part, so
// the region it encloses is the part grown by r = kerf / 2 — the set of points within r of the part,
// which is the part united with a band of half-width r along each edge and a disc of radius r at
// each corner (the Minkowski sum of the part and a disc; built here with polygon-clipping).

// ---- plain geometry, written here ----
const dist = (a: Point, b: Point) => Math.hypot(a[0] - b[0], a[1] - b[1]);
function inRing(p: Point, ring: readonly Point[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i]!;
    const [xj, yj] = ring[j]!;
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}
/** Distance from a point to the solid part (outer loop less holes): 0 inside it. */
function toSolid(p: Point, s: Section): number {
  const inside = inRing(p, s.outer) && !s.holes.some((h) => inRing(p, h));
  if (inside) return 0;
  return Math.min(...[s.outer, ...s.holes].map((loop) => loopDistance(p, loop)));
}
const ringArea = (r: readonly Point[]) =>
  Math.abs(r.reduce((s, p, i) => s + p[0] * r[(i + 1) % r.length]![1] - r[(i + 1) % r.length]![0] * p[1], 0)) / 2;
const mpArea = (m: MultiPolygon) =>
  m.reduce(
    (s, poly) => s + ringArea(poly[0]! as Point[]) - poly.slice(1).reduce((h, r) => h + ringArea(r as Point[]), 0),
    0,
  );
const closed = (loop: readonly Point[]): Ring => [...loop, loop[0]!].map((p) => [p[0], p[1]]);

/** The part grown by r: the part, a band along every edge and a disc (a 48-gon, within 0.002 mm) at every corner. */
function grown(s: Section, r: number): MultiPolygon {
  const shapes: Polygon[] = [[closed(s.outer), ...s.holes.map(closed)]];
  for (const loop of [s.outer, ...s.holes])
    loop.forEach((a, i) => {
      const b = loop[(i + 1) % loop.length]!;
      const l = dist(a, b);
      const n: Point = [(-(b[1] - a[1]) / l) * r, ((b[0] - a[0]) / l) * r];
      shapes.push([
        closed([
          [a[0] + n[0], a[1] + n[1]],
          [b[0] + n[0], b[1] + n[1]],
          [b[0] - n[0], b[1] - n[1]],
          [a[0] - n[0], a[1] - n[1]],
        ]),
      ]);
      shapes.push([
        closed(
          Array.from(
            { length: 48 },
            (_, k): Point => [a[0] + r * Math.cos((k * Math.PI) / 24), a[1] + r * Math.sin((k * Math.PI) / 24)],
          ),
        ),
      ]);
    });
  // Coordinates on a 0.1 µm grid, and the union built in batches: polygon-clipping's sweep line is
  // sturdier with fewer, snapped shapes at a time.
  const snap = (g: Polygon[]): Polygon[] =>
    g.map((poly) => poly.map((ring) => ring.map(([x, y]) => [Math.round(x * 1e4) / 1e4, Math.round(y * 1e4) / 1e4])));
  let acc: MultiPolygon = [snap([shapes[0]!])[0]!];
  const rest = snap(shapes.slice(1));
  for (let i = 0; i < rest.length; i += 40)
    acc = polygonClipping.union(acc, polygonClipping.union(rest[i]!, ...rest.slice(i + 1, i + 40)));
  return acc;
}

/** The closed loops of a route that goes round, out along slits to holes and back: largest first. */
function loopsOf(points: readonly Point[]): Point[][] {
  const loops: Point[][] = [];
  const stack: Point[] = [];
  for (const p of points) {
    if (stack.length && dist(stack.at(-1)!, p) < 1e-6) continue;
    const j = stack.findIndex((q) => dist(q, p) < 1e-6);
    if (j < 0) {
      stack.push(p);
      continue;
    }
    // Back at a point already passed: what lies between is a loop (or a slit walked back: two points).
    const loop = stack.slice(j);
    if (loop.length >= 3) loops.push(loop);
    stack.length = j + 1;
  }
  return loops.sort((a, b) => ringArea(b) - ringArea(a));
}

// ---- the replay ----
interface Replayed {
  moves: { cmd: "G0" | "G1"; from: number[]; to: number[]; f?: number; part?: string }[];
  words: string[];
  events: Event[];
  lineNumbers: (number | undefined)[];
}

function replay(text: string, m: Machine): Replayed {
  const { events, lineNumbers } = readBack(text);
  const scale = m.dialect.inch ? 25.4 : 1;
  const letters = [...m.dialect.axes, ...(m.fourAxis && m.dialect.towerAxes ? m.dialect.towerAxes : [])];
  let pos = letters.map(() => 0);
  let part: string | undefined;
  const moves: Replayed["moves"] = [];
  for (const e of events) {
    if (e.kind === "comment") {
      const k = /^PART \d+: ([^.]+)\./.exec(e.text);
      if (k) part = k[1];
      continue;
    }
    if (e.cmd !== "G0" && e.cmd !== "G1") continue;
    const to = letters.map((l, i) => (e.args[l] !== undefined ? e.args[l]! * scale : pos[i]!));
    moves.push({
      cmd: e.cmd,
      from: pos,
      to,
      f: e.args.F !== undefined ? e.args.F * scale : undefined,
      part: e.cmd === "G1" ? part : undefined,
    });
    if (e.cmd === "G0") part = undefined;
    pos = to;
  }
  return {
    moves,
    words: events.filter((e) => e.kind === "word").map((e) => (e as { cmd: string }).cmd),
    events,
    lineNumbers,
  };
}

const TOL = 0.002; // printed to 3 decimals in mm, 4 in inch
const PATH_TOL = 0.05; // the tolerance for the path against the part grown by half the kerf

interface Case {
  name: string;
  machine: Machine;
  input: ProfileProgramInput;
}

function checkProgram({ machine: m, input }: Case) {
  const prog = profileProgram(input, m);
  const text = prog.gcode;
  const r = input.kerf / 2;
  const d = m.dialect;
  const four = !!m.fourAxis;
  const { moves, words, events, lineNumbers } = replay(text, m);

  // Words: the unit word first and only, absolute distances, heat around the cutting, M2 last.
  const unit = d.unitWords === "G20/G21" ? (d.inch ? "G20" : "G21") : d.inch ? "G70" : "G71";
  expect(words[0]).toBe(unit);
  expect(words.filter((w) => /^G(20|21|70|71)$/.test(w))).toEqual([unit]);
  expect(words[1]).toBe("G90");
  expect(words.at(-1)).toBe("M2");
  if (d.lineNumbers) expect(lineNumbers.filter((n) => n !== undefined).length).toBe(words.length);
  const idx = events.map((e, i) => [e, i] as const);
  const g1 = idx.filter(([e]) => e.kind === "word" && e.cmd === "G1").map(([, i]) => i);
  if (d.heatOn && d.heatOff) {
    const on = idx.find(([e]) => e.kind === "word" && e.cmd === cmdOf(d.heatOn!))![1];
    const off = idx.filter(([e]) => e.kind === "word" && e.cmd === cmdOf(d.heatOff!)).at(-1)![1];
    expect(on).toBeLessThan(g1[0]!);
    expect(off).toBeGreaterThan(g1.at(-1)!);
  } else {
    const stops = idx.filter(([e]) => e.kind === "word" && e.cmd === "M0").map(([, i]) => i);
    expect(stops).toHaveLength(2);
    expect(stops[0]).toBeLessThan(g1[0]!);
    expect(stops[1]).toBeGreaterThan(g1.at(-1)!);
  }
  const comments = events.filter((e) => e.kind === "comment").map((e) => (e as { text: string }).text);
  expect(comments.some((c) => /NEVER HOT-WIRE POLYURETHANE/.test(c))).toBe(true);
  expect(comments.some((c) => /VENTILATE/.test(c))).toBe(true);

  // No move leaves the travel, on any axis.
  for (const mv of moves)
    mv.to.forEach((v, i) => {
      expect(v).toBeGreaterThanOrEqual(-TOL);
      expect(v).toBeLessThanOrEqual(m.travel[i % 2]! + TOL);
    });

  // Where the program says the slab is (the set-up comments), and the two foam faces along the wire.
  const setUp = comments.find((c) => c.startsWith("PLACE: THE SLAB"))!;
  const left = Number(/LEFT FACE ([\d.]+) MM FROM/.exec(setUp)![1]);
  const low = Number(/(?:SPACERS|LOWER FACE) ([\d.]+) MM/.exec(setUp)![1]);
  const zRoot = four ? Number(/THE ROOT FACE ([\d.]+) MM FROM/.exec(comments.join("\n"))![1]) : 0;
  const zTip = zRoot + input.thickness;
  const L = m.wireLength;
  const at = (q: number[], z: number): Point =>
    four ? [q[0]! + ((q[2]! - q[0]!) * z) / L, q[1]! + ((q[3]! - q[1]!) * z) / L] : [q[0]!, q[1]!];
  const box = { min: [left, low], max: [left + input.size[0], low + input.size[1]] };
  const inBox = (p: Point, e = 0) =>
    p[0] > box.min[0]! + e && p[0] < box.max[0]! - e && p[1] > box.min[1]! + e && p[1] < box.max[1]! - e;
  const put = (s: Section): Section => ({
    outer: s.outer.map(([u, v]) => [left + u, low + v]),
    holes: s.holes.map((h) => h.map(([u, v]) => [left + u, low + v])),
  });

  // Rapids stay in the air round the slab, at both faces.
  for (const mv of moves.filter((x) => x.cmd === "G0"))
    for (const z of four ? [zRoot, zTip] : [0])
      for (let k = 0; k <= 20; k++) {
        const t = k / 20;
        const q = mv.from.map((v, i) => v + (mv.to[i]! - v) * t);
        expect(inBox(at(q, z), -TOL), `rapid through the slab at ${at(q, z)}`).toBe(false);
      }

  // Each part: lead-in from the slab face, the path r off the part at each face, lead-out the same way.
  const names = new Set(moves.filter((x) => x.part).map((x) => x.part!));
  expect([...names].sort()).toEqual(input.parts.map((p) => p.name.toUpperCase()).sort());
  for (const name of names) {
    const part = input.parts.find((p) => p.name.toUpperCase() === name)!;
    const feeds = moves.filter((x) => x.part === name);
    expect(feeds.every((x) => x.cmd === "G1")).toBe(true);
    const faces: [number, Section][] = four
      ? [
          [zRoot, put(part.root)],
          [zTip, put(part.tip)],
        ]
      : [[0, put(part.root)]];
    for (const [z, solid] of faces) {
      const pts = [feeds[0]!.from, ...feeds.map((x) => x.to)].map((q) => at(q, z));
      // The lead-in starts in the air outside the slab (on the ring 10 mm out), square to the face it crosses.
      const [start, entry] = [pts[0]!, pts[1]!];
      expect(inBox(start, -TOL)).toBe(false);
      const outside = Math.max(
        box.min[0]! - start[0],
        start[0] - box.max[0]!,
        box.min[1]! - start[1],
        start[1] - box.max[1]!,
      );
      expect(outside).toBeGreaterThan(10 - TOL - 1e-9);
      expect(Math.abs(start[0] - entry[0]) <= TOL || Math.abs(start[1] - entry[1]) <= TOL).toBe(true);
      expect(Math.abs(toSolid(entry, solid) - r)).toBeLessThanOrEqual(PATH_TOL);
      // Out the same way.
      expect(dist(pts.at(-1)!, start)).toBeLessThanOrEqual(TOL);
      expect(dist(pts.at(-2)!, entry)).toBeLessThanOrEqual(TOL);
      // Every point of the path, and the middle of every step but the slits (out and back), r off the part.
      const path = pts.slice(1, -1);
      const key = (a: Point, b: Point) => `${a[0].toFixed(2)},${a[1].toFixed(2)}>${b[0].toFixed(2)},${b[1].toFixed(2)}`;
      const steps = new Set(path.slice(1).map((p, i) => key(path[i]!, p)));
      for (const p of path) expect(Math.abs(toSolid(p, solid) - r), `path point ${p}`).toBeLessThanOrEqual(PATH_TOL);
      path.slice(1).forEach((p, i) => {
        const a = path[i]!;
        if (steps.has(key(p, a))) return; // a slit: cut out and back through the part
        const mid: Point = [(a[0] + p[0]) / 2, (a[1] + p[1]) / 2];
        expect(Math.abs(toSolid(mid, solid) - r), `path step ${a} → ${p}`).toBeLessThanOrEqual(PATH_TOL);
      });
      // The region the path encloses against the part grown by r (polygon-clipping): the same to
      // within 0.05 mm on average along the outline, and the wire never inside the part.
      const loops = loopsOf(path);
      expect(loops.length).toBe(1 + solid.holes.length);
      const region: Polygon = [closed(loops[0]!), ...loops.slice(1).map(closed)];
      const want = grown(solid, r);
      const perimeter = [solid.outer, ...solid.holes].reduce(
        (s, l) => s + l.reduce((t, p, i) => t + dist(p, l[(i + 1) % l.length]!), 0),
        0,
      );
      expect(mpArea(polygonClipping.xor([region], want)) / perimeter).toBeLessThanOrEqual(PATH_TOL);
      const cutIntoPart = polygonClipping.difference([[closed(solid.outer), ...solid.holes.map(closed)]], [region]);
      expect(mpArea(cutIntoPart)).toBeLessThanOrEqual(1e-3 * perimeter);
    }
    // Feeds: the faster foam face moves at the grade's feed.
    for (const mv of feeds) {
      const face = Math.max(...(four ? [zRoot, zTip] : [0]).map((z) => dist(at(mv.from, z), at(mv.to, z))));
      // Positions print to 0.001 mm: on steps under 1 mm that alone moves the ratio by over 0.1 %.
      if (face < 1) continue;
      const tower = four
        ? dist([mv.from[0]!, mv.from[1]!], [mv.to[0]!, mv.to[1]!]) ||
          dist([mv.from[2]!, mv.from[3]!], [mv.to[2]!, mv.to[3]!])
        : face;
      expect(Math.abs((mv.f! / tower) * face - input.feed)).toBeLessThanOrEqual(0.005 * input.feed);
    }
  }
  return prog;
}

// ---- invented machines and parts (no real model's figures) ----
const dialect = (over: Partial<GcodeDialect>): GcodeDialect => ({
  unitWords: "G20/G21",
  inch: false,
  heatOn: "M3",
  heatOff: "M5",
  axes: ["X", "Y"],
  lineNumbers: false,
  ...over,
});
const machine = (over: Partial<Machine>): Machine =>
  profileCutter({ travel: [1250, 650], maxPiece: [1200, 1000, 600], dialect: dialect({}), ...over });

const ring = (r: number, n: number, c: Point, phase = 0): Point[] =>
  Array.from({ length: n }, (_, i) => [
    c[0] + r * Math.cos(phase + (2 * Math.PI * i) / n),
    c[1] + r * Math.sin(phase + (2 * Math.PI * i) / n),
  ]);
const star = (ro: number, ri: number, n: number, c: Point): Point[] =>
  Array.from({ length: 2 * n }, (_, i) => {
    const rr = i % 2 ? ri : ro;
    const a = (Math.PI * i) / n;
    return [c[0] + rr * Math.cos(a), c[1] + rr * Math.sin(a)];
  });

// A sign letter with two counters (a "B"-like frame), an L bracket, and a comb whose 1 mm slots the
// 1.6 mm kerf cannot enter (bridged, with a warning).
const letterB: Profile = {
  kind: "polygon",
  points: [
    [0, 0],
    [90, 0],
    [110, 20],
    [110, 60],
    [95, 75],
    [110, 90],
    [110, 130],
    [90, 150],
    [0, 150],
  ],
  holes: [
    [
      [25, 20],
      [80, 20],
      [85, 30],
      [85, 55],
      [80, 62],
      [25, 62],
    ],
    [
      [25, 88],
      [80, 88],
      [85, 95],
      [85, 120],
      [80, 130],
      [25, 130],
    ],
  ],
  extrudeMm: 60,
};
const bracket: Profile = {
  kind: "polygon",
  points: [
    [0, 0],
    [120, 0],
    [120, 25],
    [25, 25],
    [25, 100],
    [0, 100],
  ],
  extrudeMm: 60,
};
const comb: Profile = {
  kind: "polygon",
  points: [
    [0, 0],
    [80, 0],
    [80, 60],
    [60.5, 60],
    [60.5, 30],
    [59.5, 30],
    [59.5, 60],
    [40.5, 60],
    [40.5, 30],
    [39.5, 30],
    [39.5, 60],
    [0, 60],
  ],
  extrudeMm: 60,
};

/** One slab of a small plan: the three parts side by side in one 60 mm layer of a block. */
function signSlab(): ProfileProgramInput {
  const parts = new Map([
    ["jp-1", { size: partGeometry(letterB).size, profile: letterB }],
    ["jp-2", { size: partGeometry(bracket).size, profile: bracket }],
    ["jp-3", { size: partGeometry(comb).size, profile: comb }],
  ]);
  const plan: Pick<Plan, "placements"> = {
    placements: [
      { part: "jp-1", block: "HF-9", origin: [6, 6, 6], size: [60, 110, 150] },
      { part: "jp-2", block: "HF-9", origin: [6, 117.6, 6], size: [60, 120, 100] },
      { part: "jp-3", block: "HF-9", origin: [6, 239.2, 6], size: [60, 80, 60] },
    ],
  };
  const [slab] = planSlabs(plan, parts);
  const names: Record<string, string> = { "jp-1": "Letter B", "jp-2": "Bracket", "jp-3": "Comb" };
  return {
    title: "plan 9, block HF-9, slab 1 of 1",
    size: slab!.size,
    thickness: slab!.along[1] - slab!.along[0],
    parts: slab!.parts.map((p) => ({ name: names[p.part]!, root: p.root, tip: p.tip, tapered: p.tapered })),
    kerf: 1.6,
    feed: 260,
    grade: "EPS-II",
  };
}

function one(
  profile: Profile,
  name: string,
  kerf: number,
  feed: number,
  extra: Partial<ProfileProgramInput> = {},
): ProfileProgramInput {
  const size = partGeometry(profile).size;
  return {
    title: `part ${name}`,
    size: [size[1], size[2]],
    thickness: size[0],
    parts: [{ name, ...partSections(profile) }],
    kerf,
    feed,
    ...extra,
  };
}

const CASES: Case[] = [
  {
    name: "a slab of three sign parts (two counters, an inside corner, slots the kerf cannot enter), RS274/NGC mm, M3/M5",
    machine: machine({}),
    input: signSlab(),
  },
  {
    name: "a star with a round hole on an upright wire, DIN 66025 inch, N words, heat by hand",
    machine: machine({
      wire: "vertical",
      dialect: dialect({ unitWords: "G70/G71", inch: true, heatOn: null, heatOff: null, lineNumbers: true }),
    }),
    input: one(
      { kind: "polygon", points: star(80, 55, 9, [80, 80]), holes: [ring(20, 90, [80, 80])], extrudeMm: 40 },
      "Star",
      1.4,
      240,
      {
        direction: "cw",
      },
    ),
  },
  {
    name: "a tapered, swept NACA 2412 wing panel on a 4-axis machine, X Y U V, DIN mm, M64 P0 / M65 P0",
    machine: machine({
      fourAxis: true,
      dialect: dialect({
        unitWords: "G70/G71",
        heatOn: "M64 P0",
        heatOff: "M65 P0",
        towerAxes: ["U", "V"],
        lineNumbers: true,
      }),
    }),
    input: one(
      { kind: "naca", code: "2412", chordMm: 250, tipChordMm: 160, spanMm: 600, sweepMm: 45 },
      "Wing panel",
      1.5,
      250,
    ),
  },
  {
    name: "a straight NACA 0012 panel and a plate with dwells on a 4-axis machine lettered X Y A B, RS274/NGC mm",
    machine: machine({ fourAxis: true, dialect: dialect({ towerAxes: ["A", "B"] }) }),
    input: one({ kind: "naca", code: "0012", chordMm: 300, spanMm: 700 }, "Stabiliser", 1.5, 280, {
      dwell: { angleDeg: 30, seconds: 0.8 },
      zRoot: 120,
    }),
  },
];

describe("profile programs read back with gcode-interpreter", () => {
  it.each(CASES)("$name", (c) => {
    const p = checkProgram(c);
    expect(p.feedMm).toBeGreaterThan(0);
  });

  it("the slots narrower than the kerf are named in the program, and the dwells are G4 P words", () => {
    const sign = profileProgram(CASES[0]!.input, CASES[0]!.machine);
    expect(
      sign.warnings.filter((w) =>
        /^Comb: A notch near \(\d+(\.\d)?, \d+(\.\d)?\) mm is narrower than the kerf \(1\.6 mm\)/.test(w),
      ),
    ).toHaveLength(2);
    expect(sign.gcode).toMatch(/^\(NOTE: COMB: A NOTCH NEAR/m);
    const { events } = readBack(profileProgram(CASES[3]!.input, CASES[3]!.machine).gcode);
    const dwells = events.filter((e) => e.kind === "word" && e.cmd === "G4").map((e) => (e as { args: Args }).args.P);
    // The heat-up dwell, then one at the trailing edge's two corners (NACA 0012's open trailing edge closed by a short edge).
    expect(dwells[0]).toBe(10);
    expect(dwells.slice(1).length).toBeGreaterThanOrEqual(1);
    expect(dwells.slice(1).every((s) => s === 0.8)).toBe(true);
  });
});
