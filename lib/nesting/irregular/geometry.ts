/** Plain polygon helpers for the irregular nesting engine (floating point, no library). */
import type { Pt } from "./types";

/**
 * Signed area of a loop (positive when counter-clockwise, y up), shoelace formula.
 * @example signedArea([[0, 0], [2, 0], [2, 1], [0, 1]]) // → 2
 */
export function signedArea(loop: readonly Pt[]): number {
  let s = 0;
  for (let i = 0, j = loop.length - 1; i < loop.length; j = i++) {
    const a = loop[j]!;
    const b = loop[i]!;
    s += a[0] * b[1] - b[0] * a[1];
  }
  return s / 2;
}

/**
 * Area of an outline with holes.
 * @example outlineArea([[0, 0], [4, 0], [4, 4], [0, 4]], [[[1, 1], [3, 1], [3, 3], [1, 3]]]) // → 12
 */
export function outlineArea(outer: readonly Pt[], holes: readonly (readonly Pt[])[]): number {
  return Math.abs(signedArea(outer)) - holes.reduce((s, h) => s + Math.abs(signedArea(h)), 0);
}

/**
 * cos and sin of an angle in degrees, exact for multiples of 90.
 * @example cosSin(90) // → [0, 1]
 */
export function cosSin(deg: number): [number, number] {
  const d = ((deg % 360) + 360) % 360;
  if (d === 0) return [1, 0];
  if (d === 90) return [0, 1];
  if (d === 180) return [-1, 0];
  if (d === 270) return [0, -1];
  const r = (d * Math.PI) / 180;
  return [Math.cos(r), Math.sin(r)];
}

/**
 * A loop rotated by `deg` (counter-clockwise) about the origin; exact for multiples of 90°.
 * @example rotateLoop([[1, 0]], 90) // → [[0, 1]]
 */
export function rotateLoop(loop: readonly Pt[], deg: number): Pt[] {
  const [c, s] = cosSin(deg);
  return loop.map(([x, y]) => [c * x - s * y + 0, s * x + c * y + 0]);
}

export interface BBox {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/**
 * Bounding box of loops.
 * @example bboxOf([[[0, 1], [3, -2]]]) // → { minX: 0, minY: -2, maxX: 3, maxY: 1 }
 */
export function bboxOf(loops: readonly (readonly Pt[])[]): BBox {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const l of loops)
    for (const [x, y] of l) {
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
  return { minX, minY, maxX, maxY };
}

/**
 * Winding number of a point about a loop (0 outside; ±1 inside a simple loop). Points on an edge
 * may count either way.
 * @example winding([[0, 0], [2, 0], [2, 2], [0, 2]], 1, 1) // → 1
 */
export function winding(loop: readonly Pt[], px: number, py: number): number {
  let w = 0;
  for (let i = 0, j = loop.length - 1; i < loop.length; j = i++) {
    const [x1, y1] = loop[j]!;
    const [x2, y2] = loop[i]!;
    if (y1 <= py) {
      if (y2 > py && (x2 - x1) * (py - y1) - (px - x1) * (y2 - y1) > 0) w++;
    } else if (y2 <= py && (x2 - x1) * (py - y1) - (px - x1) * (y2 - y1) < 0) w--;
  }
  return w;
}

/**
 * Squared distance from point p to segment ab.
 * @example segDist2(0, 1, -1, 0, 1, 0) // → 1
 */
export function segDist2(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const l2 = dx * dx + dy * dy;
  let t = l2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / l2 : 0;
  if (t < 0) t = 0;
  else if (t > 1) t = 1;
  const ex = ax + t * dx - px;
  const ey = ay + t * dy - py;
  return ex * ex + ey * ey;
}

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const v = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

function onSeg(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): boolean {
  return Math.min(ax, bx) <= cx && cx <= Math.max(ax, bx) && Math.min(ay, by) <= cy && cy <= Math.max(ay, by);
}

/**
 * Whether segments ab and cd share any point (touching counts).
 * @example segmentsMeet([0, 0], [2, 2], [0, 2], [2, 0]) // → true
 */
export function segmentsMeet(a: Pt, b: Pt, c: Pt, d: Pt): boolean {
  const o1 = orient(a[0], a[1], b[0], b[1], c[0], c[1]);
  const o2 = orient(a[0], a[1], b[0], b[1], d[0], d[1]);
  const o3 = orient(c[0], c[1], d[0], d[1], a[0], a[1]);
  const o4 = orient(c[0], c[1], d[0], d[1], b[0], b[1]);
  if (o1 !== o2 && o3 !== o4) return true;
  if (o1 === 0 && onSeg(a[0], a[1], b[0], b[1], c[0], c[1])) return true;
  if (o2 === 0 && onSeg(a[0], a[1], b[0], b[1], d[0], d[1])) return true;
  if (o3 === 0 && onSeg(c[0], c[1], d[0], d[1], a[0], a[1])) return true;
  if (o4 === 0 && onSeg(c[0], c[1], d[0], d[1], b[0], b[1])) return true;
  return false;
}

/**
 * Index pair of the first two non-adjacent edges of a loop that meet, or undefined when the loop
 * is simple. O(n²): outlines here have tens to hundreds of vertices.
 * @example selfCrossing([[0, 0], [2, 2], [2, 0], [0, 2]]) // → [0, 2]
 */
export function selfCrossing(loop: readonly Pt[]): [number, number] | undefined {
  const n = loop.length;
  for (let i = 0; i < n; i++) {
    const a = loop[i]!;
    const b = loop[(i + 1) % n]!;
    for (let j = i + 1; j < n; j++) {
      if (j === i + 1 || (i === 0 && j === n - 1)) continue;
      if (segmentsMeet(a, b, loop[j]!, loop[(j + 1) % n]!)) return [i, j];
    }
  }
  return undefined;
}

/**
 * Whether two loops have edges that meet.
 * @example loopsMeet([[0, 0], [2, 0], [2, 2]], [[1, -1], [1, 3], [5, 3]]) // → true
 */
export function loopsMeet(p: readonly Pt[], q: readonly Pt[]): boolean {
  for (let i = 0; i < p.length; i++) {
    const a = p[i]!;
    const b = p[(i + 1) % p.length]!;
    for (let j = 0; j < q.length; j++) if (segmentsMeet(a, b, q[j]!, q[(j + 1) % q.length]!)) return true;
  }
  return false;
}

/**
 * Smallest distance between the edges of two loops (0 when they meet).
 * @example loopDistance([[0, 0], [1, 0], [1, 1]], [[3, 0], [4, 0], [4, 1]]) // → 2
 */
export function loopDistance(p: readonly Pt[], q: readonly Pt[]): number {
  let best = Infinity;
  for (let i = 0; i < p.length; i++) {
    const a = p[i]!;
    const b = p[(i + 1) % p.length]!;
    for (let j = 0; j < q.length; j++) {
      const c = q[j]!;
      const d = q[(j + 1) % q.length]!;
      if (segmentsMeet(a, b, c, d)) return 0;
      best = Math.min(
        best,
        segDist2(a[0], a[1], c[0], c[1], d[0], d[1]),
        segDist2(b[0], b[1], c[0], c[1], d[0], d[1]),
        segDist2(c[0], c[1], a[0], a[1], b[0], b[1]),
        segDist2(d[0], d[1], a[0], a[1], b[0], b[1]),
      );
    }
  }
  return Math.sqrt(best);
}

/**
 * Drops repeated consecutive vertices (and a closing repeat of the first).
 * @example dedupe([[0, 0], [1, 0], [1, 0], [0, 1], [0, 0]]) // → [[0, 0], [1, 0], [0, 1]]
 */
export function dedupe(loop: readonly Pt[]): Pt[] {
  const out: Pt[] = [];
  for (const p of loop) {
    const last = out[out.length - 1];
    if (!last || last[0] !== p[0] || last[1] !== p[1]) out.push([p[0], p[1]]);
  }
  while (out.length > 1 && out[0]![0] === out[out.length - 1]![0] && out[0]![1] === out[out.length - 1]![1]) out.pop();
  return out;
}

/**
 * A loop with at most `maxVertices` vertices that contains the given (simple, counter-clockwise)
 * loop, adding little area: greedily, the cheapest of (a) dropping a reflex vertex (adds the
 * triangle it cut in) and (b) replacing an edge bc by the point where the lines ab and dc meet
 * beyond b and c (adds the triangle b–meet–c) — both only grow the loop. A step is skipped when its
 * triangle would take in another vertex or its new edges would meet another edge, so the loop
 * stays simple. Stops at `maxVertices`, or when the next step would add more than `maxAdd` area.
 * @example outwardSimplify([[0, 0], [4, 0], [4, 4], [2, 3.9], [0, 4]], 4) // → [[0, 0], [4, 0], [4, 4], [0, 4]]
 */
export function outwardSimplify(loop: readonly Pt[], maxVertices: number, maxAdd = Infinity): Pt[] {
  let p: Pt[] = loop.map(([x, y]) => [x, y]);
  const banned = new Set<string>();
  const key = (q: Pt) => `${q[0]},${q[1]}`;
  const tri = (a: Pt, b: Pt, c: Pt) => ((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])) / 2;
  const inTri = (q: Pt, a: Pt, b: Pt, c: Pt) => {
    const s = Math.sign(tri(a, b, c));
    return s !== 0 && s * tri(a, b, q) >= 0 && s * tri(b, c, q) >= 0 && s * tri(c, a, q) >= 0;
  };
  while (p.length > Math.max(3, maxVertices)) {
    const n = p.length;
    let best: { cost: number; i: number; meet?: Pt } | undefined;
    for (let i = 0; i < n; i++) {
      const a = p[(i - 1 + n) % n]!;
      const b = p[i]!;
      const c = p[(i + 1) % n]!;
      const d = p[(i + 2) % n]!;
      const cr = tri(a, b, c);
      if (cr <= 0 && !banned.has(`r${key(b)}`)) {
        const cost = -cr;
        if (!best || cost < best.cost) best = { cost, i };
      }
      // Lines a→b and d→c meet at b + t(b − a) = c + s(c − d) with t, s > 0.
      const ux = b[0] - a[0];
      const uy = b[1] - a[1];
      const vx = c[0] - d[0];
      const vy = c[1] - d[1];
      const den = ux * vy - uy * vx;
      if (den === 0 || banned.has(`e${key(b)}`)) continue;
      const wx = c[0] - b[0];
      const wy = c[1] - b[1];
      const t = (wx * vy - wy * vx) / den;
      const s = (wx * uy - wy * ux) / den;
      if (!(t > 0 && s > 0)) continue;
      const meet: Pt = [b[0] + t * ux, b[1] + t * uy];
      // The triangle must lie outside (right of b→c on a counter-clockwise loop), else it would cut in.
      if (tri(b, c, meet) >= 0) continue;
      const cost = Math.abs(tri(b, meet, c));
      if (!best || cost < best.cost) best = { cost, i, meet };
    }
    if (!best || best.cost > maxAdd) break;
    const { i, meet } = best;
    const b = p[i]!;
    const c = p[(i + 1) % n]!;
    // The triangle added and the new edges, checked against the rest of the loop.
    let next: Pt[];
    let ok = true;
    if (meet) {
      const a = p[(i - 1 + n) % n]!;
      const d = p[(i + 2) % n]!;
      next = p.filter((_, k) => k !== i && k !== (i + 1) % n);
      next.splice(i < (i + 1) % n ? i : i - 1, 0, meet);
      for (let k = 0; k < n && ok; k++) {
        const q = p[k]!;
        if (q === a || q === b || q === c || q === d) continue;
        if (inTri(q, b, meet, c)) ok = false;
        const r = p[(k + 1) % n]!;
        if (r === a || r === b || r === c || r === d) continue;
        if (segmentsMeet(a, meet, q, r) || segmentsMeet(meet, d, q, r)) ok = false;
      }
      if (!ok) banned.add(`e${key(b)}`);
    } else {
      const a = p[(i - 1 + n) % n]!;
      next = p.filter((_, k) => k !== i);
      for (let k = 0; k < n && ok; k++) {
        const q = p[k]!;
        if (q === a || q === b || q === c) continue;
        if (inTri(q, a, b, c)) ok = false;
        const r = p[(k + 1) % n]!;
        if (r === a || r === b || r === c) continue;
        if (segmentsMeet(a, c, q, r)) ok = false;
      }
      if (!ok) banned.add(`r${key(b)}`);
    }
    if (ok) p = next;
  }
  return p;
}
