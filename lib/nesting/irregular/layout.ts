/**
 * The working state of the search: every piece's variant (rotation) and position, in scaled
 * integer units, against a strip of a target length; overlaps measured as penetration depths on
 * the no-fit polygons, weighted per pair (guided local search).
 *
 * A pair counts as overlapping only when its depth exceeds TOL scaled units (2^-28 of the largest
 * piece at most): positions are whole units and NFP vertices were rounded once, so an offset on an
 * NFP edge may read a hair inside it.
 */
import { type NfpCache, penetration } from "./nfp";
import type { Prepared, Variant } from "./shapes";

export const TOL = 2;

export class Layout {
  readonly n: number;
  readonly variants: readonly Variant[];
  readonly v: Int32Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Boxes of the kerf-grown shapes at their positions. */
  readonly bx0: Float64Array;
  readonly by0: Float64Array;
  readonly bx1: Float64Array;
  readonly by1: Float64Array;
  /** Pair weights (guided local search) and current depths, n × n, symmetric. */
  readonly w: Float64Array;
  /** The weight each pair starts from and decays back to (1, or larger for pairs of larger pieces). */
  readonly wBase: Float64Array;
  readonly ov: Float64Array;
  /** Sum of the depths of each piece's pairs. */
  readonly pieceOv: Float64Array;
  /** Target length of the strip, scaled units. */
  len = 0;
  evaluations = 0;
  /** Lower bounds on x and y and the upper bound on y of a variant's position (scaled, whole units). */
  readonly yLo: Float64Array;
  readonly yHi: Float64Array;
  readonly xLo: Float64Array;
  /** Width of each variant's true outline, scaled (right edge = x + wS). */
  readonly wS: Float64Array;
  readonly marginS: number;

  constructor(
    readonly prep: Prepared,
    readonly nfps: NfpCache,
  ) {
    this.n = prep.pieceType.length;
    this.variants = prep.variants;
    const n = this.n;
    this.v = new Int32Array(n);
    this.x = new Float64Array(n);
    this.y = new Float64Array(n);
    this.bx0 = new Float64Array(n);
    this.by0 = new Float64Array(n);
    this.bx1 = new Float64Array(n);
    this.by1 = new Float64Array(n);
    this.w = new Float64Array(n * n).fill(1);
    this.wBase = new Float64Array(n * n).fill(1);
    this.ov = new Float64Array(n * n);
    this.pieceOv = new Float64Array(n);
    const S = prep.scale;
    const { width, margin } = prep.problem;
    const nv = prep.variants.length;
    this.yLo = new Float64Array(nv);
    this.yHi = new Float64Array(nv);
    this.xLo = new Float64Array(nv);
    this.wS = new Float64Array(nv);
    this.marginS = margin * S;
    for (const vr of prep.variants) {
      this.xLo[vr.index] = Math.ceil(margin * S);
      this.yLo[vr.index] = Math.ceil(margin * S);
      this.yHi[vr.index] = Math.max(this.yLo[vr.index]!, Math.floor((width - margin - vr.h) * S));
      this.wS[vr.index] = vr.w * S;
    }
  }

  /**
   * Makes overlaps between large pieces cost more than between small ones: the base weight of a
   * pair is the geometric mean of the pieces' sizes (square root of area) over the mean size.
   */
  sizeWeights(on: boolean): void {
    const n = this.n;
    if (!on) {
      this.wBase.fill(1);
      return;
    }
    const size = Array.from({ length: n }, (_, i) =>
      Math.sqrt(this.variants[this.prep.variantsOf[this.prep.pieceType[i]!]![0]!]!.area),
    );
    const mean = size.reduce((s, v) => s + v, 0) / Math.max(1, n);
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) this.wBase[i * n + j] = Math.sqrt(size[i]! * size[j]!) / mean;
  }

  resetWeights(): void {
    this.w.set(this.wBase);
  }

  /** Largest x a variant's position may take in a strip of scaled length `len`. */
  xHi(vi: number, len = this.len): number {
    return Math.max(this.xLo[vi]!, Math.floor(len - this.marginS - this.wS[vi]!));
  }

  /** The strip length the current positions use (scaled): the largest right edge plus the margin. */
  usedLength(): number {
    let m = 0;
    for (let i = 0; i < this.n; i++) m = Math.max(m, this.x[i]! + this.wS[this.v[i]!]!);
    return m + this.marginS;
  }

  /**
   * Weighted overlap of piece i if it took variant vi at (px, py), against every other piece;
   * stops early once the sum reaches `bound`.
   */
  evalAt(i: number, vi: number, px: number, py: number, bound = Infinity): number {
    this.evaluations++;
    const vr = this.variants[vi]!;
    const x0 = px + vr.sMinX;
    const x1 = px + vr.sMaxX;
    const y0 = py + vr.sMinY;
    const y1 = py + vr.sMaxY;
    const n = this.n;
    const row = i * n;
    let s = 0;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      if (this.bx0[j]! >= x1 || this.bx1[j]! <= x0 || this.by0[j]! >= y1 || this.by1[j]! <= y0) continue;
      const d = penetration(this.nfps.get(this.v[j]!, vi), px - this.x[j]!, py - this.y[j]!);
      if (d > TOL) {
        s += this.w[row + j]! * d;
        if (s >= bound) return s;
      }
    }
    return s;
  }

  /** Unweighted depth of the pair (i at its place, j at its place). */
  pairDepth(i: number, j: number): number {
    if (
      this.bx0[j]! >= this.bx1[i]! ||
      this.bx1[j]! <= this.bx0[i]! ||
      this.by0[j]! >= this.by1[i]! ||
      this.by1[j]! <= this.by0[i]!
    )
      return 0;
    const d = penetration(this.nfps.get(this.v[j]!, this.v[i]!), this.x[i]! - this.x[j]!, this.y[i]! - this.y[j]!);
    return d > TOL ? d : 0;
  }

  /** Puts piece i at (vi, px, py) and refreshes its overlaps. */
  place(i: number, vi: number, px: number, py: number): void {
    const vr = this.variants[vi]!;
    this.v[i] = vi;
    this.x[i] = px;
    this.y[i] = py;
    this.bx0[i] = px + vr.sMinX;
    this.bx1[i] = px + vr.sMaxX;
    this.by0[i] = py + vr.sMinY;
    this.by1[i] = py + vr.sMaxY;
    this.refresh(i);
  }

  /** Recomputes the depths of piece i's pairs. */
  refresh(i: number): void {
    const n = this.n;
    let s = 0;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      const old = this.ov[i * n + j]!;
      const d = this.pairDepth(i, j);
      if (d !== old) {
        this.ov[i * n + j] = d;
        this.ov[j * n + i] = d;
        this.pieceOv[j] = this.pieceOv[j]! + d - old;
        if (this.pieceOv[j]! < 1e-9) this.pieceOv[j] = 0;
      }
      s += d;
    }
    this.pieceOv[i] = s;
  }

  /** Recomputes every depth from scratch (after many pieces moved at once). */
  refreshAll(): void {
    this.ov.fill(0);
    this.pieceOv.fill(0);
    const n = this.n;
    for (let i = 0; i < n; i++)
      for (let j = i + 1; j < n; j++) {
        const d = this.pairDepth(i, j);
        if (d > 0) {
          this.ov[i * n + j] = d;
          this.ov[j * n + i] = d;
          this.pieceOv[i] = this.pieceOv[i]! + d;
          this.pieceOv[j] = this.pieceOv[j]! + d;
        }
      }
  }

  /** Sets the box of piece i without refreshing depths (for bulk moves, followed by refreshAll). */
  setRaw(i: number, vi: number, px: number, py: number): void {
    const vr = this.variants[vi]!;
    this.v[i] = vi;
    this.x[i] = px;
    this.y[i] = py;
    this.bx0[i] = px + vr.sMinX;
    this.bx1[i] = px + vr.sMaxX;
    this.by0[i] = py + vr.sMinY;
    this.by1[i] = py + vr.sMaxY;
  }

  totalOverlap(): number {
    let s = 0;
    for (let i = 0; i < this.n; i++) s += this.pieceOv[i]!;
    return s / 2;
  }

  /** Weighted overlap of piece i where it is. */
  weighted(i: number): number {
    const n = this.n;
    let s = 0;
    for (let j = 0; j < n; j++) {
      const d = this.ov[i * n + j]!;
      if (d > 0) s += d * this.w[i * n + j]!;
    }
    return s;
  }

  snapshot(): Snapshot {
    return { v: Int32Array.from(this.v), x: Float64Array.from(this.x), y: Float64Array.from(this.y), len: this.len };
  }

  restore(s: Snapshot): void {
    this.len = s.len;
    for (let i = 0; i < this.n; i++) this.setRaw(i, s.v[i]!, s.x[i]!, s.y[i]!);
    this.refreshAll();
  }
}

export interface Snapshot {
  v: Int32Array;
  x: Float64Array;
  y: Float64Array;
  len: number;
}
