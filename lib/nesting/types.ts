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
  /**
   * Optional (absent: false). Profile parts (those with an `outline`) are nested by their outlines
   * in the faces of slabs, and each slab enters the block nesting as one box (see README, "Slabs of
   * true-shape nested profiles").
   */
  trueShape?: boolean;
  /**
   * Optional (absent: no limit but the blocks). The largest slab the profile cutter takes,
   * [thickness along the wire, face u (across), face v (up)] in mm: every true-shape slab is at
   * most this (its face as the cutter sees it: u across, v up; the slab is not turned on the cutter).
   */
  slabMax?: Vec3;
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
  /** Optional: the part's profile in its y–z face (for `settings.trueShape`); absent: a plain box part. */
  outline?: PartOutline;
}

/** A point `[u, v]` in a part's or a slab's face, mm. */
export type FacePoint = [number, number];

/**
 * A profile part's section(s) in its box's y–z face: u along the box's y, v along its z, from the
 * box's corner (x is along the wire). `tip`: the other end's section of a tapered (4-axis) part.
 */
export interface PartOutline {
  outer: FacePoint[];
  holes?: FacePoint[][];
  tip?: { outer: FacePoint[]; holes?: FacePoint[][] };
}

/** The faces of a slab a lead-in may start from (never the bottom: a horizontal wire cannot come up through the table). */
export type LeadInFace = "left" | "right" | "top";

/** A profile part in a slab's face: its outline turned by `rotation` (degrees anticlockwise) and moved by `at`. */
export interface SlabMember {
  part: string;
  rotation: number;
  at: FacePoint;
  /**
   * The lead-in corridor: a straight slot, kerf wide, from `face` perpendicular to the point `to`
   * on the wire's path round the part. With `via` (optional) the member is entered through an
   * earlier member's kerf instead: the wire comes in by that member's own lead-in, runs along its
   * (already cut) path to `from`, then crosses the waste on a straight bridge, kerf wide, from
   * `from` to `to`; `face` is then the face the chain starts from.
   */
  leadIn: LeadIn;
}

/** A member's lead-in: from a slab face, or (with `via` and `from`) chained through an earlier member's kerf. */
export interface LeadIn {
  face: LeadInFace;
  to: FacePoint;
  /** Index (in `members`) of the earlier member whose cut path the wire follows to the bridge. */
  via?: number;
  /** The bridge's start on that member's wire path. */
  from?: FacePoint;
}

/** A slab of true-shape nested profile parts, carried by the placement of its box. */
export interface SlabLayout {
  /** The slab's box before the placement turns it: [thickness along the wire, face u extent, face v extent]. */
  size: Vec3;
  grade?: string;
  rotate: Rotate;
  members: SlabMember[];
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
  /** Optional: this placement is a slab of true-shape nested profile parts (`part` is then the slab's own id). */
  slab?: SlabLayout;
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
  /** 1, or 2 when a placement is a slab (`placements[i].slab`): a v1 reader would see a part id that is not in the problem. */
  version: 1 | 2;
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
