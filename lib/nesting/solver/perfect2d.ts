import type { Vec3 } from "../types";
import { layerDims } from "./maxrects2d";
import type { BlockFill, BlockInfo, ItemType, PackedItem } from "./model";

const E = 1e-9;

/** A run of the skyline: from `x`, `w` long, filled up to `y`. */
interface Segment {
  x: number;
  w: number;
  y: number;
}

/** Places a `w`-wide piece `h` high at the left end of segment `i`; neighbours of equal height merge. */
function raise(sky: readonly Segment[], i: number, w: number, h: number): Segment[] {
  const s = sky[i]!;
  const next: Segment[] = [...sky.slice(0, i), { x: s.x, w, y: s.y + h }];
  if (s.w - w > E) next.push({ x: s.x + w, w: s.w - w, y: s.y });
  next.push(...sky.slice(i + 1));
  const merged: Segment[] = [];
  for (const seg of next) {
    const last = merged[merged.length - 1];
    if (last && Math.abs(last.y - seg.y) <= E) merged[merged.length - 1] = { x: last.x, w: last.w + seg.w, y: last.y };
    else merged.push(seg);
  }
  return merged;
}

/**
 * Exact search for a perfect packing of one layer: when the parts stand in the block's full
 * height and their footprints add up to the block's footprint exactly (no waste at all), it fills
 * the lowest, leftmost gap of the skyline with a part set at its left end, part by part, and
 * backtracks. Every perfect packing can be built in that order, so the search is complete (bounded
 * by `nodeLimit`); unlike the glue search it also finds packings no through cuts could free,
 * which the `layers` and `free` rules allow (a profile cutter frees them inside the layer).
 * Undefined when the parts do not fill the layer exactly, the block has defects, or no packing
 * was found within the limit.
 * @example packLayerPerfect(block, model.types, counts, 100_000) // → BlockFill with every piece
 */
export function packLayerPerfect(
  block: BlockInfo,
  types: readonly ItemType[],
  counts: readonly number[],
  nodeLimit: number,
  stop: () => boolean = () => false,
): BlockFill | undefined {
  if (block.obstacles.length > 0) return undefined;
  const [W, H] = block.usable.size;
  const live: { type: number; dims: Vec3[]; minSide: number }[] = [];
  let need = 0;
  for (let t = 0; t < counts.length; t++) {
    if (counts[t]! <= 0) continue;
    const all = layerDims(types[t]!, block);
    if (all.length === 0) return undefined;
    // One footprint per distinct size (a square turned is the same square).
    const dims = all.filter(
      (d, i) => all.findIndex((e) => Math.abs(e[0] - d[0]) <= E && Math.abs(e[1] - d[1]) <= E) === i,
    );
    live.push({ type: t, dims, minSide: Math.min(...dims.map((d) => Math.min(d[0], d[1]))) });
    need += counts[t]! * dims[0]![0] * dims[0]![1];
  }
  if (live.length === 0 || Math.abs(need - W * H) > 1e-6 * W * H) return undefined;
  // Larger footprints first: they have the fewest places to go.
  live.sort((a, b) => b.dims[0]![0] * b.dims[0]![1] - a.dims[0]![0] * a.dims[0]![1]);
  const left = live.map((l) => counts[l.type]!);
  const placed: { k: number; d: Vec3; x: number; y: number }[] = [];
  let nodes = 0;
  let aborted = false;

  const narrowest = (): number => {
    let m = Infinity;
    live.forEach((l, k) => {
      if (left[k]! > 0 && l.minSide < m) m = l.minSide;
    });
    return m;
  };

  // Whole-number sizes (the usual case) allow the gap check below.
  const whole =
    Number.isInteger(W) && live.every((l) => l.dims.every((d) => Number.isInteger(d[0]) && Number.isInteger(d[1])));
  /**
   * Whether widths of parts still to place can add up to `g` exactly, each part used once and
   * turned either way, and each standing no higher than `room` (the lowest gap's walls are
   * higher than its floor, so its floor must be covered edge to edge).
   */
  const fillable = (g: number, room: number): boolean => {
    if (!whole) return true;
    const reach = new Uint8Array(g + 1);
    reach[0] = 1;
    for (let k = 0; k < live.length; k++) {
      const ws = live[k]!.dims.filter((d) => d[1] <= room + E).map((d) => d[0]);
      for (let c = 0; c < left[k]! && ws.length > 0; c++) {
        // Downwards, so each copy is counted once.
        for (let v = g - 1; v >= 0; v--) if (reach[v]) for (const w of ws) if (v + w <= g) reach[v + w] = 1;
        if (reach[g]) return true;
      }
    }
    return reach[g] === 1;
  };
  // Failed states (skyline and parts left), bounded.
  const failed = new Set<string>();

  const dfs = (sky: readonly Segment[], rest: number): boolean => {
    if (rest === 0) return true;
    if (++nodes > nodeLimit || ((nodes & 15) === 0 && stop())) {
      aborted = true;
      return false;
    }
    // Wells: runs lower than both neighbours (or the block's sides). A part must start at each
    // well's left end, and the parts standing in it must cover its floor edge to edge; the
    // narrowest well (fewest parts fit) is filled next.
    let i = -1;
    for (let j = 0; j < sky.length; j++) {
      const s = sky[j]!;
      if ((j > 0 && sky[j - 1]!.y < s.y) || (j + 1 < sky.length && sky[j + 1]!.y < s.y)) continue;
      if (!fillable(s.w, H - s.y)) return false;
      if (i < 0 || s.w < sky[i]!.w - E || (Math.abs(s.w - sky[i]!.w) <= E && s.y < sky[i]!.y)) i = j;
    }
    const gap = sky[i]!;
    const key = `${sky.map((g) => `${g.w}:${g.y}`).join(",")}|${left.join(",")}`;
    if (failed.has(key)) return false;
    // Parts that close the well's width first, then those whose top meets the left wall's, then
    // larger ones (the order the parts were sorted in).
    const wallTop = i > 0 ? sky[i - 1]!.y : Infinity;
    const moves: { k: number; d: Vec3; rank: number }[] = [];
    for (let k = 0; k < live.length; k++) {
      if (left[k] === 0) continue;
      for (const d of live[k]!.dims) {
        if (d[0] > gap.w + E || gap.y + d[1] > H + E) continue;
        const rank = (Math.abs(d[0] - gap.w) <= E ? 0 : 2) + (Math.abs(gap.y + d[1] - wallTop) <= E ? 0 : 1);
        moves.push({ k, d, rank: rank * 1e6 + moves.length });
      }
    }
    moves.sort((a, b) => a.rank - b.rank);
    for (const { k, d } of moves) {
      const [w, h] = d;
      left[k]!--;
      // What the part leaves of the gap must take some part still to place.
      const over = gap.w - w;
      if (over > E && over < narrowest() - E) {
        left[k]!++;
        continue;
      }
      placed.push({ k, d, x: gap.x, y: gap.y });
      if (dfs(raise(sky, i, w, h), rest - 1)) return true;
      placed.pop();
      left[k]!++;
      if (aborted) return false;
    }
    if (failed.size < 50_000) failed.add(key);
    return false;
  };

  const total = left.reduce((s, c) => s + c, 0);
  if (!dfs([{ x: 0, w: W, y: 0 }], total)) return undefined;
  const o = block.usable.origin;
  const items: PackedItem[] = placed.map((p) => ({
    type: live[p.k]!.type,
    origin: [o[0] + p.x, o[1] + p.y, o[2]] as Vec3,
    dims: p.d,
  }));
  const packedVolume = items.reduce((s, it) => s + types[it.type]!.volume, 0);
  return { block: block.index, items, leftovers: [], packedVolume };
}
