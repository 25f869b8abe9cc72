/**
 * How one free box is split around a piece put in its corner, and the axis orders for growing grids of
 * like pieces: shared by the guillotine filler and the box-first filler (kept apart from both so
 * neither imports the other).
 */
import { CUT_ORDERS, splitInOrder, type Box } from "../geometry";
import type { Rng } from "../rng";
import type { Vec3 } from "../types";

export type SplitRule = "biggest" | "squares" | "random" | "column";

/**
 * Splits what is left of `f` after a box of size `g` at its origin into three cut-separable boxes,
 * in the cut order `rule` prefers: the biggest box kept whole, the most even boxes ("squares"), a
 * random order, or "column": across the piece's thinnest side last, so what is left beyond it keeps
 * the piece's footprint (a column for a stack of like pieces) and the strips beside it run the whole
 * length of the box (room for pieces turned the other way).
 */
export function split(f: Box, g: Vec3, rule: SplitRule, r: Rng): Box[] {
  const thin = g[0] <= g[1] && g[0] <= g[2] ? 0 : g[1] <= g[2] ? 1 : 2;
  const fs = f.size;
  let bestOrder = -1;
  let bestScore = -Infinity;
  // Score each order from the volumes alone; build the boxes of the chosen one only.
  for (let k = 0; k < CUT_ORDERS.length; k++) {
    const order = CUT_ORDERS[k]!;
    if (rule === "column" && order[2] !== thin) continue;
    const ext = [fs[0], fs[1], fs[2]];
    let biggest = 0;
    let squares = 0;
    for (const a of order) {
      const rest = fs[a]! - g[a]!;
      if (rest > 1e-9) {
        const v = (a === 0 ? rest : ext[0]!) * (a === 1 ? rest : ext[1]!) * (a === 2 ? rest : ext[2]!);
        if (v > biggest) biggest = v;
        squares += v * v;
      }
      ext[a] = g[a]!;
    }
    const score = rule === "biggest" || rule === "column" ? biggest : rule === "squares" ? squares : r();
    if (score > bestScore) {
      bestScore = score;
      bestOrder = k;
    }
  }
  return splitInOrder(f, g, CUT_ORDERS[bestOrder]!);
}

/** Axis orders for growing a grid of identical copies (first axis filled first). */
export const GRID_ORDERS: readonly (readonly [number, number, number])[] = [
  [0, 1, 2],
  [1, 0, 2],
  [2, 0, 1],
  [0, 2, 1],
  [1, 2, 0],
  [2, 1, 0],
];
