/**
 * Constructive placement: pieces one after another, each at its leftmost (then lowest) position
 * that overlaps nothing, over every allowed rotation. Positions are chosen among the vertices of
 * the no-fit polygons of the pieces already placed (translated to where they lie), the corners of
 * the strip's inner-fit rectangle and the points where NFP edges cross its sides — the classic
 * bottom-left rule over NFPs, without NFP-NFP crossings.
 */
import type { Layout } from "./layout";
import { TOL } from "./layout";

/**
 * Places the pieces of `order` (indices into the layout) in an open strip; every piece not in
 * `order` must already be placed or parked with `park`. Returns false when stopped early.
 * @example park(layout, all); placeBottomLeft(layout, byAreaDesc) // layout now overlaps nowhere
 */
export function placeBottomLeft(L: Layout, order: readonly number[], stop: () => boolean = () => false): boolean {
  const placed: number[] = [];
  for (let i = 0; i < L.n; i++) if (L.bx0[i]! <= L.bx1[i]!) placed.push(i);
  for (const i of order) {
    if (stop()) return false;
    const best = bestPosition(L, i, placed);
    L.setRaw(i, best.v, best.x, best.y);
    placed.push(i);
  }
  L.refreshAll();
  return true;
}

/**
 * Takes pieces out of the layout (an empty box) so they are never compared.
 * @example park(layout, [0, 1, 2]); placeBottomLeft(layout, [2, 0, 1])
 */
export function park(L: Layout, pieces: readonly number[]): void {
  for (const i of pieces) {
    L.bx0[i] = Infinity;
    L.bx1[i] = -Infinity;
    L.by0[i] = Infinity;
    L.by1[i] = -Infinity;
  }
}

/** The piece that last blocked a candidate: tried first, as it usually blocks the next one too. */
let lastBlocker = -1;

function blocks(
  L: Layout,
  j: number,
  vi: number,
  x0: number,
  x1: number,
  y0: number,
  y1: number,
  px: number,
  py: number,
): boolean {
  if (L.bx0[j]! >= x1 || L.bx1[j]! <= x0 || L.by0[j]! >= y1 || L.by1[j]! <= y0) return false;
  const nfp = L.nfps.get(L.v[j]!, vi);
  const qx = px - L.x[j]!;
  const qy = py - L.y[j]!;
  if (qx <= nfp.minX || qx >= nfp.maxX || qy <= nfp.minY || qy >= nfp.maxY) return false;
  L.evaluations++;
  return depthAbove(L, j, vi, qx, qy);
}

function feasible(L: Layout, i: number, vi: number, px: number, py: number, placed: readonly number[]): boolean {
  const vr = L.variants[vi]!;
  const x0 = px + vr.sMinX;
  const x1 = px + vr.sMaxX;
  const y0 = py + vr.sMinY;
  const y1 = py + vr.sMaxY;
  if (lastBlocker >= 0 && lastBlocker !== i && lastBlocker < L.n && blocks(L, lastBlocker, vi, x0, x1, y0, y1, px, py))
    return false;
  for (const j of placed) {
    if (j === i || j === lastBlocker) continue;
    if (blocks(L, j, vi, x0, x1, y0, y1, px, py)) {
      lastBlocker = j;
      return false;
    }
  }
  return true;
}

function depthAbove(L: Layout, j: number, vi: number, qx: number, qy: number): boolean {
  const nfp = L.nfps.get(L.v[j]!, vi);
  // Inline of penetration(): inside with depth > TOL.
  const e = nfp.e;
  const m = e.length / 4;
  let w = 0;
  for (let k = 0; k < m; k++) {
    const x1 = e[4 * k]!;
    const y1 = e[4 * k + 1]!;
    const x2 = e[4 * k + 2]!;
    const y2 = e[4 * k + 3]!;
    if (y1 <= qy) {
      if (y2 > qy && (x2 - x1) * (qy - y1) - (qx - x1) * (y2 - y1) > 0) w++;
    } else if (y2 <= qy && (x2 - x1) * (qy - y1) - (qx - x1) * (y2 - y1) < 0) w--;
  }
  if (w === 0) return false;
  const t2 = TOL * TOL;
  for (let k = 0; k < m; k++) {
    const ax = e[4 * k]!;
    const ay = e[4 * k + 1]!;
    const dx = e[4 * k + 2]! - ax;
    const dy = e[4 * k + 3]! - ay;
    const l2 = dx * dx + dy * dy;
    let t = l2 > 0 ? ((qx - ax) * dx + (qy - ay) * dy) / l2 : 0;
    if (t < 0) t = 0;
    else if (t > 1) t = 1;
    const ex = ax + t * dx - qx;
    const ey = ay + t * dy - qy;
    if (ex * ex + ey * ey <= t2) return false;
  }
  return true;
}

interface Pos {
  v: number;
  x: number;
  y: number;
}

/**
 * The bottom-left feasible position of piece i over its variants, among the pieces `placed`.
 * @example const p = bestPosition(layout, 4, [0, 1, 2, 3]); layout.setRaw(4, p.v, p.x, p.y)
 */
export function bestPosition(L: Layout, i: number, placed: readonly number[]): Pos {
  const type = L.prep.pieceType[i]!;
  let best: Pos | undefined;
  for (const vi of L.prep.variantsOf[type]!) {
    const p = leftmost(L, i, vi, placed, best?.x ?? Infinity);
    if (!p) continue;
    const right = p.x + L.wS[p.v]!;
    const bestRight = best ? best.x + L.wS[best.v]! : Infinity;
    if (!best || p.x < best.x || (p.x === best.x && (right < bestRight || (right === bestRight && p.y < best.y))))
      best = p;
  }
  return best!;
}

let cand = new Float64Array(1024);

function leftmost(L: Layout, i: number, vi: number, placed: readonly number[], xLimit: number): Pos | undefined {
  const xLo = L.xLo[vi]!;
  const yLo = L.yLo[vi]!;
  const yHi = L.yHi[vi]!;
  const vr = L.variants[vi]!;
  let nc = 0;
  const add = (x: number, y: number): void => {
    if (x >= xLo && x <= xLimit && y >= yLo && y <= yHi) {
      if (2 * nc + 2 > cand.length) {
        const bigger = new Float64Array(cand.length * 2);
        bigger.set(cand);
        cand = bigger;
      }
      cand[2 * nc] = x;
      cand[2 * nc + 1] = y;
      nc++;
    }
  };
  add(xLo, yLo);
  add(xLo, yHi);
  let far = xLo;
  for (const j of placed) {
    if (j === i) continue;
    far = Math.max(far, L.bx1[j]! - vr.sMinX + 1);
    const nfp = L.nfps.get(L.v[j]!, vi);
    const ox = L.x[j]!;
    const oy = L.y[j]!;
    if (ox + nfp.maxX < xLo || oy + nfp.maxY < yLo || oy + nfp.minY > yHi || ox + nfp.minX > xLimit) continue;
    const v = nfp.v;
    for (let k = 0; k < v.length; k += 2) add(v[k]! + ox, v[k + 1]! + oy);
    const e = nfp.e;
    for (let k = 0; k < e.length; k += 4) {
      const x1 = e[k]! + ox;
      const y1 = e[k + 1]! + oy;
      const x2 = e[k + 2]! + ox;
      const y2 = e[k + 3]! + oy;
      for (let s = 0; s < 2; s++) {
        const yy = s === 0 ? yLo : yHi;
        if ((y1 < yy && y2 > yy) || (y1 > yy && y2 < yy)) {
          const xx = x1 + ((yy - y1) * (x2 - x1)) / (y2 - y1);
          add(Math.floor(xx), yy);
          add(Math.ceil(xx), yy);
        }
      }
      if ((x1 < xLo && x2 > xLo) || (x1 > xLo && x2 < xLo)) {
        const yy = y1 + ((xLo - x1) * (y2 - y1)) / (x2 - x1);
        add(xLo, Math.floor(yy));
        add(xLo, Math.ceil(yy));
      }
    }
  }
  add(far, yLo);
  const idx = new Int32Array(nc);
  for (let k = 0; k < nc; k++) idx[k] = k;
  const c = cand;
  idx.sort((a, b) => c[2 * a]! - c[2 * b]! || c[2 * a + 1]! - c[2 * b + 1]!);
  for (const k of idx) {
    const x = c[2 * k]!;
    const y = c[2 * k + 1]!;
    if (feasible(L, i, vi, x, y, placed)) return { v: vi, x, y };
  }
  if (far <= xLimit) return { v: vi, x: far, y: yLo };
  return undefined;
}
