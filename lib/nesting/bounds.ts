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
 * Lower bound on the blocks needed to place every part that fits some block: for identical
 * blocks max(L0, L2) on the trimmed usable box inflated by kerf; for mixed blocks the volume bound
 * over the largest blocks; summed over grades where that is larger.
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
    if (identical) return Math.min(blocks.length, Math.max(volumeBound(first, items, kerf), largeItemBound(first, items, kerf)));
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
  for (const g of grades) byGrade += boundFor(problem.blocks.filter((b) => b.grade === g), problem.parts.filter((p) => p.grade === g));
  const compatibleAll = problem.blocks;
  return Math.max(byGrade, boundFor(compatibleAll, problem.parts.filter((p) => p.grade === undefined || compatibleAll.some((b) => b.grade === p.grade))));
}
