import { volume as vol, type Box } from "../geometry";
import type { Rng } from "../rng";
import type { Vec3 } from "../types";
import { GRID_ORDERS, split, type SplitRule } from "./split";
import { gridItems, type ItemType, type PackedItem } from "./model";

/** Budget for lookahead: moves judged x part lines x pieces (about 150 moves for 10 lines of 130 pieces). */
const LOOKAHEAD_WORK = 200_000;

/**
 * How many moves a box-first fill may judge by greedy completions for this many part lines and
 * pieces: none past 30 lines or 400 pieces, else a share of LOOKAHEAD_WORK.
 */
export function lookaheadCap(lines: number, pieces: number): number {
  return lines > 30 || pieces > 400 ? 0 : Math.floor(LOOKAHEAD_WORK / (lines * pieces));
}

interface State {
  free: Box[];
  remaining: number[];
  packedVolume: number;
  leftovers: Box[];
  items: PackedItem[] | undefined;
}

export interface Move {
  t: number;
  d: Vec3;
  n: Vec3;
  score: number;
}

export interface BoxFirstParams {
  grid: boolean;
  split: SplitRule;
  lookahead: number;
  rng: Rng;
  /** Out of time: the rest of the fill is plain greedy. */
  stop?: () => boolean;
}

function lowest(free: readonly Box[]): number {
  let fi = 0;
  for (let i = 1; i < free.length; i++) {
    const a = free[i]!.origin;
    const b = free[fi]!.origin;
    if (
      a[2] < b[2] - 1e-9 ||
      (Math.abs(a[2] - b[2]) <= 1e-9 && (a[1] < b[1] - 1e-9 || (Math.abs(a[1] - b[1]) <= 1e-9 && a[0] < b[0])))
    )
      fi = i;
  }
  return fi;
}

export function minSide(types: readonly ItemType[], order: readonly number[], remaining: readonly number[]): number {
  let m = Infinity;
  for (const t of order) if (remaining[t]! > 0) m = Math.min(m, types[t]!.minSide);
  return m;
}

/** The `k` best placements (a part or a grid of copies) for box `f`, best first. */
export function moves(
  f: Box,
  types: readonly ItemType[],
  order: readonly number[],
  remaining: readonly number[],
  grid: boolean,
  mMin: number,
  k: number,
): Move[] {
  const out: Move[] = [];
  const fs = f.size;
  const fv = vol(fs);
  const consider = (t: number, d: Vec3, n0: number, n1: number, n2: number): void => {
    let exact = 0;
    let waste = 0;
    const g0 = d[0] * n0;
    const g1 = d[1] * n1;
    const g2 = d[2] * n2;
    const r0 = fs[0] - g0;
    const r1 = fs[1] - g1;
    const r2 = fs[2] - g2;
    if (r0 <= 1e-9) exact++;
    else if (r0 < mMin) waste += r0 / fs[0];
    if (r1 <= 1e-9) exact++;
    else if (r1 < mMin) waste += r1 / fs[1];
    if (r2 <= 1e-9) exact++;
    else if (r2 < mMin) waste += r2 / fs[2];
    const score = exact * 2 - waste + (g0 * g1 * g2) / fv;
    if (out.length >= k && score <= out[out.length - 1]!.score) return;
    let i = out.length;
    while (i > 0 && out[i - 1]!.score < score) i--;
    out.splice(i, 0, { t, d, n: [n0, n1, n2], score });
    if (out.length > k) out.pop();
  };
  const boxMin = Math.min(fs[0], fs[1], fs[2]) + 1e-9;
  const boxMax = Math.max(fs[0], fs[1], fs[2]) + 1e-9;
  for (const t of order) {
    const rem = remaining[t]!;
    if (rem <= 0) continue;
    const ty = types[t]!;
    // No turn of a piece whose shortest side is longer than the box's shortest fits (nor longest).
    if (ty.minSide > boxMin || ty.maxSide > boxMax) continue;
    for (const d of ty.dims) {
      if (d[0] > fs[0] + 1e-9 || d[1] > fs[1] + 1e-9 || d[2] > fs[2] + 1e-9) continue;
      consider(t, d, 1, 1, 1);
      if (!grid || rem <= 1) continue;
      const cap = [Math.floor(fs[0] / d[0] + 1e-9), Math.floor(fs[1] / d[1] + 1e-9), Math.floor(fs[2] / d[2] + 1e-9)];
      for (const [a1, a2, a3] of GRID_ORDERS) {
        const n: Vec3 = [1, 1, 1];
        n[a1] = Math.min(cap[a1]!, rem);
        n[a2] = Math.min(cap[a2]!, Math.floor(rem / n[a1]!));
        n[a3] = Math.min(cap[a3]!, Math.floor(rem / (n[a1]! * n[a2]!)));
        if (n[0] * n[1] * n[2] > 1) consider(t, d, n[0], n[1], n[2]);
      }
    }
  }
  return out;
}

/**
 * The move whose greedy completion packs most (a pilot method): each move is judged by the volume
 * `complete` reaches from it; when `stop` says the time is up, the best judged so far is taken.
 */
function bestByCompletion<M extends object>(ms: readonly M[], complete: (m: M) => number, stop?: () => boolean): M {
  let chosen = ms[0]!;
  let bestVol = -1;
  for (const m of ms) {
    if (bestVol >= 0 && stop?.()) break;
    const v = complete(m);
    if (v > bestVol + 1e-9) {
      bestVol = v;
      chosen = m;
    }
  }
  return chosen;
}

/**
 * One step of a pilot fill: the only move, or the best of `ms` by `bestByCompletion`. Once `stop`
 * says the time is up it takes the first move and reports `stopped`, and the fill goes on plainly
 * greedy (both fills, cut tree and maximal boxes, step this way).
 */
export function pickMove<M extends object>(
  ms: readonly M[],
  complete: (m: M) => number,
  stop?: () => boolean,
): { move: M; stopped: boolean } {
  if (ms.length === 1) return { move: ms[0]!, stopped: false };
  if (stop?.()) return { move: ms[0]!, stopped: true };
  return { move: bestByCompletion(ms, complete, stop), stopped: false };
}

function apply(s: State, fi: number, m: Move, types: readonly ItemType[], p: BoxFirstParams): void {
  const f = s.free[fi]!;
  const { d, n } = m;
  if (s.items) s.items.push(...gridItems(m.t, f.origin, d, n));
  const count = n[0] * n[1] * n[2];
  s.remaining[m.t] = s.remaining[m.t]! - count;
  s.packedVolume += count * types[m.t]!.volume;
  s.free.splice(fi, 1, ...split(f, [d[0] * n[0], d[1] * n[1], d[2] * n[2]], p.split, p.rng));
}

function prune(s: State, mMin: number): void {
  const keep: Box[] = [];
  for (const f of s.free) (f.size.some((v) => v < mMin - 1e-9) ? s.leftovers : keep).push(f);
  s.free = keep;
}

function run(
  s: State,
  types: readonly ItemType[],
  order: readonly number[],
  p: BoxFirstParams,
  lookaheadAtStart: number,
): void {
  let lookahead = lookaheadAtStart;
  let mMin = minSide(types, order, s.remaining);
  prune(s, mMin);
  while (s.free.length > 0) {
    const fi = lowest(s.free);
    const f = s.free[fi]!;
    const ms = moves(f, types, order, s.remaining, p.grid, mMin, Math.max(1, lookahead));
    if (ms.length === 0) {
      s.leftovers.push(f);
      s.free.splice(fi, 1);
      continue;
    }
    const { move: chosen, stopped } = pickMove(
      ms,
      (m) => {
        const sim: State = {
          free: [...s.free],
          remaining: [...s.remaining],
          packedVolume: s.packedVolume,
          leftovers: [],
          items: undefined,
        };
        apply(sim, fi, m, types, p);
        run(sim, types, order, p, 0);
        return sim.packedVolume;
      },
      p.stop,
    );
    if (stopped) lookahead = 0;
    apply(s, fi, chosen, types, p);
    if (s.remaining[chosen.t] === 0) mMin = Math.max(mMin, minSide(types, order, s.remaining));
    prune(s, mMin);
  }
}

/**
 * Box-first guillotine fill: always fills the lowest free box, with the part (or grid of copies)
 * that fits it best; with `lookahead` > 1 the best few moves are judged by a greedy completion.
 * `remaining` is decremented in place.
 */
export function fillBoxFirst(
  free: Box[],
  types: readonly ItemType[],
  remaining: number[],
  order: readonly number[],
  p: BoxFirstParams,
): { items: PackedItem[]; leftovers: Box[]; packedVolume: number } {
  const s: State = { free: [...free], remaining, packedVolume: 0, leftovers: [], items: [] };
  // Lookahead costs a greedy completion per move, and a completion scans every part line at every
  // step: the number of moves judged shrinks as part lines x pieces grows.
  const live = order.filter((t) => remaining[t]! > 0);
  const pieces = live.reduce((n, t) => n + remaining[t]!, 0);
  run(s, types, live, p, Math.min(p.lookahead, lookaheadCap(live.length, pieces)));
  return { items: s.items!, leftovers: s.leftovers, packedVolume: s.packedVolume };
}
