import { orientations } from "./geometry";
import type { Problem, Rotate, Vec3 } from "./types";

export interface BoundItem {
  size: Vec3;
  rotate: Rotate;
  count: number;
}

interface Prepared {
  vol: number;
  /** Smallest side the item can show along each axis over its allowed orientations. */
  minSide: Vec3;
  count: number;
}

function prepare(items: readonly BoundItem[], kerf: number): Prepared[] {
  return items.map((it) => {
    const os = orientations(it.size, it.rotate);
    const minSide = [0, 1, 2].map((a) => Math.min(...os.map((o) => o[a]!)) + kerf) as Vec3;
    return { vol: (it.size[0] + kerf) * (it.size[1] + kerf) * (it.size[2] + kerf), minSide, count: it.count };
  });
}

const ceilSafe = (x: number): number => Math.ceil(x - 1e-9);

/**
 * Volume bound L0 for identical bins: ceil(total item volume / bin volume), sizes inflated by kerf.
 * @example volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 3 }], 0) // → 2
 */
export function volumeBound(bin: Vec3, items: readonly BoundItem[], kerf = 0): number {
  const cap = (bin[0] + kerf) * (bin[1] + kerf) * (bin[2] + kerf);
  const total = prepare(items, kerf).reduce((s, it) => s + it.vol * it.count, 0);
  return Math.max(0, ceilSafe(total / cap));
}

/**
 * Large-item bound L2 (benchmarks README, Martello–Vigo idea) for identical bins, rotation-aware:
 * an item counts as large on an axis only if it is large in every orientation it may take.
 * Thresholds are tried in proportion to the bin (p = q = r for a cube).
 * @example largeItemBound([10, 10, 10], [{ size: [6, 6, 6], rotate: "any", count: 3 }], 0) // → 3
 */
export function largeItemBound(bin: Vec3, items: readonly BoundItem[], kerf = 0): number {
  const B = bin.map((v) => v + kerf) as Vec3;
  const cap = B[0] * B[1] * B[2];
  const its = prepare(items, kerf);
  const fracs = new Set<number>([1e-9]);
  for (const it of its) for (let a = 0; a < 3; a++) if (it.minSide[a]! <= B[a]! / 2) fracs.add(it.minSide[a]! / B[a]!);
  let best = 0;
  for (const f of fracs) {
    const p = B.map((v) => v * f) as Vec3;
    let n12 = 0;
    let vol2 = 0;
    let vol3 = 0;
    let n2 = 0;
    for (const it of its) {
      const m = it.minSide;
      if (m[0] > B[0] - p[0] && m[1] > B[1] - p[1] && m[2] > B[2] - p[2]) n12 += it.count;
      else if (m[0] > B[0] / 2 && m[1] > B[1] / 2 && m[2] > B[2] / 2) {
        n12 += it.count;
        n2 += it.count;
        vol2 += it.vol * it.count;
      } else if (m[0] >= p[0] - 1e-9 && m[1] >= p[1] - 1e-9 && m[2] >= p[2] - 1e-9) vol3 += it.vol * it.count;
    }
    const extra = Math.max(0, ceilSafe((vol3 - (n2 * cap - vol2)) / cap));
    best = Math.max(best, n12 + extra);
  }
  return best;
}

/**
 * A dual feasible function (DFF) on [0, 1]: any sizes that sum to at most 1 still sum to at most 1
 * after it. Sizes are fractions of the bin's side; TOL is the packer's own tolerance.
 */
export type Dff = (x: number) => number;

const TOL = 1e-9;

/**
 * u^(k) of Fekete & Schepers: x where (k + 1)x is whole, else floor((k + 1)x) / k.
 * @example dffRound(1)(0.6) // → 1 (two sizes over 1/2 never share a bin)
 */
export function dffRound(k: number): Dff {
  return (x) => {
    const t = (k + 1) * x;
    const whole = Math.round(t);
    return Math.abs(t - whole) <= TOL ? x : Math.floor(t) / k;
  };
}

/**
 * U^(ε) of Fekete & Schepers (0 < ε ≤ 1/2): sizes over 1 − ε count as the whole bin, sizes under ε
 * as nothing, the rest as they are.
 * @example dffLarge(0.3)(0.8) // → 1
 */
export function dffLarge(eps: number): Dff {
  return (x) => (x > 1 - eps + TOL ? 1 : x < eps - TOL ? 0 : x);
}

/** Most thresholds ε tried (evenly spread over the distinct ones); fewer past 3,000 orientations. */
const MAX_THRESHOLDS = 64;

/**
 * The conservative-scale bound for identical bins (Fekete & Schepers): for a DFF f, every bin's
 * parts satisfy Σ f(w/W)·f(h/H)·f(d/D) ≤ 1, so the bins needed are at least the sum over all
 * parts, rounded up. A part that may turn counts with its least value over the orientations it
 * may take and fit in, so the bound holds whichever way it is packed. Tried: u^(k) for k ≤ 20,
 * U^(ε) at the thresholds where the parts' sides change class, and u^(k) after U^(ε) for k ≤ 10;
 * the best is returned. Sizes are grown by the kerf, as in the packer.
 * @example scaleBound([10, 10, 10], [{ size: [6, 6, 6], rotate: "any", count: 3 }], 0) // → 3
 */
export function scaleBound(bin: Vec3, items: readonly BoundItem[], kerf = 0): number {
  const B = bin.map((v) => v + kerf) as Vec3;
  // The distinct sides as fractions of the bin, and each part line's orientations as their indices.
  const index = new Map<number, number>();
  const fracs: number[] = [];
  const at = (x: number): number => {
    let i = index.get(x);
    if (i === undefined) {
      i = fracs.push(x) - 1;
      index.set(x, i);
    }
    return i;
  };
  // Only orientations that fit count (a packing uses one of them); a part that fits none is left out.
  const lines = items.map((it) => ({
    idx: orientations(it.size, it.rotate)
      .filter((o) => o.every((v, a) => v + kerf <= B[a]! + TOL))
      .map((o) => o.map((v, a) => at((v + kerf) / B[a]!))),
    count: it.count,
  }));
  const sides = new Set<number>();
  for (const x of fracs) {
    sides.add(x);
    sides.add(1 - x);
  }
  const sorted = [...sides].filter((v) => v > TOL && v <= 0.5 + TOL).sort((a, b) => a - b);
  // ε at each value, and between it and the next, so each side lands on either side of ε.
  let eps: number[] = [];
  sorted.forEach((v, i) => {
    eps.push(Math.min(v, 0.5));
    const next = sorted[i + 1];
    if (next !== undefined) eps.push((v + next) / 2);
  });
  // Fewer thresholds for very long part lists, so the bound stays a matter of milliseconds.
  const work = lines.reduce((s, l) => s + l.idx.length, 0);
  const most = Math.max(8, Math.min(MAX_THRESHOLDS, Math.floor(200_000 / Math.max(1, work))));
  if (eps.length > most) eps = Array.from({ length: most }, (_, i) => eps[Math.floor((i * eps.length) / most)]!);
  const fs: Dff[] = [];
  for (let k = 1; k <= 20; k++) fs.push(dffRound(k));
  for (const e of eps) {
    const U = dffLarge(e);
    fs.push(U);
    for (let k = 1; k <= 10; k++) {
      const u = dffRound(k);
      fs.push((x) => u(U(x)));
    }
  }
  let best = 0;
  const val = new Float64Array(fracs.length);
  for (const f of fs) {
    for (let i = 0; i < fracs.length; i++) val[i] = f(fracs[i]!);
    let sum = 0;
    for (const l of lines) {
      if (l.idx.length === 0) continue;
      let least = Infinity;
      for (const o of l.idx) least = Math.min(least, val[o[0]!]! * val[o[1]!]! * val[o[2]!]!);
      sum += least * l.count;
    }
    best = Math.max(best, ceilSafe(sum));
  }
  return best;
}

/**
 * Lower bound on the blocks needed to place every part that fits some block: for identical
 * blocks max(L0, L2, conservative scales) on the trimmed usable box inflated by kerf; for mixed
 * blocks the volume bound over the largest blocks; summed over grades where that is larger.
 * @example lowerBoundBlocks(problem) // → 3
 */
export function lowerBoundBlocks(problem: Problem): number {
  const { kerf } = problem.settings;
  const usable = (b: Problem["blocks"][number]): Vec3 => b.size.map((v) => v - 2 * b.trim) as Vec3;
  const fits = (part: Problem["parts"][number], u: Vec3): boolean =>
    orientations(part.size, part.rotate).some((o) => o[0] <= u[0] + 1e-9 && o[1] <= u[1] + 1e-9 && o[2] <= u[2] + 1e-9);
  const boundFor = (blocks: Problem["blocks"], parts: Problem["parts"]): number => {
    const items: BoundItem[] = parts
      .filter((p) => blocks.some((b) => fits(p, usable(b))))
      .map((p) => ({ size: p.size, rotate: p.rotate, count: p.quantity }));
    if (items.length === 0 || blocks.length === 0) return 0;
    const first = usable(blocks[0]!);
    const identical = blocks.every((b) => usable(b).every((v, a) => Math.abs(v - first[a]!) < 1e-9));
    if (identical)
      return Math.min(
        blocks.length,
        Math.max(volumeBound(first, items, kerf), largeItemBound(first, items, kerf), scaleBound(first, items, kerf)),
      );
    const total = prepare(items, kerf).reduce((s, it) => s + it.vol * it.count, 0);
    const caps = blocks.map((b) => usable(b).reduce((s, v) => s * (v + kerf), 1)).sort((a, b) => b - a);
    let sum = 0;
    for (let m = 0; m < caps.length; m++) {
      sum += caps[m]!;
      if (sum >= total - 1e-9) return m + 1;
    }
    return blocks.length;
  };
  const grades = new Set(problem.parts.map((p) => p.grade).filter((g): g is string => g !== undefined));
  let byGrade = 0;
  for (const g of grades)
    byGrade += boundFor(
      problem.blocks.filter((b) => b.grade === g),
      problem.parts.filter((p) => p.grade === g),
    );
  const compatibleAll = problem.blocks;
  return Math.max(
    byGrade,
    boundFor(
      compatibleAll,
      problem.parts.filter((p) => p.grade === undefined || compatibleAll.some((b) => b.grade === p.grade)),
    ),
  );
}
