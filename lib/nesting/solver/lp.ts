/**
 * A small dense simplex for the covering linear programs of the set cover (`setcover.ts`), written
 * here because javascript-lp-solver's simplex (1.0.3) cycled without end on one of them (78 rows,
 * 250 columns, from a 77-piece order: the search never returned) and cannot be interrupted.
 * This one counts its pivots and asks `stop` every few of them, so it always returns.
 */

/** Outcome of `solveCover`: an optimal x, a proof that none exists, or a search cut short. */
export type CoverLp =
  | { status: "optimal"; x: number[]; cost: number }
  | { status: "infeasible" }
  | { status: "stopped" };

export interface CoverLpOptions {
  /** Pivots allowed before giving up (default 50 × (rows + columns)). */
  maxPivots?: number;
  /** Asked before the first pivot and every 16th; true ends the search ("stopped"). */
  stop?: () => boolean;
}

const TOL = 1e-9;

/**
 * Minimises `cost · x` subject to `Σ_j cover[j][i] · x_j ≥ demand[i]` for every row i,
 * `Σ_{j in group g} x_j ≤ cap[g]` for every group, and x ≥ 0; `cover[j]` lists column j's
 * nonzero rows as [row, amount] pairs (amounts ≥ 0), `group[j]` its group. Costs must not be
 * negative. It solves the dual, a packing problem whose origin is feasible (no phase one):
 * maximise `demand · y − cap · z` subject to `Σ_i cover[j][i] · y_i − z_group(j) ≤ cost_j` and
 * y, z ≥ 0, by the primal simplex on a dense tableau (Dantzig's rule, Bland's rule after a run of
 * degenerate pivots against cycling, and a pivot limit besides); x is read off the reduced costs of the dual's slacks.
 * An unbounded dual means no x covers the demand.
 * @example solveCover([[[0, 2]], [[0, 1]]], [0, 0], [1, 1], [4], [10]) // → { status: "optimal", x: [2, 0], cost: 2 }
 */
export function solveCover(
  cover: readonly (readonly (readonly [number, number])[])[],
  group: readonly number[],
  cost: readonly number[],
  demand: readonly number[],
  cap: readonly number[],
  opts: CoverLpOptions = {},
): CoverLp {
  const n = cover.length;
  const nRows = demand.length;
  const nGroups = cap.length;
  // Dual variables: y_0..y_{nRows-1}, z_0..z_{nGroups-1}, then one slack per column.
  const nVars = nRows + nGroups;
  const width = nVars + n + 1;
  const rhs = width - 1;
  const m = n;
  const t = new Float64Array((m + 1) * width);
  const obj = m * width;
  for (let j = 0; j < n; j++) {
    const row = j * width;
    for (const [i, a] of cover[j]!) t[row + i] = t[row + i]! + a;
    t[row + nRows + group[j]!] = -1;
    t[row + nVars + j] = 1;
    t[row + rhs] = cost[j]!;
  }
  // Objective row holds the reduced costs of maximising demand·y − cap·z: −demand, +cap.
  for (let i = 0; i < nRows; i++) t[obj + i] = -demand[i]!;
  for (let g = 0; g < nGroups; g++) t[obj + nRows + g] = cap[g]!;
  const basis = Int32Array.from({ length: m }, (_, j) => nVars + j);
  const maxPivots = opts.maxPivots ?? 50 * (m + width);
  const nz = new Int32Array(width);
  let degenerate = 0;
  for (let pivots = 0; ; pivots++) {
    if (pivots >= maxPivots || ((pivots & 15) === 0 && opts.stop?.())) return { status: "stopped" };
    const bland = degenerate > 50;
    // Entering column: most negative reduced cost, or (Bland) the first negative one.
    let e = -1;
    let best = -TOL;
    for (let c = 0; c < rhs; c++) {
      const v = t[obj + c]!;
      if (v < best) {
        e = c;
        if (bland) break;
        best = v;
      }
    }
    if (e < 0) break;
    // Leaving row: the ratio test, ties to the lowest basic variable (Bland).
    let r = -1;
    let ratio = Infinity;
    for (let i = 0; i < m; i++) {
      const a = t[i * width + e]!;
      if (a <= TOL) continue;
      const q = t[i * width + rhs]! / a;
      if (q < ratio - TOL || (q <= ratio + TOL && r >= 0 && basis[i]! < basis[r]!)) {
        ratio = q;
        r = i;
      }
    }
    if (r < 0) return { status: "infeasible" };
    degenerate = ratio <= TOL ? degenerate + 1 : 0;
    // Pivot on (r, e), touching only the pivot row's nonzero columns.
    const pr = r * width;
    const inv = 1 / t[pr + e]!;
    let k = 0;
    for (let c = 0; c < width; c++) {
      if (t[pr + c] === 0) continue;
      t[pr + c] = t[pr + c]! * inv;
      nz[k++] = c;
    }
    t[pr + e] = 1;
    for (let i = 0; i <= m; i++) {
      if (i === r) continue;
      const row = i * width;
      const f = t[row + e]!;
      if (f === 0) continue;
      for (let q = 0; q < k; q++) {
        const c = nz[q]!;
        t[row + c] = t[row + c]! - f * t[pr + c]!;
      }
      t[row + e] = 0;
      // Keep the right-hand side from drifting below zero by rounding.
      if (i < m && t[row + rhs]! < 0 && t[row + rhs]! > -TOL) t[row + rhs] = 0;
    }
    basis[r] = e;
  }
  // At the optimum the reduced cost of slack j is the price of dual row j: the primal x_j.
  const x = Array.from({ length: n }, (_, j) => Math.max(0, t[obj + nVars + j]!));
  const total = x.reduce((s, v, j) => s + v * cost[j]!, 0);
  return { status: "optimal", x, cost: total };
}
