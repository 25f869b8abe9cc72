/**
 * True-shape (irregular) nesting: outlines with holes into a strip of fixed width or a rectangle,
 * without overlap, minimising the length used. Pure: no I/O, no clock or randomness that is not
 * handed in. See lib/nesting/README.md, section "True-shape nesting".
 */
import { runAnytime } from "../anytime";
import { bestPosition } from "./construct";
import type { Snapshot } from "./layout";
import { parseIrregular, type IrregularParseResult } from "./parse";
import { IrregularSearch, type SearchConfig } from "./search";
import { NfpStore } from "./nfp";
import { prepare, type Prepared } from "./shapes";
import type {
  IrregularOptions,
  IrregularPlacement,
  IrregularProblem,
  IrregularSolution,
  IrregularUnplaced,
} from "./types";

export type * from "./types";
export { parseIrregular, type IrregularParseResult, NfpStore };
export { validateIrregular, placedOutlines, intersectionArea, OVERLAP_SHARE } from "./validate";

const DEFAULT_TIME_MS = 10_000;
const DEFAULT_MOVES = 20_000;

/** Options plus tuning knobs of the search (for experiments; the defaults are the measured ones). */
export interface IrregularRunOptions extends IrregularOptions {
  config?: Partial<SearchConfig>;
  /** No-fit polygons shared with other runs of the same items (see NfpStore). */
  nfpStore?: NfpStore;
}

function makeSearch(problem: IrregularProblem, options: IrregularRunOptions): IrregularSearch {
  return new IrregularSearch(prepare(problem), {
    seed: options.seed ?? 1,
    ...(options.now ? { now: options.now } : {}),
    timeLimitMs: options.now ? (options.timeLimitMs ?? DEFAULT_TIME_MS) : Infinity,
    maxMoves: options.maxMoves ?? (options.now ? Infinity : DEFAULT_MOVES),
    ...(options.config ? { config: options.config } : {}),
    ...(options.nfpStore ? { nfpStore: options.nfpStore } : {}),
  });
}

function report(search: IrregularSearch, options: IrregularOptions): void {
  const S = search.prep.scale;
  const { width } = search.prep.problem;
  const bestLength = search.bestLen / S;
  options.onProgress?.({
    fraction: search.fraction(),
    bestLength,
    density: bestLength > 0 ? search.pieceArea / (width * bestLength) : 0,
    targetLength: search.L.len / S,
    phase: search.phase === "done" ? "compress" : search.phase,
  });
}

/**
 * Nests the items of a parsed problem and resolves with the shortest valid layout found when the
 * budget ends (`timeLimitMs` with a clock, else `maxMoves`) or the signal aborts. Yields to the
 * event loop about every 20 ms so progress and abort get through.
 * @example
 * const sol = await nestIrregular(problem, { seed: 1, now: () => performance.now(), timeLimitMs: 5000 });
 * validateIrregular(problem, sol) // → []
 */
export async function nestIrregular(
  problem: IrregularProblem,
  options: IrregularRunOptions = {},
): Promise<IrregularSolution> {
  const search = makeSearch(problem, options);
  await runAnytime(search, options, () => report(search, options));
  return finish(search);
}

/**
 * The same search as `nestIrregular`, without yielding (the signal is still checked between steps).
 * @example const sol = nestIrregularSync(problem, { seed: 2, maxMoves: 2000 });
 */
export function nestIrregularSync(problem: IrregularProblem, options: IrregularRunOptions = {}): IrregularSolution {
  const search = makeSearch(problem, options);
  while (!search.done(options.signal)) {
    search.step();
    if (options.onProgress) report(search, options);
  }
  return finish(search);
}

/**
 * Turns the best layout into placements; in a rectangle, pieces past its end are taken out and
 * put back bottom-left where they fit, else reported unplaced.
 */
function finish(search: IrregularSearch): IrregularSolution {
  const prep = search.prep;
  const { problem } = prep;
  const unplaced: IrregularUnplaced[] = prep.tooWide.map((t) => ({
    item: problem.items[t]!.id,
    count: problem.items[t]!.quantity,
    reason: "wider than the stock in every allowed rotation",
  }));
  const snap = search.best;
  const placedIdx: number[] = [];
  const L = search.L;
  if (snap) {
    L.restore(snap);
    for (let i = 0; i < L.n; i++) placedIdx.push(i);
    if (problem.length !== undefined) {
      const limit = problem.length * prep.scale - L.marginS;
      const out = placedIdx.filter((i) => L.x[i]! + L.wS[L.v[i]!]! > limit);
      if (out.length > 0) {
        for (const i of out) {
          L.bx0[i] = Infinity;
          L.bx1[i] = -Infinity;
          L.by0[i] = Infinity;
          L.by1[i] = -Infinity;
        }
        const keep = placedIdx.filter((i) => !out.includes(i));
        const missing = new Map<number, number>();
        for (const i of out) {
          const p = bestPosition(L, i, keep);
          if (p.x + L.wS[p.v]! <= limit) {
            L.setRaw(i, p.v, p.x, p.y);
            keep.push(i);
          } else missing.set(prep.pieceType[i]!, (missing.get(prep.pieceType[i]!) ?? 0) + 1);
        }
        placedIdx.length = 0;
        placedIdx.push(...keep);
        for (const [t, count] of missing)
          unplaced.push({
            item: problem.items[t]!.id,
            count,
            reason: "does not fit in the stock's length with the others",
          });
      }
    }
  }
  return toSolution(prep, snap ? L.snapshot() : undefined, placedIdx, unplaced, search);
}

function toSolution(
  prep: Prepared,
  snap: Snapshot | undefined,
  placedIdx: readonly number[],
  unplaced: IrregularUnplaced[],
  search: IrregularSearch,
): IrregularSolution {
  const S = prep.scale;
  const { problem } = prep;
  const placements: IrregularPlacement[] = [];
  // Copies are numbered per item in the order they are listed.
  const copies = new Map<number, number>();
  let maxX = 0;
  let area = 0;
  const sorted = [...placedIdx].sort((a, b) => a - b);
  for (const i of sorted) {
    if (!snap) break;
    const vr = prep.variants[snap.v[i]!]!;
    const t = prep.pieceType[i]!;
    const copy = copies.get(t) ?? 0;
    copies.set(t, copy + 1);
    const x = snap.x[i]! / S - vr.bb.minX;
    const y = snap.y[i]! / S - vr.bb.minY;
    placements.push({ item: problem.items[t]!.id, copy, rotation: vr.angle, x, y });
    maxX = Math.max(maxX, x + vr.bb.maxX);
    area += vr.area;
  }
  // Unplaced copies take the numbers after the placed ones (validators count them only).
  const length = placements.length > 0 ? maxX + problem.margin : 0;
  return {
    width: problem.width,
    length,
    density: length > 0 ? area / (problem.width * length) : 0,
    placements,
    unplaced,
    stats: {
      elapsedMs: search.elapsed(),
      firstLength: search.firstLen / S,
      firstMs: search.firstMs,
      evaluations: search.L.evaluations,
      moves: search.moves,
      improvements: search.improvements,
    },
  };
}
