/**
 * What the drawing, SVG and text importers share: flattening curves to a chord tolerance, chaining
 * open pieces into loops within a join tolerance, finding crossings, nesting loops into outer loops
 * and holes by containment, and the last checks before a profile is offered. Pure: no I/O.
 *
 * Rules (the same for every importer):
 * - curves become straight chords that stay within CHORD_TOLERANCE_MM (0.05 mm) of the true curve;
 * - two ends closer than JOIN_TOLERANCE_MM (0.05 mm) are the same point;
 * - coordinates are rounded to 0.001 mm;
 * - a loop inside an even number of other loops is an outer loop (a part of its own); inside an odd
 *   number, a hole of the smallest loop around it (so an island inside a hole is a part again);
 * - outer loops run anticlockwise, holes clockwise (y up); each profile is moved so its box starts at 0, 0.
 */
import { checkOutline, outlineArea, pointInPolygon, polygonArea, polygonBounds, type Point } from "./polygon";

/** Largest distance between a flattened chord and the true curve, mm. */
export const CHORD_TOLERANCE_MM = 0.05;
/** Ends closer than this are joined into one point when pieces are chained into loops, mm. */
export const JOIN_TOLERANCE_MM = 0.05;
/** What one part takes (the part schema's limits). */
export const MAX_LOOP_POINTS = 2_000;
export const MAX_HOLES = 200;
export const MAX_PROFILES = 200;
export const MAX_PROFILE_MM = 30_000;
/** The smallest area a loop may enclose, mm² (a 0.1 mm square): less is "no area". */
export const MIN_LOOP_AREA_MM2 = 0.01;

export type DrawingUnit = "mm" | "cm" | "m" | "in" | "ft";
export const DRAWING_UNITS: readonly DrawingUnit[] = ["mm", "cm", "m", "in", "ft"];
/** Millimetres per drawing unit; inch and foot exact by the 1959 international yard and pound agreement. */
export const MM_PER_UNIT: Record<DrawingUnit, number> = { mm: 1, cm: 10, m: 1000, in: 25.4, ft: 304.8 };
export const UNIT_NAMES: Record<DrawingUnit, string> = {
  mm: "millimetres",
  cm: "centimetres",
  m: "metres",
  in: "inches",
  ft: "feet",
};

export function isDrawingUnit(v: unknown): v is DrawingUnit {
  return typeof v === "string" && (DRAWING_UNITS as readonly string[]).includes(v);
}

/** One profile found in a drawing or made from text, ready to become a polygon part. */
export interface ImportedProfile {
  /** A name for people: "logo.svg, shape 2", "Letter O". */
  name: string;
  /** Outer loop, mm, anticlockwise, its box starting at 0, 0. */
  points: Point[];
  /** Holes, mm, clockwise. */
  holes: Point[][];
  /** Where it came from (stored with the part, at most 200 characters). */
  source: string;
  /** Width and height of its box, mm. */
  boxMm: [number, number];
  /** Outer area less the holes, mm². */
  areaMm2: number;
  /** Where the box's lower-left corner sat in the drawing, mm (before it was moved to 0, 0). */
  originMm: Point;
}

/** Something wrong with the input, naming what it came from. */
export interface ImportProblem {
  message: string;
  /** The entity, element or letter: "LINE (handle 1F)", "path 3 (id “logo”)". */
  subject?: string;
  /** Where in the drawing, mm. */
  at?: Point;
  /** The form field it belongs to, when it is not the file itself. */
  field?: "unit" | "text" | "font" | "svgPath" | "file";
}

/** How a drawing's numbers became millimetres. */
export interface UnitUsed {
  /** "mm", "in", "px"… */
  name: string;
  mmPerUnit: number;
  /** Read from the file, given by the person, or a stated default (SVG px at 96 to the inch). */
  from: "file" | "given" | "default";
}

export type ImportResult =
  | { ok: true; profiles: ImportedProfile[]; unit: UnitUsed; notes: string[] }
  | { ok: false; needsUnit: boolean; errors: ImportProblem[]; notes: string[] };

export const fail = (errors: ImportProblem[], notes: string[] = [], needsUnit = false): ImportResult => ({
  ok: false,
  needsUnit,
  errors,
  notes,
});

// ---------------------------------------------------------------------------------------------
// Flattening

/**
 * Chords for a circular arc of radius r sweeping `sweep` radians so that no chord's sagitta
 * r·(1 − cos(θ/2)) exceeds `tol` (plane geometry). At least one.
 *
 *   arcSegments(100, 2 * Math.PI, 0.05)  // 223
 */
export function arcSegments(r: number, sweep: number, tol: number): number {
  if (!(r > tol)) return Math.max(1, Math.ceil(Math.abs(sweep) / (Math.PI / 2)));
  const step = 2 * Math.acos(1 - tol / r);
  return Math.max(1, Math.ceil(Math.abs(sweep) / step - 1e-9));
}

/**
 * Points along a circular arc from angle a0 sweeping `sweep` radians (positive: anticlockwise),
 * both ends included.
 *
 *   arcPoints([0, 0], 10, 0, Math.PI / 2, 0.05)  // [[10, 0], …, [0, 10]]
 */
export function arcPoints(c: Point, r: number, a0: number, sweep: number, tol: number): Point[] {
  const n = arcSegments(r, sweep, tol);
  const out: Point[] = [];
  for (let i = 0; i <= n; i++) {
    const a = a0 + (sweep * i) / n;
    out.push([c[0] + r * Math.cos(a), c[1] + r * Math.sin(a)]);
  }
  return out;
}

/**
 * Points along an elliptical arc c + u·cos t + v·sin t for t from t0 sweeping `sweep`, both ends
 * included. With uniform steps h the chord error is at most h²·max|C''|/8 and |C''| ≤ max(|u|, |v|)
 * (the second-derivative bound for linear interpolation; from memory).
 */
export function ellipsePoints(c: Point, u: Point, v: Point, t0: number, sweep: number, tol: number): Point[] {
  const a = Math.max(Math.hypot(u[0], u[1]), Math.hypot(v[0], v[1]));
  const h = a > 0 ? Math.sqrt((8 * tol) / a) : Math.PI / 2;
  const n = Math.max(4, Math.ceil(Math.abs(sweep) / h - 1e-9));
  const out: Point[] = [];
  for (let i = 0; i <= n; i++) {
    const t = t0 + (sweep * i) / n;
    const ct = Math.cos(t),
      st = Math.sin(t);
    out.push([c[0] + u[0] * ct + v[0] * st, c[1] + u[1] * ct + v[1] * st]);
  }
  return out;
}

const len = (p: Point) => Math.hypot(p[0], p[1]);

/**
 * A quadratic Bézier as chords, the end point included, the start left out. Uniform steps: the
 * error is at most h²·|P0 − 2P1 + P2|·2/8 (Wang's bound for Bézier subdivision; from memory).
 */
export function quadPoints(p0: Point, p1: Point, p2: Point, tol: number): Point[] {
  const m = len([p0[0] - 2 * p1[0] + p2[0], p0[1] - 2 * p1[1] + p2[1]]);
  const n = Math.max(1, Math.min(1000, Math.ceil(Math.sqrt(m / (4 * tol)))));
  const out: Point[] = [];
  for (let i = 1; i <= n; i++) {
    const t = i / n,
      s = 1 - t;
    out.push([s * s * p0[0] + 2 * s * t * p1[0] + t * t * p2[0], s * s * p0[1] + 2 * s * t * p1[1] + t * t * p2[1]]);
  }
  return out;
}

/**
 * A cubic Bézier as chords, the end point included, the start left out. Uniform steps with the
 * second derivative bounded by 6·max(|P0 − 2P1 + P2|, |P1 − 2P2 + P3|) (Wang's bound; from memory).
 */
export function cubicPoints(p0: Point, p1: Point, p2: Point, p3: Point, tol: number): Point[] {
  const m = Math.max(
    len([p0[0] - 2 * p1[0] + p2[0], p0[1] - 2 * p1[1] + p2[1]]),
    len([p1[0] - 2 * p2[0] + p3[0], p1[1] - 2 * p2[1] + p3[1]]),
  );
  const n = Math.max(1, Math.min(1000, Math.ceil(Math.sqrt((6 * m) / (8 * tol)))));
  const out: Point[] = [];
  for (let i = 1; i <= n; i++) {
    const t = i / n,
      s = 1 - t;
    const a = s * s * s,
      b = 3 * s * s * t,
      c = 3 * s * t * t,
      d = t * t * t;
    out.push([a * p0[0] + b * p1[0] + c * p2[0] + d * p3[0], a * p0[1] + b * p1[1] + c * p2[1] + d * p3[1]]);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Pieces and loops

/** A run of points from one source (an entity, an element), open or closed; `from` names it. */
export interface Piece {
  pts: Point[];
  from: string;
}

/** A closed loop; edge i runs from pts[i] to pts[i + 1] (the last back to the first) and came from from[i]. */
export interface Loop {
  pts: Point[];
  from: string[];
}

const dist = (a: Point, b: Point) => Math.hypot(a[0] - b[0], a[1] - b[1]);

/** A formatter for "(12.5, 40) mm", with the drawing's own unit beside it when that is not mm. */
export function placeFormatter(unit?: { name: string; mmPerUnit: number }) {
  const r = (v: number, places: number) => String(Math.round(v * 10 ** places) / 10 ** places);
  return (p: Point): string => {
    const mm = `(${r(p[0], 2)}, ${r(p[1], 2)}) mm`;
    if (!unit || unit.mmPerUnit === 1) return mm;
    return `${mm}, (${r(p[0] / unit.mmPerUnit, 4)}, ${r(p[1] / unit.mmPerUnit, 4)}) ${unit.name}`;
  };
}

/** Names of the sources of a run of edges: "LINE (handle 1F), ARC (handle 20) and 3 more". */
export function sourceList(from: readonly string[], max = 3): string {
  const distinct = [...new Set(from)];
  if (distinct.length <= max) return joinAnd(distinct);
  return `${distinct.slice(0, max).join(", ")} and ${distinct.length - max} more`;
}

export const joinAnd = (xs: readonly string[]) =>
  xs.length <= 1 ? (xs[0] ?? "") : `${xs.slice(0, -1).join(", ")} and ${xs[xs.length - 1]}`;

/** Ends near a point: a uniform grid keyed by cell, for chaining many pieces quickly. */
class EndGrid {
  private cells = new Map<string, number[]>();
  constructor(private cell: number) {}
  private key(x: number, y: number) {
    return `${Math.floor(x / this.cell)},${Math.floor(y / this.cell)}`;
  }
  add(p: Point, id: number) {
    const k = this.key(p[0], p[1]);
    const list = this.cells.get(k);
    if (list) list.push(id);
    else this.cells.set(k, [id]);
  }
  near(p: Point): number[] {
    const cx = Math.floor(p[0] / this.cell),
      cy = Math.floor(p[1] / this.cell);
    const out: number[] = [];
    for (let dx = -1; dx <= 1; dx++)
      for (let dy = -1; dy <= 1; dy++) {
        const l = this.cells.get(`${cx + dx},${cy + dy}`);
        if (l) out.push(...l);
      }
    return out;
  }
}

/** A run of pieces that does not close: what it is made of, and its two free ends. */
export interface OpenChain {
  from: string[];
  start: Point;
  end: Point;
  gapMm: number;
}

/**
 * Chains pieces end to end into closed loops: a piece whose ends meet (within `tol`) is a loop by
 * itself; otherwise the nearest free end within `tol` is joined on, forwards then backwards, until
 * the run closes. Runs that cannot close come back as `open`, with the gap between their ends.
 *
 *   chainPieces([{ pts: [[0, 0], [10, 0]], from: "LINE 1" }, { pts: [[10, 0], [0, 0]], from: "LINE 2" }], 0.05)
 *   // { loops: [{ pts: [[0, 0], [10, 0]], from: ["LINE 1", "LINE 2"] }], open: [], tiny: [] }
 */
export function chainPieces(
  pieces: readonly Piece[],
  tol: number,
): { loops: Loop[]; open: OpenChain[]; tiny: string[] } {
  // A piece that never leaves a circle of `tol` (a zero-length line, a dot) joins nothing: set aside.
  const tinyPiece = (p: Piece) => p.pts.length < 2 || p.pts.every((q) => dist(q, p.pts[0]!) <= tol);
  const tiny = pieces.filter(tinyPiece).map((p) => p.from);
  const usable = pieces.filter((p) => !tinyPiece(p));
  const grid = new EndGrid(Math.max(tol * 4, 1e-6));
  usable.forEach((p, i) => {
    grid.add(p.pts[0]!, i);
    grid.add(p.pts[p.pts.length - 1]!, i);
  });
  const used = new Array<boolean>(usable.length).fill(false);
  const loops: Loop[] = [];
  const open: OpenChain[] = [];

  for (let i = 0; i < usable.length; i++) {
    if (used[i]) continue;
    used[i] = true;
    let pts = [...usable[i]!.pts];
    let from = new Array<string>(pts.length - 1).fill(usable[i]!.from);
    const closes = () => pts.length > 2 && dist(pts[0]!, pts[pts.length - 1]!) <= tol;
    const extend = () => {
      while (!closes()) {
        const end = pts[pts.length - 1]!;
        let best = -1,
          bestD = Infinity,
          bestReversed = false;
        for (const j of grid.near(end)) {
          if (used[j]) continue;
          const q = usable[j]!.pts;
          const ds = dist(end, q[0]!),
            de = dist(end, q[q.length - 1]!);
          if (ds <= tol && ds < bestD) [best, bestD, bestReversed] = [j, ds, false];
          if (de <= tol && de < bestD) [best, bestD, bestReversed] = [j, de, true];
        }
        if (best < 0) return;
        used[best] = true;
        const q = bestReversed ? [...usable[best]!.pts].reverse() : usable[best]!.pts;
        pts = pts.concat(q.slice(1));
        from = from.concat(new Array<string>(q.length - 1).fill(usable[best]!.from));
      }
    };
    extend();
    if (!closes()) {
      pts.reverse();
      from.reverse();
      extend();
    }
    if (closes()) {
      // The last point is the first one again: drop it; the last edge closes the loop.
      pts.pop();
      loops.push({ pts, from });
    } else {
      // Back in the direction the first piece was drawn.
      pts.reverse();
      from.reverse();
      open.push({ from, start: pts[0]!, end: pts[pts.length - 1]!, gapMm: dist(pts[0]!, pts[pts.length - 1]!) });
    }
  }
  return { loops, open, tiny };
}

/** Rounds to 0.001 mm and drops points that repeat their neighbour (keeping edge sources aligned). */
export function tidyLoop(loop: Loop): Loop {
  const r = (v: number) => Math.round(v * 1000) / 1000 + 0; // + 0 turns −0 into 0
  const pts: Point[] = [];
  const from: string[] = [];
  loop.pts.forEach((p, i) => {
    const q: Point = [r(p[0]), r(p[1])];
    const last = pts[pts.length - 1];
    if (last && last[0] === q[0] && last[1] === q[1]) return;
    pts.push(q);
    from.push(loop.from[i] ?? loop.from[loop.from.length - 1] ?? "");
  });
  while (pts.length > 1 && pts[0]![0] === pts[pts.length - 1]![0] && pts[0]![1] === pts[pts.length - 1]![1]) {
    pts.pop();
    from.pop();
  }
  return { pts, from };
}

// ---------------------------------------------------------------------------------------------
// Crossings

interface Seg {
  a: Point;
  b: Point;
  loop: number;
  i: number;
}

function cross(o: Point, a: Point, b: Point) {
  return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
}
function within(a: Point, b: Point, p: Point) {
  return (
    Math.min(a[0], b[0]) <= p[0] &&
    p[0] <= Math.max(a[0], b[0]) &&
    Math.min(a[1], b[1]) <= p[1] &&
    p[1] <= Math.max(a[1], b[1])
  );
}

/** Where two segments meet (cross, touch or overlap), or null; the same test as checkPolygon's. */
export function segmentMeeting(a: Point, b: Point, c: Point, d: Point): Point | null {
  const d1 = cross(c, d, a),
    d2 = cross(c, d, b),
    d3 = cross(a, b, c),
    d4 = cross(a, b, d);
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) {
    const t = d1 / (d1 - d2);
    return [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
  }
  if (d1 === 0 && within(c, d, a)) return a;
  if (d2 === 0 && within(c, d, b)) return b;
  if (d3 === 0 && within(a, b, c)) return c;
  if (d4 === 0 && within(a, b, d)) return d;
  return null;
}

/**
 * The first place where edges of these loops cross or touch (an edge and its neighbours in the same
 * loop aside), naming the sources of both edges; null when no two edges meet. Edges are sorted into
 * a grid so large drawings stay quick.
 */
export function findCrossing(loops: readonly Loop[]): { a: string; b: string; at: Point; sameLoop: boolean } | null {
  const segs: Seg[] = [];
  loops.forEach((l, li) => {
    for (let i = 0; i < l.pts.length; i++) segs.push({ a: l.pts[i]!, b: l.pts[(i + 1) % l.pts.length]!, loop: li, i });
  });
  if (segs.length < 2) return null;
  let minX = Infinity,
    minY = Infinity,
    maxX = -Infinity,
    maxY = -Infinity;
  for (const s of segs) {
    minX = Math.min(minX, s.a[0], s.b[0]);
    maxX = Math.max(maxX, s.a[0], s.b[0]);
    minY = Math.min(minY, s.a[1], s.b[1]);
    maxY = Math.max(maxY, s.a[1], s.b[1]);
  }
  const side = Math.max(maxX - minX, maxY - minY, 1e-6);
  const cells = Math.max(1, Math.min(512, Math.ceil(Math.sqrt(segs.length))));
  const size = side / cells + 1e-9;
  const grid = new Map<number, number[]>();
  const cellOf = (v: number, min: number) => Math.min(cells - 1, Math.max(0, Math.floor((v - min) / size)));
  segs.forEach((s, k) => {
    const x0 = cellOf(Math.min(s.a[0], s.b[0]), minX),
      x1 = cellOf(Math.max(s.a[0], s.b[0]), minX);
    const y0 = cellOf(Math.min(s.a[1], s.b[1]), minY),
      y1 = cellOf(Math.max(s.a[1], s.b[1]), minY);
    for (let x = x0; x <= x1; x++)
      for (let y = y0; y <= y1; y++) {
        const key = x * cells + y;
        const l = grid.get(key);
        if (l) l.push(k);
        else grid.set(key, [k]);
      }
  });
  const tested = new Set<number>();
  for (const list of grid.values()) {
    for (let p = 0; p < list.length; p++) {
      for (let q = p + 1; q < list.length; q++) {
        const i = Math.min(list[p]!, list[q]!),
          j = Math.max(list[p]!, list[q]!);
        const s = segs[i]!,
          t = segs[j]!;
        if (s.loop === t.loop) {
          const n = loops[s.loop]!.pts.length;
          if (Math.abs(s.i - t.i) === 1 || Math.abs(s.i - t.i) === n - 1) continue;
        }
        const key = i * segs.length + j;
        if (tested.has(key)) continue;
        tested.add(key);
        const at = segmentMeeting(s.a, s.b, t.a, t.b);
        if (at)
          return {
            a: loops[s.loop]!.from[s.i] ?? "",
            b: loops[t.loop]!.from[t.i] ?? "",
            at,
            sameLoop: s.loop === t.loop,
          };
      }
    }
  }
  return null;
}

// ---------------------------------------------------------------------------------------------
// Nesting and the last checks

/** Outer loops with their holes, by containment (even depth: outer; odd: a hole of its parent). */
export function nestLoops(loops: readonly Loop[]): { outer: Loop; holes: Loop[] }[] {
  const items = loops
    .map((l) => ({ l, area: Math.abs(polygonArea(l.pts)), box: polygonBounds(l.pts) }))
    .sort((a, b) => b.area - a.area);
  const parent = new Array<number>(items.length).fill(-1);
  const depth = new Array<number>(items.length).fill(0);
  for (let i = 0; i < items.length; i++) {
    const me = items[i]!;
    const probe = me.l.pts[0]!;
    // The smallest loop holding this one: scan from the next-larger down.
    for (let j = i - 1; j >= 0; j--) {
      const o = items[j]!;
      if (o.area <= me.area) continue;
      const inBox =
        me.box.min[0] >= o.box.min[0] &&
        me.box.max[0] <= o.box.max[0] &&
        me.box.min[1] >= o.box.min[1] &&
        me.box.max[1] <= o.box.max[1];
      if (inBox && pointInPolygon(probe, o.l.pts)) {
        parent[i] = j;
        depth[i] = depth[j]! + 1;
        break;
      }
    }
  }
  const groups = new Map<number, { outer: Loop; holes: Loop[] }>();
  items.forEach((it, i) => {
    if (depth[i]! % 2 === 0) groups.set(i, { outer: it.l, holes: [] });
  });
  items.forEach((it, i) => {
    if (depth[i]! % 2 === 1) groups.get(parent[i]!)!.holes.push(it.l);
  });
  return [...groups.values()];
}

const orient = (pts: Point[], anticlockwise: boolean): Point[] =>
  polygonArea(pts) > 0 === anticlockwise ? pts : [...pts].reverse();

/**
 * Ramer–Douglas–Peucker on a closed loop: drops points that lie within `tol` of the line through
 * their kept neighbours, so a loop with more points than a part takes can often still be used.
 */
export function simplifyLoop(pts: Point[], tol: number): Point[] {
  if (pts.length <= 3) return pts;
  // Split the loop at its first point and the point farthest from it.
  let far = 0,
    farD = -1;
  pts.forEach((p, i) => {
    const d = dist(p, pts[0]!);
    if (d > farD) [far, farD] = [i, d];
  });
  const keep = new Array<boolean>(pts.length).fill(false);
  keep[0] = keep[far] = true;
  const stack: [number, number][] = [
    [0, far],
    [far, pts.length],
  ];
  while (stack.length) {
    const [i, j] = stack.pop()!;
    const a = pts[i]!,
      b = pts[j % pts.length]!;
    let worst = -1,
      worstD = 0;
    const L = dist(a, b);
    for (let k = i + 1; k < j; k++) {
      const p = pts[k]!;
      const d = L > 0 ? Math.abs(cross(a, b, p)) / L : dist(a, p);
      if (d > worstD) [worst, worstD] = [k, d];
    }
    if (worst >= 0 && worstD > tol) {
      keep[worst] = true;
      stack.push([i, worst], [worst, j]);
    }
  }
  return pts.filter((_, i) => keep[i]);
}

/**
 * Checks each loop (no area, crossing), nests them, and makes the profiles: named, oriented,
 * moved to 0, 0, within the part limits. Problems name the entity or element (`Loop.from`).
 */
export function profilesFromLoops(
  loops: Loop[],
  o: {
    name: (index: number, count: number) => string;
    source: string;
    place: (p: Point) => string;
    /** Tolerance for thinning loops with too many points, mm. */
    tol: number;
  },
): { profiles: ImportedProfile[]; errors: ImportProblem[]; notes: string[] } {
  const errors: ImportProblem[] = [];
  const notes: string[] = [];
  const tidy = loops.map(tidyLoop);
  const kept: Loop[] = [];
  for (const l of tidy) {
    const area = l.pts.length >= 3 ? Math.abs(polygonArea(l.pts)) : 0;
    if (area < MIN_LOOP_AREA_MM2 && !(l.pts.length >= 4 && findCrossing([l]))) {
      errors.push({
        message: `${sourceList(l.from)} ${new Set(l.from).size > 1 ? "enclose" : "encloses"} no area (${area.toFixed(3)} mm²): the outline folds back on itself or its points lie on one line, near ${o.place(l.pts[0] ?? [0, 0])}.`,
        subject: l.from[0],
        at: l.pts[0],
      });
      continue;
    }
    kept.push(l);
  }
  if (errors.length) return { profiles: [], errors, notes };
  const hit = findCrossing(kept);
  if (hit) {
    const who = hit.a === hit.b ? `${hit.a} crosses or touches itself` : `${hit.a} and ${hit.b} cross or touch`;
    errors.push({
      message: `${who} near ${o.place(hit.at)}: a wire cannot follow crossing edges. Separate the outlines or join them into one.`,
      subject: hit.a,
      at: hit.at,
    });
    return { profiles: [], errors, notes };
  }
  const groups = nestLoops(kept).sort((a, b) => {
    const ba = polygonBounds(a.outer.pts),
      bb = polygonBounds(b.outer.pts);
    // Left to right, then top to bottom: the order a person reads the drawing in.
    return ba.min[0] - bb.min[0] || bb.max[1] - ba.max[1];
  });
  if (groups.length > MAX_PROFILES) {
    errors.push({
      message: `The drawing holds ${groups.length} separate shapes; at most ${MAX_PROFILES} can be taken at once.`,
    });
    return { profiles: [], errors, notes };
  }
  const profiles: ImportedProfile[] = [];
  groups.forEach((g, gi) => {
    const name = o.name(gi, groups.length);
    const withinLimit = (pts: Point[], what: string): Point[] | null => {
      if (pts.length <= MAX_LOOP_POINTS) return pts;
      const thin = simplifyLoop(pts, o.tol);
      if (thin.length <= MAX_LOOP_POINTS) {
        notes.push(`${name}: ${what} thinned from ${pts.length} to ${thin.length} points (within ${o.tol} mm).`);
        return thin;
      }
      errors.push({
        message: `${name}: ${what} (${sourceList(g.outer.from)}) has ${thin.length} points even when thinned to ${o.tol} mm; a part takes at most ${MAX_LOOP_POINTS}.`,
        subject: g.outer.from[0],
      });
      return null;
    };
    if (g.holes.length > MAX_HOLES) {
      errors.push({
        message: `${name} has ${g.holes.length} holes; a part takes at most ${MAX_HOLES}.`,
        subject: g.outer.from[0],
      });
      return;
    }
    const outer = withinLimit(g.outer.pts, "the outer loop");
    const holes = g.holes.map((h, i) => withinLimit(h.pts, `hole ${i + 1}`));
    if (!outer || holes.some((h) => !h)) return;
    const box = polygonBounds(outer);
    if (box.size[0] > MAX_PROFILE_MM || box.size[1] > MAX_PROFILE_MM) {
      errors.push({
        message: `${name} is ${Math.round(box.size[0])} × ${Math.round(box.size[1])} mm; a part may be at most ${MAX_PROFILE_MM.toLocaleString("en")} mm across. Is the unit right?`,
        subject: g.outer.from[0],
      });
      return;
    }
    const [ox, oy] = box.min;
    const move = (pts: Point[]): Point[] =>
      pts.map(([x, y]) => [Math.round((x - ox) * 1000) / 1000 + 0, Math.round((y - oy) * 1000) / 1000 + 0]);
    const points = orient(move(outer), true);
    const holesMoved = (holes as Point[][]).map((h) => orient(move(h), false));
    const problem = checkOutline(points, holesMoved);
    if (problem) {
      errors.push({ message: `${name} (${sourceList(g.outer.from)}): ${problem}`, subject: g.outer.from[0] });
      return;
    }
    const b = polygonBounds(points);
    profiles.push({
      name,
      points,
      holes: holesMoved,
      source: o.source.slice(0, 200),
      boxMm: [b.size[0], b.size[1]],
      areaMm2: Math.round(outlineArea(points, holesMoved) * 1000) / 1000,
      originMm: [ox, oy],
    });
  });
  return { profiles: errors.length ? [] : profiles, errors, notes };
}

/** An affine map [a, b, c, d, e, f]: x' = a·x + c·y + e, y' = b·x + d·y + f (the SVG matrix order). */
export type Affine = [number, number, number, number, number, number];
export const IDENTITY: Affine = [1, 0, 0, 1, 0, 0];

/** m·n: apply n first, then m. */
export function compose(m: Affine, n: Affine): Affine {
  return [
    m[0] * n[0] + m[2] * n[1],
    m[1] * n[0] + m[3] * n[1],
    m[0] * n[2] + m[2] * n[3],
    m[1] * n[2] + m[3] * n[3],
    m[0] * n[4] + m[2] * n[5] + m[4],
    m[1] * n[4] + m[3] * n[5] + m[5],
  ];
}

export const apply = (m: Affine, p: Point): Point => [
  m[0] * p[0] + m[2] * p[1] + m[4],
  m[1] * p[0] + m[3] * p[1] + m[5],
];

/** The largest stretch the map gives any direction (its largest singular value). */
export function maxScale(m: Affine): number {
  const [a, b, c, d] = m;
  const s1 = a * a + b * b + c * c + d * d;
  const det = a * d - b * c;
  return Math.sqrt((s1 + Math.sqrt(Math.max(0, s1 * s1 - 4 * det * det))) / 2);
}
