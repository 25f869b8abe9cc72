/**
 * No-fit polygons (NFP) between shape variants, and the penetration depth measured on them.
 *
 * NFP(A, B) is the set of offsets q (B's position minus A's, scaled units) at which B overlaps A.
 * It is built as Clipper2 does Minkowski sums: the union of the parallelograms edge(A) ⊕ edge(−B)
 * over every pair of edges (loops of holes included), i.e. every offset at which the boundaries
 * meet. The holes of that union are either offsets where B lies inside A (or A inside B) — part
 * of the NFP — or free pockets (B in a hole or a closed cavity of A); one point of each hole is
 * tested to tell which. Free pockets are kept as holes of the NFP, so a small part can be nested
 * into a hole of a large one.
 */
import { Clipper64, ClipType, FillRule, type Path64, PolyTree64, type PolyPath64 } from "@countertype/clipper2-ts";
import { quarterTurns, rot90, type Variant } from "./shapes";

export interface Nfp {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
  /** Edges x1, y1, x2, y2 of every kept loop; outer loops counter-clockwise, free holes clockwise. */
  e: Float64Array;
  /** Vertices x, y of every kept loop (the candidate positions of the constructive placement). */
  v: Float64Array;
  loops: Path64[];
  /** A grid over the box: per cell 0 surely outside, 1 surely inside, 2 crossed by an edge. */
  gx: number;
  gy: number;
  cw: number;
  ch: number;
  cell: Uint8Array;
  /** Per cell (CSR): the edges that can be nearest to a point of it, for cells of kind 1 and 2. */
  cellStart: Int32Array;
  cellList: Int32Array;
  /** Per grid row (CSR): the edges whose y-range meets it, for the winding number. */
  rowStart: Int32Array;
  rowList: Int32Array;
}

function area2(p: Path64): number {
  let s = 0;
  for (let i = 0, j = p.length - 1; i < p.length; j = i++) s += p[j]!.x * p[i]!.y - p[i]!.x * p[j]!.y;
  return s;
}

/**
 * Winding number of (px, py) about the loops of a shape (nonzero inside material, 0 in holes and outside).
 * @example shapeWinding([[{ x: 0, y: 0 }, { x: 4, y: 0 }, { x: 4, y: 4 }, { x: 0, y: 4 }]], 1, 1) // → 1
 */
export function shapeWinding(loops: readonly Path64[], px: number, py: number): number {
  let w = 0;
  for (const l of loops)
    for (let i = 0, j = l.length - 1; i < l.length; j = i++) {
      const x1 = l[j]!.x;
      const y1 = l[j]!.y;
      const x2 = l[i]!.x;
      const y2 = l[i]!.y;
      if (y1 <= py) {
        if (y2 > py && (x2 - x1) * (py - y1) - (px - x1) * (y2 - y1) > 0) w++;
      } else if (y2 <= py && (x2 - x1) * (py - y1) - (px - x1) * (y2 - y1) < 0) w--;
    }
  return w;
}

/**
 * A point well inside a region bounded by `outer` and outside its `inner` loops, found on
 * horizontal scan lines (the midpoint of the longest inside run), or undefined when the region
 * is thinner than 4 units everywhere tried.
 * @example interiorPoint(square0to10, []) // → { x: 5, y: 5.5, len: 10 }
 */
export function interiorPoint(outer: Path64, inner: readonly Path64[]): { x: number; y: number } | undefined {
  let minY = Infinity;
  let maxY = -Infinity;
  for (const p of outer) {
    minY = Math.min(minY, p.y);
    maxY = Math.max(maxY, p.y);
  }
  if (maxY - minY < 4) return undefined;
  let best: { x: number; y: number; len: number } | undefined;
  for (const f of [0.5, 0.25, 0.75, 0.125, 0.375, 0.625, 0.875, 0.0625, 0.9375, 0.03125, 0.96875]) {
    const y = minY + f * (maxY - minY) + 0.5;
    const xs: number[] = [];
    for (const l of [outer, ...inner])
      for (let i = 0, j = l.length - 1; i < l.length; j = i++) {
        const a = l[j]!;
        const b = l[i]!;
        if (a.y <= y !== b.y <= y) xs.push(a.x + ((y - a.y) * (b.x - a.x)) / (b.y - a.y));
      }
    xs.sort((p, q) => p - q);
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const len = xs[k + 1]! - xs[k]!;
      if (!best || len > best.len) best = { x: (xs[k]! + xs[k + 1]!) / 2, y, len };
    }
  }
  return best && best.len >= 4 ? best : undefined;
}

/** Whether B moved by q overlaps A, for offsets where their boundaries do not meet. */
function overlapsWithoutCrossing(a: readonly Path64[], b: readonly Path64[], qx: number, qy: number): boolean {
  for (const l of b) if (shapeWinding(a, l[0]!.x + qx, l[0]!.y + qy) !== 0) return true;
  for (const l of a) if (shapeWinding(b, l[0]!.x - qx, l[0]!.y - qy) !== 0) return true;
  return false;
}

/**
 * The NFP of moving shape b against fixed shape a (both as integer loops, outers positive).
 * @example const nfp = computeNfp(square10, square10) // box from (-10, -10) to (10, 10)
 */
export function computeNfp(a: readonly Path64[], b: readonly Path64[]): Nfp {
  const quads: Path64[] = [];
  for (const la of a)
    for (const lb0 of b) {
      const lb = lb0.map((p) => ({ x: -p.x, y: -p.y }));
      for (let i = 0, g = la.length - 1; i < la.length; g = i++)
        for (let j = 0, h = lb.length - 1; j < lb.length; h = j++) {
          const ag = la[g]!;
          const ai = la[i]!;
          const bh = lb[h]!;
          const bj = lb[j]!;
          const quad = [
            { x: ag.x + bh.x, y: ag.y + bh.y },
            { x: ai.x + bh.x, y: ai.y + bh.y },
            { x: ai.x + bj.x, y: ai.y + bj.y },
            { x: ag.x + bj.x, y: ag.y + bj.y },
          ];
          const s = area2(quad);
          if (s !== 0) quads.push(s > 0 ? quad : quad.reverse());
        }
    }
  // Parallel edge pairs give flat parallelograms, left out: the segment each sweeps is also swept
  // by the pairs of one of its edges with the other shape's neighbouring (non-parallel) edges.
  const c = new Clipper64();
  c.addSubject(quads);
  const tree = new PolyTree64();
  c.execute(ClipType.Union, FillRule.NonZero, tree);
  const kept: Path64[] = [];
  const visitOuter = (node: PolyPath64): void => {
    // node: an outer loop (material of the swept region)
    const poly = node.polygon!;
    kept.push(area2(poly) > 0 ? poly : [...poly].reverse());
    for (let k = 0; k < node.count; k++) visitHole(node.child(k));
  };
  const visitHole = (node: PolyPath64): void => {
    const hole = node.polygon!;
    const islands: Path64[] = [];
    for (let k = 0; k < node.count; k++) islands.push(node.child(k).polygon!);
    const pt = interiorPoint(hole, islands);
    const free = pt !== undefined && !overlapsWithoutCrossing(a, b, pt.x, pt.y);
    if (free) {
      kept.push(area2(hole) < 0 ? hole : [...hole].reverse());
      for (let k = 0; k < node.count; k++) visitOuter(node.child(k));
    } else {
      // Filled: the hole and its islands are all overlap; their own holes are tested afresh.
      for (let k = 0; k < node.count; k++) {
        const isl = node.child(k);
        for (let m = 0; m < isl.count; m++) visitHole(isl.child(m));
      }
    }
  };
  for (let k = 0; k < tree.count; k++) visitOuter(tree.child(k));
  return buildNfp(kept);
}

/**
 * Packs loops into the flat edge form with a grid: every cell is classified, and the cells where
 * the depth may be asked keep the few edges that can be nearest to their points, so a depth costs
 * a handful of edges instead of all of them.
 * @example buildNfp([[{ x: -1, y: -1 }, { x: 1, y: -1 }, { x: 1, y: 1 }, { x: -1, y: 1 }]]).e.length // → 16
 */
export function buildNfp(loops: readonly Path64[]): Nfp {
  let m = 0;
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const l of loops) {
    m += l.length;
    for (const p of l) {
      if (p.x < minX) minX = p.x;
      if (p.x > maxX) maxX = p.x;
      if (p.y < minY) minY = p.y;
      if (p.y > maxY) maxY = p.y;
    }
  }
  const e = new Float64Array(4 * m);
  const v = new Float64Array(2 * m);
  let k = 0;
  let kv = 0;
  for (const l of loops)
    for (let i = 0, j = l.length - 1; i < l.length; j = i++) {
      e[k++] = l[j]!.x;
      e[k++] = l[j]!.y;
      e[k++] = l[i]!.x;
      e[k++] = l[i]!.y;
      v[kv++] = l[i]!.x;
      v[kv++] = l[i]!.y;
    }
  const g = m === 0 ? 1 : m <= 16 ? 6 : m <= 40 ? 10 : m <= 100 ? 14 : 20;
  const gx = g;
  const gy = g;
  if (m === 0) {
    minX = minY = 0;
    maxX = maxY = -1;
  }
  const cw = Math.max(1, (maxX - minX) / gx);
  const ch = Math.max(1, (maxY - minY) / gy);
  const cell = new Uint8Array(gx * gy);
  // A cell an edge passes through is a boundary cell (2); the others are wholly inside or
  // outside, decided at their centre.
  for (let i = 0; i < m; i++) {
    const x1 = e[4 * i]!;
    const y1 = e[4 * i + 1]!;
    const x2 = e[4 * i + 2]!;
    const y2 = e[4 * i + 3]!;
    const c0 = Math.max(0, Math.floor((Math.min(x1, x2) - minX) / cw));
    const c1 = Math.min(gx - 1, Math.floor((Math.max(x1, x2) - minX) / cw));
    const r0 = Math.max(0, Math.floor((Math.min(y1, y2) - minY) / ch));
    const r1 = Math.min(gy - 1, Math.floor((Math.max(y1, y2) - minY) / ch));
    for (let r = r0; r <= r1; r++)
      for (let cc = c0; cc <= c1; cc++) {
        const id = r * gx + cc;
        if (cell[id] === 2) continue;
        const bx0 = minX + cc * cw;
        const by0 = minY + r * ch;
        if (segTouchesBox(x1, y1, x2, y2, bx0, by0, bx0 + cw, by0 + ch)) cell[id] = 2;
      }
  }
  const reach = new Float64Array(gx * gy);
  const diag = Math.hypot(cw, ch);
  for (let r = 0; r < gy; r++)
    for (let cc = 0; cc < gx; cc++) {
      const id = r * gx + cc;
      if (cell[id] === 2) {
        // Inside points of the cell are within a diagonal of the edge crossing it.
        reach[id] = diag;
        continue;
      }
      const px = minX + (cc + 0.5) * cw;
      const py = minY + (r + 0.5) * ch;
      if (windingEdges(e, m, px, py) !== 0) {
        cell[id] = 1;
        // Depth is 1-Lipschitz: no point of the cell is deeper than the centre's depth plus half a diagonal.
        reach[id] = Math.sqrt(minDist2(e, m, px, py)) + diag / 2;
      }
    }
  // Candidate edges per cell: those whose box comes within `reach` of the cell (a superset of the nearest).
  const cellStart = new Int32Array(gx * gy + 1);
  const list: number[] = [];
  for (let id = 0; id < gx * gy; id++) {
    cellStart[id] = list.length;
    if (cell[id] === 0) continue;
    const cc = id % gx;
    const r = (id - cc) / gx;
    const bx0 = minX + cc * cw;
    const by0 = minY + r * ch;
    const bx1 = bx0 + cw;
    const by1 = by0 + ch;
    const lim = reach[id]! + 1;
    const lim2 = lim * lim;
    for (let i = 0; i < m; i++) {
      const ex0 = Math.min(e[4 * i]!, e[4 * i + 2]!);
      const ex1 = Math.max(e[4 * i]!, e[4 * i + 2]!);
      const ey0 = Math.min(e[4 * i + 1]!, e[4 * i + 3]!);
      const ey1 = Math.max(e[4 * i + 1]!, e[4 * i + 3]!);
      const dx = ex0 > bx1 ? ex0 - bx1 : bx0 > ex1 ? bx0 - ex1 : 0;
      const dy = ey0 > by1 ? ey0 - by1 : by0 > ey1 ? by0 - ey1 : 0;
      if (dx * dx + dy * dy <= lim2) list.push(i);
    }
  }
  cellStart[gx * gy] = list.length;
  const rowStart = new Int32Array(gy + 1);
  const rows: number[] = [];
  for (let r = 0; r < gy; r++) {
    rowStart[r] = rows.length;
    const y0 = minY + r * ch;
    const y1 = y0 + ch;
    for (let i = 0; i < m; i++) {
      const a = e[4 * i + 1]!;
      const b = e[4 * i + 3]!;
      if (Math.max(a, b) >= y0 && Math.min(a, b) <= y1) rows.push(i);
    }
  }
  rowStart[gy] = rows.length;
  return {
    minX,
    minY,
    maxX,
    maxY,
    e,
    v,
    loops: loops as Path64[],
    gx,
    gy,
    cw,
    ch,
    cell,
    cellStart,
    cellList: Int32Array.from(list),
    rowStart,
    rowList: Int32Array.from(rows),
  };
}

function segTouchesBox(
  x1: number,
  y1: number,
  x2: number,
  y2: number,
  bx0: number,
  by0: number,
  bx1: number,
  by1: number,
): boolean {
  // Liang–Barsky clip of the segment against the closed box.
  let t0 = 0;
  let t1 = 1;
  const dx = x2 - x1;
  const dy = y2 - y1;
  for (let k = 0; k < 4; k++) {
    const p = k === 0 ? -dx : k === 1 ? dx : k === 2 ? -dy : dy;
    const q = k === 0 ? x1 - bx0 : k === 1 ? bx1 - x1 : k === 2 ? y1 - by0 : by1 - y1;
    if (p === 0) {
      if (q < 0) return false;
    } else {
      const t = q / p;
      if (p < 0) {
        if (t > t1) return false;
        if (t > t0) t0 = t;
      } else {
        if (t < t0) return false;
        if (t < t1) t1 = t;
      }
    }
  }
  return true;
}

function windingEdges(e: Float64Array, m: number, px: number, py: number): number {
  let w = 0;
  for (let i = 0; i < m; i++) {
    const x1 = e[4 * i]!;
    const y1 = e[4 * i + 1]!;
    const x2 = e[4 * i + 2]!;
    const y2 = e[4 * i + 3]!;
    if (y1 <= py) {
      if (y2 > py && (x2 - x1) * (py - y1) - (px - x1) * (y2 - y1) > 0) w++;
    } else if (y2 <= py && (x2 - x1) * (py - y1) - (px - x1) * (y2 - y1) < 0) w--;
  }
  return w;
}

function minDist2(e: Float64Array, m: number, px: number, py: number): number {
  let best = Infinity;
  for (let i = 0; i < m; i++) {
    const ax = e[4 * i]!;
    const ay = e[4 * i + 1]!;
    const dx = e[4 * i + 2]! - ax;
    const dy = e[4 * i + 3]! - ay;
    const l2 = dx * dx + dy * dy;
    let t = l2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / l2 : 0;
    if (t < 0) t = 0;
    else if (t > 1) t = 1;
    const ex = ax + t * dx - px;
    const ey = ay + t * dy - py;
    const d = ex * ex + ey * ey;
    if (d < best) best = d;
  }
  return best;
}

/**
 * Penetration depth of offset q in an NFP: 0 outside (or on the boundary), else the distance to
 * the nearest boundary point — how far B must move to stop overlapping A.
 * @example penetration(nfpOfTwoUnitSquares, 0, 0) // → 1 (scaled units: the square's side)
 */
export function penetration(n: Nfp, qx: number, qy: number): number {
  if (qx <= n.minX || qx >= n.maxX || qy <= n.minY || qy >= n.maxY) return 0;
  const cc = Math.min(n.gx - 1, Math.floor((qx - n.minX) / n.cw));
  const r = Math.min(n.gy - 1, Math.floor((qy - n.minY) / n.ch));
  const id = r * n.gx + cc;
  const kind = n.cell[id]!;
  if (kind === 0) return 0;
  const e = n.e;
  if (kind === 2) {
    // Winding number over the edges of this row only (the others cannot cross the ray).
    const rl = n.rowList;
    let w = 0;
    for (let t = n.rowStart[r]!, end = n.rowStart[r + 1]!; t < end; t++) {
      const k = 4 * rl[t]!;
      const x1 = e[k]!;
      const y1 = e[k + 1]!;
      const x2 = e[k + 2]!;
      const y2 = e[k + 3]!;
      if (y1 <= qy) {
        if (y2 > qy && (x2 - x1) * (qy - y1) - (qx - x1) * (y2 - y1) > 0) w++;
      } else if (y2 <= qy && (x2 - x1) * (qy - y1) - (qx - x1) * (y2 - y1) < 0) w--;
    }
    if (w === 0) return 0;
  }
  const cl = n.cellList;
  let best = Infinity;
  for (let t = n.cellStart[id]!, end = n.cellStart[id + 1]!; t < end; t++) {
    const k = 4 * cl[t]!;
    const ax = e[k]!;
    const ay = e[k + 1]!;
    const dx = e[k + 2]! - ax;
    const dy = e[k + 3]! - ay;
    const l2 = dx * dx + dy * dy;
    let u = l2 > 0 ? ((qx - ax) * dx + (qy - ay) * dy) / l2 : 0;
    if (u < 0) u = 0;
    else if (u > 1) u = 1;
    const ex = ax + u * dx - qx;
    const ey = ay + u * dy - qy;
    const d = ex * ex + ey * ey;
    if (d < best) best = d;
  }
  return Math.sqrt(best);
}

/**
 * No-fit polygons kept across runs: the Minkowski sums of pairs of integer item shapes (scaled,
 * kerf-grown, own frames) by relative quarter turn. Hand one store to several runs whose items
 * repeat (the strips of one slab group) and each pair is computed once; runs whose scale or kerf
 * differ simply get other shapes, hence other ids. Not bounded: one store per planning run.
 * @example const store = new NfpStore(); nestIrregularSync(p1, { nfpStore: store }); nestIrregularSync(p2, { nfpStore: store });
 */
export class NfpStore {
  readonly base = new Map<string, Path64[]>();
  /** Whole NFPs (with their grids) of pairs of quarter-turned variants, by ids, turns and offsets. */
  readonly built = new Map<string, Nfp>();
  private readonly ids = new Map<string, number>();
  /** The id of an integer shape (its loops written out in full). */
  idOf(loops: readonly Path64[]): number {
    const k = loops.map((l) => l.map((p) => `${p.x},${p.y}`).join(" ")).join("|");
    let id = this.ids.get(k);
    if (id === undefined) {
      id = this.ids.size;
      this.ids.set(k, id);
    }
    return id;
  }
}

/**
 * Lazily computed NFPs of every ordered pair of variants. Pairs whose rotations are multiples of
 * 90° share one Minkowski computation per pair of items and relative rotation: NFP(R_a A, R_b B) =
 * R_a(A ⊕ −R_(b−a) B), exact on integers; NFP(B, A) is −NFP(A, B).
 */
export class NfpCache {
  private readonly map: (Nfp | undefined)[];
  private readonly base: Map<string, Path64[]>;
  private readonly nv: number;
  /** Per item type: its id in the store (equal integer shapes share one id). */
  private readonly typeId: number[];
  computed = 0;
  constructor(
    private readonly variants: readonly Variant[],
    private readonly typeShape: readonly Path64[][],
    private readonly store: NfpStore = new NfpStore(),
  ) {
    this.nv = variants.length;
    this.map = new Array(this.nv * this.nv);
    this.base = store.base;
    this.typeId = typeShape.map((loops) => store.idOf(loops));
  }
  /** NFP of variant b (moving) against variant a (fixed). */
  get(a: number, b: number): Nfp {
    const key = a * this.nv + b;
    let n = this.map[key];
    if (n) return n;
    const va = this.variants[a]!;
    const vb = this.variants[b]!;
    const rev = this.map[b * this.nv + a];
    if (rev) n = buildNfp(rev.loops.map((l) => l.map((p) => ({ x: -p.x, y: -p.y }))));
    else if (va.grid && vb.grid) {
      const qa = quarterTurns(va.angle)!;
      const qd = (((quarterTurns(vb.angle)! - qa) % 4) + 4) % 4;
      const dx = vb.ox - va.ox;
      const dy = vb.oy - va.oy;
      const built = `${this.typeId[va.type]},${this.typeId[vb.type]},${qa},${qd},${dx},${dy}`;
      const had = this.store.built.get(built);
      if (had) {
        this.map[key] = had;
        return had;
      }
      const loops = this.baseNfp(va.type, vb.type, qd);
      n = buildNfp(
        loops.map((l) =>
          l.map((p) => {
            const r = rot90(p.x, p.y, qa);
            return { x: r.x + dx, y: r.y + dy };
          }),
        ),
      );
      this.store.built.set(built, n);
    } else {
      n = computeNfp(va.shape, vb.shape);
      this.computed++;
    }
    this.map[key] = n;
    return n;
  }

  /** A ⊕ −R_q(B) for item types ta, tb (own frames), computed once per unordered pair. */
  private baseNfp(ta: number, tb: number, q: number): Path64[] {
    const ia = this.typeId[ta]!;
    const ib = this.typeId[tb]!;
    const key = `${ia},${ib},${q}`;
    let loops = this.base.get(key);
    if (loops) return loops;
    const other = this.base.get(`${ib},${ia},${(4 - q) % 4}`);
    if (other) {
      // base(B, A, −q) = −R_(−q)(base(A, B, q))  ⇔  base(A, B, q) = −R_q(base(B, A, −q))
      loops = other.map((l) =>
        l.map((p) => {
          const r = rot90(p.x, p.y, q);
          return { x: -r.x + 0, y: -r.y + 0 };
        }),
      );
    } else {
      const B = this.typeShape[tb]!.map((l) => l.map((p) => rot90(p.x, p.y, q)));
      loops = computeNfp(this.typeShape[ta]!, B).loops;
      this.computed++;
    }
    this.base.set(key, loops);
    return loops;
  }
}
