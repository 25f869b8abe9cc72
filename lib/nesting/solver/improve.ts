import { guillotineSplits, type Box } from "../geometry";
import type { Vec3 } from "../types";
import { fitsIn, type BlockFill, type Model, type PackedItem } from "./model";

/** Splits what is left of `f` after a piece `d` at its corner, keeping the largest box whole. */
function splitBiggest(f: Box, d: Vec3): Box[] {
  let best: Box[] = [];
  let bestVol = -1;
  for (const out of guillotineSplits(f, d)) {
    const v = Math.max(0, ...out.map((b) => b.size[0] * b.size[1] * b.size[2]));
    if (v > bestVol) {
      bestVol = v;
      best = out;
    }
  }
  return best;
}

/** A block with more pieces than this is not emptied piece by piece (quadratic in pieces and leftovers). */
const MAX_PIECES_MOVED = 500;

/**
 * Tries to empty the least-filled blocks by moving their pieces into the leftover boxes of the
 * other blocks (each leftover is a region of that block's cut tree, so cuts still separate
 * everything). Returns the improved fills, or the input when no block could be emptied.
 */
export function eliminateBlocks(model: Model, fills: readonly BlockFill[]): BlockFill[] {
  let current = fills.map((f) => ({ ...f, items: [...f.items], leftovers: [...f.leftovers] }));
  for (let round = 0; round < 3 && current.length > 1; round++) {
    const order = [...current].sort((a, b) => a.packedVolume - b.packedVolume);
    let improved = false;
    for (const weak of order.slice(0, 3)) {
      // Piece by piece into the smallest leftover that takes it is slow for thousands of pieces, and
      // hopeless when the leftovers of the others hold less room than the weak block's parts.
      if (weak.items.length > MAX_PIECES_MOVED) continue;
      const room = current.reduce(
        (sum, f) => (f === weak ? sum : f.leftovers.reduce((s, l) => s + l.size[0] * l.size[1] * l.size[2], sum)),
        0,
      );
      if (room < weak.packedVolume) continue;
      const others = current
        .filter((f) => f !== weak)
        .map((f) => ({ ...f, items: [...f.items], leftovers: [...f.leftovers] }));
      const pieces = [...weak.items].sort((a, b) => model.types[b.type]!.volume - model.types[a.type]!.volume);
      let ok = true;
      for (const piece of pieces) {
        let placed = false;
        for (const o of others) {
          if (!model.compatible[o.block]!.includes(piece.type)) continue;
          // Smallest leftover that takes the piece in some orientation.
          let best: { i: number; d: Vec3; vol: number } | undefined;
          o.leftovers.forEach((l, i) => {
            const v = l.size[0] * l.size[1] * l.size[2];
            for (const d of model.types[piece.type]!.dims)
              if (fitsIn(d, l.size) && (!best || v < best.vol)) best = { i, d, vol: v };
          });
          if (!best) continue;
          const l = o.leftovers[best.i]!;
          const item: PackedItem = { type: piece.type, origin: [...l.origin] as Vec3, dims: best.d };
          o.items.push(item);
          o.packedVolume += model.types[piece.type]!.volume;
          o.leftovers.splice(best.i, 1, ...splitBiggest(l, best.d));
          placed = true;
          break;
        }
        if (!placed) {
          ok = false;
          break;
        }
      }
      if (ok) {
        current = others;
        improved = true;
        break;
      }
    }
    if (!improved) break;
  }
  return current.length < fills.length ? current : [...fills];
}
