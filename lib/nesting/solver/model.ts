import { orientations, type Box } from "../geometry";
import type { Problem, Vec3 } from "../types";

/** One part line of the problem, as the packer sees it: sizes inflated by the kerf. */
export interface ItemType {
  index: number;
  id: string;
  grade?: string;
  count: number;
  /** Real volume of one piece. */
  volume: number;
  /** Allowed orientations, each side grown by the kerf. */
  dims: Vec3[];
  /** Smallest inflated side over orientations. */
  minSide: number;
  maxSide: number;
}

/** One block in the packer's frame: the usable box and defect obstacles, grown by the kerf. */
export interface BlockInfo {
  index: number;
  id: string;
  grade?: string;
  cost: number;
  /** Volume of the whole block (what a plan consumes). */
  volume: number;
  offcut: boolean;
  usable: Box;
  obstacles: Box[];
  /** Blocks with equal keys are interchangeable. */
  classKey: string;
}

export interface Model {
  problem: Problem;
  kerf: number;
  types: ItemType[];
  blocks: BlockInfo[];
  /** compatible[b] = indices of the types that may go into block b (grade match). */
  compatible: number[][];
}

/**
 * Builds the packer's model. Inflating every part and the usable box by the kerf turns "kerf
 * apart" into "touching": a piece at `o` with inflated size `s + k` really spans [o, o + s].
 * A defect zone [a, b] (grown by the margin) blocks [a, b + k) so pieces end a kerf before it.
 */
export function buildModel(problem: Problem): Model {
  const k = problem.settings.kerf;
  const m = problem.settings.defectMargin;
  const types: ItemType[] = problem.parts.map((p, index) => {
    const dims = orientations(p.size, p.rotate).map((o) => o.map((v) => v + k) as Vec3);
    return {
      index,
      id: p.id,
      ...(p.grade !== undefined ? { grade: p.grade } : {}),
      count: p.quantity,
      volume: p.size[0] * p.size[1] * p.size[2],
      dims,
      minSide: Math.min(...p.size) + k,
      maxSide: Math.max(...p.size) + k,
    };
  });
  const blocks: BlockInfo[] = problem.blocks.map((b, index) => {
    const t = b.trim;
    const usable: Box = { origin: [t, t, t], size: b.size.map((v) => v - 2 * t + k) as Vec3 };
    const obstacles: Box[] = b.defects.map((d) => {
      const lo = d.min.map((v) => v - m) as Vec3;
      const hi = d.max.map((v) => v + m + k) as Vec3;
      return { origin: lo, size: [hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]] };
    });
    const classKey = JSON.stringify([
      b.size,
      t,
      b.grade ?? null,
      b.cost,
      b.offcut,
      b.defects.map((d) => [d.min, d.max]),
    ]);
    return {
      index,
      id: b.id,
      ...(b.grade !== undefined ? { grade: b.grade } : {}),
      cost: b.cost,
      volume: b.size[0] * b.size[1] * b.size[2],
      offcut: b.offcut,
      usable,
      obstacles,
      classKey,
    };
  });
  const compatible = blocks.map((b) =>
    types.filter((t) => t.grade === undefined || t.grade === b.grade).map((t) => t.index),
  );
  return { problem, kerf: k, types, blocks, compatible };
}

export const fitsIn = (d: Vec3, s: Vec3): boolean => d[0] <= s[0] + 1e-9 && d[1] <= s[1] + 1e-9 && d[2] <= s[2] + 1e-9;

/** A packed piece in the packer's (inflated) frame. */
export interface PackedItem {
  type: number;
  origin: Vec3;
  dims: Vec3;
}

/** An n0 × n1 × n2 grid of identical pieces of type `type`, size `d`, from `origin`. */
export function gridItems(type: number, origin: Vec3, d: Vec3, n: Vec3): PackedItem[] {
  const out: PackedItem[] = [];
  for (let i = 0; i < n[0]; i++)
    for (let j = 0; j < n[1]; j++)
      for (let l = 0; l < n[2]; l++)
        out.push({ type, origin: [origin[0] + i * d[0], origin[1] + j * d[1], origin[2] + l * d[2]], dims: d });
  return out;
}

/** What one block holds after filling: pieces, and leftover boxes (disjoint, cut-separable). */
export interface BlockFill {
  block: number;
  items: PackedItem[];
  leftovers: Box[];
  packedVolume: number;
}
