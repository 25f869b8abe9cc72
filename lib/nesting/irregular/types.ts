/** Types of the 2D irregular (true-shape) nesting engine: outlines into a strip or a rectangle. */

/** A point `[x, y]` in the problem's own units. */
export type Pt = [number, number];

export interface IrregularItem {
  id: string;
  /** Outer loop, vertices in order (either direction), not repeated at the end. */
  outer: Pt[];
  /** Holes inside the outer loop (each a simple loop); parts may be nested into them. */
  holes: Pt[][];
  quantity: number;
  /** Rotations a copy may take, degrees counter-clockwise about the item's own origin. No mirroring. */
  rotations: number[];
}

export interface IrregularProblem {
  /** The fixed width of the strip (its y extent): pieces lie in 0 ≤ y ≤ width. */
  width: number;
  /** The length of a rectangle (x extent) when the stock is finite; absent for an open strip. */
  length?: number;
  /** Spacing between parts (the wire's kerf); each outline is grown by kerf/2 against the others. */
  kerf: number;
  /** Distance kept from the stock's edges (0 lets outlines touch them). */
  margin: number;
  items: IrregularItem[];
}

/** One placed copy: its outline rotated by `rotation` about the item's origin, then moved by (x, y). */
export interface IrregularPlacement {
  item: string;
  copy: number;
  rotation: number;
  x: number;
  y: number;
}

export interface IrregularUnplaced {
  item: string;
  count: number;
  reason: string;
}

export interface IrregularSolution {
  width: number;
  /** Largest x of any placed outline (the strip length used). */
  length: number;
  /** Area of the placed outlines (holes subtracted) ÷ (width × length). */
  density: number;
  placements: IrregularPlacement[];
  unplaced: IrregularUnplaced[];
  stats: IrregularStats;
}

export interface IrregularStats {
  elapsedMs: number;
  /** Length of the first (constructive) solution. */
  firstLength: number;
  /** Time the first solution took, ms (0 without a clock). */
  firstMs?: number;
  /** Overlap evaluations of one piece at one position. */
  evaluations: number;
  /** Pieces moved by the overlap-minimisation phase. */
  moves: number;
  /** Times a shorter valid layout was found after the first one. */
  improvements: number;
}

export interface IrregularProgress {
  /** Share of the budget used, 0..1. */
  fraction: number;
  /** Length of the best valid layout so far. */
  bestLength: number;
  density: number;
  /** Length the search is trying to reach now. */
  targetLength: number;
  phase: "construct" | "explore" | "compress";
}

export interface IrregularOptions {
  /** Seed of the search's random choices; same seed and same move budget → same layout. */
  seed?: number;
  /** Clock in ms (e.g. performance.now); without it only `maxMoves` bounds the search. */
  now?: () => number;
  /** Time budget in ms, measured with `now` (default 10,000). */
  timeLimitMs?: number;
  /** Upper bound on piece moves of the improvement phase (default 20,000 without a clock, unbounded with one). */
  maxMoves?: number;
  signal?: AbortSignal;
  onProgress?: (p: IrregularProgress) => void;
}
