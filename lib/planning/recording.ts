/**
 * The arithmetic of recording a block at the machine, kept apart from the database: what a block
 * cut partly (some steps done) has become, the defect zones that go with each piece into stock,
 * and how the block's value is shared among the pieces that return to stock. Pure.
 */
import type { Vec3 } from "@/lib/nesting";
import type { Box } from "@/lib/nesting/geometry";
import type { OkProcedure } from "./procedure";

export interface CutState {
  /** Parts that came off in the steps done: the plan's part key and its box (block frame). */
  parts: { part: string; box: Box }[];
  /** Offcuts that came off, by their index among the block's offcuts in the plan. */
  offcuts: { index: number; box: Box }[];
  /** Pieces on their way to a step not done yet: they go back to stock with these true sizes. */
  remainders: { piece: string; step: number; box: Box }[];
  /** The cuts made (block frame), for the loss breakdown. */
  cuts: { axis: "x" | "y" | "z"; at: number }[];
  /** Steps checked off whose piece had not come off an earlier step done: not counted. */
  skipped: number[];
  /** Steps counted. */
  counted: number[];
}

/**
 * What a block has become after the steps `done` of its procedure. A step counts only when its
 * piece exists: the block for step 1, else a piece freed by a counted earlier step. With every
 * step done, the result is the whole plan: all its parts and offcuts and no remainder.
 *
 *   cutState(proc, new Set([1])).remainders  // pieces waiting for step 2, 3 … as stock
 */
export function cutState(proc: OkProcedure, done: ReadonlySet<number>): CutState {
  const out: CutState = { parts: [], offcuts: [], remainders: [], cuts: [], skipped: [], counted: [] };
  // Where each step's piece comes from: the step that freed it (step 1: the block itself).
  const waiting = new Map<number, { piece: string; box: Box }>();
  if (proc.steps[0]) waiting.set(proc.steps[0].n, { piece: proc.steps[0].piece, box: boxOf(proc.steps[0]) });
  for (const step of proc.steps) {
    const here = waiting.get(step.n);
    if (!here || !done.has(step.n)) {
      if (done.has(step.n)) out.skipped.push(step.n);
      continue;
    }
    waiting.delete(step.n);
    out.counted.push(step.n);
    for (const c of step.cuts) out.cuts.push({ axis: c.axis, at: c.at });
    for (const n of step.next) {
      if (n.what.kind === "part") out.parts.push({ part: n.what.part, box: n.box });
      else if (n.what.kind === "offcut") out.offcuts.push({ index: n.what.index, box: n.box });
      else if (n.what.kind === "step") waiting.set(n.what.step, { piece: n.what.piece, box: n.box });
    }
  }
  for (const [step, w] of waiting) out.remainders.push({ piece: w.piece, step, box: w.box });
  out.remainders.sort((a, b) => a.step - b.step);
  return out;
}

const boxOf = (s: { origin: Vec3; size: Vec3 }): Box => ({ origin: [...s.origin], size: [...s.size] });

/**
 * A defect zone clipped to a piece, in the piece's own frame (origin at its low corner), or null
 * when the zone lies outside it.
 *
 *   clipZone({ min: [90, 0, 0], max: [120, 10, 10] }, { origin: [100, 0, 0], size: [50, 50, 50] })
 *   // → { min: [0, 0, 0], max: [20, 10, 10] }
 */
export function clipZone(zone: { min: Vec3; max: Vec3 }, piece: Box): { min: Vec3; max: Vec3 } | null {
  const min = zone.min.map((v, k) => Math.max(v, piece.origin[k]!) - piece.origin[k]!) as Vec3;
  const max = zone.max.map((v, k) => Math.min(v, piece.origin[k]! + piece.size[k]!) - piece.origin[k]!) as Vec3;
  return max.every((v, k) => v > min[k]!) ? { min, max } : null;
}

/**
 * The value of each piece returning to stock: its share of the block's value by volume, to the
 * cent (the rest of the value went into parts, kerf and scrap).
 *
 *   shareValue(100, 1, [[500, 1000, 1000]])  // → [50]
 */
export function shareValue(blockValue: number, blockVolumeM3: number, sizes: readonly Vec3[]): number[] {
  return sizes.map((s) => {
    const v = (s[0] * s[1] * s[2]) / 1e9;
    return blockVolumeM3 > 0 ? Math.round(((blockValue * v) / blockVolumeM3) * 100) / 100 : 0;
  });
}
