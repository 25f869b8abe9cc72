import { lowerBoundBlocks } from "../bounds";
import { volume } from "../geometry";
import { lookaheadCap } from "./boxfirst";
import { compareScores, scoreOf, scorePlan, type Score } from "../objective";
import { rng as makeRng, type Rng } from "../rng";
import type { Plan, Problem } from "../types";
import { validatePlan } from "../validate";
import { assemblePlan, keptOffcuts } from "./assemble";
import { fillBlockGuillotine } from "./guillotine3d";
import type { SplitRule } from "./split";
import { fillBlockMaxRects, fillBlockMaxRectsPackage, layerDims, type RectRule } from "./maxrects2d";
import { buildModel, fitsIn, type BlockFill, type Model } from "./model";
import {
  MAX_PARTITION_PIECES,
  packAllByCuts,
  packAllByMerging,
  packAllByTable,
  packAllInBlock,
  packAllIntoBlocks,
} from "./exact";
import { eliminateBlocks } from "./improve";
import { fillBlockFree } from "./freefill";
import { packLayerPerfect } from "./perfect2d";
import { ColumnPool, coverDemand, denseDisjoint } from "./setcover";

type OrderKey = "volume" | "maxSide" | "area" | "minSide";

interface PassParams {
  orderKey: OrderKey;
  noise: number;
  grid: boolean;
  split: SplitRule;
  thinSlabs: boolean;
  boxFirst: boolean;
  lookahead: number;
  rectRule: RectRule | "package";
  planarMaxRects: boolean;
  blockOrder: "cheap" | "large" | "shuffle";
  candidates: number;
  /** Fill attempts per block with varied settings; the fullest one is kept. */
  tries: number;
  /** Free layout only: keep the empty room as maximal boxes (freefill.ts) instead of a cut tree. */
  free: boolean;
  /** Free fills: from the block corner nearest each empty box, or from the origin corner. */
  corners: boolean;
  /** Start from this share of the best plan's block count in dense remembered fillings, then fill on. */
  reuse: number;
}

const DEFAULT: PassParams = {
  orderKey: "volume",
  noise: 0,
  grid: true,
  split: "biggest",
  thinSlabs: true,
  boxFirst: false,
  lookahead: 0,
  rectRule: "bssf",
  planarMaxRects: true,
  blockOrder: "cheap",
  candidates: 1,
  tries: 1,
  free: false,
  corners: true,
  reuse: 0,
};

/** Share of passes (once `reusable`) that start from remembered dense fillings. */
const REUSE_SHARE = 0.8;

/** Share of the time budget that the search for exact fills over several blocks may take in all. */
const PARTITION_SHARE = 0.6;

/** Glue steps of the first exact-fills-over-several-blocks attempt (the later ones: 4–8 per piece). */
const PARTITION_NODES = 2000;

/** Attempts per pass at exact fills over several blocks when there is no clock (a pass budget)... */
const PARTITION_TRIES = 8;

/** ...in this many passes at most (the attempts cost as much as many passes). */
const PARTITION_PASSES = 3;

/** The perfect-layer search is tried for up to this many pieces (beyond, it rarely ends in time). */
const MAX_PERFECT_PIECES = 40;

function pick<T>(r: Rng, xs: readonly T[]): T {
  return xs[Math.floor(r() * xs.length)]!;
}

export interface SearchOptions {
  seed: number;
  now?: () => number;
  iterations: number;
  timeLimitMs: number;
  warmStart?: Plan;
}

/** The anytime search: one greedy pass per `step()`, keeping the best plan by the objective. */
export class Search {
  readonly model: Model;
  readonly lowerBound: number;
  private readonly r: Rng;
  private readonly start: number;
  private best?: { score: Score; fills?: BlockFill[]; plan?: Plan; yield: number; unplaced: number };
  private iteration = 0;
  private readonly placeable: number;
  private readonly typeFitsSomewhere: boolean[];
  private readonly pool: ColumnPool;
  private nextCover = 6;
  /** Completion searches already tried (block class + remaining parts), with their node budget. */
  private readonly tried = new Map<string, number>();
  /** Each type's sort key for every part order (before noise). */
  private readonly orderKeys: Record<OrderKey, number[]>;
  /** One block, or more parts than the blocks hold (3D): passes aim at full blocks. */
  private readonly fillMost: boolean;
  /** Share of passes that fill blocks in free layout (maximal empty boxes); 0 unless the layout is free. */
  private readonly freeShare: number;
  /**
   * The order fills `k` ≥ 2 identical blocks exactly (no waste at all, by volume): the blocks it
   * would take, the attempts so far and their time, and the glues blamed for dead ends.
   */
  private partition?: {
    blocks: number[];
    /** One more block of the same kind, if offered: the k + 1st of the fallback. */
    spare: number[];
    spentMs: number;
    attempts: number;
    learned: Set<string>;
    /** The glues blamed in searches of the rest of the order (after `exactPart`). */
    learnedRest: Set<string>;
  };
  /**
   * The k + 1 fallback: blocks that a failed attempt at exact fills over several blocks did fill
   * exactly (the most so far). Passes start from them on alternate iterations, so the rest of the
   * order (a whole number of blocks by volume, mixed up by a chance match) is packed by the general
   * search: at most k + 1 blocks as long as the rest takes one block more than its volume.
   */
  private exactPart?: BlockFill[];
  /** The order fills k identical blocks exactly: fewer blocks first (see `compare`). */
  private readonly fewerBlocksFirst: boolean;

  constructor(
    problem: Problem,
    private readonly opts: SearchOptions,
  ) {
    this.model = buildModel(problem);
    this.r = makeRng(opts.seed);
    this.start = opts.now?.() ?? 0;
    this.lowerBound = lowerBoundBlocks(problem);
    this.typeFitsSomewhere = this.model.types.map((t) =>
      this.model.blocks.some(
        (b) => this.model.compatible[b.index]!.includes(t.index) && t.dims.some((d) => fitsIn(d, b.usable.size)),
      ),
    );
    this.pool = new ColumnPool(this.model, 250);
    const sorted = this.model.types.map((t) => [...t.dims[0]!].sort((a, b) => b - a));
    const first = this.model.types.map((t) => t.dims[0]!);
    this.orderKeys = {
      volume: first.map((d) => d[0] * d[1] * d[2]),
      maxSide: sorted.map((s) => s[0]! * 1e6 + s[1]!),
      area: sorted.map((s) => s[0]! * s[1]!),
      minSide: sorted.map((s) => s[2]! * 1e6 + s[1]!),
    };
    const capacity = this.model.blocks.reduce((s, b) => s + volume(b.usable.size), 0);
    const cargo = this.model.types.reduce((s, t) => s + volume(t.dims[0]!) * t.count, 0);
    // One layer of parts (a 2D problem) is left to the rectangle packers and the glue search.
    const oneLayer =
      problem.settings.layout !== "guillotine" &&
      this.model.blocks.every((b) => this.model.types.every((t) => layerDims(t, b).length > 0));
    // Judging moves by greedy completions is allowed for modest orders only.
    const pieces = this.model.types.reduce((s, t) => s + t.count, 0);
    const modest = lookaheadCap(this.model.types.length, pieces) > 0;
    this.fillMost = modest && !oneLayer && (this.model.blocks.length === 1 || cargo >= capacity);
    this.freeShare = problem.settings.layout === "free" ? 0.7 : 0;
    this.placeable = this.model.types.reduce((s, t, i) => s + (this.typeFitsSomewhere[i] ? t.volume * t.count : 0), 0);
    this.partition = this.exactBlocks(cargo);
    this.fewerBlocksFirst = !!this.partition;
    if (opts.warmStart && validatePlan(problem, opts.warmStart).length === 0) {
      const w = opts.warmStart;
      this.best = {
        score: scorePlan(problem, w),
        plan: w,
        yield: w.stats.yield,
        unplaced: w.unplaced.reduce((n, u) => n + u.count, 0),
      };
    }
  }

  /**
   * When the parts (grown by the kerf) fill a whole number k ≥ 2 of identical blocks exactly, the
   * cheapest k such blocks (blocks without defects, taking every part); otherwise undefined.
   */
  private exactBlocks(cargo: number): Search["partition"] {
    const m = this.model;
    const pieces = m.types.reduce((s, t) => s + t.count, 0);
    if (pieces > MAX_PARTITION_PIECES || !this.typeFitsSomewhere.every(Boolean)) return undefined;
    const byClass = new Map<string, number[]>();
    for (const b of this.blockOrder(DEFAULT)) {
      const info = m.blocks[b]!;
      if (info.obstacles.length > 0 || m.compatible[b]!.length < m.types.length) continue;
      byClass.set(info.classKey, [...(byClass.get(info.classKey) ?? []), b]);
    }
    let best: { blocks: number[]; cost: number; spare: number[] } | undefined;
    for (const group of byClass.values()) {
      const info = m.blocks[group[0]!]!;
      const cap = volume(info.usable.size);
      const k = Math.round(cargo / cap);
      if (k < 2 || k > group.length || Math.abs(cargo - k * cap) > 1e-6 * k * cap) continue;
      if (!best || k * info.cost < best.cost)
        best = { blocks: group.slice(0, k), cost: k * info.cost, spare: group.slice(k, k + 1) };
    }
    return (
      best && {
        blocks: best.blocks,
        spare: best.spare,
        spentMs: 0,
        attempts: 0,
        learned: new Set(),
        learnedRest: new Set(),
      }
    );
  }

  /**
   * Attempts at exact fills over several blocks (`packAllIntoBlocks`), while the best plan uses more
   * blocks than that and the attempts have spent less than their share of the budget: the first
   * glues in a fixed order with `PARTITION_NODES` steps, the later ones (restarts) shuffle equally
   * good glues with a few steps per piece, and glues blamed for dead ends in earlier attempts go
   * last. With a clock, one call takes up to a third of the budget; without one (a pass budget),
   * `PARTITION_TRIES` attempts in each of the first `PARTITION_PASSES` calls, so runs stay
   * deterministic and a long pass budget does not repeat them.
   */
  private tryPartition(): void {
    const part = this.partition;
    if (!part) return;
    const s = this.best?.score;
    const k = part.blocks.length;
    if (s && s.blocksUsed <= k && this.allPlaced(s)) {
      this.partition = undefined;
      return;
    }
    const m = this.model;
    const counts = m.types.map((t) => t.count);
    const pieces = counts.reduce((a, c) => a + c, 0);
    const limitMs = this.opts.timeLimitMs * PARTITION_SHARE;
    const t0 = this.elapsed();
    const sliceMs = this.opts.timeLimitMs / 3;
    const over = (): boolean =>
      this.fraction() >= 1 ||
      (!!this.opts.now && (part.spentMs + this.elapsed() - t0 >= limitMs || this.elapsed() - t0 >= sliceMs));
    // Without a clock the attempts are counted instead: PARTITION_TRIES per pass, in the first passes.
    const cap = this.opts.now ? 1000 : PARTITION_PASSES * PARTITION_TRIES;
    for (let tries = 0; tries < PARTITION_TRIES || this.opts.now; tries++) {
      if (over() || part.attempts >= cap) break;
      const nodes = part.attempts === 0 ? PARTITION_NODES : Math.round(4 * pieces * (1 + part.attempts / 10));
      // With blocks already filled exactly (the fallback), every other attempt searches only the rest
      // of the order over the other blocks: fewer pieces, and the chance match may be gone with them.
      const kept = this.exactPart;
      if (kept && kept.length <= k - 2 && part.attempts % 2 === 1) {
        const rest = [...counts];
        for (const f of kept) for (const it of f.items) rest[it.type]!--;
        const more = packAllIntoBlocks(
          m.blocks[part.blocks[0]!]!,
          m.types,
          rest,
          k - kept.length,
          Math.round(4 * pieces * (1 + part.attempts / 10)),
          over,
          this.r,
          part.learnedRest,
        );
        part.attempts++;
        if (more) {
          this.offer([...kept, ...more.map((f, i) => ({ ...f, block: part.blocks[kept.length + i]! }))]);
          this.partition = undefined;
          this.exactPart = undefined;
          return;
        }
        continue;
      }
      const partial: { fills: BlockFill[]; rest?: BlockFill[] } = { fills: [] };
      const fills = packAllIntoBlocks(
        m.blocks[part.blocks[0]!]!,
        m.types,
        counts,
        k,
        nodes,
        over,
        part.attempts > 0 ? this.r : undefined,
        part.learned,
        partial,
      );
      part.attempts++;
      if (fills) {
        this.offer(fills.map((f, i) => ({ ...f, block: part.blocks[i]! })));
        this.partition = undefined;
        this.exactPart = undefined;
        return;
      }
      // The k + 1 fallback at once: the blocks filled exactly, and the boxes glued so far packed whole
      // into the other blocks (k - j + 1 at most).
      const all = [...part.blocks, ...part.spare];
      if (partial.rest && partial.fills.length + partial.rest.length <= all.length)
        this.offer([...partial.fills, ...partial.rest].map((f, i) => ({ ...f, block: all[i]! })));
      if (partial.fills.length > (this.exactPart?.length ?? 0)) {
        // More blocks filled exactly than before: keep them, and pack the rest at once (so a plan of
        // at most k + 1 blocks exists early, whatever the remaining budget).
        this.exactPart = partial.fills.map((f, i) => ({ ...f, block: part.blocks[i]! }));
        part.learnedRest = new Set();
        const rest = this.pass({ ...DEFAULT, boxFirst: true, lookahead: 24 }, this.exactPart);
        if (rest) this.offer(rest);
      }
    }
    part.spentMs += this.elapsed() - t0;
  }

  elapsed(): number {
    return this.opts.now ? this.opts.now() - this.start : 0;
  }

  /** Share of the budget used. */
  fraction(): number {
    const byIter = this.iteration / this.opts.iterations;
    const byTime = this.opts.now ? this.elapsed() / this.opts.timeLimitMs : 0;
    return Math.min(1, Math.max(byIter, byTime));
  }

  /** Past the time limit in a pass after the first (the first always completes). */
  private outOfTime(): boolean {
    return this.iteration > 1 && !!this.opts.now && this.fraction() >= 1;
  }

  /**
   * Whether a plan places every part that fits somewhere: its part volume, summed in another order,
   * may differ from `placeable` by rounding (relatively, not by a fixed amount: volumes in mm³ of
   * a hundred parts run to 1e10).
   */
  private allPlaced(s: Score): boolean {
    return s.placedVolume >= this.placeable - Math.max(1e-6, 1e-9 * this.placeable);
  }

  /** True when nothing better can be found: everything placed in as few blocks as the bound. */
  atBound(): boolean {
    const s = this.best?.score;
    return !!s && this.allPlaced(s) && s.blocksUsed <= this.lowerBound;
  }

  done(signal?: AbortSignal): boolean {
    if (this.iteration === 0) return false;
    return !!signal?.aborted || this.atBound() || this.fraction() >= 1;
  }

  bestScore(): Score | undefined {
    return this.best?.score;
  }

  /** One pass; the first uses fixed, sensible settings so a valid plan exists at once. */
  step(): void {
    const p = { ...(this.iteration === 0 ? DEFAULT : this.randomParams()) };
    if (this.reusable() && this.r() < REUSE_SHARE) p.reuse = 0.3 + 0.6 * this.r();
    this.iteration++;
    // After the first pass (so a plan exists at once): exact fills over several blocks, when the
    // order fills a whole number of blocks by volume.
    if (this.iteration > 1) {
      this.tryPartition();
      if (this.atBound()) return;
    }
    // The k + 1 fallback: alternate passes start from the blocks filled exactly.
    const fills = this.pass(p, this.iteration % 2 === 0 ? this.exactPart : undefined);
    if (!fills) return;
    this.offer(fills);
    if (
      fills.length > 1 &&
      !this.outOfTime() &&
      this.model.blocks.every((b) => b.classKey === this.model.blocks[0]!.classKey)
    )
      this.offer(eliminateBlocks(this.model, fills));
    if (this.iteration >= this.nextCover) {
      this.nextCover = Math.ceil(this.iteration * 1.6) + 2;
      this.cover();
    }
  }

  /**
   * Whether passes may start from remembered fillings: everything fits, above the bound, in
   * blocks of one kind (decided without drawing, so other problems keep their random sequence).
   */
  private reusable(): boolean {
    const s = this.best?.score;
    if (!s || this.iteration < 4 || this.pool.size < 4 || this.atBound() || !this.allPlaced(s)) return false;
    return this.model.blocks.every((b) => b.classKey === this.model.blocks[0]!.classKey) && s.blocksUsed > 1;
  }

  /** The dense fillings a pass starts from (see `denseDisjoint`), each given a block of its own. */
  private reuseFills(share: number, remaining: number[], unused: number[]): BlockFill[] {
    const want = Math.min(unused.length, Math.floor(share * (this.best?.score.blocksUsed ?? 0)));
    return denseDisjoint(this.pool.columns(), remaining, want, this.r).map((c) => ({
      ...c.fill,
      block: unused.shift()!,
    }));
  }

  /** Recombines remembered fillings by set cover when everything fits but above the bound. */
  private cover(): void {
    const s = this.best?.score;
    if (!s || this.atBound() || !this.allPlaced(s) || this.pool.size < 2) return;
    const demand = this.model.types.map((t, i) => (this.typeFitsSomewhere[i] ? t.count : 0));
    // Keep the linear program modest: at most 80 part lines.
    if (demand.filter((d) => d > 0).length > 80) return;
    const left = this.opts.now ? this.opts.timeLimitMs - this.elapsed() : Infinity;
    if (left < 50) return;
    // The simplex asks the clock every few pivots (and has a pivot limit without one).
    const fills = coverDemand(this.model, this.pool.columns(), demand, () => this.outOfTime());
    if (fills) this.offer(fills);
  }

  private offer(fills: BlockFill[]): void {
    for (const f of fills) this.pool.add(f);
    const offcuts = fills.flatMap((f) =>
      keptOffcuts(this.model, f).map((o) => ({ block: f.block, volume: o.size[0] * o.size[1] * o.size[2] })),
    );
    const placedVolume = fills.reduce((s, f) => s + f.packedVolume, 0);
    const score = scoreOf(this.model.problem, { placedVolume, usedBlocks: fills.map((f) => f.block), offcuts });
    if (this.best && this.compare(score, this.best.score) >= 0) return;
    const net =
      fills.reduce((s, f) => s + this.model.blocks[f.block]!.volume, 0) - offcuts.reduce((s, o) => s + o.volume, 0);
    const placed = fills.reduce((s, f) => s + f.items.length, 0);
    const demand = this.model.types.reduce((s, t) => s + t.count, 0);
    this.best = { score, fills, yield: net > 0 ? placedVolume / net : 0, unplaced: demand - placed };
  }

  /**
   * The objective's order, except for orders that fill k identical blocks exactly: there, of two
   * plans that place everything, the one with fewer blocks wins first (spread over more blocks with
   * their offcuts kept, a plan may consume no more stock, but it is not what the order was cut for).
   */
  private compare(a: Score, b: Score): number {
    if (this.fewerBlocksFirst && this.allPlaced(a) && this.allPlaced(b) && a.blocksUsed !== b.blocksUsed)
      return a.blocksUsed - b.blocksUsed;
    return compareScores(a, b);
  }

  /** Figures of the best plan so far, for progress reports. */
  bestSummary(): { placedVolume: number; blocksUsed: number; yield: number; unplacedCount: number } {
    const b = this.best;
    return {
      placedVolume: b?.score.placedVolume ?? 0,
      blocksUsed: b?.score.blocksUsed ?? 0,
      yield: b?.yield ?? 0,
      unplacedCount: b?.unplaced ?? 0,
    };
  }

  result(): Plan {
    const elapsed = Math.round(this.elapsed());
    if (this.best?.plan)
      return {
        ...this.best.plan,
        stats: { ...this.best.plan.stats, elapsedMs: elapsed, lowerBoundBlocks: this.lowerBound },
      };
    return assemblePlan(this.model, this.best?.fills ?? [], elapsed, this.lowerBound);
  }

  private randomParams(): PassParams {
    const r = this.r;
    // The second pass of a fill-most search: the setting that fills single blocks best on average.
    if (this.fillMost && this.iteration === 1)
      return { ...DEFAULT, boxFirst: true, lookahead: 96, free: this.freeShare > 0, corners: true };
    if (this.fillMost && r() < 0.85)
      // Stock is short (or there is one block): the fullest block wins, and box-first fills judged
      // by many greedy completions (a pilot method) fill a single block best.
      return {
        ...DEFAULT,
        orderKey: pick(r, ["volume", "volume", "maxSide", "area"] as const),
        noise: pick(r, [0, 0, 0.1]),
        grid: r() < 0.9,
        split: pick(r, ["biggest", "squares", "column"] as const),
        boxFirst: true,
        lookahead: pick(r, [24, 48, 96, 192]),
        blockOrder: pick(r, ["cheap", "large"] as const),
        // Drawn only in free layout, so other layouts keep their random sequence.
        ...this.freeChoice(0.8),
      };
    return {
      orderKey: pick(r, ["volume", "volume", "maxSide", "area", "minSide"] as const),
      noise: pick(r, [0, 0.05, 0.1, 0.2, 0.4]),
      grid: r() < 0.7,
      split: pick(r, ["biggest", "column", "squares", "random"] as const),
      thinSlabs: r() < 0.8,
      boxFirst: r() < 0.5,
      lookahead: pick(r, [0, 3, 6, 12]),
      rectRule: pick(r, ["bssf", "bssf", "baf", "bl", "package"] as const),
      planarMaxRects: r() < 0.7,
      blockOrder: pick(r, ["cheap", "cheap", "large", "shuffle"] as const),
      candidates: pick(r, [1, 2, 4, 8]),
      tries: pick(r, [1, 2, 4, 8]),
      ...this.freeChoice(0.5),
      reuse: 0,
    };
  }

  /** Free layout: whether a pass uses maximal empty boxes and, if so, fills from the nearest corners. */
  private freeChoice(cornerShare: number): { free: boolean; corners: boolean } {
    if (this.freeShare === 0 || this.r() >= this.freeShare) return { free: false, corners: true };
    return { free: true, corners: this.r() < cornerShare };
  }

  private typeOrder(p: PassParams, types: number[]): number[] {
    const base = this.orderKeys[p.orderKey];
    const keyed = types.map((t) => ({ t, key: base[t]! * (1 + p.noise * (this.r() - 0.5)) }));
    keyed.sort((a, b) => b.key - a.key);
    return keyed.map((k) => k.t);
  }

  private blockOrder(p: PassParams): number[] {
    const bl = this.model.blocks;
    const idx = bl.map((b) => b.index);
    const perVol = (i: number): number => bl[i]!.cost / bl[i]!.volume;
    if (p.blockOrder === "large") return idx.sort((a, b) => bl[b]!.volume - bl[a]!.volume || perVol(a) - perVol(b));
    const jitter = new Map(idx.map((i) => [i, p.blockOrder === "shuffle" ? this.r() : 0]));
    return idx.sort(
      (a, b) =>
        Number(bl[b]!.offcut) - Number(bl[a]!.offcut) ||
        perVol(a) - perVol(b) ||
        jitter.get(a)! - jitter.get(b)! ||
        bl[b]!.volume - bl[a]!.volume,
    );
  }

  private fillOne(block: number, remaining: number[], p: PassParams): BlockFill {
    let best: { fill: BlockFill; rem: number[] } | undefined;
    for (let i = 0; i < p.tries; i++) {
      if (i > 0 && this.outOfTime()) break;
      const q =
        i === 0 ? p : { ...this.randomParams(), candidates: p.candidates, tries: p.tries, blockOrder: p.blockOrder };
      const rem = [...remaining];
      const fill = this.fillWith(block, rem, q);
      if (!best || fill.packedVolume > best.fill.packedVolume + 1e-9) best = { fill, rem };
    }
    for (let i = 0; i < remaining.length; i++) remaining[i] = best!.rem[i]!;
    return best!.fill;
  }

  private fillWith(block: number, remaining: number[], p: PassParams): BlockFill {
    const m = this.model;
    const info = m.blocks[block]!;
    const live = m.compatible[block]!.filter((t) => remaining[t]! > 0);
    const order = this.typeOrder(p, live);
    const planar =
      m.problem.settings.layout !== "guillotine" &&
      p.planarMaxRects &&
      live.every((t) => layerDims(m.types[t]!, info).length > 0);
    if (planar && p.rectRule === "package" && info.obstacles.length === 0)
      return fillBlockMaxRectsPackage(info, m.types, remaining, order);
    if (planar)
      return fillBlockMaxRects(info, m.types, remaining, order, p.rectRule === "package" ? "bssf" : p.rectRule);
    // Piece by piece, free fills leave many small empty boxes: no moves judged then (too slow).
    if (p.free)
      return fillBlockFree(info, m.types, remaining, {
        order,
        grid: p.grid,
        lookahead: p.boxFirst && p.grid ? p.lookahead : 0,
        corners: p.corners,
        stop: () => this.outOfTime(),
      });
    return fillBlockGuillotine(info, m.types, remaining, {
      order,
      grid: p.grid,
      split: p.split,
      thinSlabs: p.thinSlabs,
      boxFirst: p.boxFirst,
      lookahead: p.lookahead,
      rng: this.r,
      stop: () => this.outOfTime(),
    });
  }

  /**
   * When what is left could fit one candidate block by volume, searches for a packing of all of
   * it there (cheapest block first). Each state is searched again only with a larger budget.
   */
  private tryFinish(cands: readonly number[], remaining: readonly number[]): BlockFill | undefined {
    const m = this.model;
    const sorted = [...cands].sort((a, b) => m.blocks[a]!.cost - m.blocks[b]!.cost);
    for (const b of sorted) {
      const info = m.blocks[b]!;
      const counts = remaining.map((c, t) => (m.compatible[b]!.includes(t) ? c : 0));
      if (counts.some((c, t) => c < remaining[t]!)) continue;
      const need = counts.reduce((s, c, t) => s + c * volume(m.types[t]!.dims[0]!), 0);
      const cap = volume(info.usable.size);
      if (need > cap + 1e-6 || need === 0) continue;
      const key = `${info.classKey}|${counts.join(",")}`;
      const budget = (this.tried.get(key) ?? 25) * 2;
      if (budget > 51_200) continue;
      this.tried.set(key, budget);
      const stop = (): boolean => this.fraction() >= 1;
      // Parts that fill the block exactly (no waste at all): glue their cut tree back together,
      // first in a fixed order, then shuffled as the budget grows (restarts).
      // Under the layers and free rules one layer may also hold parts no through cut frees: then a
      // perfect packing of the layer is searched next (complete, skyline order).
      const zeroWaste = Math.abs(need - cap) <= 1e-6 * cap;
      const left = counts.reduce((a, c) => a + c, 0);
      // The table over sets of pieces settles whether a cut tree exists (null: none does, so the glue
      // search is skipped); for larger orders (undefined), or when it runs out, the glue search.
      const table = zeroWaste ? packAllByTable(info, m.types, counts, 100_000 * budget, stop) : undefined;
      const exact =
        table ??
        (zeroWaste && table === undefined
          ? packAllByMerging(info, m.types, counts, 200 + budget * 4, stop, budget > 50 ? this.r : undefined)
          : undefined) ??
        (zeroWaste && m.problem.settings.layout !== "guillotine" && left <= MAX_PERFECT_PIECES
          ? packLayerPerfect(info, m.types, counts, 4000 + budget * 40, stop)
          : undefined);
      const fill =
        exact ??
        packAllByCuts(info, m.types, counts, budget, this.r, stop) ??
        packAllInBlock(info, m.types, counts, budget / 2, this.r, stop);
      if (fill) return fill;
    }
    return undefined;
  }

  /**
   * One greedy pass: block after block, each filled as well as the pass's settings manage; with
   * `fixed`, starting from those fills (their parts and blocks taken).
   */
  private pass(p: PassParams, fixed?: readonly BlockFill[]): BlockFill[] | undefined {
    const m = this.model;
    const remaining = m.types.map((t, i) => (this.typeFitsSomewhere[i] ? t.count : 0));
    let unused = this.blockOrder(p);
    if (fixed) {
      for (const f of fixed) for (const it of f.items) remaining[it.type]!--;
      const taken = new Set(fixed.map((f) => f.block));
      unused = unused.filter((b) => !taken.has(b));
    }
    const fills: BlockFill[] = fixed ? [...fixed] : p.reuse > 0 ? this.reuseFills(p.reuse, remaining, unused) : [];
    const left = (): number => remaining.reduce((s, v) => s + v, 0);
    while (left() > 0 && unused.length > 0) {
      // Out of time: drop this pass (the first one always completes, so a plan exists).
      if (this.outOfTime()) return undefined;
      const cands: number[] = [];
      const classes = new Set<string>();
      for (const b of unused) {
        if (cands.length >= p.candidates) break;
        if (classes.has(m.blocks[b]!.classKey)) continue;
        if (!m.compatible[b]!.some((t) => remaining[t]! > 0)) continue;
        classes.add(m.blocks[b]!.classKey);
        cands.push(b);
      }
      if (cands.length === 0) break;
      let chosen: { fill: BlockFill; rem: number[]; finishes: boolean; value: number } | undefined;
      const useless = new Set<number>();
      for (const b of cands) {
        if (chosen && this.outOfTime()) break;
        const rem = [...remaining];
        const fill = this.fillOne(b, rem, p);
        if (fill.items.length === 0) {
          useless.add(b);
          continue;
        }
        const info = m.blocks[b]!;
        const kept = keptOffcuts(m, fill).reduce((s, o) => s + o.size[0] * o.size[1] * o.size[2], 0);
        const net = Math.max(1e-12, info.cost - (info.cost * kept) / info.volume);
        const finishes = rem.every((v) => v === 0);
        // Finishing fills compete on net cost; others on part volume per unit of net cost.
        const value = finishes ? -net : fill.packedVolume / net;
        if (!chosen || (finishes && !chosen.finishes) || (finishes === chosen.finishes && value > chosen.value))
          chosen = { fill, rem, finishes, value };
      }
      unused = unused.filter((b) => !useless.has(b));
      if (!chosen?.finishes) {
        // Greedy did not finish here: search harder for a packing of everything that is left.
        const finish = this.tryFinish(cands, remaining);
        if (finish) {
          fills.push(finish);
          for (const it of finish.items) remaining[it.type]!--;
          unused = unused.filter((b) => b !== finish.block);
          continue;
        }
      }
      if (!chosen) continue;
      fills.push(chosen.fill);
      for (let i = 0; i < remaining.length; i++) remaining[i] = chosen.rem[i]!;
      unused = unused.filter((b) => b !== chosen.fill.block);
    }
    return fills;
  }
}
