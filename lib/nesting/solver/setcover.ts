import solver from "javascript-lp-solver";
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
 * Picks the cheapest combination of remembered fillings that covers the demand (cutting-stock
 * set cover, solved as an integer program by javascript-lp-solver), then drops surplus pieces and
 * maps the chosen fillings onto real blocks of their class. Returns undefined when no cover is
 * found in time.
 * @example coverDemand(model, pool.columns(), demand, 300) // → BlockFill[] | undefined
 */
export function coverDemand(model: Model, columns: readonly Column[], demand: readonly number[], timeoutMs: number): BlockFill[] | undefined {
  if (columns.length === 0) return undefined;
  const classBlocks = new Map<string, number[]>();
  for (const b of model.blocks) classBlocks.set(b.classKey, [...(classBlocks.get(b.classKey) ?? []), b.index]);
  const classId = new Map([...classBlocks.keys()].map((k, i) => [k, `c${i}`]));
  const constraints: Record<string, { min?: number; max?: number }> = {};
  demand.forEach((d, t) => {
    if (d > 0) constraints[`t${t}`] = { min: d };
  });
  for (const [k, blocks] of classBlocks) constraints[classId.get(k)!] = { max: blocks.length };
  const variables: Record<string, Record<string, number>> = {};
  const ints: Record<string, 1> = {};
  columns.forEach((c, j) => {
    const block = model.blocks[c.fill.block]!;
    // Cost first, then a nudge towards fewer blocks.
    const v: Record<string, number> = { cost: block.cost * (1 + 1e-6) + 1e-9, [classId.get(c.classKey)!]: 1 };
    for (const [t, n] of c.counts) if (demand[t]! > 0) v[`t${t}`] = n;
    variables[`f${j}`] = v;
    ints[`f${j}`] = 1;
  });
  let res: Record<string, unknown>;
  try {
    res = solver.Solve({ optimize: "cost", opType: "min", constraints, variables, ints, options: { timeout: timeoutMs } }) as unknown as Record<string, unknown>;
  } catch {
    return undefined;
  }
  if (!res.feasible) return undefined;
  // Chosen columns, with multiplicities rounded up (still a cover); class limits are re-checked.
  const chosen: { col: Column; n: number }[] = [];
  const used = new Map<string, number>();
  columns.forEach((c, j) => {
    const x = Number(res[`f${j}`] ?? 0);
    const n = Math.ceil(x - 1e-6);
    if (n > 0) {
      chosen.push({ col: c, n });
      used.set(c.classKey, (used.get(c.classKey) ?? 0) + n);
    }
  });
  for (const [k, n] of used) if (n > classBlocks.get(k)!.length) return undefined;
  const surplus = demand.map((d) => -d);
  for (const { col, n } of chosen) for (const [t, c] of col.counts) surplus[t]! += c * n;
  if (surplus.some((s, t) => s < 0 && demand[t]! > 0)) return undefined;
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
