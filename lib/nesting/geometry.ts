import type { Axis, Cut, Rotate, Vec3 } from "./types";

/** Tolerance for comparing lengths in mm (inputs are decimals such as a 1.5 mm kerf). */
export const EPS = 1e-6;

export interface Box {
  origin: Vec3;
  size: Vec3;
}

export const AXIS_NAMES: readonly Axis[] = ["x", "y", "z"];

/**
 * The distinct orientations (sizes along x, y, z) a part may take under its rotate rule.
 * @example orientations([1, 2, 3], "z") // → [[1, 2, 3], [2, 1, 3]]
 */
export function orientations(size: Vec3, rotate: Rotate): Vec3[] {
  const [a, b, c] = size;
  const all: Vec3[] =
    rotate === "none"
      ? [[a, b, c]]
      : rotate === "z"
        ? [
            [a, b, c],
            [b, a, c],
          ]
        : [
            [a, b, c],
            [b, a, c],
            [a, c, b],
            [c, a, b],
            [b, c, a],
            [c, b, a],
          ];
  const out: Vec3[] = [];
  for (const o of all) if (!out.some((p) => sameVec(p, o))) out.push(o);
  return out;
}

export function sameVec(a: Vec3, b: Vec3, eps = EPS): boolean {
  return Math.abs(a[0] - b[0]) <= eps && Math.abs(a[1] - b[1]) <= eps && Math.abs(a[2] - b[2]) <= eps;
}

export const volume = (s: Vec3): number => s[0] * s[1] * s[2];

/**
 * True when the interiors of two boxes overlap (touching faces do not count).
 * @example overlaps({ origin: [0,0,0], size: [1,1,1] }, { origin: [1,0,0], size: [1,1,1] }) // → false
 */
export function overlaps(a: Box, b: Box, eps = EPS): boolean {
  for (let i = 0; i < 3; i++) {
    if (a.origin[i]! + a.size[i]! <= b.origin[i]! + eps) return false;
    if (b.origin[i]! + b.size[i]! <= a.origin[i]! + eps) return false;
  }
  return true;
}

/** Up to this many boxes every pair is compared; beyond, a grid keeps far-apart boxes from meeting. */
const PAIRS_BY_HAND = 64;

/**
 * The pairs [i, j] (i < j, in that order) of boxes whose interiors overlap, by the test of
 * `overlaps`. Past a few dozen boxes they are hashed into a uniform grid (about 2·∛n cells per
 * axis, never finer than the median box) and only boxes sharing a cell are compared; a pair is
 * reported from the one cell holding the lower corner of its overlap. 22,000 cubes in one block:
 * tens of milliseconds, where comparing every pair took 94 s.
 * @example overlappingPairs([{ origin: [0,0,0], size: [2,2,2] }, { origin: [1,1,1], size: [2,2,2] }, { origin: [5,0,0], size: [1,1,1] }]) // → [[0, 1]]
 */
export function overlappingPairs(boxes: readonly Box[], eps = EPS): [number, number][] {
  const n = boxes.length;
  const out: [number, number][] = [];
  if (n <= PAIRS_BY_HAND) {
    for (let i = 0; i < n; i++)
      for (let j = i + 1; j < n; j++) if (overlaps(boxes[i]!, boxes[j]!, eps)) out.push([i, j]);
    return out;
  }
  const lo: number[] = [Infinity, Infinity, Infinity];
  const hi: number[] = [-Infinity, -Infinity, -Infinity];
  for (const b of boxes)
    for (let a = 0; a < 3; a++) {
      lo[a] = Math.min(lo[a]!, b.origin[a]!);
      hi[a] = Math.max(hi[a]!, b.origin[a]! + b.size[a]!);
    }
  const perAxis = 2 * Math.ceil(Math.cbrt(n));
  const cell: number[] = [];
  const cells: number[] = [];
  for (let a = 0; a < 3; a++) {
    const sides = boxes.map((b) => b.size[a]!).sort((p, q) => p - q);
    cell.push(Math.max((hi[a]! - lo[a]!) / perAxis, sides[sides.length >> 1]!, 1e-9));
  }
  const at = (v: number, a: number): number =>
    Math.min(cells[a]! - 1, Math.max(0, Math.floor((v - lo[a]!) / cell[a]!)));
  // Many large boxes among small ones would each sit in thousands of cells: coarsen the grid until
  // the boxes take at most ~32 cells each on average (at worst one cell, every pair compared).
  for (;;) {
    for (let a = 0; a < 3; a++) cells[a] = Math.floor((hi[a]! - lo[a]!) / cell[a]!) + 1;
    let entries = 0;
    for (const b of boxes) {
      let k = 1;
      for (let a = 0; a < 3; a++) k *= at(b.origin[a]! + b.size[a]!, a) - at(b.origin[a]!, a) + 1;
      entries += k;
    }
    if (entries <= 32 * n || cells[0]! * cells[1]! * cells[2]! === 1) break;
    for (let a = 0; a < 3; a++) cell[a]! *= 2;
  }
  const grid = new Map<number, number[]>();
  boxes.forEach((b, i) => {
    const from = [0, 1, 2].map((a) => at(b.origin[a]!, a));
    const to = [0, 1, 2].map((a) => at(b.origin[a]! + b.size[a]!, a));
    for (let x = from[0]!; x <= to[0]!; x++)
      for (let y = from[1]!; y <= to[1]!; y++)
        for (let z = from[2]!; z <= to[2]!; z++) {
          const key = x + cells[0]! * (y + cells[1]! * z);
          const list = grid.get(key);
          if (list) list.push(i);
          else grid.set(key, [i]);
        }
  });
  for (const [key, list] of grid) {
    for (let p = 0; p < list.length; p++)
      for (let q = p + 1; q < list.length; q++) {
        const a = boxes[list[p]!]!;
        const b = boxes[list[q]!]!;
        if (!overlaps(a, b, eps)) continue;
        const corner = [0, 1, 2].map((k) => at(Math.max(a.origin[k]!, b.origin[k]!), k));
        if (corner[0]! + cells[0]! * (corner[1]! + cells[1]! * corner[2]!) !== key) continue;
        out.push(list[p]! < list[q]! ? [list[p]!, list[q]!] : [list[q]!, list[p]!]);
      }
  }
  return out.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
}

/**
 * Grows a box by `d` on every side.
 * @example grow({ origin: [5, 5, 5], size: [1, 1, 1] }, 1) // → { origin: [4, 4, 4], size: [3, 3, 3] }
 */
export function grow(b: Box, d: number): Box {
  return { origin: b.origin.map((v) => v - d) as Vec3, size: b.size.map((v) => v + 2 * d) as Vec3 };
}

/** The extent of an axis-aligned box as min and max corners. */
export function fromMinMax(min: Vec3, max: Vec3): Box {
  return { origin: [...min] as Vec3, size: [max[0] - min[0], max[1] - min[1], max[2] - min[2]] };
}

/**
 * Whether `sorted(size)` is at least `sorted(min)` element by element (offcut size rule).
 * @example atLeastSorted([25, 300, 150], [150, 150, 25]) // → true
 */
export function atLeastSorted(size: Vec3, min: Vec3, eps = EPS): boolean {
  const s = [...size].sort((p, q) => p - q);
  const m = [...min].sort((p, q) => p - q);
  return s.every((v, i) => v + eps >= m[i]!);
}

/**
 * Splits pieces into groups separated by through cuts across `axis`: a new group starts where a
 * piece begins at least `kerf` past the end of everything before it. Returns the groups (indices)
 * and the cut positions (where each kerf starts).
 */
export function splitAlong(
  boxes: readonly Box[],
  idx: readonly number[],
  axis: number,
  kerf: number,
): { groups: number[][]; cuts: number[] } {
  const order = [...idx].sort((i, j) => boxes[i]!.origin[axis]! - boxes[j]!.origin[axis]!);
  const groups: number[][] = [];
  const cuts: number[] = [];
  let current: number[] = [];
  let maxEnd = -Infinity;
  for (const i of order) {
    const b = boxes[i]!;
    if (current.length > 0 && b.origin[axis]! + EPS >= maxEnd + kerf) {
      groups.push(current);
      cuts.push(maxEnd);
      current = [];
    }
    current.push(i);
    maxEnd = Math.max(maxEnd, b.origin[axis]! + b.size[axis]!);
  }
  if (current.length > 0) groups.push(current);
  return { groups, cuts };
}

export type SeparationMode = "guillotine" | "layers";

export interface Separation {
  /** Through cuts in an order a cutter can make them. */
  cuts: Cut[];
  /** Index sets that no through cut separates (empty when the pieces are separable). */
  stuck: number[][];
}

/**
 * Separates pieces recursively by through cuts. In "layers" mode a region whose pieces all span
 * the same interval on one axis counts as one layer and needs no further through cuts.
 * @example
 * separate([{ origin: [0,0,0], size: [1,1,1] }, { origin: [2,0,0], size: [1,1,1] }], 1, "guillotine")
 * // → { cuts: [{ axis: "x", at: 1 }], stuck: [] }
 */
export function separate(
  boxes: readonly Box[],
  kerf: number,
  mode: SeparationMode,
  /** Told of every split: the pieces split (the same array as an earlier `groups` entry, or the first set), the axis, the groups and the cuts between them. */
  onSplit?: (parent: readonly number[], axis: number, groups: readonly number[][], at: readonly number[]) => void,
): Separation {
  const cuts: Cut[] = [];
  const stuck: number[][] = [];
  const stack: number[][] = [boxes.map((_, i) => i)];
  while (stack.length > 0) {
    const idx = stack.pop()!;
    if (idx.length < 2) continue;
    let done = false;
    for (let a = 0; a < 3 && !done; a++) {
      const { groups, cuts: at } = splitAlong(boxes, idx, a, kerf);
      if (groups.length < 2) continue;
      onSplit?.(idx, a, groups, at);
      for (const c of at) cuts.push({ axis: AXIS_NAMES[a]!, at: c });
      for (let g = groups.length - 1; g >= 0; g--) stack.push(groups[g]!);
      done = true;
    }
    if (done) continue;
    if (mode === "layers" && isLayer(boxes, idx)) continue;
    stuck.push(idx);
  }
  return { cuts, stuck };
}

/** True when all the pieces span the same interval on some axis. */
export function isLayer(boxes: readonly Box[], idx: readonly number[]): boolean {
  const first = boxes[idx[0]!]!;
  for (let a = 0; a < 3; a++) {
    if (
      idx.every(
        (i) =>
          Math.abs(boxes[i]!.origin[a]! - first.origin[a]!) <= EPS &&
          Math.abs(boxes[i]!.size[a]! - first.size[a]!) <= EPS,
      )
    )
      return true;
  }
  return false;
}

/** The six orders three through cuts can be made in: x-y-z, x-z-y, y-x-z, y-z-x, z-x-y, z-y-x. */
export const CUT_ORDERS: readonly (readonly [number, number, number])[] = [
  [0, 1, 2],
  [0, 2, 1],
  [1, 0, 2],
  [1, 2, 0],
  [2, 0, 1],
  [2, 1, 0],
];

/** The leftover boxes when a piece `d` at the lower corner of box `f` is freed by cuts in `order`. */
export function splitInOrder(f: Box, d: Vec3, order: readonly [number, number, number]): Box[] {
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
  return boxes;
}

/**
 * The six ways three through cuts can free a piece `d` sitting at the lower corner of box `f`,
 * one list of leftover boxes per cut order (`CUT_ORDERS`), in that fixed order.
 * @example guillotineSplits({ origin: [0, 0, 0], size: [10, 10, 10] }, [4, 10, 10]) // six times [{ origin: [4,0,0], size: [6,10,10] }]
 */
export function guillotineSplits(f: Box, d: Vec3): Box[][] {
  return CUT_ORDERS.map((order) => splitInOrder(f, d, order));
}
