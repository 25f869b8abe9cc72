import { guillotineSplits, type Box } from "../geometry";
import type { Rng } from "../rng";
import type { Vec3 } from "../types";
import { carveObstacles } from "./guillotine3d";
import { fitsIn, type BlockFill, type BlockInfo, type ItemType, type PackedItem } from "./model";

const vol = (s: Vec3): number => s[0] * s[1] * s[2];

/** The distinct three-box guillotine splits of `f` around a piece `d` at its corner. */
function splits(f: Box, d: Vec3): Box[][] {
  const seen = new Set<string>();
  return guillotineSplits(f, d).filter((boxes) => {
    const key = boxes.map((b) => `${b.origin.join(",")}:${b.size.join(",")}`).sort().join("|");
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

const lowerCorner = (a: Box, b: Box): number => a.origin[2] - b.origin[2] || a.origin[1] - b.origin[1] || a.origin[0] - b.origin[0];

/**
 * Depth-first search for a guillotine packing of ALL the given pieces into one block. It fills
 * the lowest free box first, tries exact fits first, and prunes as soon as the space thrown away
 * exceeds the block's slack (usable volume minus part volume). Bounded by `nodeLimit`.
 * Returns the fill, or undefined when it gives up.
 */
export function packAllInBlock(block: BlockInfo, types: readonly ItemType[], counts: readonly number[], nodeLimit: number, r: Rng, stop: () => boolean = () => false): BlockFill | undefined {
  const { free: initial } = carveObstacles(block.usable, block.obstacles, true, r);
  const capacity = initial.reduce((s, b) => s + vol(b.size), 0);
  const live = counts.map((c, t) => (c > 0 ? t : -1)).filter((t) => t >= 0);
  const inflatedVol = (t: number): number => vol(types[t]!.dims[0]!);
  const need = live.reduce((s, t) => s + counts[t]! * inflatedVol(t), 0);
  const slack = capacity - need;
  if (slack < -1e-6) return undefined;
  const rem = [...counts];
  const items: PackedItem[] = [];
  let nodes = 0;
  let left = live.reduce((s, t) => s + counts[t]!, 0);
  const minSide = (): number => Math.min(...live.filter((t) => rem[t]! > 0).map((t) => types[t]!.minSide));
  const jitter = live.map(() => r() * 1e-3);

  const dfs = (free: Box[], wasted: number): boolean => {
    if (left === 0) return true;
    if (++nodes > nodeLimit || ((nodes & 127) === 0 && stop() && (nodes = Infinity))) return false;
    if (free.length === 0) return false;
    let fi = 0;
    for (let i = 1; i < free.length; i++) if (lowerCorner(free[i]!, free[fi]!) < 0) fi = i;
    const f = free[fi]!;
    const rest = free.filter((_, i) => i !== fi);
    const m = minSide();
    const cands: { t: number; d: Vec3; score: number }[] = [];
    live.forEach((t, k) => {
      if (rem[t]! <= 0) return;
      for (const d of types[t]!.dims) {
        if (!fitsIn(d, f.size)) continue;
        let exact = 0;
        let dead = false;
        for (let a = 0; a < 3; a++) {
          const g = f.size[a]! - d[a]!;
          if (g <= 1e-9) exact++;
          else if (g < m - 1e-9) dead = true;
        }
        cands.push({ t, d, score: exact * 10 - (dead ? 5 : 0) + vol(d) / vol(f.size) + jitter[k]! });
      }
    });
    cands.sort((a, b) => b.score - a.score);
    for (const c of cands) {
      for (const parts of splits(f, c.d)) {
        // Boxes too thin for every remaining part are waste now.
        rem[c.t]!--;
        left--;
        const m2 = left > 0 ? minSide() : Infinity;
        let w = wasted;
        const keep: Box[] = [];
        for (const b of parts) (b.size.some((v) => v < m2 - 1e-9) ? (w += vol(b.size)) : keep.push(b));
        if (w <= slack + 1e-6) {
          items.push({ type: c.t, origin: [...f.origin] as Vec3, dims: c.d });
          if (dfs([...rest, ...keep], w)) return true;
          items.pop();
        }
        rem[c.t]!++;
        left++;
        if (nodes > nodeLimit) return false;
      }
    }
    // Leave this box empty if the slack allows it.
    const w = wasted + vol(f.size);
    if (w <= slack + 1e-6) return dfs(rest, w);
    return false;
  };

  if (!dfs(initial, 0)) return undefined;
  const packedVolume = items.reduce((s, it) => s + types[it.type]!.volume, 0);
  return { block: block.index, items, leftovers: [], packedVolume };
}

/**
 * Depth-first search that builds the cut tree top-down: the current region is either exactly one
 * part, or is cut through along an axis at a part's length (the first piece of a strip or slab),
 * or is left as waste while the slack allows. Complete for cut trees whose cuts fall at part
 * lengths, which is how a cutter usually works; bounded by `nodeLimit`.
 */
export function packAllByCuts(block: BlockInfo, types: readonly ItemType[], counts: readonly number[], nodeLimit: number, r: Rng, stop: () => boolean = () => false): BlockFill | undefined {
  const { free: initial } = carveObstacles(block.usable, block.obstacles, true, r);
  const capacity = initial.reduce((s, b) => s + vol(b.size), 0);
  const live = counts.map((c, t) => (c > 0 ? t : -1)).filter((t) => t >= 0);
  const need = live.reduce((s, t) => s + counts[t]! * vol(types[t]!.dims[0]!), 0);
  const slack = capacity - need;
  if (slack < -1e-6) return undefined;
  const rem = [...counts];
  const items: PackedItem[] = [];
  let nodes = 0;
  let left = live.reduce((s, t) => s + counts[t]!, 0);
  const order = [...live].sort((a, b) => vol(types[b]!.dims[0]!) - vol(types[a]!.dims[0]!) + (r() - 0.5) * 1e-9);
  const fittingVolume = (size: Vec3): number => {
    let v = 0;
    for (const t of order) if (rem[t]! > 0 && types[t]!.dims.some((d) => fitsIn(d, size))) v += rem[t]! * vol(types[t]!.dims[0]!);
    return v;
  };

  /** Orientations that fit, or -1 when the parts that fit cannot fill the region within `spare`. */
  const choices = (size: Vec3, spare: number): number => {
    let n = 0;
    let v = 0;
    for (const t of order) {
      if (rem[t]! <= 0) continue;
      let fits = false;
      for (const d of types[t]!.dims)
        if (fitsIn(d, size)) {
          n++;
          fits = true;
        }
      if (fits) v += rem[t]! * vol(types[t]!.dims[0]!);
    }
    return v < vol(size) - spare ? -1 : n;
  };

  const dfs = (regions: Box[], wasted: number): boolean => {
    if (left === 0) return true;
    if (++nodes > nodeLimit || ((nodes & 127) === 0 && stop() && (nodes = Infinity)) || regions.length === 0) return false;
    // Most constrained region first: dead ends show up early.
    const spare0 = slack - wasted + 1e-6;
    let ri = regions.length - 1;
    let best = choices(regions[ri]!.size, spare0);
    if (best < 0) return false;
    for (let i = regions.length - 2; i >= 0; i--) {
      const c = choices(regions[i]!.size, spare0);
      if (c < 0) return false;
      if (c < best) {
        best = c;
        ri = i;
      }
    }
    const R = regions[ri]!;
    const rest = regions.filter((_, i) => i !== ri);
    // Exact fits first, then cuts at part lengths (strips that match the region on more axes first).
    const cuts = new Map<string, { a: number; c: number; score: number }>();
    let anyFits = false;
    for (const t of order) {
      if (rem[t]! <= 0) continue;
      for (const d of types[t]!.dims) {
        if (!fitsIn(d, R.size)) continue;
        anyFits = true;
        const match = [0, 1, 2].filter((a) => Math.abs(d[a]! - R.size[a]!) <= 1e-9).length;
        if (match === 3) {
          rem[t]!--;
          left--;
          items.push({ type: t, origin: [...R.origin] as Vec3, dims: d });
          if (dfs(rest, wasted)) return true;
          items.pop();
          rem[t]!++;
          left++;
          if (nodes > nodeLimit) return false;
          continue;
        }
        for (let a = 0; a < 3; a++) {
          if (d[a]! >= R.size[a]! - 1e-9) continue;
          // Cutting at c or at R - c gives the same two slabs, mirrored: try the pair once.
          const c = d[a]!;
          const key = `${a}:${Math.min(c, R.size[a]! - c)}`;
          const score = match * 1e9 + c;
          const prev = cuts.get(key);
          if (!prev || prev.score < score) cuts.set(key, { a, c, score });
        }
      }
    }
    if (anyFits) {
      for (const { a, c } of [...cuts.values()].sort((x, y) => y.score - x.score)) {
        const first: Box = { origin: [...R.origin] as Vec3, size: [...R.size] as Vec3 };
        first.size[a] = c;
        const second: Box = { origin: [...R.origin] as Vec3, size: [...R.size] as Vec3 };
        second.origin[a] = R.origin[a]! + c;
        second.size[a] = R.size[a]! - c;
        // A region needs enough fitting parts to fill it, up to the slack still unspent.
        const spare = slack - wasted + 1e-6;
        if (fittingVolume(first.size) < vol(first.size) - spare || fittingVolume(second.size) < vol(second.size) - spare) continue;
        if (dfs([...rest, second, first], wasted)) return true;
        if (nodes > nodeLimit) return false;
      }
    }
    const w = wasted + vol(R.size);
    return w <= slack + 1e-6 && dfs(rest, w);
  };

  if (!dfs(initial, 0)) return undefined;
  const packedVolume = items.reduce((s, it) => s + types[it.type]!.volume, 0);
  return { block: block.index, items, leftovers: [], packedVolume };
}
