/**
 * Overlap minimisation in a strip of fixed length: guided local search over penetration depths.
 * Each overlapping piece in turn moves to the best position found by sampling (across the strip
 * and around where it is, in every allowed rotation) and refining the best sample by a pattern
 * search; when a pass ends no better than before, the weights of the pairs still overlapping
 * grow, so the next passes push those apart harder.
 */
import type { Rng } from "../rng";
import { shuffle } from "../rng";
import type { Layout, Snapshot } from "./layout";

export interface SeparateConfig {
  /** Samples across the whole strip per move (spread over the rotations). */
  globalSamples: number;
  /** Samples around the piece's position per move. */
  localSamples: number;
  /** Passes without a better total overlap before a strike. */
  itersNoImprove: number;
  /** Strikes (each restarting from the best state of the attempt) before giving up. */
  strikes: number;
  /** Samples at contact positions: a vertex of the NFP of the piece against another piece, where they touch. */
  contactSamples: number;
}

export const DEFAULT_SEPARATE: SeparateConfig = {
  globalSamples: 40,
  localSamples: 20,
  itersNoImprove: 40,
  strikes: 4,
  contactSamples: 20,
};

export interface Ctx {
  rand: Rng;
  stop: () => boolean;
  moves: number;
}

/**
 * Moves piece i to the least weighted-overlap position found (keeping it where it is when nothing
 * better turns up).
 * @example moveItem(layout, 3, { rand: rng(1), stop: () => false, moves: 0 }, DEFAULT_SEPARATE)
 */
export function moveItem(L: Layout, i: number, ctx: Ctx, cfg: SeparateConfig): void {
  const r = ctx.rand;
  const vs = L.prep.variantsOf[L.prep.pieceType[i]!]!;
  let bv = L.v[i]!;
  let bx = L.x[i]!;
  let by = L.y[i]!;
  let be = L.weighted(i);
  if (be === 0) return;
  ctx.moves++;
  const try1 = (vi: number, x: number, y: number): void => {
    const e = L.evalAt(i, vi, x, y, be);
    if (e < be) {
      be = e;
      bv = vi;
      bx = x;
      by = y;
    }
  };
  for (let k = 0; k < cfg.globalSamples && be > 0; k++) {
    const vi = vs[Math.floor(r() * vs.length)]!;
    const xl = L.xLo[vi]!;
    const xh = L.xHi(vi);
    const yl = L.yLo[vi]!;
    const yh = L.yHi[vi]!;
    try1(vi, Math.round(xl + r() * (xh - xl)), Math.round(yl + r() * (yh - yl)));
  }
  const cv = L.v[i]!;
  const cx = L.x[i]!;
  const cy = L.y[i]!;
  for (let k = 0; k < cfg.localSamples && be > 0; k++) {
    const vi = k % 4 === 3 ? vs[Math.floor(r() * vs.length)]! : cv;
    const vr = L.variants[vi]!;
    const rx = (vr.sMaxX - vr.sMinX) * 0.5;
    const ry = (vr.sMaxY - vr.sMinY) * 0.5;
    const x = clamp(Math.round(cx + (2 * r() - 1) * rx), L.xLo[vi]!, L.xHi(vi));
    const y = clamp(Math.round(cy + (2 * r() - 1) * ry), L.yLo[vi]!, L.yHi[vi]!);
    try1(vi, x, y);
  }
  for (let k = 0; k < cfg.contactSamples && be > 0; k++) {
    const j = Math.floor(r() * L.n);
    if (j === i) continue;
    const vi = vs[Math.floor(r() * vs.length)]!;
    const nfp = L.nfps.get(L.v[j]!, vi);
    const nv = nfp.v.length / 2;
    if (nv === 0) continue;
    const t = Math.floor(r() * nv);
    const x = clamp(nfp.v[2 * t]! + L.x[j]!, L.xLo[vi]!, L.xHi(vi));
    const y = clamp(nfp.v[2 * t + 1]! + L.y[j]!, L.yLo[vi]!, L.yHi[vi]!);
    try1(vi, x, y);
  }
  if (be > 0) {
    const res = refine(L, i, bv, bx, by, be);
    bx = res.x;
    by = res.y;
  }
  L.place(i, bv, bx, by);
}

const clamp = (v: number, lo: number, hi: number): number => Math.max(lo, Math.min(hi, v));

/** Pattern search from (x, y): steps along ±x and ±y, growing on success, halving on failure. */
function refine(
  L: Layout,
  i: number,
  vi: number,
  x0: number,
  y0: number,
  e0: number,
): { x: number; y: number; e: number } {
  const vr = L.variants[vi]!;
  const size = Math.max(vr.sMaxX - vr.sMinX, vr.sMaxY - vr.sMinY);
  let sx = Math.max(1, (vr.sMaxX - vr.sMinX) * 0.1);
  let sy = Math.max(1, (vr.sMaxY - vr.sMinY) * 0.1);
  let x = x0;
  let y = y0;
  let e = e0;
  const xl = L.xLo[vi]!;
  const xh = L.xHi(vi);
  const yl = L.yLo[vi]!;
  const yh = L.yHi[vi]!;
  let dir = 0;
  for (let it = 0; it < 200 && e > 0; it++) {
    let moved = false;
    for (let k = 0; k < 4; k++) {
      const d = (dir + k) % 4;
      const nx = d === 0 ? clamp(Math.round(x + sx), xl, xh) : d === 1 ? clamp(Math.round(x - sx), xl, xh) : x;
      const ny = d === 2 ? clamp(Math.round(y + sy), yl, yh) : d === 3 ? clamp(Math.round(y - sy), yl, yh) : y;
      if (nx === x && ny === y) continue;
      const ne = L.evalAt(i, vi, nx, ny, e);
      if (ne < e) {
        x = nx;
        y = ny;
        e = ne;
        dir = d;
        moved = true;
        break;
      }
    }
    if (moved) {
      if (dir < 2) sx *= 1.5;
      else sy *= 1.5;
    } else {
      if (sx <= 1 && sy <= 1) break;
      sx = Math.max(1, sx * 0.5);
      sy = Math.max(1, sy * 0.5);
      // Deep in an overlap that small steps do not clear: stop refining, the weights will act.
      if (sx < size * 1e-3 && sy < size * 1e-3 && e > size * 0.02) break;
    }
  }
  return { x, y, e };
}

/**
 * Multiplies the weights of overlapping pairs (by 1.2–2 with their depth), decays the others towards their base.
 * @example updateWeights(layout) // after a pass of moves
 */
export function updateWeights(L: Layout): void {
  const n = L.n;
  let maxOv = 0;
  for (let k = 0; k < n * n; k++) if (L.ov[k]! > maxOv) maxOv = L.ov[k]!;
  for (let i = 0; i < n; i++)
    for (let j = i + 1; j < n; j++) {
      const k = i * n + j;
      const d = L.ov[k]!;
      let w = L.w[k]!;
      if (d > 0) w *= 1.2 + (0.8 * d) / maxOv;
      else w = Math.max(L.wBase[k]!, w * 0.95);
      L.w[k] = w;
      L.w[j * n + i] = w;
    }
}

/**
 * Removal of every overlap at the layout's current length, one pass at a time (a pass moves each
 * overlapping piece once), so a caller can stop between passes.
 * @example const sep = new Separator(layout, ctx); while ((s = sep.pass()) === "running") {}
 */
export class Separator {
  private best: number;
  private bestSnap: Snapshot;
  private noImp = 0;
  private strike = 0;
  private readonly order: number[] = [];
  constructor(
    private readonly L: Layout,
    private readonly ctx: Ctx,
    private readonly cfg: SeparateConfig = DEFAULT_SEPARATE,
  ) {
    this.best = L.totalOverlap();
    this.bestSnap = L.snapshot();
  }

  /** One pass. "feasible": nothing overlaps; "failed": out of strikes (layout = least-overlapping state met). */
  pass(): "feasible" | "failed" | "running" {
    const { L, ctx, cfg } = this;
    if (L.totalOverlap() === 0) return "feasible";
    const order = this.order;
    order.length = 0;
    for (let i = 0; i < L.n; i++) if (L.pieceOv[i]! > 0) order.push(i);
    shuffle(order, ctx.rand);
    for (const i of order) {
      if (ctx.stop()) return "running";
      if (L.pieceOv[i]! > 0) moveItem(L, i, ctx, cfg);
    }
    const o = L.totalOverlap();
    if (o === 0) return "feasible";
    if (o < this.best) {
      this.best = o;
      this.bestSnap = L.snapshot();
      this.noImp = 0;
    } else this.noImp++;
    updateWeights(L);
    if (this.noImp >= cfg.itersNoImprove) {
      L.restore(this.bestSnap);
      this.noImp = 0;
      this.strike++;
      if (this.strike >= cfg.strikes) return "failed";
    }
    return "running";
  }
}

/**
 * Tries to remove every overlap at the layout's current length. Returns true when it did (the
 * layout then overlaps nowhere), false when it gave up or was stopped.
 * @example separate(layout, { rand: rng(1), stop: () => false, moves: 0 }) // → true when it found room
 */
export function separate(L: Layout, ctx: Ctx, cfg: SeparateConfig = DEFAULT_SEPARATE): boolean {
  const sep = new Separator(L, ctx, cfg);
  for (;;) {
    if (ctx.stop()) return false;
    const s = sep.pass();
    if (s !== "running") return s === "feasible";
  }
}

/**
 * Shortens the strip to `len` (scaled): pieces right of a random cut line move left by the
 * difference, and any still past the end are pushed back inside; overlaps are refreshed.
 * @example shrinkTo(layout, Math.floor(layout.len * 0.99), rng(1))
 */
export function shrinkTo(L: Layout, len: number, rand: Rng): void {
  const delta = L.len - len;
  const cut = rand() * len;
  L.len = len;
  for (let i = 0; i < L.n; i++) {
    const vi = L.v[i]!;
    let x = L.x[i]!;
    if (x + L.wS[vi]! / 2 > cut) x -= Math.round(delta);
    L.setRaw(i, vi, clamp(x, L.xLo[vi]!, L.xHi(vi, len)), L.y[i]!);
  }
  L.refreshAll();
}
