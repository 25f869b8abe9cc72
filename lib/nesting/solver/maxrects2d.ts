import { MaxRectsPacker } from "maxrects-packer";
import type { Box } from "../geometry";
import type { Vec3 } from "../types";
import type { BlockFill, BlockInfo, ItemType, PackedItem } from "./model";

interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

export type RectRule = "bssf" | "baf" | "bl";

const E = 1e-9;

/**
 * In-plane orientations of a type that stand exactly one layer tall in this block, or none.
 * A block whose compatible parts all have one is a single layer: inside it (layout "layers" or
 * "free") pieces may sit in any arrangement, so a MaxRects packer may place them.
 */
export function layerDims(type: ItemType, block: BlockInfo): Vec3[] {
  const h = block.usable.size[2];
  return type.dims.filter((d) => Math.abs(d[2] - h) <= 1e-9);
}

const contains = (a: Rect, b: Rect): boolean =>
  b.x >= a.x - E && b.y >= a.y - E && b.x + b.w <= a.x + a.w + E && b.y + b.h <= a.y + a.h + E;

/** Removes `used` from the free rectangles, MaxRects style (maximal, overlapping free rects). */
function occupy(free: Rect[], used: Rect): Rect[] {
  const out: Rect[] = [];
  for (const f of free) {
    if (
      used.x >= f.x + f.w - E ||
      used.x + used.w <= f.x + E ||
      used.y >= f.y + f.h - E ||
      used.y + used.h <= f.y + E
    ) {
      out.push(f);
      continue;
    }
    if (used.x > f.x + E) out.push({ x: f.x, y: f.y, w: used.x - f.x, h: f.h });
    if (used.x + used.w < f.x + f.w - E)
      out.push({ x: used.x + used.w, y: f.y, w: f.x + f.w - used.x - used.w, h: f.h });
    if (used.y > f.y + E) out.push({ x: f.x, y: f.y, w: f.w, h: used.y - f.y });
    if (used.y + used.h < f.y + f.h - E)
      out.push({ x: f.x, y: used.y + used.h, w: f.w, h: f.y + f.h - used.y - used.h });
  }
  return out.filter((r, i) => !out.some((o, j) => j !== i && contains(o, r) && (!contains(r, o) || j < i)));
}

/**
 * Fills one layer-tall block with MaxRects: parts in `order`, each into the free rectangle chosen
 * by `rule` (best short side fit, best area fit, bottom-left). The leftover kept is the larger
 * clean strip beside all pieces (it is separated by one through cut).
 */
export function fillBlockMaxRects(
  block: BlockInfo,
  types: readonly ItemType[],
  remaining: number[],
  order: readonly number[],
  rule: RectRule,
): BlockFill {
  const u = block.usable;
  let free: Rect[] = [{ x: u.origin[0], y: u.origin[1], w: u.size[0], h: u.size[1] }];
  for (const ob of block.obstacles) {
    const zlo = Math.max(ob.origin[2], u.origin[2]);
    const zhi = Math.min(ob.origin[2] + ob.size[2], u.origin[2] + u.size[2]);
    if (zhi > zlo + E) free = occupy(free, { x: ob.origin[0], y: ob.origin[1], w: ob.size[0], h: ob.size[1] });
  }
  const items: PackedItem[] = [];
  let packedVolume = 0;
  for (const t of order) {
    const dims = layerDims(types[t]!, block);
    while (remaining[t]! > 0) {
      let best: { r: Rect; d: Vec3; s1: number; s2: number } | undefined;
      for (const f of free)
        for (const d of dims) {
          if (d[0] > f.w + E || d[1] > f.h + E) continue;
          const lw = f.w - d[0];
          const lh = f.h - d[1];
          const [s1, s2] =
            rule === "bssf"
              ? [Math.min(lw, lh), Math.max(lw, lh)]
              : rule === "baf"
                ? [f.w * f.h - d[0] * d[1], Math.min(lw, lh)]
                : [f.y + d[1], f.x];
          if (!best || s1 < best.s1 - E || (s1 <= best.s1 + E && s2 < best.s2))
            best = { r: { x: f.x, y: f.y, w: d[0], h: d[1] }, d, s1, s2 };
        }
      if (!best) break;
      items.push({ type: t, origin: [best.r.x, best.r.y, u.origin[2]], dims: best.d });
      packedVolume += types[t]!.volume;
      remaining[t] = remaining[t]! - 1;
      free = occupy(free, best.r);
    }
  }
  return { block: block.index, items, leftovers: items.length > 0 ? [edgeStrip(u, items)] : [], packedVolume };
}

/** The larger of the strips left beyond all pieces on x and on y. */
export function edgeStrip(u: Box, items: readonly PackedItem[]): Box {
  let best: Box = { origin: [...u.origin] as Vec3, size: [0, 0, 0] };
  for (let a = 0; a < 3; a++) {
    const end = Math.max(...items.map((it) => it.origin[a]! + it.dims[a]!));
    const size = [...u.size] as Vec3;
    size[a] = u.origin[a]! + u.size[a]! - end;
    const origin = [...u.origin] as Vec3;
    origin[a] = end;
    if (size[a]! > 1e-9 && size[0] * size[1] * size[2] > best.size[0] * best.size[1] * best.size[2])
      best = { origin, size };
  }
  return best;
}

/**
 * The same single-layer fill done by the `maxrects-packer` package (its own MaxRects choice
 * rule). Pieces that spill into its second bin stay unplaced here. Blocks with defects are left to
 * `fillBlockMaxRects`, which can route around them.
 */
export function fillBlockMaxRectsPackage(
  block: BlockInfo,
  types: readonly ItemType[],
  remaining: number[],
  order: readonly number[],
): BlockFill {
  const u = block.usable;
  const packer = new MaxRectsPacker(u.size[0], u.size[1], 0, {
    smart: false,
    pot: false,
    square: false,
    allowRotation: true,
    border: 0,
  });
  for (const t of order) {
    const dims = layerDims(types[t]!, block).filter((d) => d[0] <= u.size[0] + E && d[1] <= u.size[1] + E);
    const d = dims[0];
    if (!d) continue;
    for (let i = 0; i < remaining[t]!; i++) packer.add(d[0], d[1], { t, allowRotation: dims.length > 1 });
  }
  const items: PackedItem[] = [];
  let packedVolume = 0;
  for (const r of packer.bins[0]?.rects ?? []) {
    const t = (r.data as { t: number }).t;
    const d = layerDims(types[t]!, block).find((o) => Math.abs(o[0] - r.width) <= E && Math.abs(o[1] - r.height) <= E);
    if (!d || remaining[t]! <= 0) continue;
    items.push({ type: t, origin: [u.origin[0] + r.x, u.origin[1] + r.y, u.origin[2]], dims: d });
    remaining[t] = remaining[t]! - 1;
    packedVolume += types[t]!.volume;
  }
  return { block: block.index, items, leftovers: items.length > 0 ? [edgeStrip(u, items)] : [], packedVolume };
}
