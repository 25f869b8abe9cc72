import { volume as vol, type Box } from "../geometry";
import type { Vec3 } from "../types";
import { lookaheadCap, minSide, moves, pickMove, type Move } from "./boxfirst";
import { gridItems, type BlockFill, type BlockInfo, type ItemType, type PackedItem } from "./model";

/**
 * Free layout (rule 2 of the format only, for comparison with classic box-packing results): the
 * empty room of a block is kept as its maximal empty boxes, which overlap, instead of the disjoint
 * boxes a cut tree leaves. A piece may then sit where no through cut would free it, and a strip
 * beside a large piece keeps the whole length of the block on both of its sides.
 */

export interface FreeFillParams {
  order: readonly number[];
  grid: boolean;
  /** Moves per step judged by a greedy completion (0 = plain greedy). */
  lookahead: number;
  /** Fill from the corner of the block nearest each empty box (true) or always from the origin corner. */
  corners: boolean;
  /** Out of time: the rest of the fill is plain greedy. */
  stop?: () => boolean;
}

const E = 1e-9;

/**
 * Removes box `p` from a list of maximal empty boxes: each box it overlaps is replaced by the up
 * to six boxes of it beyond each face of `p`; boxes with a side under `minSide`, or inside another
 * box, are dropped.
 * @example subtractBox([{ origin: [0,0,0], size: [4,4,4] }], { origin: [0,0,0], size: [2,4,4] }, 0)
 * // → [{ origin: [2,0,0], size: [2,4,4] }]
 */
export function subtractBox(spaces: readonly Box[], p: Box, minSide: number): Box[] {
  const kept: Box[] = [];
  const near: Box[] = [];
  // New boxes by the face of p they lie beyond (a box beyond one face never holds one beyond another).
  const fresh: Box[][] = [[], [], [], [], [], []];
  const po = p.origin;
  const pe0 = po[0] + p.size[0];
  const pe1 = po[1] + p.size[1];
  const pe2 = po[2] + p.size[2];
  for (const s of spaces) {
    const so = s.origin;
    const se0 = so[0] + s.size[0];
    const se1 = so[1] + s.size[1];
    const se2 = so[2] + s.size[2];
    // Apart, touching, or overlapping?
    const gap = Math.max(po[0] - se0, so[0] - pe0, po[1] - se1, so[1] - pe1, po[2] - se2, so[2] - pe2);
    if (gap > -E) {
      kept.push(s);
      // A new box touches p, so only a box touching p can hold it.
      if (gap <= E) near.push(s);
      continue;
    }
    for (let a = 0; a < 3; a++) {
      const below = po[a]! - so[a]!;
      if (below >= minSide - E && below > E) {
        const size = [...s.size] as Vec3;
        size[a] = below;
        fresh[2 * a]!.push({ origin: so, size });
      }
      const end = a === 0 ? pe0 : a === 1 ? pe1 : pe2;
      const above = (a === 0 ? se0 : a === 1 ? se1 : se2) - end;
      if (above >= minSide - E && above > E) {
        const origin = [...so] as Vec3;
        origin[a] = end;
        const size = [...s.size] as Vec3;
        size[a] = above;
        fresh[2 * a + 1]!.push({ origin, size });
      }
    }
  }
  // Only the new boxes can lie inside another one (the old ones were maximal already).
  const out = kept;
  for (const group of fresh)
    for (let i = 0; i < group.length; i++) {
      const f = group[i]!;
      let inside = false;
      for (const o of near)
        if (contains(o, f)) {
          inside = true;
          break;
        }
      for (let j = 0; j < group.length && !inside; j++) {
        if (j === i) continue;
        const g = group[j]!;
        // Of two equal boxes keep the first.
        if (contains(g, f) && (j < i || !contains(f, g))) inside = true;
      }
      if (!inside) out.push(f);
    }
  return out;
}

function contains(o: Box, f: Box): boolean {
  for (let a = 0; a < 3; a++) {
    if (f.origin[a]! < o.origin[a]! - E) return false;
    if (f.origin[a]! + f.size[a]! > o.origin[a]! + o.size[a]! + E) return false;
  }
  return true;
}

/** The maximal empty boxes of `usable` around the given pieces and obstacles. */
export function emptySpaces(usable: Box, taken: readonly Box[], minSide: number): Box[] {
  let spaces: Box[] = [usable];
  for (const t of taken) spaces = subtractBox(spaces, t, minSide);
  return spaces;
}

/**
 * Disjoint leftover boxes from maximal empty boxes: the largest is kept and cut out of the rest,
 * again and again (so every kept box is empty and none overlaps another).
 */
export function disjointLeftovers(spaces: readonly Box[], minSide: number, max = 64): Box[] {
  let cand = [...spaces];
  const out: Box[] = [];
  while (cand.length > 0 && out.length < max) {
    let bi = 0;
    for (let i = 1; i < cand.length; i++) if (vol(cand[i]!.size) > vol(cand[bi]!.size)) bi = i;
    const l = cand[bi]!;
    out.push(l);
    cand.splice(bi, 1);
    cand = subtractBox(cand, l, minSide);
  }
  return out;
}

interface State {
  spaces: Box[];
  remaining: number[];
  packedVolume: number;
  items: PackedItem[] | undefined;
  mMin: number;
}

interface Anchor {
  index: number;
  /** Per axis: fill from the far end of the box. */
  far: [boolean, boolean, boolean];
}

/**
 * The empty box to fill next: the one with a corner nearest a corner of the block (distances per
 * axis sorted, compared in turn), larger boxes first among equals. Without `corners`, the lowest
 * box (z, then y, then x) from its origin corner.
 */
function nextSpace(spaces: readonly Box[], u: Box, corners: boolean): Anchor {
  let best = 0;
  let b0 = Infinity;
  let b1 = Infinity;
  let b2 = Infinity;
  let b3 = Infinity;
  for (let i = 0; i < spaces.length; i++) {
    const s = spaces[i]!;
    let k0: number;
    let k1: number;
    let k2: number;
    if (corners) {
      // Distance of the box's nearest corner to the block's, per axis, sorted.
      const d0 = Math.min(s.origin[0] - u.origin[0], u.origin[0] + u.size[0] - s.origin[0] - s.size[0]);
      const d1 = Math.min(s.origin[1] - u.origin[1], u.origin[1] + u.size[1] - s.origin[1] - s.size[1]);
      const d2 = Math.min(s.origin[2] - u.origin[2], u.origin[2] + u.size[2] - s.origin[2] - s.size[2]);
      k0 = Math.min(d0, d1, d2);
      k2 = Math.max(d0, d1, d2);
      k1 = d0 + d1 + d2 - k0 - k2;
    } else {
      k0 = s.origin[2];
      k1 = s.origin[1];
      k2 = s.origin[0];
    }
    const k3 = -(s.size[0] * s.size[1] * s.size[2]);
    if (
      k0 < b0 - E ||
      (k0 <= b0 + E && (k1 < b1 - E || (k1 <= b1 + E && (k2 < b2 - E || (k2 <= b2 + E && k3 < b3 - E)))))
    ) {
      best = i;
      b0 = k0;
      b1 = k1;
      b2 = k2;
      b3 = k3;
    }
  }
  const far: [boolean, boolean, boolean] = [false, false, false];
  if (corners) {
    const s = spaces[best]!;
    for (let a = 0; a < 3; a++)
      far[a] = u.origin[a]! + u.size[a]! - s.origin[a]! - s.size[a]! < s.origin[a]! - u.origin[a]! - E;
  }
  return { index: best, far };
}

function apply(s: State, at: Anchor, m: Move, types: readonly ItemType[], order: readonly number[]): void {
  const f = s.spaces[at.index]!;
  const { d, n } = m;
  const g: Vec3 = [d[0] * n[0], d[1] * n[1], d[2] * n[2]];
  const origin = [0, 1, 2].map((a) => (at.far[a] ? f.origin[a]! + f.size[a]! - g[a]! : f.origin[a]!)) as Vec3;
  if (s.items) s.items.push(...gridItems(m.t, origin, d, n));
  const count = n[0] * n[1] * n[2];
  s.remaining[m.t] = s.remaining[m.t]! - count;
  s.packedVolume += count * types[m.t]!.volume;
  if (s.remaining[m.t] === 0) s.mMin = Math.max(s.mMin, minSide(types, order, s.remaining));
  s.spaces = subtractBox(s.spaces, { origin, size: g }, s.mMin);
}

function run(
  s: State,
  u: Box,
  types: readonly ItemType[],
  order: readonly number[],
  p: FreeFillParams,
  lookaheadAtStart: number,
): void {
  let lookahead = lookaheadAtStart;
  while (s.spaces.length > 0) {
    const at = nextSpace(s.spaces, u, p.corners);
    const f = s.spaces[at.index]!;
    const ms = moves(f, types, order, s.remaining, p.grid, s.mMin, Math.max(1, lookahead));
    if (ms.length === 0) {
      s.spaces.splice(at.index, 1);
      continue;
    }
    const { move: chosen, stopped } = pickMove(
      ms,
      (m) => {
        // apply() replaces sim.spaces before anything changes it, so the list itself is shared.
        const sim: State = {
          spaces: s.spaces,
          remaining: [...s.remaining],
          packedVolume: s.packedVolume,
          items: undefined,
          mMin: s.mMin,
        };
        apply(sim, at, m, types, order);
        run(sim, u, types, order, p, 0);
        return sim.packedVolume;
      },
      p.stop,
    );
    if (stopped) lookahead = 0;
    apply(s, at, chosen, types, order);
  }
}

/**
 * Fills one block in free layout: always the empty box nearest a corner of the block, with the
 * part (or grid of copies) that fits it best; with `lookahead` the best few moves are judged by a
 * greedy completion. `remaining` is decremented in place. The leftovers returned are disjoint
 * empty boxes (the largest first), so they can be kept as offcuts or filled later.
 */
export function fillBlockFree(
  block: BlockInfo,
  types: readonly ItemType[],
  remaining: number[],
  p: FreeFillParams,
): BlockFill {
  const live = p.order.filter((t) => remaining[t]! > 0);
  const smallest = minSide(types, live, remaining);
  const s: State = {
    spaces: emptySpaces(block.usable, block.obstacles, smallest),
    remaining,
    packedVolume: 0,
    items: [],
    mMin: smallest,
  };
  const pieces = live.reduce((n, t) => n + remaining[t]!, 0);
  // A completion here costs about twice a cut-tree one (more, overlapping boxes): half the moves.
  run(s, block.usable, types, live, p, Math.min(p.lookahead, Math.floor(lookaheadCap(live.length, pieces) / 2)));
  const items = s.items!;
  const taken: Box[] = [...block.obstacles, ...items.map((it) => ({ origin: it.origin, size: it.dims }))];
  // Leftovers as small as the smallest part of the order (any size when nothing was left to place).
  const keep = Number.isFinite(smallest) ? smallest : 0;
  const leftovers = disjointLeftovers(emptySpaces(block.usable, taken, keep), keep);
  return { block: block.index, items, leftovers, packedVolume: s.packedVolume };
}
