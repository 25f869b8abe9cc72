/**
 * The arithmetic of recording a block at the machine, kept apart from the database: what a block
 * cut partly (some steps done) has become, the defect zones that go with each piece into stock,
 * and how the block's value is shared among the pieces that return to stock. Pure.
 */
import type { Vec3 } from "@/lib/nesting";
import type { Box } from "@/lib/nesting/geometry";
import type { OkProcedure } from "./procedure";
import { partIdFromKey } from "./problem";
import { countByPart, type SlabIndex } from "./slabs";

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

/** A reject as the form or a checked-off step gives it. */
export interface Reject {
  jobPartId: number;
  count: number;
  reason: string;
}

/**
 * How many pieces of each job part a list of plan part keys holds ("jp-7" is job part 7); a slab's
 * key ("slab-1", a true-shape plan) counts its members, from `slabs` (`slabIndex(plan)`).
 *
 *   countParts(["jp-7", "jp-7", "jp-9"])  // → Map { 7 → 2, 9 → 1 }
 */
export function countParts(keys: readonly string[], slabs: SlabIndex = {}): Map<number, number> {
  return countByPart(keys, slabs);
}

/**
 * Rejects checked against what came off a block, in the order given (the steps' rejects, then the
 * form's): an entry for a part that did not come off, or one taking the rejects of a part past what
 * came off, is a problem under `<field>.jobPartId` or `<field>.count`; the others add up per part
 * with their reasons. `placed` (the plan's pieces in the block) tells "not cut from this block"
 * from "not come off in the steps done".
 *
 *   tallyRejects([{ reject: { jobPartId: 7, count: 3, reason: "void" }, field: "rejects.0" }], new Map([[7, 2]]), new Map([[7, 2]]))
 *   // → { rejects: Map {}, fields: { "rejects.0.count": "Only 2 of that part came off this block." } }
 */
export function tallyRejects(
  entries: readonly { reject: Reject; field: string }[],
  cameOff: ReadonlyMap<number, number>,
  placed: ReadonlyMap<number, number>,
): { rejects: Map<number, { count: number; reasons: string[] }>; fields: Record<string, string> } {
  const rejects = new Map<number, { count: number; reasons: string[] }>();
  const fields: Record<string, string> = {};
  for (const { reject: r, field } of entries) {
    const came = cameOff.get(r.jobPartId) ?? 0;
    const already = rejects.get(r.jobPartId)?.count ?? 0;
    if (!came)
      fields[`${field}.jobPartId`] = placed.get(r.jobPartId)
        ? "That part has not come off this block in the steps done."
        : "That part is not cut from this block.";
    else if (already + r.count > came) fields[`${field}.count`] = `Only ${came} of that part came off this block.`;
    else
      rejects.set(r.jobPartId, {
        count: already + r.count,
        reasons: [...(rejects.get(r.jobPartId)?.reasons ?? []), r.reason],
      });
  }
  return { rejects, fields };
}

/**
 * The sizes of the rejected pieces: for each part, its first `count` pieces in the order they came
 * off (they count as rejects in the loss breakdown, not as parts made). Slabs must be expanded to
 * their members first (`memberPieces` in ./slabs).
 *
 *   rejectedSizes([{ part: "jp-7", box: b1 }, { part: "jp-7", box: b2 }], new Map([[7, { count: 1 }]]))  // → [b1.size]
 */
export function rejectedSizes(
  parts: readonly { part: string; box: Box }[],
  rejects: ReadonlyMap<number, { count: number }>,
): Vec3[] {
  const sizes: Vec3[] = [];
  const remaining = new Map([...rejects].map(([k, v]) => [k, v.count]));
  for (const p of parts) {
    const id = partIdFromKey(p.part);
    if ((remaining.get(id) ?? 0) > 0) {
      sizes.push(p.box.size);
      remaining.set(id, remaining.get(id)! - 1);
    }
  }
  return sizes;
}

/**
 * One job part's line of a recording: good = came off less rejected; not cut = placed in the block
 * but not come off (owed again); its volume on the true volume where the part has a profile, else
 * on its box ("basis"), m³.
 *
 *   partLine({ size: [100, 100, 100], trueVolumeMm3: null }, { placed: 3, came: 2, rejected: 1 })
 *   // → { good: 1, rejected: 1, notCut: 1, basis: "box", eachM3: 0.001, volumeM3: 0.001 }
 */
export function partLine(
  part: { size: Vec3; trueVolumeMm3: number | null },
  n: { placed: number; came: number; rejected: number },
): { good: number; rejected: number; notCut: number; basis: "profile" | "box"; eachM3: number; volumeM3: number } {
  const good = n.came - n.rejected;
  const basis = part.trueVolumeMm3 !== null ? "profile" : "box";
  const eachM3 =
    part.trueVolumeMm3 !== null ? part.trueVolumeMm3 / 1e9 : (part.size[0] * part.size[1] * part.size[2]) / 1e9;
  return { good, rejected: n.rejected, notCut: n.placed - n.came, basis, eachM3, volumeM3: eachM3 * good };
}

/**
 * The volume basis of a block's recording: "profile" or "box" when all its parts agree, else "mixed"
 * ("box" with no parts).
 *
 *   volumeBasis(["box", "profile"])  // → "mixed"
 */
export function volumeBasis(bases: readonly string[]): string {
  const set = new Set(bases);
  return set.size > 1 ? "mixed" : ([...set][0] ?? "box");
}
