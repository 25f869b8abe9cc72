/**
 * The wire's path round one profile in its cutting plane: the outline offset by half the kerf
 * (outward round the outer loop, inward round each hole) with Clipper2, a straight lead-in from a
 * face of the blank, slits from the outer loop to the holes, the cutting direction, and dwells at
 * sharp corners. Pure: no I/O.
 *
 * Choices (say them to the cutter):
 * - Round joins. The set of points at exactly kerf / 2 from the part is the wire centre that
 *   leaves the part's edge exactly where the drawing has it: its inner kerf edge pivots on every
 *   outside corner, so outside corners stay sharp; a mitre join would carry the wire out past the
 *   corner and back (longer, and Clipper squares mitres past its limit). Inside corners cannot be
 *   sharper than the kerf's radius whatever the join.
 * - Arc tolerance 0.01 mm: the chords of the round joins lie at most 0.01 mm inside the true
 *   arcs, well under a hot wire's repeatability (tenths of a millimetre) and the 0.05 mm the
 *   read-back check allows; a 0.75 mm radius gets about 20 chords per turn.
 * - Coordinates go to Clipper at 0.1 µm (4 decimals); every loop keeps that grid.
 */
import { differenceD, EndType, FillRule, inflatePathsD, JoinType, type PathD } from "@countertype/clipper2-ts";
import { checkOutline, pointInPolygon, polygonArea, polygonBounds, type Point } from "./polygon";

/** Chord tolerance of the round joins, mm. */
export const ARC_TOLERANCE_MM = 0.01;
/** Decimal places Clipper keeps (0.1 µm). */
const PRECISION = 4;
const EPS = 1e-6;

/** Why a toolpath cannot be made; the message is written for a person. */
export class ToolpathError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ToolpathError";
  }
}

/** A face of the blank: left (least first coordinate), right, bottom (least second), top. */
export type Face = "left" | "right" | "bottom" | "top";
export const FACES: readonly Face[] = ["left", "right", "bottom", "top"];

export interface Blank {
  min: Point;
  max: Point;
}

export interface Dwell {
  /** A corner of the part turning the wire by at least this many degrees gets a dwell. */
  angleDeg: number;
  /** How long the wire waits there (G4), s. */
  seconds: number;
}

export interface ToolpathOptions {
  /** Kerf width, mm: the wire's centre runs kerf / 2 off the part. */
  kerf: number;
  /** The foam the profile is cut from (its faces are where a lead-in may start); default the profile's box. */
  blank?: Blank;
  /** Faces the wire may enter from; default all four (a horizontal wire cannot come up through the table: leave out "bottom"). */
  faces?: readonly Face[];
  /** The planner's lead-in point: the wire enters the path at the point nearest it. Absent: the shortest lead-in. */
  leadIn?: Point | null;
  /** Way round the outer loop in the cutting plane (second axis up); holes go the other way, so the part stays on one side of the wire. Default "ccw". */
  direction?: "cw" | "ccw";
  /** Dwell at sharp corners; absent or null: none. */
  dwell?: Dwell | null;
  /** Per hole (by its index in the profile), the planner's slit point on the outer loop; absent: the shortest slit. */
  slits?: readonly (Point | null | undefined)[];
  /** Other parts' outlines in the same plane: a lead-in must not cut into them. */
  avoid?: readonly (readonly Point[])[];
}

export interface RoutePoint {
  p: Point;
  /** Seconds to wait at this point (a sharp corner). */
  dwell?: number;
}

export interface Slit {
  /** Index of the hole in the profile. */
  hole: number;
  /** On the outer path (or on the path of the hole it is reached from). */
  from: Point;
  /** On the hole's path. */
  to: Point;
}

export interface Toolpath {
  kerf: number;
  /** The outer loop offset by kerf / 2, in cutting order, starting where the lead-in meets it (not repeated at the end). */
  outer: Point[];
  /** Each hole's loop offset by kerf / 2 inward, in cutting order from its slit (a hole may come out as two loops). */
  holes: { hole: number; loop: Point[] }[];
  leadIn: { face: Face; from: Point; to: Point };
  /** Back out along the lead-in: the wire leaves the way it came, so one slit in the waste serves both. */
  leadOut: { face: Face; from: Point; to: Point };
  slits: Slit[];
  /** The whole route: from the face, the lead-in, the outer loop with each slit and hole, back out to the face. */
  route: RoutePoint[];
  /** The part of the route between the lead-in and the lead-out: from the entry round every loop back to it. */
  loop: RoutePoint[];
  /** Where the wire dwells. */
  corners: Point[];
  /** Route length, mm. */
  lengthMm: number;
  /** What the cutter should know: notches the kerf cannot enter, holes too small to cut. */
  warnings: string[];
}

const dist = (a: Point, b: Point) => Math.hypot(a[0] - b[0], a[1] - b[1]);
const r1 = (v: number) => Math.round(v * 10) / 10;
const at = (p: Point) => `(${r1(p[0])}, ${r1(p[1])})`;
const toD = (loop: readonly Point[]): PathD => loop.map(([x, y]) => ({ x, y }));
const fromD = (path: PathD): Point[] => path.map((q) => [q.x, q.y] as Point);
const ccw = (loop: readonly Point[]): Point[] => (polygonArea(loop) < 0 ? [...loop].reverse() : [...loop]);

/** Closest points of segments ab and cd (plain vector geometry). */
function segmentClosest(a: Point, b: Point, c: Point, d: Point): { p: Point; q: Point; d: number } {
  const onSeg = (p: Point, s0: Point, s1: Point): Point => {
    const vx = s1[0] - s0[0];
    const vy = s1[1] - s0[1];
    const l2 = vx * vx + vy * vy;
    const t = l2 > 0 ? Math.max(0, Math.min(1, ((p[0] - s0[0]) * vx + (p[1] - s0[1]) * vy) / l2)) : 0;
    return [s0[0] + t * vx, s0[1] + t * vy];
  };
  if (segmentsCross(a, b, c, d)) {
    // They cross: the crossing point on both.
    const den = (b[0] - a[0]) * (d[1] - c[1]) - (b[1] - a[1]) * (d[0] - c[0]);
    if (Math.abs(den) > 1e-12) {
      const t = ((c[0] - a[0]) * (d[1] - c[1]) - (c[1] - a[1]) * (d[0] - c[0])) / den;
      const p: Point = [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
      return { p, q: p, d: 0 };
    }
  }
  const cands = [
    { p: a, q: onSeg(a, c, d) },
    { p: b, q: onSeg(b, c, d) },
    { p: onSeg(c, a, b), q: c },
    { p: onSeg(d, a, b), q: d },
  ].map((x) => ({ ...x, d: dist(x.p, x.q) }));
  return cands.reduce((m, x) => (x.d < m.d ? x : m));
}

const orient = (a: Point, b: Point, c: Point) => (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);

/** Do the segments properly cross or touch (shared end points of neighbours excluded by the caller)? */
function segmentsCross(a: Point, b: Point, c: Point, d: Point): boolean {
  const d1 = orient(c, d, a);
  const d2 = orient(c, d, b);
  const d3 = orient(a, b, c);
  const d4 = orient(a, b, d);
  return ((d1 > EPS && d2 < -EPS) || (d1 < -EPS && d2 > EPS)) && ((d3 > EPS && d4 < -EPS) || (d3 < -EPS && d4 > EPS));
}

/** Distance from a point to a segment. */
function pointSegment(p: Point, a: Point, b: Point): number {
  return segmentClosest(p, p, a, b).d;
}

/** Does segment ab cross any edge of the loop, or pass within `clear` of it (ignoring points within `skip` of `b`)? */
function segmentHitsLoop(a: Point, b: Point, loop: readonly Point[], clear = 0, skip = 0): boolean {
  for (let i = 0; i < loop.length; i++) {
    const c = loop[i]!;
    const d = loop[(i + 1) % loop.length]!;
    if (skip > 0 && (dist(c, b) <= skip || dist(d, b) <= skip || pointSegment(b, c, d) <= skip)) continue;
    const s = segmentClosest(a, b, c, d);
    if (s.d <= clear + EPS) return true;
  }
  return false;
}

/** Puts `p` into the loop on its nearest edge (or finds the vertex it already is); returns the loop and its index. */
function insertPoint(loop: Point[], p: Point): number {
  let best = 0;
  let bestD = Infinity;
  for (let i = 0; i < loop.length; i++) {
    const d = pointSegment(p, loop[i]!, loop[(i + 1) % loop.length]!);
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  }
  const a = loop[best]!;
  const b = loop[(best + 1) % loop.length]!;
  if (dist(a, p) < 1e-7) return best;
  if (dist(b, p) < 1e-7) return (best + 1) % loop.length;
  loop.splice(best + 1, 0, p);
  return best + 1;
}

/** The point of the loop nearest `p`. */
function nearestOnLoop(loop: readonly Point[], p: Point): Point {
  let best: Point = loop[0]!;
  let bestD = Infinity;
  for (let i = 0; i < loop.length; i++) {
    const s = segmentClosest(p, p, loop[i]!, loop[(i + 1) % loop.length]!);
    if (s.d < bestD) {
      bestD = s.d;
      best = s.q;
    }
  }
  return best;
}

/** Closest pair of points of two loops (segment pairs whose boxes lie further apart than the best so far are skipped). */
function closestPair(a: readonly Point[], b: readonly Point[]): { p: Point; q: Point; d: number } {
  let best = { p: a[0]!, q: b[0]!, d: Infinity };
  // A good first guess from the nearest vertices makes the box test prune almost every pair.
  let vi = 0;
  let vj = 0;
  for (let i = 0; i < a.length; i++)
    for (let j = 0; j < b.length; j++) {
      const d = (a[i]![0] - b[j]![0]) ** 2 + (a[i]![1] - b[j]![1]) ** 2;
      if (d < best.d) {
        best = { p: a[i]!, q: b[j]!, d };
        vi = i;
        vj = j;
      }
    }
  best = { p: a[vi]!, q: b[vj]!, d: Math.sqrt(best.d) };
  for (let i = 0; i < a.length; i++) {
    const a0 = a[i]!;
    const a1 = a[(i + 1) % a.length]!;
    const ax0 = Math.min(a0[0], a1[0]);
    const ax1 = Math.max(a0[0], a1[0]);
    const ay0 = Math.min(a0[1], a1[1]);
    const ay1 = Math.max(a0[1], a1[1]);
    for (let j = 0; j < b.length; j++) {
      const b0 = b[j]!;
      const b1 = b[(j + 1) % b.length]!;
      const gx = Math.max(0, Math.min(b0[0], b1[0]) - ax1, ax0 - Math.max(b0[0], b1[0]));
      const gy = Math.max(0, Math.min(b0[1], b1[1]) - ay1, ay0 - Math.max(b0[1], b1[1]));
      if (gx * gx + gy * gy >= best.d * best.d) continue;
      const s = segmentClosest(a0, a1, b0, b1);
      if (s.d < best.d) best = s;
    }
  }
  return best;
}

/** The offset of an outline: Clipper2 round-join inflation of the solid (outer loop less holes) by `delta`. */
function inflate(loops: readonly (readonly Point[])[], delta: number): PathD[] {
  return inflatePathsD(loops.map(toD), delta, JoinType.Round, EndType.Polygon, 2, PRECISION, ARC_TOLERANCE_MM);
}

/**
 * Places where the offset bridges the outline: the solid offset out by r and back in by r (a
 * closing) keeps foam the drawing does not have. A region touching two edges that do not meet is a
 * notch narrower than the kerf; one in an inside corner is reported only when it reaches deeper
 * than the kerf (a corner sharper than about 40°): every inside corner keeps a radius of kerf / 2.
 */
function bridged(outer: Point[], holes: Point[][], r: number, gone: ReadonlySet<number>): string[] {
  const offset = inflate([outer, ...holes], r);
  const closing = inflatePathsD(offset, -r, JoinType.Round, EndType.Polygon, 2, PRECISION, ARC_TOLERANCE_MM);
  const filled = differenceD(closing, [outer, ...holes].map(toD), FillRule.NonZero, PRECISION);
  const loops = [outer, ...holes];
  const out: string[] = [];
  for (const region of filled) {
    const pts = fromD(region);
    const area = Math.abs(polygonArea(pts));
    if (area < Math.max(1e-3, 0.01 * r * r)) continue;
    const touched = new Map<number, Set<number>>();
    for (const p of pts)
      loops.forEach((loop, l) => {
        for (let i = 0; i < loop.length; i++)
          if (pointSegment(p, loop[i]!, loop[(i + 1) % loop.length]!) < 2e-4) {
            if (!touched.has(l)) touched.set(l, new Set());
            touched.get(l)!.add(i);
          }
      });
    let notch = false;
    let corner: Point | null = null;
    for (const [l, edges] of touched) {
      const n = loops[l]!.length;
      const list = [...edges];
      for (const i of list)
        for (const j of list) {
          const gap = Math.min((i - j + n) % n, (j - i + n) % n);
          if (gap >= 2) notch = true;
          if (gap === 1) corner = loops[l]![(j - i + n) % n === 1 ? j : i]!;
        }
    }
    // A hole the kerf cannot enter at all is reported as such.
    if ([...touched.keys()].some((l) => l > 0 && gone.has(l - 1))) continue;
    const c = pts.reduce((s, p) => [s[0] + p[0] / pts.length, s[1] + p[1] / pts.length] as Point, [0, 0] as Point);
    const inHole = [...touched.keys()].find((l) => l > 0);
    const where = inHole !== undefined ? `in hole ${inHole}` : "";
    if (notch)
      out.push(
        `A notch ${where ? `${where} ` : ""}near ${at(c)} mm is narrower than the kerf (${r1(2 * r)} mm): the wire passes over it and about ${r1(area)} mm² of foam stays in it.`,
      );
    else if (corner) {
      // Depth of the fill along the corner's bisector: from the corner to the nearest point of the fill not on its edges.
      const inner = pts.filter((p) =>
        loops.every((loop) => loop.every((q, i) => pointSegment(p, q, loop[(i + 1) % loop.length]!) >= 2e-4)),
      );
      const depth = inner.length ? Math.min(...inner.map((p) => dist(p, corner!))) : 0;
      if (depth > 2 * r)
        out.push(
          `The inside corner ${where ? `${where} ` : ""}at ${at(corner)} mm is sharper than the kerf can cut: about ${r1(area)} mm² of foam stays in it.`,
        );
    }
  }
  return out;
}

/** The vertex (or the middle of a flat edge) of the loop furthest toward a face; inserted into the loop. */
function extremeToward(loop: Point[], face: Face): number {
  const axis = face === "left" || face === "right" ? 0 : 1;
  const sign = face === "left" || face === "bottom" ? -1 : 1;
  let best = -Infinity;
  for (const p of loop) best = Math.max(best, sign * p[axis]);
  const tied = loop.map((p, i) => (Math.abs(sign * p[axis] - best) <= 1e-7 ? i : -1)).filter((i) => i >= 0);
  // A flat edge facing the face: enter at its middle.
  let longest = -1;
  let longestLen = 0;
  for (const i of tied) {
    const j = (i + 1) % loop.length;
    if (tied.includes(j) && dist(loop[i]!, loop[j]!) > longestLen) {
      longest = i;
      longestLen = dist(loop[i]!, loop[j]!);
    }
  }
  if (longest >= 0) {
    const a = loop[longest]!;
    const b = loop[(longest + 1) % loop.length]!;
    return insertPoint(loop, [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]);
  }
  return tied[0]!;
}

/** The foot on a face of the perpendicular from `p`; `p` itself when it lies beyond the face (already in the air). */
function onFace(p: Point, face: Face, blank: Blank): Point {
  if (face === "left") return [Math.min(p[0], blank.min[0]), p[1]];
  if (face === "right") return [Math.max(p[0], blank.max[0]), p[1]];
  if (face === "bottom") return [p[0], Math.min(p[1], blank.min[1])];
  return [p[0], Math.max(p[1], blank.max[1])];
}

/** Turning angle of the outline at each vertex, degrees (0: straight on). */
function turnAngles(loop: readonly Point[]): number[] {
  const n = loop.length;
  return loop.map((p, i) => {
    const a = loop[(i - 1 + n) % n]!;
    const b = loop[(i + 1) % n]!;
    const u = [p[0] - a[0], p[1] - a[1]];
    const v = [b[0] - p[0], b[1] - p[1]];
    const lu = Math.hypot(u[0]!, u[1]!);
    const lv = Math.hypot(v[0]!, v[1]!);
    if (lu === 0 || lv === 0) return 0;
    const cos = Math.max(-1, Math.min(1, (u[0]! * v[0]! + u[1]! * v[1]!) / (lu * lv)));
    return (Math.acos(cos) * 180) / Math.PI;
  });
}

/**
 * Where on an offset loop (in cutting order) the wire dwells for a sharp corner of the part at
 * `corner`: an outside corner is an arc of points all kerf / 2 from it, and the wire waits where
 * that arc begins (the end of the edge coming in, the corner's kerf edge just reached); an inside
 * corner is one point of the path.
 */
function dwellIndex(loop: readonly Point[], corner: Point): number {
  const n = loop.length;
  let k = 0;
  for (let i = 1; i < n; i++) if (dist(loop[i]!, corner) < dist(loop[k]!, corner)) k = i;
  const d0 = dist(loop[k]!, corner);
  for (let steps = 0; steps < n; steps++) {
    const prev = (k - 1 + n) % n;
    if (Math.abs(dist(loop[prev]!, corner) - d0) > 2e-3) break;
    k = prev;
  }
  return k;
}

/**
 * The toolpath of one profile (outer loop and holes, mm, second coordinate up).
 *
 *   toolpath([[0, 0], [100, 0], [100, 50], [0, 50]], [], { kerf: 2, blank: { min: [0, 0], max: [120, 60] }, faces: ["left", "right", "top"] })
 *   // → { outer: [[-1, 25], …] (a rounded rectangle 1 mm outside), leadIn: { face: "left", from: [-1, 25], to: [-1, 25] }, lengthMm: ≈ 306.3, … }
 */
export function toolpath(
  points: readonly Point[],
  holes: readonly (readonly Point[])[],
  opts: ToolpathOptions,
): Toolpath {
  if (!(opts.kerf > 0)) throw new ToolpathError("The kerf must be more than 0 mm.");
  const problem = checkOutline(points, holes);
  if (problem) throw new ToolpathError(problem);
  const r = opts.kerf / 2;
  const outerIn = ccw(points);
  const holesIn = holes.map((h) => ccw(h).reverse());
  const warnings: string[] = [];

  // The offset: one outer loop (a connected part stays connected), holes shrunk, split or gone.
  const paths = inflate([outerIn, ...holesIn], r).map(fromD);
  const outers = paths.filter((p) => polygonArea(p) > 0);
  if (outers.length !== 1) throw new ToolpathError("The offset outline came out in pieces; check the drawing.");
  let outer = outers[0]!;
  const holeLoops: { hole: number; loop: Point[] }[] = [];
  for (const p of paths.filter((q) => polygonArea(q) < 0)) {
    const h = holesIn.findIndex((hole) => pointInPolygon(p[0]!, hole));
    holeLoops.push({ hole: Math.max(h, 0), loop: p });
  }
  const gone = new Set<number>();
  holesIn.forEach((_, h) => {
    if (holeLoops.some((l) => l.hole === h)) return;
    gone.add(h);
    warnings.push(
      `Hole ${h + 1} is narrower than the kerf (${r1(opts.kerf)} mm) everywhere: the wire cannot cut it, so it stays foam.`,
    );
  });
  warnings.push(...bridged(outerIn, holesIn, r, gone));

  // Direction: the outer loop as asked, holes the other way round.
  const dir = opts.direction ?? "ccw";
  if (dir === "cw") outer = outer.reverse();
  for (const h of holeLoops) if (polygonArea(h.loop) > 0 === (dir === "ccw")) h.loop.reverse();

  // Lead-in from a face of the blank, perpendicular to it.
  const bounds = polygonBounds(points);
  const blank = opts.blank ?? { min: bounds.min, max: bounds.max };
  const faces = opts.faces ?? FACES;
  if (!faces.length) throw new ToolpathError("No face of the blank is open for the wire to enter from.");
  const avoid = opts.avoid ?? [];
  const blocked = (from: Point, to: Point, loop: readonly Point[]) =>
    segmentHitsLoop(from, to, loop, 0, 1e-6) ||
    holeLoops.some((h) => segmentHitsLoop(from, to, h.loop)) ||
    avoid.some((o) => segmentHitsLoop(from, to, o, r));
  let entry: Point;
  let face: Face;
  if (opts.leadIn) {
    entry = nearestOnLoop(outer, opts.leadIn);
    insertPoint(outer, entry);
    const options = faces
      .map((f) => ({ f, from: onFace(entry, f, blank) }))
      .sort((a, b) => dist(a.from, entry) - dist(b.from, entry))
      .filter((o) => !blocked(o.from, entry, outer));
    if (!options.length)
      throw new ToolpathError(
        `No straight lead-in from a face of the blank reaches the point chosen at ${at(opts.leadIn)} mm without cutting the part: choose another point.`,
      );
    face = options[0]!.f;
  } else {
    const options = faces
      .map((f) => {
        const copy = [...outer];
        const i = extremeToward(copy, f);
        const p = copy[i]!;
        return { f, p, from: onFace(p, f, blank) };
      })
      .sort((a, b) => dist(a.from, a.p) - dist(b.from, b.p));
    const ok = options.find((o) => !avoid.some((loop) => segmentHitsLoop(o.from, o.p, loop, r)));
    if (!ok)
      throw new ToolpathError(
        "Every straight lead-in from a face of the blank would cut into another part: move the parts apart or pick a lead-in point.",
      );
    face = ok.f;
    entry = ok.p;
    insertPoint(outer, entry);
  }
  const leadFrom = onFace(entry, face, blank);

  // Slits: each hole from the nearest loop already reached (the outer loop first), or from the planner's point.
  const slits: Slit[] = [];
  const children = new Map<Point[], { at: Point; slit: Slit; loop: Point[] }[]>();
  const reached: Point[][] = [outer];
  const link = (h: { hole: number; loop: Point[] }, from: Point[], p: Point, q: Point) => {
    insertPoint(from, p);
    insertPoint(h.loop, q);
    const slit = { hole: h.hole, from: p, to: q };
    slits.push(slit);
    if (!children.has(from)) children.set(from, []);
    children.get(from)!.push({ at: p, slit, loop: h.loop });
    reached.push(h.loop);
  };
  // The planner's slits first: from the outer loop at the point nearest the one chosen, straight to the hole.
  const pending = holeLoops.filter((h) => !opts.slits?.[h.hole]);
  for (const h of holeLoops.filter((x) => opts.slits?.[x.hole])) {
    const chosen = opts.slits![h.hole]!;
    const p = nearestOnLoop(outer, chosen);
    const q = nearestOnLoop(h.loop, p);
    if (segmentHitsLoop(q, p, outer, 0, 1e-6) || holeLoops.some((o) => o !== h && segmentHitsLoop(p, q, o.loop)))
      throw new ToolpathError(
        `The slit to hole ${h.hole + 1} from ${at(p)} mm would cross another hole or the outline: choose another point.`,
      );
    link(h, outer, p, q);
  }
  // The others by shortest slit from any loop already reached: the shortest such slit cannot cross a
  // loop not yet reached (that loop would be nearer) nor one reached (a shorter slit would start on it).
  while (pending.length) {
    let best = { k: 0, from: outer, p: outer[0]!, q: outer[0]!, d: Infinity };
    pending.forEach((h, k) => {
      for (const from of reached) {
        const c = closestPair(from, h.loop);
        if (c.d < best.d) best = { k, from, p: c.p, q: c.q, d: c.d };
      }
    });
    link(pending.splice(best.k, 1)[0]!, best.from, best.p, best.q);
  }

  // Dwell corners: the part's vertices turning by at least the angle, found on the loop that cuts them.
  const dwellAt = new Map<Point[], Set<number>>();
  const corners: Point[] = [];
  if (opts.dwell && opts.dwell.seconds > 0) {
    const sources: [Point[], Point[]][] = [
      [outerIn, outer],
      ...holeLoops.map((h): [Point[], Point[]] => [holesIn[h.hole]!, h.loop]),
    ];
    for (const [src, loop] of sources) {
      const turns = turnAngles(src);
      src.forEach((v, i) => {
        if (turns[i]! + 1e-9 < opts.dwell!.angleDeg) return;
        // A split hole: only the loop that passes this corner.
        if (loop !== outer && Math.min(...loop.map((p) => dist(p, v))) > r * 4 + 1) return;
        if (!dwellAt.has(loop)) dwellAt.set(loop, new Set());
        dwellAt.get(loop)!.add(dwellIndex(loop, v));
      });
    }
  }

  // The route: lead-in, the outer loop from the entry with each hole on the way, back to the entry, out.
  const route: RoutePoint[] = [];
  const walk = (loop: Point[], start: Point) => {
    const n = loop.length;
    const s = loop.findIndex((p) => dist(p, start) < 1e-7);
    const dw = dwellAt.get(loop);
    for (let k = 0; k <= n; k++) {
      const i = (s + k) % n;
      const p = loop[i]!;
      const wait = k < n && dw?.has(i) ? opts.dwell!.seconds : undefined;
      route.push(wait ? { p, dwell: wait } : { p });
      if (wait) corners.push(p);
      if (k === n) break;
      for (const c of children.get(loop) ?? [])
        if (dist(c.at, p) < 1e-7) {
          walk(c.loop, c.slit.to);
          route.push({ p }); // back along the slit
        }
    }
  };
  walk(outer, entry);
  // Drop zero-length steps (a slit of length 0 where a hole's path meets the outer one).
  const loopRoute: RoutePoint[] = [];
  for (const q of route) {
    const last = loopRoute.at(-1);
    if (last && dist(last.p, q.p) < 1e-9) {
      if (q.dwell) last.dwell = q.dwell;
      continue;
    }
    loopRoute.push(q);
  }
  // The same with the lead-in and lead-out (of length 0 when the path reaches past the face).
  const clean: RoutePoint[] = [];
  for (const q of [{ p: leadFrom }, ...loopRoute, { p: leadFrom }]) {
    const last = clean.at(-1);
    if (last && dist(last.p, q.p) < 1e-9) {
      if (q.dwell) last.dwell = q.dwell;
      continue;
    }
    clean.push(q);
  }
  let lengthMm = 0;
  for (let i = 1; i < clean.length; i++) lengthMm += dist(clean[i - 1]!.p, clean[i]!.p);

  const n = outer.length;
  const s = outer.findIndex((p) => dist(p, entry) < 1e-7);
  const rotated = [...outer.slice(s), ...outer.slice(0, s)].slice(0, n);
  return {
    kerf: opts.kerf,
    outer: rotated,
    holes: holeLoops.map((h) => {
      const slit = slits.find((x) => h.loop.some((p) => dist(p, x.to) < 1e-7));
      const k = slit ? h.loop.findIndex((p) => dist(p, slit.to) < 1e-7) : 0;
      return { hole: h.hole, loop: [...h.loop.slice(k), ...h.loop.slice(0, k)] };
    }),
    leadIn: { face, from: leadFrom, to: entry },
    leadOut: { face, from: entry, to: leadFrom },
    slits,
    route: clean,
    loop: loopRoute,
    corners,
    lengthMm,
    warnings,
  };
}
