import type { Box } from "../geometry";
import type { Rng } from "../rng";
import type { Vec3 } from "../types";
import { carveObstacles } from "./guillotine3d";
import { fitsIn, type BlockFill, type BlockInfo, type ItemType, type PackedItem } from "./model";

const vol = (s: Vec3): number => s[0] * s[1] * s[2];

/** The distinct three-box guillotine splits of `f` around a piece `d` at its corner. */
function splits(f: Box, d: Vec3): Box[][] {
  const out: Box[][] = [];
  const seen = new Set<string>();
  for (const order of [[0, 1, 2], [0, 2, 1], [1, 0, 2], [1, 2, 0], [2, 0, 1], [2, 1, 0]]) {
    const boxes: Box[] = [];
    const ext = [...f.size] as Vec3;
    for (const a of order) {
      const r = f.size[a]! - d[a]!;
      if (r > 1e-9) {
        const o = [...f.origin] as Vec3;
        o[a] = f.origin[a]! + d[a]!;
        const s = [...ext] as Vec3;
        s[a] = r;
        boxes.push({ origin: o, size: s });
      }
      ext[a] = d[a]!;
    }
    const key = boxes.map((b) => `${b.origin.join(",")}:${b.size.join(",")}`).sort().join("|");
    if (!seen.has(key)) {
      seen.add(key);
      out.push(boxes);
    }
  }
  return out;
}

const lowerCorner = (a: Box, b: Box): number => a.origin[2] - b.origin[2] || a.origin[1] - b.origin[1] || a.origin[0] - b.origin[0];

/**
 * Depth-first search for a guillotine packing of ALL the given pieces into one block. It fills
 * the lowest free box first, tries exact fits first, and prunes as soon as the space thrown away
 * exceeds the block's slack (usable volume minus part volume). Bounded by `nodeLimit`.
 * Returns the fill, or undefined when it gives up.
 */
export function packAllInBlock(block: BlockInfo, types: readonly ItemType[], counts: readonly number[], nodeLimit: number, r: Rng): BlockFill | undefined {
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
    if (++nodes > nodeLimit) return false;
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
