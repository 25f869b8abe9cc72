import { solveCover } from "./lp";
import type { BlockFill, Model } from "./model";

/** A block filling remembered as a column of the cutting-stock integer program. */
export interface Column {
  classKey: string;
  counts: Map<number, number>;
  fill: BlockFill;
  /** Part volume over block volume: how good the filling is on its own. */
  density: number;
}

/** Keeps the distinct fillings met during the search, the densest first, up to `limit`. */
export class ColumnPool {
  private readonly byKey = new Map<string, Column>();
  constructor(
    private readonly model: Model,
    private readonly limit: number,
  ) {}

  add(fill: BlockFill): void {
    if (fill.items.length === 0) return;
    const block = this.model.blocks[fill.block]!;
    const counts = new Map<number, number>();
    for (const it of fill.items) counts.set(it.type, (counts.get(it.type) ?? 0) + 1);
    const key = `${block.classKey}|${[...counts].sort((a, b) => a[0] - b[0]).join(";")}`;
    if (this.byKey.has(key)) return;
    this.byKey.set(key, { classKey: block.classKey, counts, fill, density: fill.packedVolume / block.volume });
    if (this.byKey.size > this.limit * 1.5) this.trim();
  }

  private trim(): void {
    const keep = [...this.byKey].sort((a, b) => b[1].density - a[1].density).slice(0, this.limit);
    this.byKey.clear();
    for (const [k, c] of keep) this.byKey.set(k, c);
  }

  get size(): number {
    return this.byKey.size;
  }

  columns(): Column[] {
    this.trim();
    return [...this.byKey.values()];
  }
}

/**
 * Up to `want` remembered fillings that take no piece twice, densest first (densities jittered by
 * ±5 % so passes differ); takes their pieces off `remaining`. A pass that starts from them packs
 * only the rest afresh, so the densest blocks of earlier passes are combined.
 * @example denseDisjoint(pool.columns(), remaining, 3, rng) // → the 3 densest compatible columns
 */
export function denseDisjoint(
  columns: readonly Column[],
  remaining: number[],
  want: number,
  rng: () => number,
): Column[] {
  const keyed = columns.map((c) => ({ c, key: c.density * (1 + 0.1 * (rng() - 0.5)) }));
  keyed.sort((a, b) => b.key - a.key);
  const out: Column[] = [];
  for (const { c } of keyed) {
    if (out.length >= want) break;
    if ([...c.counts].some(([t, n]) => remaining[t]! < n)) continue;
    for (const [t, n] of c.counts) remaining[t]! -= n;
    out.push(c);
  }
  return out;
}

/**
 * Picks a cheap combination of remembered fillings that covers the demand (cutting-stock set
 * cover): the linear relaxation is solved by the small simplex of `lp.ts` (javascript-lp-solver
 * was used before: its branch and bound ran far past its timeout on some models, and its simplex
 * cycled without end on one), the solution is rounded down and the rest of the demand is covered
 * greedily by the fillings that cover most of it; surplus pieces are dropped and the fillings are
 * mapped onto real blocks of their class. Undefined when no cover is found, or when `stop` says
 * the time is up (asked every few pivots) or the simplex runs past its pivot limit.
 * @example coverDemand(model, pool.columns(), demand, () => clock() > deadline) // → BlockFill[] | undefined
 */
export function coverDemand(
  model: Model,
  columns: readonly Column[],
  demand: readonly number[],
  stop?: () => boolean,
): BlockFill[] | undefined {
  if (columns.length === 0) return undefined;
  const classBlocks = new Map<string, number[]>();
  for (const b of model.blocks) classBlocks.set(b.classKey, [...(classBlocks.get(b.classKey) ?? []), b.index]);
  const classIndex = new Map([...classBlocks.keys()].map((k, i) => [k, i]));
  // One covering row per part line still in demand.
  const row = new Map<number, number>();
  const need: number[] = [];
  demand.forEach((d, t) => {
    if (d <= 0) return;
    row.set(t, need.length);
    need.push(d);
  });
  const cover = columns.map((c) => {
    const out: [number, number][] = [];
    for (const [t, n] of c.counts) if (row.has(t)) out.push([row.get(t)!, n]);
    return out;
  });
  const lp = solveCover(
    cover,
    columns.map((c) => classIndex.get(c.classKey)!),
    columns.map((c) => model.blocks[c.fill.block]!.cost * (1 + 1e-6) + 1e-9),
    need,
    [...classBlocks.values()].map((bs) => bs.length),
    stop ? { stop } : {},
  );
  if (lp.status !== "optimal") return undefined;
  const mult = lp.x.map((x) => Math.floor(x + 1e-6));
  const used = new Map<string, number>();
  columns.forEach((c, j) => used.set(c.classKey, (used.get(c.classKey) ?? 0) + mult[j]!));
  const short = demand.map((d) => d);
  columns.forEach((c, j) => {
    for (const [t, n] of c.counts) short[t]! -= n * mult[j]!;
  });
  // Greedy completion of what rounding down left uncovered.
  for (;;) {
    const needVol = short.reduce((s, v, t) => s + Math.max(0, v) * model.types[t]!.volume, 0);
    if (needVol <= 0) break;
    let best = -1;
    let bestGain = 0;
    columns.forEach((c, j) => {
      if ((used.get(c.classKey) ?? 0) >= classBlocks.get(c.classKey)!.length) return;
      let gain = 0;
      for (const [t, n] of c.counts) gain += Math.min(n, Math.max(0, short[t]!)) * model.types[t]!.volume;
      gain /= model.blocks[c.fill.block]!.cost + 1e-9;
      if (gain > bestGain) {
        bestGain = gain;
        best = j;
      }
    });
    if (best < 0) return undefined;
    mult[best]!++;
    const c = columns[best]!;
    used.set(c.classKey, (used.get(c.classKey) ?? 0) + 1);
    for (const [t, n] of c.counts) short[t]! -= n;
  }
  const chosen = columns.map((col, j) => ({ col, n: mult[j]! })).filter((x) => x.n > 0);
  const surplus = short.map((v) => -v);
  // Least dense fillings give up their surplus pieces first.
  chosen.sort((a, b) => a.col.density - b.col.density);
  const free = new Map([...classBlocks].map(([k, bs]) => [k, [...bs]]));
  const fills: BlockFill[] = [];
  for (const { col, n } of chosen)
    for (let i = 0; i < n; i++) {
      const block = free.get(col.classKey)!.shift()!;
      const items = col.fill.items.filter((it) => {
        if (surplus[it.type]! > 0) {
          surplus[it.type]!--;
          return false;
        }
        return true;
      });
      if (items.length === 0) continue;
      const packedVolume = items.reduce((s, it) => s + model.types[it.type]!.volume, 0);
      fills.push({ block, items, leftovers: col.fill.leftovers, packedVolume });
    }
  return fills;
}
