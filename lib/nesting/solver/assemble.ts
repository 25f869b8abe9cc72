import { atLeastSorted, orientations, separate, type Box } from "../geometry";
import type { Offcut, Placement, Plan, Unplaced, Vec3 } from "../types";
import { fitsIn, type BlockFill, type Model } from "./model";

/** Leftover boxes of a fill that are worth keeping, in real (not kerf-grown) sizes. */
export function keptOffcuts(model: Model, fill: BlockFill): Box[] {
  const k = model.kerf;
  const min = model.problem.settings.minOffcut;
  const out: Box[] = [];
  for (const l of fill.leftovers) {
    const size = l.size.map((v) => v - k) as Vec3;
    if (size.every((v) => v > 1e-9) && atLeastSorted(size, min)) out.push({ origin: [...l.origin] as Vec3, size });
  }
  return out;
}

function unplacedReason(model: Model, type: number): string {
  const t = model.types[type]!;
  const part = model.problem.parts[type]!;
  const gradeText = t.grade === undefined ? "" : ` of grade ${t.grade}`;
  const blocks = model.blocks.filter((b) => t.grade === undefined || b.grade === t.grade);
  if (blocks.length === 0) return `no block${gradeText}`;
  const anyFits = blocks.some((b) =>
    orientations(part.size, part.rotate).some((o) => fitsIn(o.map((v) => v + model.kerf) as Vec3, b.usable.size)),
  );
  if (!anyFits) return `larger than the usable box of every block${gradeText}`;
  return `not enough room left in the blocks${gradeText}`;
}

/** Turns the packer's fills into a plan in the format's frame (real sizes, ordered cuts). */
export function assemblePlan(
  model: Model,
  fills: readonly BlockFill[],
  elapsedMs: number,
  lowerBoundBlocks: number,
): Plan {
  const k = model.kerf;
  const placements: Placement[] = [];
  const offcuts: Offcut[] = [];
  const cuts: Plan["cuts"] = {};
  const placed = new Array<number>(model.types.length).fill(0);
  let partVolume = 0;
  let stockVolume = 0;
  let offcutVolume = 0;
  const mode = model.problem.settings.layout === "guillotine" ? "guillotine" : "layers";
  for (const fill of fills) {
    if (fill.items.length === 0) continue;
    const block = model.blocks[fill.block]!;
    stockVolume += block.volume;
    const pieces: Box[] = [];
    for (const it of fill.items) {
      const size = it.dims.map((v) => v - k) as Vec3;
      placements.push({ part: model.types[it.type]!.id, block: block.id, origin: [...it.origin] as Vec3, size });
      pieces.push({ origin: it.origin, size });
      placed[it.type]!++;
      partVolume += model.types[it.type]!.volume;
    }
    for (const oc of keptOffcuts(model, fill)) {
      offcuts.push({ block: block.id, origin: oc.origin, size: oc.size });
      pieces.push(oc);
      offcutVolume += oc.size[0] * oc.size[1] * oc.size[2];
    }
    cuts[block.id] = separate(pieces, k, mode).cuts;
  }
  const unplaced: Unplaced[] = [];
  model.types.forEach((t, i) => {
    const missing = t.count - placed[i]!;
    if (missing > 0) unplaced.push({ part: t.id, count: missing, reason: unplacedReason(model, i) });
  });
  const net = stockVolume - offcutVolume;
  return {
    version: 1,
    placements,
    unplaced,
    offcuts,
    cuts,
    stats: {
      blocksUsed: fills.filter((f) => f.items.length > 0).length,
      partVolume,
      stockVolume,
      offcutVolume,
      yield: net > 0 ? partVolume / net : 0,
      elapsedMs,
      lowerBoundBlocks,
    },
  };
}
