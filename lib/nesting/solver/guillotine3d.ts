import type { Box } from "../geometry";
import type { Rng } from "../rng";
import type { Vec3 } from "../types";
import { fillBoxFirst } from "./boxfirst";
import { GRID_ORDERS, split, type SplitRule } from "./split";
import { gridItems, type BlockFill, type BlockInfo, type ItemType, type PackedItem } from "./model";

export interface FillParams {
  /** Type indices in the order they are tried. */
  order: number[];
  /** Place a grid of identical copies at once (fast, tidy) or one piece at a time. */
  grid: boolean;
  split: SplitRule;
  /** Carve defects away across the thinnest axis first (true) or in a random axis order. */
  thinSlabs: boolean;
  /** Fill the lowest free box with the part that fits it best, instead of part after part. */
  boxFirst: boolean;
  /** Box-first only: candidates per step judged by a greedy completion (0 = plain greedy). */
  lookahead: number;
  rng: Rng;
  /** Box-first only: out of time, finish the fill without lookahead. */
  stop?: () => boolean;
}

/**
 * Cuts the defect obstacles out of the usable box with through cuts: first a slab across the
 * obstacle's thinnest axis, then strips inside that slab, so only a small cell is lost.
 */
export function carveObstacles(
  usable: Box,
  obstacles: readonly Box[],
  thinSlabs: boolean,
  r: Rng,
): { free: Box[]; lost: Box[] } {
  let free: Box[] = [usable];
  const lost: Box[] = [];
  for (const ob of obstacles) {
    const next: Box[] = [];
    for (const f of free) {
      const lo = [0, 1, 2].map((a) => Math.max(f.origin[a]!, ob.origin[a]!));
      const hi = [0, 1, 2].map((a) => Math.min(f.origin[a]! + f.size[a]!, ob.origin[a]! + ob.size[a]!));
      if (lo.some((v, a) => v >= hi[a]! - 1e-9)) {
        next.push(f);
        continue;
      }
      const axes = [0, 1, 2];
      if (thinSlabs) axes.sort((a, b) => hi[a]! - lo[a]! - (hi[b]! - lo[b]!));
      else axes.sort(() => r() - 0.5);
      let region: Box = f;
      for (const a of axes) {
        const o = region.origin;
        const s = region.size;
        const before: Box = { origin: [...o] as Vec3, size: [...s] as Vec3 };
        before.size[a] = lo[a]! - o[a]!;
        const after: Box = { origin: [...o] as Vec3, size: [...s] as Vec3 };
        after.origin[a] = hi[a]!;
        after.size[a] = o[a]! + s[a]! - hi[a]!;
        if (before.size[a]! > 1e-9) next.push(before);
        if (after.size[a]! > 1e-9) next.push(after);
        const mid: Box = { origin: [...o] as Vec3, size: [...s] as Vec3 };
        mid.origin[a] = lo[a]!;
        mid.size[a] = hi[a]! - lo[a]!;
        region = mid;
      }
      lost.push(region);
    }
    free = next;
  }
  return { free, lost };
}

/** Slack on axes too thin for any remaining part costs much; other slack a little. */
function wasteScore(f: Vec3, g0: number, g1: number, g2: number, mMin: number): number {
  let waste = 0;
  const r0 = f[0] - g0;
  const r1 = f[1] - g1;
  const r2 = f[2] - g2;
  if (r0 > 1e-9) waste += r0 < mMin ? (r0 / f[0]) * 4 : r0 / f[0] / 4;
  if (r1 > 1e-9) waste += r1 < mMin ? (r1 / f[1]) * 4 : r1 / f[1] / 4;
  if (r2 > 1e-9) waste += r2 < mMin ? (r2 / f[2]) * 4 : r2 / f[2] / 4;
  return waste;
}

interface Candidate {
  free: number;
  dims: Vec3;
  n: Vec3;
  score: number;
}

/**
 * Fills one block with guillotine cuts: parts in `order`, each (or a grid of copies) into the free
 * box where it wastes least, the rest of that box split into three boxes by through cuts.
 * `remaining` is decremented in place.
 */
export function fillBlockGuillotine(
  block: BlockInfo,
  types: readonly ItemType[],
  remaining: number[],
  p: FillParams,
): BlockFill {
  const { free: initial, lost } = carveObstacles(block.usable, block.obstacles, p.thinSlabs, p.rng);
  let free = initial;
  const leftovers: Box[] = [...lost.filter(() => false)];
  const items: PackedItem[] = [];
  let packedVolume = 0;
  const minSideLeft = (): number => {
    let m = Infinity;
    for (const t of p.order) if (remaining[t]! > 0) m = Math.min(m, types[t]!.minSide);
    return m;
  };
  let mMin = minSideLeft();
  // Drop free boxes nothing can use any more.
  const prune = (): void => {
    const keep: Box[] = [];
    for (const f of free) (f.size.some((v) => v < mMin - 1e-9) ? leftovers : keep).push(f);
    free = keep;
  };
  prune();
  if (p.boxFirst) {
    const r = fillBoxFirst(free, types, remaining, p.order, {
      grid: p.grid,
      split: p.split,
      lookahead: p.lookahead,
      rng: p.rng,
      ...(p.stop ? { stop: p.stop } : {}),
    });
    return {
      block: block.index,
      items: r.items,
      leftovers: [...leftovers, ...r.leftovers],
      packedVolume: r.packedVolume,
    };
  }
  for (const t of p.order) {
    const type = types[t]!;
    while (remaining[t]! > 0 && free.length > 0) {
      let best: Candidate | undefined;
      for (let fi = 0; fi < free.length; fi++) {
        const f = free[fi]!;
        const fs = f.size;
        for (const d of type.dims) {
          if (d[0] > fs[0] + 1e-9 || d[1] > fs[1] + 1e-9 || d[2] > fs[2] + 1e-9) continue;
          if (!p.grid || remaining[t]! === 1) {
            const score = wasteScore(fs, d[0], d[1], d[2], mMin) - 1e-6;
            if (!best || score < best.score) best = { free: fi, dims: d, n: [1, 1, 1], score };
            continue;
          }
          const rem = remaining[t]!;
          const cap: Vec3 = [
            Math.floor(fs[0] / d[0] + 1e-9),
            Math.floor(fs[1] / d[1] + 1e-9),
            Math.floor(fs[2] / d[2] + 1e-9),
          ];
          for (const [a1, a2, a3] of GRID_ORDERS) {
            const n: Vec3 = [1, 1, 1];
            n[a1] = Math.min(cap[a1]!, rem);
            n[a2] = Math.min(cap[a2]!, Math.floor(rem / n[a1]!));
            n[a3] = Math.min(cap[a3]!, Math.floor(rem / (n[a1]! * n[a2]!)));
            const count = n[0] * n[1] * n[2];
            const score = wasteScore(fs, d[0] * n[0], d[1] * n[1], d[2] * n[2], mMin) - count * 1e-6;
            if (!best || score < best.score) best = { free: fi, dims: d, n, score };
          }
        }
      }
      if (!best) break;
      const f = free[best.free]!;
      const { dims: d, n } = best;
      items.push(...gridItems(t, f.origin, d, n));
      const count = n[0] * n[1] * n[2];
      remaining[t] = remaining[t]! - count;
      packedVolume += count * type.volume;
      const g: Vec3 = [d[0] * n[0], d[1] * n[1], d[2] * n[2]];
      free.splice(best.free, 1, ...split(f, g, p.split, p.rng));
      if (remaining[t] === 0) {
        const m = minSideLeft();
        if (m > mMin) mMin = m;
      }
      prune();
    }
  }
  leftovers.push(...free);
  return { block: block.index, items, leftovers, packedVolume };
}
