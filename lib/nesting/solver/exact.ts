import { EPS, atLeastSorted, guillotineSplits, sameVec, volume as vol, type Box } from "../geometry";
import type { Rng } from "../rng";
import type { Vec3 } from "../types";
import { carveObstacles, fillBlockGuillotine } from "./guillotine3d";
import { fitsIn, type BlockFill, type BlockInfo, type ItemType, type PackedItem } from "./model";

/** The distinct three-box guillotine splits of `f` around a piece `d` at its corner. */
function splits(f: Box, d: Vec3): Box[][] {
  const seen = new Set<string>();
  return guillotineSplits(f, d).filter((boxes) => {
    const key = boxes
      .map((b) => `${b.origin.join(",")}:${b.size.join(",")}`)
      .sort()
      .join("|");
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

const lowerCorner = (a: Box, b: Box): number =>
  a.origin[2] - b.origin[2] || a.origin[1] - b.origin[1] || a.origin[0] - b.origin[0];

/**
 * Depth-first search for a guillotine packing of ALL the given pieces into one block. It fills
 * the lowest free box first, tries exact fits first, and prunes as soon as the space thrown away
 * exceeds the block's slack (usable volume minus part volume). Bounded by `nodeLimit`.
 * Returns the fill, or undefined when it gives up.
 */
export function packAllInBlock(
  block: BlockInfo,
  types: readonly ItemType[],
  counts: readonly number[],
  nodeLimit: number,
  r: Rng,
  stop: () => boolean = () => false,
): BlockFill | undefined {
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
        for (const b of parts) b.size.some((v) => v < m2 - 1e-9) ? (w += vol(b.size)) : keep.push(b);
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
export function packAllByCuts(
  block: BlockInfo,
  types: readonly ItemType[],
  counts: readonly number[],
  nodeLimit: number,
  r: Rng,
  stop: () => boolean = () => false,
): BlockFill | undefined {
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
    for (const t of order)
      if (rem[t]! > 0 && types[t]!.dims.some((d) => fitsIn(d, size))) v += rem[t]! * vol(types[t]!.dims[0]!);
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
    if (++nodes > nodeLimit || ((nodes & 127) === 0 && stop() && (nodes = Infinity)) || regions.length === 0)
      return false;
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
        if (
          fittingVolume(first.size) < vol(first.size) - spare ||
          fittingVolume(second.size) < vol(second.size) - spare
        )
          continue;
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

/** The six axis permutations: oriented size = [d[p[0]], d[p[1]], d[p[2]]]. */
const PERMS: readonly (readonly [number, number, number])[] = [
  [0, 1, 2],
  [1, 0, 2],
  [0, 2, 1],
  [2, 0, 1],
  [1, 2, 0],
  [2, 1, 0],
];
const permute = (p: number, d: Vec3): Vec3 => {
  const q = PERMS[p]!;
  return [d[q[0]]!, d[q[1]]!, d[q[2]]!];
};
/** AFTER[q][p]: the permutation "p, then q". */
const AFTER: number[][] = PERMS.map((q) => PERMS.map((p) => PERMS.findIndex((r) => r.every((v, j) => v === p[q[j]!]))));
const near = (a: number, b: number): boolean => Math.abs(a - b) <= EPS;
const ascending = (d: Vec3): Vec3 => [...d].sort((x, y) => x - y) as Vec3;

/** The glue search is tried for up to this many pieces. */
export const MAX_MERGE_PIECES = 64;

/** A box of the merge search: one part, or two boxes glued face to face (a through cut between them). */
interface MergeNode {
  /** Size in the node's own frame. */
  dims: Vec3;
  /** Bit p set: the node may be turned by PERMS[p] without breaking any part's rotate rule. */
  mask: number;
  /** Same key = same sizes reachable = interchangeable in the search. */
  key: string;
  /** 32-bit hash of `key`, for remembering failed states compactly. */
  hash: number;
  sorted: Vec3;
  volume: number;
  type?: number;
  kids?: { node: MergeNode; perm: number; at: Vec3 }[];
}

function mergeNode(dims: Vec3, mask: number, extra: Pick<MergeNode, "type" | "kids">): MergeNode {
  const sizes = new Set<string>();
  for (let p = 0; p < PERMS.length; p++)
    if (mask & (1 << p))
      sizes.add(
        permute(p, dims)
          .map((v) => v.toFixed(4))
          .join(","),
      );
  const key = [...sizes].sort().join(";");
  return { dims, mask, key, hash: fnv(key, 0x811c9dc5), sorted: ascending(dims), volume: vol(dims), ...extra };
}

/** FNV-1a over a string's UTF-16 code units. */
function fnv(text: string, seed: number): number {
  let h = seed >>> 0;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 0x01000193) >>> 0;
  return h;
}

/**
 * A state (a multiset of boxes) as one number: two 32-bit hashes of the sorted box hashes, folded
 * into 52 bits. A collision can only make the search skip a state (never accept a wrong packing).
 */
function stateHash(boxes: readonly MergeNode[]): number {
  const hs = boxes.map((b) => b.hash).sort((x, y) => x - y);
  let a = 0x811c9dc5;
  let b = 0x01000193;
  for (const h of hs) {
    a = Math.imul(a ^ h, 0x01000193) >>> 0;
    b = Math.imul(b ^ (h + 0x9e3779b9), 0x85ebca6b) >>> 0;
  }
  return a * 0x100000 + (b & 0xfffff);
}

/** True when two ascending sizes share at least two sides (a face could be common). */
function shareTwoSides(a: Vec3, b: Vec3): boolean {
  let i = 0;
  let j = 0;
  let common = 0;
  while (i < 3 && j < 3) {
    if (near(a[i]!, b[j]!)) {
      common++;
      i++;
      j++;
    } else if (a[i]! < b[j]!) i++;
    else j++;
  }
  return common >= 2;
}

/**
 * Exact search for a packing with no waste at all: when the parts (grown by the kerf) fill the
 * block's usable box exactly, as when the parts were themselves cut from one block, the cut tree
 * is rebuilt bottom-up by gluing two boxes that share a face into one, until one box is left that
 * is the block. Every guillotine tree can be glued back this way, so the search is complete for
 * zero-waste packings (bounded by `nodeLimit`); failed states are remembered. Rotation rules are
 * kept by carrying, per box, the turns all its parts allow. Only for blocks without defects.
 * The first call should go without `r` (a fixed order); calls again with `r` shuffle the order
 * among equally good moves, since a wrong early glue can cost the whole budget.
 */
export function packAllByMerging(
  block: BlockInfo,
  types: readonly ItemType[],
  counts: readonly number[],
  nodeLimit: number,
  stop: () => boolean = () => false,
  r?: Rng,
): BlockFill | undefined {
  if (block.obstacles.length > 0) return undefined;
  const target = block.usable.size;
  const targetSorted = ascending(target);
  const leaves: MergeNode[] = [];
  let need = 0;
  counts.forEach((c, t) => {
    if (c <= 0) return;
    const type = types[t]!;
    const base = type.dims[0]!;
    let mask = 0;
    for (let p = 0; p < PERMS.length; p++) if (type.dims.some((d) => sameVec(d, permute(p, base)))) mask |= 1 << p;
    for (let i = 0; i < c; i++) leaves.push(mergeNode(base, mask, { type: t }));
    need += c * vol(base);
  });
  // Each level of the search holds its candidate glues: beyond a few dozen pieces that costs more
  // memory and time than it is worth.
  if (leaves.length === 0 || leaves.length > MAX_MERGE_PIECES || Math.abs(need - vol(target)) > 1e-6 * vol(target))
    return undefined;
  const rootPerm = (n: MergeNode): number => {
    for (let p = 0; p < PERMS.length; p++) if (n.mask & (1 << p) && sameVec(permute(p, n.dims), target)) return p;
    return -1;
  };

  /** Every distinct box that gluing a and b can give. */
  const glue = (a: MergeNode, b: MergeNode): MergeNode[] => {
    const out = new Map<string, MergeNode>();
    for (let pa = 0; pa < PERMS.length; pa++) {
      if (!(a.mask & (1 << pa))) continue;
      const da = permute(pa, a.dims);
      for (let pb = 0; pb < PERMS.length; pb++) {
        if (!(b.mask & (1 << pb))) continue;
        const db = permute(pb, b.dims);
        for (let ax = 0; ax < 3; ax++) {
          const o1 = (ax + 1) % 3;
          const o2 = (ax + 2) % 3;
          if (!near(da[o1]!, db[o1]!) || !near(da[o2]!, db[o2]!)) continue;
          const dims = [...da] as Vec3;
          dims[ax] = da[ax]! + db[ax]!;
          if (!atLeastSorted(target, dims)) continue;
          let mask = 0;
          for (let q = 0; q < PERMS.length; q++)
            if (a.mask & (1 << AFTER[q]![pa]!) && b.mask & (1 << AFTER[q]![pb]!)) mask |= 1 << q;
          const at: Vec3 = [0, 0, 0];
          at[ax] = da[ax]!;
          const node = mergeNode(dims, mask, {
            kids: [
              { node: a, perm: pa, at: [0, 0, 0] },
              { node: b, perm: pb, at },
            ],
          });
          if (!out.has(node.key)) out.set(node.key, node);
        }
      }
    }
    return [...out.values()];
  };

  // Failed states, as numbers; bounded so a long search cannot grow memory without end.
  const failed = new Set<number>();
  const MAX_REMEMBERED = 200_000;
  let nodes = 0;
  let aborted = false;
  const dfs = (boxes: MergeNode[]): MergeNode | undefined => {
    if (boxes.length === 1) return rootPerm(boxes[0]!) >= 0 ? boxes[0] : undefined;
    if (++nodes > nodeLimit || ((nodes & 15) === 0 && stop())) {
      aborted = true;
      return undefined;
    }
    const stateKey = stateHash(boxes);
    if (failed.has(stateKey)) return undefined;
    const moves: { i: number; j: number; node: MergeNode; score: number }[] = [];
    const pairs = new Set<string>();
    const sharing: [number, number][] = [];
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++)
        if (shareTwoSides(boxes[i]!.sorted, boxes[j]!.sorted)) sharing.push([i, j]);
    for (const [i, j] of sharing) {
      const a = boxes[i]!;
      const b = boxes[j]!;
      const pk = a.key < b.key ? `${a.key}/${b.key}` : `${b.key}/${a.key}`;
      if (pairs.has(pk)) continue;
      pairs.add(pk);
      for (const node of glue(a, b)) {
        // Boxes that reach a side of the block whole are the slabs a cutter makes first.
        const whole = node.sorted.filter((v) => targetSorted.some((t) => near(v, t))).length;
        // Then small boxes first (bottom-up); with an rng, a shuffled order for restarts.
        moves.push({ i, j, node, score: whole * 1e12 - node.volume * (r ? 0.5 + r() : 1) });
      }
    }
    moves.sort((x, y) => y.score - x.score);
    for (const m of moves) {
      const next = boxes.filter((_, k) => k !== m.i && k !== m.j);
      next.push(m.node);
      const found = dfs(next);
      if (found || aborted) return found;
    }
    if (failed.size < MAX_REMEMBERED) failed.add(stateKey);
    return undefined;
  };
  const root = dfs(leaves);
  if (!root) return undefined;

  // Unfold the glued tree into placements in the block's frame.
  const items: PackedItem[] = [];
  const place = (n: MergeNode, perm: number, origin: Vec3): void => {
    if (n.type !== undefined) {
      items.push({ type: n.type, origin, dims: permute(perm, n.dims) });
      return;
    }
    for (const k of n.kids!) {
      const at = permute(perm, k.at);
      place(k.node, AFTER[perm]![k.perm]!, [origin[0] + at[0], origin[1] + at[1], origin[2] + at[2]]);
    }
  };
  place(root, rootPerm(root), [...block.usable.origin] as Vec3);
  const packedVolume = items.reduce((s, it) => s + types[it.type]!.volume, 0);
  return { block: block.index, items, leftovers: [], packedVolume };
}

/** The table search numbers sets of pieces up to this many (20 different pieces, or more alike ones). */
const MAX_TABLE_STATES = 2 ** 20;

/** At most this many sets that fill some box are kept (about 200 bytes each). */
const MAX_TABLE_SETS = 200_000;

/** One set of pieces in the table search: how many of each part line, and the boxes it can fill. */
interface TileSet {
  /** Mixed-radix number of the counts (the same set of pieces has the same number). */
  id: number;
  counts: Int32Array;
  /** Bit i set: holds the piece of single-piece line i (the first 31 such lines). */
  mask: number;
  boxes: Vec3[];
  /** How each box was made: one piece, or two disjoint sets glued across `axis`. */
  ways: ({ type: number } | { a: TileSet; ia: number; b: TileSet; ib: number; axis: number })[];
}

/**
 * Complete search for a cut tree with no waste, bottom-up over sets of pieces: every cut tree is two
 * cut trees of disjoint sets that share a face, so the sets that fill some box are built by size,
 * each from two smaller ones, keeping every distinct box (in the block's frame, as the rotate rules
 * allow) that fits the usable box. Identical pieces are counted, not told apart, so an order of few
 * part lines with large quantities stays small. Unlike the glue search it has no order to get wrong:
 * it returns the packing when one exists, `null` when it has proved that none does, and undefined
 * when it ran past `pairLimit` pairs of sets or `stop`, or when the sets of pieces number more than
 * `MAX_TABLE_STATES` (the product over part lines of quantity + 1).
 * @example packAllByTable(block, types, counts, 1e6) // → BlockFill | null | undefined
 */
export function packAllByTable(
  block: BlockInfo,
  types: readonly ItemType[],
  counts: readonly number[],
  pairLimit: number,
  stop: () => boolean = () => false,
): BlockFill | null | undefined {
  if (block.obstacles.length > 0) return undefined;
  // A local copy for the face test of the hot loop: imported bindings are read through accessors
  // in some module systems.
  const eps = EPS;
  const lines = counts.map((c, t) => ({ c, t })).filter((x) => x.c > 0);
  const k = lines.length;
  const target = block.usable.size;
  const need = lines.reduce((s, { c, t }) => s + c * vol(types[t]!.dims[0]!), 0);
  if (k === 0 || Math.abs(need - vol(target)) > 1e-6 * vol(target)) return undefined;
  const radix: number[] = [];
  let states = 1;
  for (const { c } of lines) {
    radix.push(states);
    states *= c + 1;
    if (states > MAX_TABLE_STATES) return undefined;
  }
  const total = lines.reduce((s, x) => s + x.c, 0);
  const byId = new Map<number, TileSet>();
  const bySize: TileSet[][] = Array.from({ length: total + 1 }, () => []);
  // Lines of one piece (most, in a one-off order) are told apart by a bit; the others by their counts.
  const bit = new Int32Array(k);
  const counted: number[] = [];
  let nextBit = 0;
  lines.forEach(({ c }, i) => {
    if (c === 1 && nextBit < 31) bit[i] = 1 << nextBit++;
    else counted.push(i);
  });
  lines.forEach(({ t }, i) => {
    const cs = new Int32Array(k);
    cs[i] = 1;
    const set: TileSet = { id: radix[i]!, counts: cs, mask: bit[i]!, boxes: [], ways: [] };
    for (const d of types[t]!.dims) {
      if (!fitsIn(d, target)) continue;
      set.boxes.push(d);
      set.ways.push({ type: t });
    }
    if (set.boxes.length > 0) {
      byId.set(set.id, set);
      bySize[1]!.push(set);
    }
  });
  const disjoint = (a: TileSet, b: TileSet): boolean => {
    for (const i of counted) if (a.counts[i]! + b.counts[i]! > lines[i]!.c) return false;
    return true;
  };
  let pairs = 0;
  for (let size = 2; size <= total; size++) {
    for (let sa = 1; sa <= size - sa; sa++) {
      const left = bySize[sa]!;
      const right = bySize[size - sa]!;
      // The numbers of the right-hand sets in a flat array: the disjointness test is the hot loop.
      const rightIds = Float64Array.from(right, (x) => x.id);
      const rightMasks = Int32Array.from(right, (x) => x.mask);
      for (const a of left) {
        pairs += right.length;
        if (pairs > pairLimit || stop()) return undefined;
        const am = a.mask;
        for (let j = 0; j < rightIds.length; j++) {
          if ((am & rightMasks[j]!) !== 0 || (sa === size - sa && a.id > rightIds[j]!)) continue;
          const b = right[j]!;
          if (!disjoint(a, b)) continue;
          let set: TileSet | undefined;
          for (let ia = 0; ia < a.boxes.length; ia++)
            for (let ib = 0; ib < b.boxes.length; ib++) {
              const x = a.boxes[ia]!;
              const y = b.boxes[ib]!;
              for (let axis = 0; axis < 3; axis++) {
                const o1 = (axis + 1) % 3;
                const o2 = (axis + 2) % 3;
                if (Math.abs(x[o1]! - y[o1]!) > eps || Math.abs(x[o2]! - y[o2]!) > eps) continue;
                const d = [...x] as Vec3;
                d[axis] = x[axis]! + y[axis]!;
                if (!fitsIn(d, target)) continue;
                set ??= byId.get(a.id + b.id);
                if (!set) {
                  // Too many sets to keep in memory: give up (the glue search takes over).
                  if (byId.size >= MAX_TABLE_SETS) return undefined;
                  const id = a.id + b.id;
                  const cs = new Int32Array(k);
                  for (let i = 0; i < k; i++) cs[i] = a.counts[i]! + b.counts[i]!;
                  set = { id, counts: cs, mask: a.mask | b.mask, boxes: [], ways: [] };
                  byId.set(id, set);
                  bySize[size]!.push(set);
                }
                if (set.boxes.some((o) => sameVec(o, d))) continue;
                set.boxes.push(d);
                set.ways.push({ a, ia, b, ib, axis });
              }
            }
        }
      }
    }
  }
  const all = byId.get(states - 1);
  const at = all ? all.boxes.findIndex((d) => sameVec(d, target)) : -1;
  if (!all || at < 0) return null;
  const items: PackedItem[] = [];
  const place = (set: TileSet, i: number, origin: Vec3): void => {
    const way = set.ways[i]!;
    if ("type" in way) {
      items.push({ type: way.type, origin, dims: set.boxes[i]! });
      return;
    }
    place(way.a, way.ia, origin);
    const next = [...origin] as Vec3;
    next[way.axis] = next[way.axis]! + way.a.boxes[way.ia]![way.axis]!;
    place(way.b, way.ib, next);
  };
  place(all, at, [...block.usable.origin] as Vec3);
  return {
    block: block.index,
    items,
    leftovers: [],
    packedVolume: items.reduce((s, it) => s + types[it.type]!.volume, 0),
  };
}

/** The glue search over several blocks is tried for up to this many pieces. */
export const MAX_PARTITION_PIECES = 240;

/**
 * The glue search over several identical blocks: when the parts (grown by the kerf) fill `k` of the
 * block's usable boxes exactly — as when they were cut from k such blocks and mixed — it partitions
 * the order into k exact fills without choosing the subsets first. Every block's cut tree is a stack
 * of slabs across one axis (its first through cuts), each spanning the block's other two sides, so
 * it works in two stages: boxes that share a face are glued into one (as in `packAllByMerging`)
 * until every piece is in a slab — a box that spans two sides of the block is set aside as soon as
 * it forms, never glued on — and then the slabs are shared out among the k blocks so that each
 * block's stack fills its length exactly (a subset sum per block). Gluing slabs into blocks early
 * is what lost the glue search its way: it is a bin packing of slab lengths, settled here apart.
 * Failed states are remembered; with `r`, equally good glues are tried in a shuffled order
 * (restarts). Blocks without defects only; at most `MAX_PARTITION_PIECES` pieces; bounded by
 * `nodeLimit` (glues and subset steps) and `stop`. Returns one fill per block, all with `block`'s
 * index (the caller assigns the blocks), or undefined.
 * @example packAllIntoBlocks(block, types, counts, 3, 20_000) // → BlockFill[] (3) | undefined
 */
export function packAllIntoBlocks(
  block: BlockInfo,
  types: readonly ItemType[],
  counts: readonly number[],
  k: number,
  nodeLimit: number,
  stop: () => boolean = () => false,
  r?: Rng,
  learned: Set<string> = new Set(),
  partial?: { fills: BlockFill[]; rest?: BlockFill[] },
): BlockFill[] | undefined {
  if (block.obstacles.length > 0 || k < 1) return undefined;
  const target = block.usable.size;
  const targetVol = vol(target);
  const targetSorted = ascending(target);
  const leaves: MergeNode[] = [];
  let need = 0;
  counts.forEach((c, t) => {
    if (c <= 0) return;
    const type = types[t]!;
    const base = type.dims[0]!;
    let mask = 0;
    for (let p = 0; p < PERMS.length; p++) if (type.dims.some((d) => sameVec(d, permute(p, base)))) mask |= 1 << p;
    for (let i = 0; i < c; i++) leaves.push(mergeNode(base, mask, { type: t }));
    need += c * vol(base);
  });
  if (
    leaves.length === 0 ||
    leaves.length > MAX_PARTITION_PIECES ||
    Math.abs(need - k * targetVol) > 1e-6 * k * targetVol
  )
    return undefined;
  if (leaves.some((l) => !atLeastSorted(target, l.sorted))) return undefined;
  /** Every distinct box that gluing a and b can give (as in `packAllByMerging`). */
  const glue = (a: MergeNode, b: MergeNode): MergeNode[] => {
    const out = new Map<string, MergeNode>();
    for (let pa = 0; pa < PERMS.length; pa++) {
      if (!(a.mask & (1 << pa))) continue;
      const da = permute(pa, a.dims);
      for (let pb = 0; pb < PERMS.length; pb++) {
        if (!(b.mask & (1 << pb))) continue;
        const db = permute(pb, b.dims);
        for (let ax = 0; ax < 3; ax++) {
          const o1 = (ax + 1) % 3;
          const o2 = (ax + 2) % 3;
          if (!near(da[o1]!, db[o1]!) || !near(da[o2]!, db[o2]!)) continue;
          const dims = [...da] as Vec3;
          dims[ax] = da[ax]! + db[ax]!;
          if (!atLeastSorted(target, dims)) continue;
          let mask = 0;
          for (let q = 0; q < PERMS.length; q++)
            if (a.mask & (1 << AFTER[q]![pa]!) && b.mask & (1 << AFTER[q]![pb]!)) mask |= 1 << q;
          const at: Vec3 = [0, 0, 0];
          at[ax] = da[ax]!;
          const node = mergeNode(dims, mask, {
            kids: [
              { node: a, perm: pa, at: [0, 0, 0] },
              { node: b, perm: pb, at },
            ],
          });
          if (!out.has(node.key)) out.set(node.key, node);
        }
      }
    }
    return [...out.values()];
  };

  /** A box that spans two sides of the block (as its turns allow): the ways it can stand as a slab. */
  const slabWays = (n: MergeNode): { axis: number; length: number; perm: number }[] => {
    const ways: { axis: number; length: number; perm: number }[] = [];
    for (let p = 0; p < PERMS.length; p++) {
      if (!(n.mask & (1 << p))) continue;
      const d = permute(p, n.dims);
      for (let a = 0; a < 3; a++) {
        if (!near(d[(a + 1) % 3]!, target[(a + 1) % 3]!) || !near(d[(a + 2) % 3]!, target[(a + 2) % 3]!)) continue;
        if (d[a]! > target[a]! + EPS || ways.some((w) => w.axis === a && near(w.length, d[a]!))) continue;
        ways.push({ axis: a, length: d[a]!, perm: p });
      }
    }
    return ways;
  };

  interface Slab {
    node: MergeNode;
    ways: { axis: number; length: number; perm: number }[];
  }
  /** A finished block: slabs stacked along `axis` (one slab of full length is a whole block). */
  interface Stack {
    axis: number;
    slabs: { slab: Slab; perm: number; length: number }[];
  }
  const closed: Stack[] = [];
  const slabs: Slab[] = [];
  const open: MergeNode[] = [];
  for (const l of leaves) {
    const ways = slabWays(l);
    ways.length > 0 ? slabs.push({ node: l, ways }) : open.push(l);
  }
  const failed = new Set<number>();
  const MAX_REMEMBERED = 200_000;
  // The glues of a pair of boxes, kept: most pairs of a state are pairs of the state before it.
  const glued = new Map<MergeNode, Map<MergeNode, MergeNode[]>>();
  let gluedPairs = 0;
  const glueOnce = (a: MergeNode, b: MergeNode): MergeNode[] => {
    let row = glued.get(a);
    const hit = row?.get(b);
    if (hit) return hit;
    if (gluedPairs > 400_000) {
      glued.clear();
      gluedPairs = 0;
      row = undefined;
    }
    const out = glue(a, b);
    if (!row) glued.set(a, (row = new Map()));
    row.set(b, out);
    gluedPairs++;
    return out;
  };
  let nodes = 0;
  let aborted = false;
  const tick = (): boolean => {
    if (++nodes > nodeLimit || stop()) aborted = true;
    return aborted;
  };

  /**
   * Every block is a stack of slabs across one axis (its first through cuts). With all pieces in
   * slabs, the slabs are shared out among the blocks so each stack fills its block's length exactly
   * (a subset sum per block, longest slab first).
   */
  const stackSlabs = (left: Slab[], blocks: number): boolean => {
    if (left.length === 0) return blocks === 0;
    if (blocks === 0 || tick()) return false;
    // The slab with the fewest ways and then the longest starts the next block.
    let fi = 0;
    for (let i = 1; i < left.length; i++) {
      const a = left[i]!;
      const b = left[fi]!;
      if (a.ways.length < b.ways.length || (a.ways.length === b.ways.length && a.node.volume > b.node.volume)) fi = i;
    }
    const first = left[fi]!;
    for (const w of first.ways) {
      const rest = left.filter((_, i) => i !== fi);
      const cands = rest
        .map((slab) => ({ slab, way: slab.ways.find((v) => v.axis === w.axis) }))
        .filter((c): c is { slab: Slab; way: Slab["ways"][number] } => c.way !== undefined)
        .sort((x, y) => y.way.length - x.way.length);
      const chosen: { slab: Slab; perm: number; length: number }[] = [{ slab: first, perm: w.perm, length: w.length }];
      const fill = (from: number, room: number): boolean => {
        if (Math.abs(room) <= EPS * 100) {
          const used = new Set(chosen.map((c) => c.slab));
          closed.push({ axis: w.axis, slabs: [...chosen] });
          if (
            stackSlabs(
              rest.filter((x) => !used.has(x)),
              blocks - 1,
            )
          )
            return true;
          closed.pop();
          return false;
        }
        if (tick()) return false;
        let prev = Number.NaN;
        for (let i = from; i < cands.length; i++) {
          const c = cands[i]!;
          // Equal lengths are interchangeable here: try the first of a run only.
          if (near(c.way.length, prev) || c.way.length > room + EPS * 100) continue;
          prev = c.way.length;
          chosen.push({ slab: c.slab, perm: c.way.perm, length: c.way.length });
          if (fill(i + 1, room - c.way.length)) return true;
          chosen.pop();
          if (aborted) return false;
        }
        return false;
      };
      if (fill(0, target[w.axis]! - w.length)) return true;
      if (aborted) return false;
    }
    return false;
  };

  /** The glues on the way to the current state, for blaming a dead end. */
  const path: { a: MergeNode; b: MergeNode }[] = [];
  const pairKey = (a: MergeNode, b: MergeNode): string => (a.key < b.key ? `${a.key}/${b.key}` : `${b.key}/${a.key}`);
  /**
   * A dead end (open boxes, and no two of them glue): blame, for each stuck box, the latest glue
   * that used up a box it could have been glued to. Such glues go last from then on (in this call
   * and in later calls given the same `learned`): a glue of boxes from different blocks whose
   * sides match by chance is what leads the search astray.
   */
  const blame = (stuck: readonly MergeNode[]): void => {
    for (const d of stuck)
      for (let q = path.length - 1; q >= 0; q--) {
        const { a, b } = path[q]!;
        if (shareTwoSides(a.sorted, d.sorted) || shareTwoSides(b.sorted, d.sorted)) {
          if (learned.size < 10_000) learned.add(pairKey(a, b));
          break;
        }
      }
  };

  /** The slabs of the state with the fewest open boxes so far (for `partial`). */
  let deepest = { open: [] as MergeNode[], slabs: [] as Slab[] };
  let deepestOpen = Number.POSITIVE_INFINITY;
  const dfs = (boxes: MergeNode[]): boolean => {
    if (partial && boxes.length < deepestOpen) {
      deepestOpen = boxes.length;
      deepest = { open: boxes, slabs: [...slabs] };
    }
    if (boxes.length === 0) return stackSlabs(slabs, k);
    if (tick()) return false;
    const stateKey = stateHash([...boxes, ...slabs.map((x) => x.node)]);
    if (failed.has(stateKey)) return false;
    // j < 0: box i glued to slab -j - 1 (see below).
    const moves: { i: number; j: number; node: MergeNode; score: number }[] = [];
    const pairs = new Set<string>();
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i]!;
        const b = boxes[j]!;
        if (!shareTwoSides(a.sorted, b.sorted) || a.volume + b.volume > targetVol * (1 + 1e-9)) continue;
        const pk = pairKey(a, b);
        if (pairs.has(pk)) continue;
        pairs.add(pk);
        const blamed = learned.has(pk) ? 4e12 : 0;
        for (const node of glueOnce(a, b)) {
          const whole = node.sorted.filter((v) => targetSorted.some((t) => near(v, t))).length;
          moves.push({ i, j, node, score: whole * 1e12 - blamed - node.volume * (r ? 0.5 + r() : 1) });
        }
      }
    // A box set aside as a slab may still be part of a smaller box in its block, when its sides
    // equal the block's only by chance (a piece of 1200 mm in a strip across a 2400 mm block): such
    // glues come after all others, so the search stays complete.
    for (let i = 0; i < boxes.length; i++)
      for (let q = 0; q < slabs.length; q++) {
        const a = boxes[i]!;
        const b = slabs[q]!.node;
        if (!shareTwoSides(a.sorted, b.sorted) || a.volume + b.volume > targetVol * (1 + 1e-9)) continue;
        const pk = `${pairKey(a, b)}#`;
        if (pairs.has(pk)) continue;
        pairs.add(pk);
        for (const node of glueOnce(a, b)) moves.push({ i, j: -q - 1, node, score: -8e12 - node.volume });
      }
    if (moves.length === 0) blame(boxes);
    moves.sort((x, y) => y.score - x.score);
    for (const m of moves) {
      const next = boxes.filter((_, q) => q !== m.i && q !== m.j);
      const at = m.j < 0 ? -m.j - 1 : -1;
      const taken = at >= 0 ? slabs.splice(at, 1)[0]! : undefined;
      const ways = slabWays(m.node);
      if (ways.length > 0) slabs.push({ node: m.node, ways });
      else next.push(m.node);
      path.push({ a: boxes[m.i]!, b: taken ? taken.node : boxes[m.j]! });
      if (dfs(next)) return true;
      path.pop();
      if (ways.length > 0) slabs.pop();
      if (taken) slabs.splice(at, 0, taken);
      if (aborted) return false;
    }
    if (failed.size < MAX_REMEMBERED) failed.add(stateKey);
    return false;
  };
  /** The pieces of a glued box turned by `perm` with its corner at `origin`, into `items`. */
  const place = (items: PackedItem[], n: MergeNode, perm: number, origin: Vec3): void => {
    if (n.type !== undefined) {
      items.push({ type: n.type, origin, dims: permute(perm, n.dims) });
      return;
    }
    for (const kid of n.kids!) {
      const at = permute(perm, kid.at);
      place(items, kid.node, AFTER[perm]![kid.perm]!, [origin[0] + at[0], origin[1] + at[1], origin[2] + at[2]]);
    }
  };
  const fillOf = (items: PackedItem[]): BlockFill => ({
    block: block.index,
    items,
    leftovers: [],
    packedVolume: items.reduce((s, it) => s + types[it.type]!.volume, 0),
  });
  /** A stack of slabs as a fill of the block. */
  const toFill = (stack: Stack): BlockFill => {
    const items: PackedItem[] = [];
    const origin = [...block.usable.origin] as Vec3;
    for (const s of stack.slabs) {
      place(items, s.slab.node, s.perm, [...origin] as Vec3);
      origin[stack.axis] = origin[stack.axis]! + s.length;
    }
    return fillOf(items);
  };

  /**
   * The boxes glued so far (each a finished cut tree with no waste), packed whole into at most
   * `most` blocks: the slabs stacked first-fit by decreasing length (each block a stack across one
   * axis, as in a bin packing of lengths), then the open boxes into the room left at the end of each
   * stack and into further blocks by the guillotine greedy, largest first. Undefined when they do
   * not all fit.
   */
  const packGlued = (
    slabsLeft: readonly Slab[],
    openLeft: readonly MergeNode[],
    most: number,
  ): BlockFill[] | undefined => {
    const bins: Stack[] = [];
    const room = (st: Stack): number => target[st.axis]! - st.slabs.reduce((s, c) => s + c.length, 0);
    for (const slab of [...slabsLeft].sort((x, y) => y.node.volume - x.node.volume)) {
      let put = false;
      for (const st of bins) {
        const w = slab.ways.find((v) => v.axis === st.axis && v.length <= room(st) + EPS * 100);
        if (!w) continue;
        st.slabs.push({ slab, perm: w.perm, length: w.length });
        put = true;
        break;
      }
      if (put) continue;
      const w = slab.ways[0]!;
      bins.push({ axis: w.axis, slabs: [{ slab, perm: w.perm, length: w.length }] });
    }
    if (bins.length > most) return undefined;
    const glued: ItemType[] = openLeft.map((n, index) => {
      const dims: Vec3[] = [];
      for (let p = 0; p < PERMS.length; p++) {
        const d = permute(p, n.dims);
        if (n.mask & (1 << p) && !dims.some((e) => sameVec(e, d))) dims.push(d);
      }
      return {
        index,
        id: `glued ${index}`,
        count: 1,
        volume: n.volume,
        dims,
        minSide: n.sorted[0]!,
        maxSide: n.sorted[2]!,
      };
    });
    const remaining = glued.map(() => 1);
    const order = glued.map((_, i) => i).sort((x, y) => glued[y]!.volume - glued[x]!.volume || x - y);
    /**
     * The open boxes the greedy puts into `space` (a block, or the room at the end of a stack); the
     * room it leaves goes to `leftovers` (kept as offcuts where large enough).
     */
    const fillSpace = (space: Box, items: PackedItem[], leftovers: Box[]): void => {
      if (!remaining.some((c) => c > 0)) {
        leftovers.push(space);
        return;
      }
      const info: BlockInfo = { ...block, usable: space, obstacles: [] };
      const f = fillBlockGuillotine(info, glued, remaining, {
        order,
        grid: false,
        split: "biggest",
        thinSlabs: true,
        boxFirst: false,
        lookahead: 0,
        rng: r ?? (() => 0.5),
      });
      leftovers.push(...f.leftovers);
      for (const it of f.items) {
        const n = openLeft[it.type]!;
        const perm = PERMS.findIndex((_, p) => n.mask & (1 << p) && sameVec(permute(p, n.dims), it.dims));
        place(items, n, perm, it.origin);
      }
    };
    const out: BlockFill[] = [];
    for (const st of bins) {
      const fill = toFill(st);
      const used = target[st.axis]! - room(st);
      const origin = [...block.usable.origin] as Vec3;
      origin[st.axis] = origin[st.axis]! + used;
      const size = [...target] as Vec3;
      size[st.axis] = room(st);
      const leftovers: Box[] = [];
      if (size[st.axis]! > EPS) fillSpace({ origin, size }, fill.items, leftovers);
      out.push({ ...fillOf(fill.items), leftovers });
    }
    while (remaining.some((c) => c > 0) && out.length < most) {
      const items: PackedItem[] = [];
      const leftovers: Box[] = [];
      fillSpace(block.usable, items, leftovers);
      if (items.length === 0) return undefined;
      out.push({ ...fillOf(items), leftovers });
    }
    return remaining.some((c) => c > 0) ? undefined : out;
  };

  /**
   * After a failed search: as many blocks as the slabs of the deepest state fill exactly, one stack
   * after another (a subset sum per block, at most `PARTIAL_STEPS` steps in all). Slabs glued across
   * blocks by a chance match stay out; the blocks they spoil are left to the caller.
   */
  const someStacks = (pool: Slab[]): Stack[] => {
    const out: Stack[] = [];
    let steps = 0;
    let left = [...pool].sort((a, b) => a.ways.length - b.ways.length || b.node.volume - a.node.volume);
    for (let fi = 0; fi < left.length && out.length < k - 1; ) {
      const first = left[fi]!;
      let found: Stack | undefined;
      for (const w of first.ways) {
        const cands = left
          .filter((x) => x !== first)
          .map((slab) => ({ slab, way: slab.ways.find((v) => v.axis === w.axis) }))
          .filter((c): c is { slab: Slab; way: Slab["ways"][number] } => c.way !== undefined)
          .sort((x, y) => y.way.length - x.way.length);
        const chosen: Stack["slabs"] = [{ slab: first, perm: w.perm, length: w.length }];
        const fill = (from: number, room: number): boolean => {
          if (Math.abs(room) <= EPS * 100) return true;
          if (++steps > PARTIAL_STEPS) return false;
          let prev = Number.NaN;
          for (let i = from; i < cands.length; i++) {
            const c = cands[i]!;
            if (near(c.way.length, prev) || c.way.length > room + EPS * 100) continue;
            prev = c.way.length;
            chosen.push({ slab: c.slab, perm: c.way.perm, length: c.way.length });
            if (fill(i + 1, room - c.way.length)) return true;
            chosen.pop();
          }
          return false;
        };
        if (fill(0, target[w.axis]! - w.length)) {
          found = { axis: w.axis, slabs: chosen };
          break;
        }
      }
      if (!found) {
        fi++;
        continue;
      }
      out.push(found);
      const used = new Set(found.slabs.map((c) => c.slab));
      left = left.filter((x) => !used.has(x));
      fi = 0;
    }
    return out;
  };

  if (!dfs(open) || closed.length !== k) {
    if (partial) {
      const stacks = someStacks(deepest.slabs);
      partial.fills = stacks.map(toFill);
      // The rest: the k - j blocks' worth of glued boxes, in k - j + 1 blocks at most.
      const used = new Set(stacks.flatMap((st) => st.slabs.map((c) => c.slab)));
      const slabsLeft = deepest.slabs.filter((x) => !used.has(x));
      const more =
        slabsLeft.length + deepest.open.length > 0
          ? packGlued(slabsLeft, deepest.open, k - stacks.length + 1)
          : undefined;
      if (more) partial.rest = more;
    }
    return undefined;
  }
  return closed.map(toFill);
}

/** Subset-sum steps for the blocks filled exactly after a failed search over several blocks. */
const PARTIAL_STEPS = 20_000;
