/** Types of the nesting problem and plan, format v1 (see ../shared/nesting-format.md). */

export type Vec3 = [number, number, number];
export type Axis = "x" | "y" | "z";
export type Layout = "guillotine" | "layers" | "free";
export type Rotate = "any" | "z" | "none";

export interface Settings {
  kerf: number;
  trim: number;
  defectMargin: number;
  minOffcut: Vec3;
  layout: Layout;
  timeLimitMs: number;
}

export interface Defect {
  id?: string;
  min: Vec3;
  max: Vec3;
}

export interface Block {
  id: string;
  size: Vec3;
  grade?: string;
  /** Cost of using this block; defaults to its volume in m³. */
  cost: number;
  offcut: boolean;
  /** Face trim of this block; defaults to settings.trim for raw blocks, 0 for offcuts. */
  trim: number;
  defects: Defect[];
}

export interface Part {
  id: string;
  size: Vec3;
  quantity: number;
  grade?: string;
  rotate: Rotate;
}

/** A problem with every default filled in (what `parseProblem` returns). */
export interface Problem {
  version: 1;
  settings: Settings;
  blocks: Block[];
  parts: Part[];
}

export interface Placement {
  part: string;
  block: string;
  origin: Vec3;
  size: Vec3;
}

export interface Unplaced {
  part: string;
  count: number;
  reason: string;
}

export interface Offcut {
  block: string;
  origin: Vec3;
  size: Vec3;
}

export interface Cut {
  axis: Axis;
  at: number;
}

export interface PlanStats {
  blocksUsed: number;
  partVolume: number;
  stockVolume: number;
  offcutVolume: number;
  yield: number;
  elapsedMs: number;
  lowerBoundBlocks: number;
}

export interface Plan {
  version: 1;
  placements: Placement[];
  unplaced: Unplaced[];
  offcuts: Offcut[];
  cuts: Record<string, Cut[]>;
  stats: PlanStats;
}

export interface Progress {
  /** Share of the time (or iteration) budget used, 0..1. */
  fraction: number;
  best: {
    placedVolume: number;
    blocksUsed: number;
    yield: number;
    unplacedCount: number;
    lowerBoundBlocks: number;
  };
}

export interface NestOptions {
  signal?: AbortSignal;
  onProgress?: (p: Progress) => void;
  /** Seed of the search's random choices; same seed, same budget → same plan. */
  seed?: number;
  /** Clock in ms (e.g. performance.now). Without it the search is bounded by `iterations` only. */
  now?: () => number;
  /** Upper bound on improvement iterations (default 400 without a clock, unbounded with one). */
  iterations?: number;
  /** A previous valid plan for this problem (e.g. before a block was added); the search starts from it. */
  warmStart?: Plan;
}

export const AXES: readonly Axis[] = ["x", "y", "z"];
