/**
 * The anytime driver: a bottom-left construction gives the first valid layout; then the strip is
 * shortened step by step and the overlaps this causes are removed by guided local search
 * (`separate.ts`). A success is the new best; a failure first gives half the step back (twice),
 * then restores the best, swaps two pieces and tries again, with a smaller step after two
 * failures. The last part of the budget uses small steps only (compression).
 * @example const s = new IrregularSearch(prepare(problem), { seed: 1, timeLimitMs: Infinity, maxMoves: 5000 }); while (!s.done()) s.step();
 */
import { rng, type Rng } from "../rng";
import { park, placeBottomLeft } from "./construct";
import { Layout, type Snapshot } from "./layout";
import { NfpCache, type NfpStore } from "./nfp";
import { type Ctx, DEFAULT_SEPARATE, type SeparateConfig, Separator, shrinkTo } from "./separate";
import type { Prepared } from "./shapes";

export interface SearchOptions {
  seed: number;
  now?: () => number;
  timeLimitMs: number;
  maxMoves: number;
  /** Tuning knobs (defaults: DEFAULT_CONFIG, the measured ones). */
  config?: Partial<SearchConfig>;
  /** No-fit polygons shared with other runs (see NfpStore). */
  nfpStore?: NfpStore;
}

export interface SearchConfig extends SeparateConfig {
  /** First shrink step, as a share of the length. */
  shrinkStart: number;
  /** Smallest shrink step while exploring. */
  shrinkMin: number;
  /** Share of the budget spent exploring before compression. */
  exploreShare: number;
  /** Step during compression. */
  compressStep: number;
  /** For experiments: a budget in overlap evaluations instead of time (0 = none). */
  maxEvaluations: number;
  /** Pairs of larger pieces weigh more (see Layout.sizeWeights). */
  sizeWeights: boolean;
  /** Before a retry after a failed attempt, swap two pieces of different items in the best layout. */
  disrupt: boolean;
  /**
   * After a failed attempt, how many times to go halfway back towards the best length from the
   * least-overlapping state reached (instead of starting afresh from the best layout).
   */
  relax: number;
}

export const DEFAULT_CONFIG: SearchConfig = {
  ...DEFAULT_SEPARATE,
  shrinkStart: 0.03,
  shrinkMin: 0.004,
  exploreShare: 0.8,
  compressStep: 0.001,
  maxEvaluations: 0,
  sizeWeights: true,
  disrupt: true,
  relax: 2,
};

export type Phase = "construct" | "explore" | "compress" | "done";

export class IrregularSearch {
  readonly L: Layout;
  readonly nfps: NfpCache;
  readonly rand: Rng;
  readonly cfg: SearchConfig;
  phase: Phase = "construct";
  best: Snapshot | undefined;
  /** Used length (scaled) of the best layout. */
  bestLen = Infinity;
  firstLen = Infinity;
  /** Time the construction took (ms, 0 without a clock). */
  firstMs = 0;
  improvements = 0;
  /** Total area of the pieces (problem units). */
  readonly pieceArea: number;
  /** No layout is shorter (scaled): the widest piece at its narrowest, or the area over the width. */
  readonly lowerBound: number;
  private sep: Separator | undefined;
  private step_ = 0;
  private readonly t0: number;
  private readonly ctx: Ctx;
  private failures = 0;
  private relaxLeft = 0;
  attempts = 0;
  successes = 0;

  constructor(
    readonly prep: Prepared,
    readonly opts: SearchOptions,
  ) {
    this.nfps = new NfpCache(prep.variants, prep.typeShape, opts.nfpStore);
    this.L = new Layout(prep, this.nfps);
    this.rand = rng(opts.seed);
    this.cfg = { ...DEFAULT_CONFIG, ...opts.config };
    this.L.sizeWeights(this.cfg.sizeWeights);
    this.L.resetWeights();
    this.t0 = opts.now?.() ?? 0;
    this.ctx = { rand: this.rand, stop: () => this.outOfBudget(), moves: 0 };
    this.step_ = this.cfg.shrinkStart;
    this.pieceArea = prep.pieceType.reduce((s, t) => s + prep.variants[prep.variantsOf[t]![0]!]!.area, 0);
    const { width, margin } = prep.problem;
    let widest = 0;
    for (const t of new Set(prep.pieceType))
      widest = Math.max(widest, Math.min(...prep.variantsOf[t]!.map((v) => prep.variants[v]!.w)));
    this.lowerBound = (2 * margin + Math.max(widest, this.pieceArea / (width - 2 * margin))) * prep.scale;
  }

  get moves(): number {
    return this.ctx.moves;
  }

  elapsed(): number {
    return this.opts.now ? this.opts.now() - this.t0 : 0;
  }

  /** Share of the budget used. */
  fraction(): number {
    const t = this.opts.now ? this.elapsed() / this.opts.timeLimitMs : 0;
    const m = Number.isFinite(this.opts.maxMoves) ? this.ctx.moves / this.opts.maxMoves : 0;
    const e = this.cfg.maxEvaluations > 0 ? this.L.evaluations / this.cfg.maxEvaluations : 0;
    return Math.min(1, Math.max(t, m, e));
  }

  outOfBudget(): boolean {
    return this.fraction() >= 1;
  }

  done(signal?: AbortSignal): boolean {
    if (this.phase === "done") return true;
    if (this.best && this.bestLen <= this.lowerBound * (1 + 1e-12) + 2) {
      this.phase = "done";
      return true;
    }
    if (this.best && (signal?.aborted || this.outOfBudget())) {
      this.phase = "done";
      return true;
    }
    return false;
  }

  /** One unit of work: the construction, or one pass of overlap removal. */
  step(): void {
    const L = this.L;
    if (this.phase === "construct") {
      const order = Array.from({ length: L.n }, (_, i) => i);
      const area = (i: number) => this.prep.variants[this.prep.variantsOf[this.prep.pieceType[i]!]![0]!]!.area;
      order.sort((a, b) => area(b) - area(a) || a - b);
      park(L, order);
      placeBottomLeft(L, order);
      L.len = L.usedLength();
      this.accept();
      this.firstLen = this.bestLen;
      this.firstMs = this.elapsed();
      this.phase = L.n > 1 ? "explore" : "done";
      return;
    }
    if (this.phase === "done") return;
    if (!this.sep) {
      if (this.phase === "explore" && this.fraction() >= this.cfg.exploreShare) this.phase = "compress";
      const r = this.phase === "compress" ? this.cfg.compressStep * (0.5 + this.rand()) : this.step_;
      L.restore(this.best!);
      L.len = this.bestLen;
      L.resetWeights();
      if (this.cfg.disrupt && this.failures > 0) this.swapTwo();
      shrinkTo(L, Math.floor(this.bestLen * (1 - r)), this.rand);
      this.sep = new Separator(L, this.ctx, this.cfg);
      this.relaxLeft = this.cfg.relax;
      this.attempts++;
      // An attempt counts as a move, so even attempts that move nothing use up a move budget.
      this.ctx.moves++;
    }
    let s = this.sep.pass();
    if (s === "running") return;
    this.sep = undefined;
    // Pieces wider than the target stick out of it: that is no success.
    if (s === "feasible" && L.usedLength() > L.len) s = "failed";
    if (s === "feasible") {
      this.successes++;
      this.accept();
      this.failures = 0;
    } else {
      const mid = Math.floor((L.len + this.bestLen) / 2);
      if (this.relaxLeft > 0 && this.bestLen - mid > this.bestLen * 1e-4) {
        // Nearly there: give the overlapping layout half the step back and keep separating.
        this.relaxLeft--;
        L.len = mid;
        L.refreshAll();
        this.sep = new Separator(L, this.ctx, this.cfg);
        return;
      }
      this.failures++;
      if (this.phase === "explore" && this.failures >= 2) {
        this.step_ = Math.max(this.cfg.shrinkMin, this.step_ * 0.7);
        this.failures = 0;
      }
    }
  }

  /**
   * Swaps two pieces of different items (each keeps its rotation, placed at the other's lower-left
   * corner, clamped into the strip): a disruption that lets a retry start from another layout.
   */
  private swapTwo(): void {
    const L = this.L;
    const types = this.prep.pieceType;
    for (let tries = 0; tries < 20; tries++) {
      const a = Math.floor(this.rand() * L.n);
      const b = Math.floor(this.rand() * L.n);
      if (types[a] === types[b]) continue;
      const ax = L.x[a]!;
      const ay = L.y[a]!;
      const va = L.v[a]!;
      const vb = L.v[b]!;
      const cl = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
      L.setRaw(a, va, cl(L.x[b]!, L.xLo[va]!, L.xHi(va)), cl(L.y[b]!, L.yLo[va]!, L.yHi[va]!));
      L.setRaw(b, vb, cl(ax, L.xLo[vb]!, L.xHi(vb)), cl(ay, L.yLo[vb]!, L.yHi[vb]!));
      L.refreshAll();
      return;
    }
  }

  private accept(): void {
    const L = this.L;
    const used = L.usedLength();
    if (used < this.bestLen || !this.best) {
      if (this.best) this.improvements++;
      this.bestLen = used;
      this.best = L.snapshot();
      this.best.len = used;
    }
  }
}
