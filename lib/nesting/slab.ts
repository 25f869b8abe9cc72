/**
 * Slabs of true-shape nested profile parts (`settings.trueShape`): reading a part's outline, the
 * region a part occupies in a slab's face, lead-in corridors, and the check of a slab's members
 * (README, "Slabs of true-shape nested profiles"). Pure: no I/O. Its one outside import is
 * Clipper2 (unions and offsets); the checks use plain distances and the irregular engine's
 * intersection area.
 *
 * Rules:
 * - Holes: in a slab no part sits in another part's hole. The wire reaches a part only through a
 *   lead-in from a slab face, and one inside a counter could only be reached by cutting through the
 *   part around it; the counter's foam falls out as scrap. So a member occupies its outer loop.
 * - A tapered (4-axis) part occupies the union of its root and tip sections' outer loops (the wire
 *   sweeps between them; the union is conservative).
 * - Lead-in corridor: a straight slot, kerf wide, perpendicular to the left, right or top face of
 *   the slab (never the bottom: a horizontal wire cannot come up through the table), from that face
 *   to a point of the wire's path round the part (kerf / 2 outside it). It must keep kerf / 2 from
 *   every other member, so cutting it never touches another part.
 * - Chained lead-in (`leadIn.via`): a member no face corridor reaches (walled in by others) may be
 *   entered through an earlier member's kerf: the wire comes in by that member's lead-in, runs along
 *   its already cut path to `from`, and crosses the waste on a straight bridge, kerf wide, to `to`
 *   on this member's path, keeping kerf / 2 from every other member; it leaves the same way.
 *   Running in a kerf the wire has already cut is common practice on hot-wire machines (common
 *   practice, no source). The host comes earlier in `members` (it is cut first), so a chain always
 *   ends at a member with a face corridor and has no cycle.
 */
import { EndType, FillRule, inflatePathsD, JoinType, type PathD, unionD } from "@countertype/clipper2-ts";
import {
  bboxOf,
  type BBox,
  dedupe,
  loopDistance,
  rotateLoop,
  selfCrossing,
  signedArea,
  winding,
} from "./irregular/geometry";
import { intersectionArea, OVERLAP_SHARE, type PlacedOutline } from "./irregular/validate";
import type {
  FacePoint,
  LeadIn,
  LeadInFace,
  Part,
  PartOutline,
  Problem,
  Rotate,
  SlabLayout,
  SlabMember,
  Vec3,
} from "./types";

/** Faces a lead-in may start from, in the order they are tried. */
export const LEAD_IN_FACES: readonly LeadInFace[] = ["top", "right", "left"];
/** How far an outline may reach past its part's box, mm (sizes are kept to 0.01 mm). */
export const OUTLINE_BOX_TOL = 0.011;
/** How far the lead-in's end may sit from the wire's path (kerf / 2 off the part), mm: the chords of a round offset. */
export const LEAD_IN_TOL = 0.02;

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

function readLoop(raw: unknown, path: string, size: Vec3, errors: string[]): FacePoint[] | undefined {
  if (!Array.isArray(raw)) return void errors.push(`${path}: must be an array of [u, v] points`);
  const pts: FacePoint[] = [];
  for (const [i, p] of raw.entries()) {
    if (!Array.isArray(p) || p.length !== 2 || !isNum(p[0]) || !isNum(p[1]))
      return void errors.push(`${path}[${i}]: must be a point [u, v] of 2 finite numbers`);
    pts.push([p[0], p[1]]);
  }
  const loop = dedupe(pts);
  if (loop.length < 3) return void errors.push(`${path}: needs at least 3 different points`);
  const cross = selfCrossing(loop);
  if (cross) return void errors.push(`${path}: edges ${cross[0]} and ${cross[1]} cross or touch`);
  if (Math.abs(signedArea(loop)) <= 0) return void errors.push(`${path}: encloses no area`);
  const b = bboxOf([loop]);
  if (b.minX < -OUTLINE_BOX_TOL || b.minY < -OUTLINE_BOX_TOL)
    return void errors.push(`${path}: reaches below 0 (the part's box starts at its corner)`);
  if (b.maxX > size[1] + OUTLINE_BOX_TOL || b.maxY > size[2] + OUTLINE_BOX_TOL)
    return void errors.push(`${path}: reaches past the part's face ${size[1]} × ${size[2]} (its size[1] × size[2])`);
  return loop;
}

function readSection(raw: Obj, path: string, size: Vec3, errors: string[]): PartOutline | undefined {
  const outer = readLoop(raw.outer, `${path}.outer`, size, errors);
  const holes: FacePoint[][] = [];
  if (raw.holes !== undefined) {
    if (!Array.isArray(raw.holes)) errors.push(`${path}.holes: must be an array of loops`);
    else
      for (const [i, h] of raw.holes.entries()) {
        const loop = readLoop(h, `${path}.holes[${i}]`, size, errors);
        if (loop && outer && winding(outer, loop[0]![0], loop[0]![1]) === 0)
          errors.push(`${path}.holes[${i}]: must lie inside the outer loop`);
        if (loop) holes.push(loop);
      }
  }
  return outer ? { outer, ...(holes.length ? { holes } : {}) } : undefined;
}

/**
 * Reads the optional `outline` of a part (its profile in the box's y–z face, u along y, v along z)
 * and names every problem by its path.
 * @example readOutline({ outer: [[0, 0], [40, 0], [0, 30]] }, "parts[0].outline", [50, 40, 30]).outline?.outer.length // → 3
 */
export function readOutline(raw: unknown, path: string, size: Vec3): { outline?: PartOutline; errors: string[] } {
  const errors: string[] = [];
  if (!isObj(raw)) return { errors: [`${path}: must be an object { outer, holes?, tip? }`] };
  const root = readSection(raw, path, size, errors);
  let tip: PartOutline | undefined;
  if (raw.tip !== undefined) {
    if (!isObj(raw.tip)) errors.push(`${path}.tip: must be an object { outer, holes? }`);
    else tip = readSection(raw.tip, `${path}.tip`, size, errors);
  }
  if (errors.length || !root) return { errors };
  return {
    outline: { ...root, ...(tip ? { tip: { outer: tip.outer, ...(tip.holes ? { holes: tip.holes } : {}) } } : {}) },
    errors,
  };
}

const toPath = (l: readonly FacePoint[]): PathD => l.map(([x, y]) => ({ x, y }));
const fromPath = (p: PathD): FacePoint[] => p.map((q) => [q.x, q.y]);
const ccw = (l: FacePoint[]): FacePoint[] => (signedArea(l) < 0 ? [...l].reverse() : l);

/** Convex hull (monotone chain), anticlockwise. */
function hull(points: readonly FacePoint[]): FacePoint[] {
  const p = [...points].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  const cross = (o: FacePoint, a: FacePoint, b: FacePoint) =>
    (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
  const lower: FacePoint[] = [];
  for (const q of p) {
    while (lower.length >= 2 && cross(lower.at(-2)!, lower.at(-1)!, q) <= 0) lower.pop();
    lower.push(q);
  }
  const upper: FacePoint[] = [];
  for (const q of p.reverse()) {
    while (upper.length >= 2 && cross(upper.at(-2)!, upper.at(-1)!, q) <= 0) upper.pop();
    upper.push(q);
  }
  return [...lower.slice(0, -1), ...upper.slice(0, -1)];
}

const occupiedCache = new WeakMap<PartOutline, FacePoint[]>();

/**
 * The loop a profile part occupies in a slab's face: its outer loop (holes stay foam of the part:
 * nothing is nested into them), for a tapered part the union of root and tip (their convex hull if
 * they do not meet). Anticlockwise.
 * @example occupiedOutline({ outer: [[0, 0], [10, 0], [0, 10]] }) // → [[0, 0], [10, 0], [0, 10]]
 */
export function occupiedOutline(o: PartOutline): FacePoint[] {
  const hit = occupiedCache.get(o);
  if (hit) return hit;
  let loop: FacePoint[];
  if (!o.tip) loop = ccw(dedupe(o.outer));
  else {
    const u = unionD([toPath(o.outer), toPath(o.tip.outer)], [], FillRule.NonZero, 6).filter((p) => p.length >= 3);
    const outers = u.map(fromPath).filter((l) => signedArea(l) > 0);
    loop = outers.length === 1 ? dedupe(outers[0]!) : hull([...o.outer, ...o.tip.outer]);
  }
  occupiedCache.set(o, loop);
  return loop;
}

/**
 * A member's occupied loop where it lies in the slab's face.
 * @example memberLoop([[0, 0], [10, 0], [0, 5]], 90, [20, 0]) // → [[20, 0], [20, 10], [15, 0]]
 */
export function memberLoop(occupied: readonly FacePoint[], rotation: number, at: FacePoint): FacePoint[] {
  return rotateLoop(occupied, rotation).map(([x, y]) => [x + at[0], y + at[1]] as FacePoint);
}

/**
 * Rotations a part may take in a slab's face: quarter turns about the wire for `rotate: "any"`;
 * none otherwise ("z" keeps the part's top up, "none" keeps the part as drawn).
 * @example faceRotations("any") // → [0, 90, 180, 270]
 */
export function faceRotations(rotate: Rotate): number[] {
  return rotate === "any" ? [0, 90, 180, 270] : [0];
}

/** How strict a rotate rule is: a slab takes the strictest rule of its members. */
export const ROTATE_RANK: Record<Rotate, number> = { any: 0, z: 1, none: 2 };

/**
 * Where a lead-in starts: the foot on `face` of the perpendicular from `to` (the point itself when
 * it lies beyond the face already).
 * @example leadInFoot([30, 12], "top", [100, 50]) // → [30, 50]
 */
export function leadInFoot(to: FacePoint, face: LeadInFace, uv: [number, number]): FacePoint {
  if (face === "left") return [Math.min(to[0], 0), to[1]];
  if (face === "right") return [Math.max(to[0], uv[0]), to[1]];
  return [to[0], Math.max(to[1], uv[1])];
}

/**
 * Distance from the segment ab to a loop's region: 0 when the segment meets or lies inside it.
 * @example slotClearance([0, 5], [0, 9], [[2, 0], [4, 0], [4, 4]]) // → 2
 */
export function slotClearance(a: FacePoint, b: FacePoint, loop: readonly FacePoint[]): number {
  if (winding(loop, a[0], a[1]) !== 0) return 0;
  return loopDistance([a, b], loop);
}

export interface PlacedMember {
  loop: FacePoint[];
  bb: BBox;
  area: number;
}

/**
 * The wire's path round an occupied loop: kerf / 2 outside it, round joins (chords within 0.01 mm),
 * the largest loop of the offset; the loop itself for no kerf.
 */
export function wirePath(loop: readonly FacePoint[], kerf: number): FacePoint[] {
  if (!(kerf > 0)) return [...loop];
  const off = inflatePathsD([toPath(loop)], kerf / 2, JoinType.Round, EndType.Polygon, 2, 4, 0.01);
  let best: FacePoint[] = [...loop];
  let bestArea = -Infinity;
  for (const p of off) {
    const l = fromPath(p);
    const a = signedArea(l);
    if (a > bestArea) {
      bestArea = a;
      best = l;
    }
  }
  return best;
}

/** Crossings of the line {axis = c} with a loop: the other coordinate at each crossing. */
function crossings(loop: readonly FacePoint[], axis: 0 | 1, c: number): number[] {
  const o = (1 - axis) as 0 | 1;
  const out: number[] = [];
  for (let i = 0, j = loop.length - 1; i < loop.length; j = i++) {
    const p = loop[j]!;
    const q = loop[i]!;
    if (p[axis] <= c === q[axis] <= c) continue;
    const t = (c - p[axis]) / (q[axis] - p[axis]);
    out.push(p[o] + t * (q[o] - p[o]));
  }
  return out;
}

/**
 * A clear lead-in corridor for member `k`: the shortest of the slots from the left, right or top
 * face to its wire path, tried at the path's extreme point toward each face and at 11 stations
 * across it, that keeps kerf / 2 (and 1 µm) from every other member. Null when every one is blocked.
 * @example findLeadIn(members, 0, [600, 400], 1.5) // → { face: "top", to: [120.5, 310.75] }
 */
export function findLeadIn(
  members: readonly PlacedMember[],
  k: number,
  uv: [number, number],
  kerf: number,
): SlabMember["leadIn"] | null {
  const own = members[k]!;
  const r = kerf / 2;
  const path = wirePath(own.loop, kerf);
  const pb = bboxOf([path]);
  const cands: { face: LeadInFace; to: FacePoint; len: number }[] = [];
  const stations = [0.5, 0.3, 0.7, 0.15, 0.85, 0.4, 0.6, 0.05, 0.95, 0.22, 0.78];
  for (const face of LEAD_IN_FACES) {
    const axis: 0 | 1 = face === "top" ? 0 : 1; // the line runs across this axis's stations
    const lo = axis === 0 ? pb.minX : pb.minY;
    const hi = axis === 0 ? pb.maxX : pb.maxY;
    // The extreme vertex toward the face.
    let ext = path[0]!;
    for (const p of path)
      if (face === "top" ? p[1] > ext[1] : face === "right" ? p[0] > ext[0] : p[0] < ext[0]) ext = p;
    const tos: FacePoint[] = [ext];
    for (const s of stations) {
      const c = lo + s * (hi - lo);
      const xs = crossings(path, axis, c);
      if (!xs.length) continue;
      const far = face === "left" ? Math.min(...xs) : Math.max(...xs);
      tos.push(axis === 0 ? [c, far] : [far, c]);
    }
    for (const to of tos) {
      const foot = leadInFoot(to, face, uv);
      cands.push({ face, to, len: Math.hypot(foot[0] - to[0], foot[1] - to[1]) });
    }
  }
  cands.sort((a, b) => a.len - b.len);
  for (const c of cands) {
    const foot = leadInFoot(c.to, c.face, uv);
    const sb = {
      minX: Math.min(foot[0], c.to[0]) - r,
      maxX: Math.max(foot[0], c.to[0]) + r,
      minY: Math.min(foot[1], c.to[1]) - r,
      maxY: Math.max(foot[1], c.to[1]) + r,
    };
    let clear = true;
    for (let j = 0; j < members.length && clear; j++) {
      if (j === k) continue;
      const m = members[j]!;
      if (m.bb.minX > sb.maxX || m.bb.maxX < sb.minX || m.bb.minY > sb.maxY || m.bb.maxY < sb.minY) continue;
      if (slotClearance(c.to, foot, m.loop) < r + 1e-3) clear = false;
    }
    if (clear) return { face: c.face, to: c.to };
  }
  return null;
}

/** The point of segment ab nearest to p. */
function nearestOnSeg(p: FacePoint, a: FacePoint, b: FacePoint): FacePoint {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const l2 = dx * dx + dy * dy;
  const t = l2 > 0 ? Math.min(1, Math.max(0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / l2)) : 0;
  return [a[0] + t * dx, a[1] + t * dy];
}

/** The point of a closed path nearest to p, and its distance. */
function nearestOnPath(p: FacePoint, path: readonly FacePoint[]): { q: FacePoint; d: number } {
  let best: FacePoint = path[0]!;
  let bd = Infinity;
  for (let i = 0, j = path.length - 1; i < path.length; j = i++) {
    const q = nearestOnSeg(p, path[j]!, path[i]!);
    const d = Math.hypot(q[0] - p[0], q[1] - p[1]);
    if (d < bd) {
      bd = d;
      best = q;
    }
  }
  return { q: best, d: bd };
}

/** Whether a slot from a to b keeps kerf / 2 (and 1 µm) from every member but those in `skip`. */
function slotClear(
  members: readonly PlacedMember[],
  a: FacePoint,
  b: FacePoint,
  r: number,
  skip: readonly number[],
): boolean {
  const sb = {
    minX: Math.min(a[0], b[0]) - r,
    maxX: Math.max(a[0], b[0]) + r,
    minY: Math.min(a[1], b[1]) - r,
    maxY: Math.max(a[1], b[1]) + r,
  };
  for (let j = 0; j < members.length; j++) {
    if (skip.includes(j)) continue;
    const m = members[j]!;
    if (m.bb.minX > sb.maxX || m.bb.maxX < sb.minX || m.bb.minY > sb.maxY || m.bb.maxY < sb.minY) continue;
    if (slotClearance(a, b, m.loop) < r + 1e-3) return false;
  }
  return true;
}

/**
 * Whether a straight line from p (on the wire's path round a member) leaves the member's box in
 * one of the four directions without nearing the member: a profile program finds the entry on the
 * path only from such a line.
 */
function seesOut(p: FacePoint, m: PlacedMember, r: number): boolean {
  const b = m.bb;
  const rays: [FacePoint, FacePoint][] = [
    [
      [p[0] - 0.5, p[1]],
      [b.minX - r - 1, p[1]],
    ],
    [
      [p[0] + 0.5, p[1]],
      [b.maxX + r + 1, p[1]],
    ],
    [
      [p[0], p[1] - 0.5],
      [p[0], b.minY - r - 1],
    ],
    [
      [p[0], p[1] + 0.5],
      [p[0], b.maxY + r + 1],
    ],
  ];
  return rays.some(
    ([a, f]) =>
      (f[0] - a[0]) * (f[0] - p[0]) + (f[1] - a[1]) * (f[1] - p[1]) <= 0 || loopDistance([a, f], m.loop) >= r + 0.05,
  );
}

/** Hosts tried per walled-in member (the nearest by their boxes), and points of its path tried per host. */
const BRIDGE_HOSTS = 6;
const BRIDGE_POINTS = 96;
const BRIDGE_TRIES = 16;

/**
 * A chained lead-in for member `k` that no face corridor reaches: a straight bridge, kerf wide,
 * from the wire path of one of `hosts` (members already reachable, cut before it) to its own path,
 * keeping kerf / 2 from every other member and not cutting into either part. The shortest clear
 * bridge over the nearest hosts; null when none is clear. `paths` caches the members' wire paths.
 * @example findBridge(members, 3, [0, 1], 1.5, paths) // → { via: 1, from: [212.3, 80.75], to: [212.3, 82.25] }
 */
export function findBridge(
  members: readonly PlacedMember[],
  k: number,
  hosts: readonly number[],
  kerf: number,
  paths: (FacePoint[] | undefined)[],
): { via: number; from: FacePoint; to: FacePoint } | null {
  const r = kerf / 2;
  const pathOf = (i: number) => {
    paths[i] ??= wirePath(members[i]!.loop, kerf);
    return paths[i]!;
  };
  const own = members[k]!;
  const gap = (b: BBox) =>
    Math.max(0, b.minX - own.bb.maxX, own.bb.minX - b.maxX) + Math.max(0, b.minY - own.bb.maxY, own.bb.minY - b.maxY);
  const near = [...hosts].sort((a, b) => gap(members[a]!.bb) - gap(members[b]!.bb) || a - b).slice(0, BRIDGE_HOSTS);
  const ownPath = pathOf(k);
  const step = Math.max(1, Math.floor(ownPath.length / BRIDGE_POINTS));
  const cands: { via: number; from: FacePoint; to: FacePoint; len: number }[] = [];
  for (const j of near) {
    const hostPath = pathOf(j);
    const hb = members[j]!.bb;
    for (let i = 0; i < ownPath.length; i += step) {
      const to = ownPath[i]!;
      // A point of the path farther from the host's box than the best so far cannot give a shorter bridge.
      const dBox = Math.hypot(
        Math.max(0, hb.minX - to[0], to[0] - hb.maxX),
        Math.max(0, hb.minY - to[1], to[1] - hb.maxY),
      );
      if (dBox > 4 * kerf + 50) continue;
      const { q, d } = nearestOnPath(to, hostPath);
      cands.push({ via: j, from: q, to, len: d });
    }
  }
  cands.sort((a, b) => a.len - b.len || a.via - b.via);
  let tries = 0;
  for (const c of cands) {
    if (tries++ >= BRIDGE_TRIES) break;
    const host = members[c.via]!;
    if (!seesOut(c.to, own, r)) continue;
    if (c.len > 1e-9) {
      if (loopDistance([c.from, c.to], own.loop) < r - LEAD_IN_TOL) continue;
      if (loopDistance([c.from, c.to], host.loop) < r - LEAD_IN_TOL) continue;
    }
    if (!slotClear(members, c.from, c.to, r, [k, c.via])) continue;
    return { via: c.via, from: c.from, to: c.to };
  }
  return null;
}

/**
 * Lead-ins for every member of a layout: a face corridor where one is clear, else a chained
 * lead-in through a member reached before it. Returns the order to cut them in (every host before
 * the members chained through it) and each member's lead-in with `via` naming its host's place in
 * that order; `blocked` lists the members neither reaches.
 * @example leadIns(members, [600, 400], 1.5).blocked // → [] when every member is reachable
 */
export function leadIns(
  members: readonly PlacedMember[],
  uv: [number, number],
  kerf: number,
  chainable: (k: number) => boolean = () => true,
): { order: number[]; leads: LeadIn[]; blocked: number[] } {
  const face = members.map((_, k) => findLeadIn(members, k, uv, kerf));
  const order = face.map((l, k) => (l ? k : -1)).filter((k) => k >= 0);
  const byMember = new Map<number, LeadIn>(order.map((k) => [k, face[k]!]));
  let pending = face.map((l, k) => (l ? -1 : k)).filter((k) => k >= 0);
  const paths: (FacePoint[] | undefined)[] = [];
  while (pending.length && order.length) {
    const still: number[] = [];
    const hosts = order.filter(chainable);
    for (const k of pending) {
      const b = chainable(k) && hosts.length ? findBridge(members, k, hosts, kerf, paths) : null;
      if (!b) {
        still.push(k);
        continue;
      }
      byMember.set(k, { face: byMember.get(b.via)!.face, to: b.to, via: b.via, from: b.from });
      order.push(k);
      hosts.push(k);
    }
    if (still.length === pending.length) break;
    pending = still;
  }
  const place = new Map(order.map((k, i) => [k, i]));
  const leads = order.map((k) => {
    const l = byMember.get(k)!;
    return l.via === undefined ? l : { ...l, via: place.get(l.via)! };
  });
  return { order, leads, blocked: pending };
}

/**
 * Places members' occupied loops (for checks and drawings).
 * @example placeMembers(problem, slab)[0].loop // the first member's loop in the slab's face
 */
export function placeMembers(
  parts: ReadonlyMap<string, Part>,
  members: readonly SlabMember[],
): (PlacedMember | null)[] {
  return members.map((m) => {
    const part = parts.get(m.part);
    if (!part?.outline || !Array.isArray(m.at) || !isNum(m.at[0]) || !isNum(m.at[1]) || !isNum(m.rotation)) return null;
    const loop = memberLoop(occupiedOutline(part.outline), m.rotation, m.at);
    return { loop, bb: bboxOf([loop]), area: Math.abs(signedArea(loop)) };
  });
}

const fmt = (v: number): string => String(Number(v.toPrecision(7)));

export interface SlabCheck {
  errors: string[];
  /** Members that break a rule (by index), so a planner can take them out. */
  bad: Set<number>;
  /** Copies per part the slab holds. */
  counts: Map<string, number>;
}

/**
 * Checks the members of a slab placement at `path` ("placements[3].slab"): each part known, with an
 * outline, of the slab's grade and thickness, a rotate rule the slab keeps, a listed rotation;
 * inside the slab's face; no two overlapping (intersection ≤ 1e-6 of the smaller) and each pair at
 * least the kerf apart; every lead-in corridor clear (its end on the wire's path, its slot kerf / 2
 * from every other member).
 * @example checkSlab(problem, plan.placements[0].slab!, "placements[0].slab").errors // → []
 */
export function checkSlab(problem: Problem, slab: SlabLayout, path: string): SlabCheck {
  const errors: string[] = [];
  const bad = new Set<number>();
  const counts = new Map<string, number>();
  const kerf = problem.settings.kerf;
  const r = kerf / 2;
  const parts = new Map(problem.parts.map((p) => [p.id, p]));
  const size = slab.size;
  if (!Array.isArray(size) || size.length !== 3 || !size.every((v) => isNum(v) && v > 0)) {
    errors.push(`${path}.size: must be 3 numbers > 0`);
    return { errors, bad, counts };
  }
  if (!(slab.rotate in ROTATE_RANK)) errors.push(`${path}.rotate: must be one of "any", "z", "none"`);
  const max = problem.settings.slabMax;
  if (max) {
    const over = ["thickness", "face u", "face v"].filter((_, i) => size[i]! > max[i]! + 1e-6);
    if (over.length)
      errors.push(
        `${path}.size: ${size.map((v) => Math.round(v * 10) / 10).join(" × ")} is larger than the profile cutter takes (settings.slabMax ${max.join(" × ")}: ${over.join(", ")})`,
      );
  }
  if (!Array.isArray(slab.members) || slab.members.length === 0) {
    errors.push(`${path}.members: must list at least one part`);
    return { errors, bad, counts };
  }
  const U = size[1];
  const V = size[2];
  const fail = (k: number, msg: string) => {
    errors.push(`${path}.members[${k}]: ${msg}`);
    bad.add(k);
  };
  for (const [k, m] of slab.members.entries()) {
    const part = parts.get(m.part);
    if (!part) {
      fail(k, `unknown part "${m.part}"`);
      continue;
    }
    counts.set(part.id, (counts.get(part.id) ?? 0) + 1);
    if (!part.outline) fail(k, `part ${part.id} has no outline to nest`);
    if (part.grade !== slab.grade)
      fail(k, `part ${part.id} of grade ${part.grade ?? "(none)"} in a slab of grade ${slab.grade ?? "(none)"}`);
    if (Math.abs(part.size[0] - size[0]) > OUTLINE_BOX_TOL)
      fail(k, `part ${part.id} is ${part.size[0]} long along the wire, the slab ${size[0]}`);
    if (ROTATE_RANK[slab.rotate] < ROTATE_RANK[part.rotate])
      fail(k, `part ${part.id} has rotate "${part.rotate}" but the slab may turn "${slab.rotate}"`);
    const rot = ((m.rotation % 360) + 360) % 360;
    const allowed = faceRotations(part.rotate);
    if (!isNum(m.rotation) || !allowed.some((a) => Math.abs(a - rot) < 1e-9))
      fail(k, `rotation ${m.rotation}° is not allowed for part ${part.id} (allowed ${allowed.join(", ")})`);
    if (!Array.isArray(m.at) || !isNum(m.at[0]) || !isNum(m.at[1])) fail(k, "at: must be a point [u, v]");
    const li = m.leadIn;
    if (!isObj(li) || !LEAD_IN_FACES.includes(li.face) || !Array.isArray(li.to) || !isNum(li.to[0]) || !isNum(li.to[1]))
      fail(k, `leadIn: must be { face: "left" | "right" | "top", to: [u, v] }`);
    else if (li.via !== undefined || li.from !== undefined) {
      if (!Number.isInteger(li.via) || li.via! < 0 || li.via! >= k)
        fail(
          k,
          `leadIn.via: must be the index of an earlier member (one cut before this one, 0 to ${k - 1}), not ${JSON.stringify(li.via ?? null)}`,
        );
      else if (!Array.isArray(li.from) || !isNum(li.from[0]) || !isNum(li.from[1]))
        fail(k, "leadIn.from: must be a point [u, v] on the wire's path of the member named by leadIn.via");
    }
  }
  if (errors.length) return { errors, bad, counts };

  const placed = placeMembers(parts, slab.members) as PlacedMember[];
  const tol = 1e-6 * Math.max(U, V, 1);
  for (const [k, m] of placed.entries()) {
    if (m.bb.minX < -tol || m.bb.minY < -tol || m.bb.maxX > U + tol || m.bb.maxY > V + tol)
      fail(
        k,
        `part ${slab.members[k]!.part} lies outside the slab's face ${fmt(U)} × ${fmt(V)} (box ${fmt(m.bb.minX)}..${fmt(m.bb.maxX)} × ${fmt(m.bb.minY)}..${fmt(m.bb.maxY)})`,
      );
  }
  // Pairs: overlap by Clipper's intersection area, spacing by edge distance.
  const asOutline = (m: PlacedMember, k: number): PlacedOutline => ({
    label: `#${k}`,
    loops: [m.loop],
    bb: m.bb,
    area: m.area,
  });
  for (let a = 0; a < placed.length; a++)
    for (let b = a + 1; b < placed.length; b++) {
      const A = placed[a]!;
      const B = placed[b]!;
      if (B.bb.minX >= A.bb.maxX + kerf || A.bb.minX >= B.bb.maxX + kerf) continue;
      if (B.bb.minY >= A.bb.maxY + kerf || A.bb.minY >= B.bb.maxY + kerf) continue;
      const inter = intersectionArea(asOutline(A, a), asOutline(B, b));
      const names = `${path}.members[${a}] (${slab.members[a]!.part}) and members[${b}] (${slab.members[b]!.part})`;
      if (
        inter > OVERLAP_SHARE * Math.min(A.area, B.area) ||
        winding(A.loop, B.loop[0]![0], B.loop[0]![1]) !== 0 ||
        winding(B.loop, A.loop[0]![0], A.loop[0]![1]) !== 0
      ) {
        errors.push(`${names} overlap (area ${fmt(inter)} mm²)`);
        bad.add(b);
        continue;
      }
      if (kerf > 0) {
        const d = loopDistance(A.loop, B.loop);
        if (d < kerf * (1 - 1e-6) - tol) {
          errors.push(`${names} are ${fmt(d)} apart, less than the kerf ${kerf}`);
          bad.add(b);
        }
      }
    }
  // Corridors.
  for (const [k, m] of slab.members.entries()) {
    const own = placed[k]!;
    const { face, to } = m.leadIn;
    const foot = leadInFoot(to, face, [U, V]);
    const dOwn = loopDistance([to, to], own.loop);
    if (dOwn > r + LEAD_IN_TOL || dOwn < r - LEAD_IN_TOL || (dOwn > 1e-9 && winding(own.loop, to[0], to[1]) !== 0)) {
      fail(
        k,
        `leadIn.to ${fmt(to[0])}, ${fmt(to[1])} is ${fmt(dOwn)} from the part, not on the wire's path (kerf / 2 = ${fmt(r)})`,
      );
      continue;
    }
    if (
      to[0] < -r - LEAD_IN_TOL ||
      to[0] > U + r + LEAD_IN_TOL ||
      to[1] < -r - LEAD_IN_TOL ||
      to[1] > V + r + LEAD_IN_TOL
    ) {
      fail(k, "leadIn.to lies outside the slab");
      continue;
    }
    const via = m.leadIn.via;
    if (via !== undefined) {
      // A chained lead-in: the bridge from the host's wire path to this member's.
      const host = placed[via]!;
      const from = m.leadIn.from!;
      const dHost = loopDistance([from, from], host.loop);
      if (
        dHost > r + LEAD_IN_TOL ||
        dHost < r - LEAD_IN_TOL ||
        (dHost > 1e-9 && winding(host.loop, from[0], from[1]) !== 0)
      ) {
        fail(
          k,
          `leadIn.from ${fmt(from[0])}, ${fmt(from[1])} is ${fmt(dHost)} from members[${via}] (${slab.members[via]!.part}), not on its wire's path (kerf / 2 = ${fmt(r)})`,
        );
        continue;
      }
      if (m.leadIn.face !== slab.members[via]!.leadIn.face) {
        fail(
          k,
          `leadIn.face: a chained lead-in starts where its host's does (${slab.members[via]!.leadIn.face}), not ${face}`,
        );
        continue;
      }
      const long = Math.hypot(from[0] - to[0], from[1] - to[1]) > 1e-9;
      if (long && loopDistance([from, to], own.loop) < r - LEAD_IN_TOL) {
        fail(k, `the bridge from members[${via}] cuts through its own part ${m.part}`);
        continue;
      }
      if (long && loopDistance([from, to], host.loop) < r - LEAD_IN_TOL) {
        fail(k, `the bridge cuts through members[${via}] (${slab.members[via]!.part}), the member it starts from`);
        continue;
      }
      for (const [j, o] of placed.entries()) {
        if (j === k || j === via) continue;
        const d = slotClearance(from, to, o.loop);
        if (d < r - 1e-6) {
          fail(
            k,
            `the bridge from members[${via}] at ${fmt(from[0])}, ${fmt(from[1])} to ${fmt(to[0])}, ${fmt(to[1])} is blocked by members[${j}] (${slab.members[j]!.part}): ${fmt(d)} from it, kerf / 2 = ${fmt(r)}`,
          );
          break;
        }
      }
      continue;
    }
    if (loopDistance([foot, to], own.loop) < r - LEAD_IN_TOL) {
      fail(k, `the lead-in from the ${face} face cuts through its own part ${m.part}`);
      continue;
    }
    for (const [j, o] of placed.entries()) {
      if (j === k) continue;
      const d = slotClearance(to, foot, o.loop);
      if (d < r - 1e-6) {
        fail(
          k,
          `the lead-in corridor from the ${face} face to ${fmt(to[0])}, ${fmt(to[1])} is blocked by members[${j}] (${slab.members[j]!.part}): ${fmt(d)} from it, kerf / 2 = ${fmt(r)}`,
        );
        break;
      }
    }
  }
  return { errors, bad, counts };
}
