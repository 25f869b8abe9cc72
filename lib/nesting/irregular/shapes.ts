/**
 * Turns the problem's outlines into the integer shapes the search works on: one variant per item
 * and allowed rotation, scaled by a power of two and rounded (Clipper64 needs integers), grown by
 * kerf/2 so that shapes that do not overlap are at least a kerf apart.
 *
 * Precision: the scale S = 2^k is the largest with (largest piece extent + kerf) · S ≤ 2^29, so
 * every no-fit polygon stays below 2^30 in magnitude (Clipper's exact products need differences
 * under 2^32). Rounding moves a vertex by at most 1/(2S) — about 1e-9 of the largest piece.
 */
import { Clipper, EndType, JoinType, type Path64 } from "@countertype/clipper2-ts";
import { bboxOf, outlineArea, rotateLoop, signedArea, type BBox } from "./geometry";
import type { IrregularProblem, Pt } from "./types";

/** One item in one rotation. Positions in the search are the scaled coordinates of its bounding box's lower-left corner. */
export interface Variant {
  index: number;
  type: number;
  angle: number;
  /** The true outline in this rotation (outer then holes), problem units. */
  loops: Pt[][];
  bb: BBox;
  /** Width and height of the true outline's box, problem units. */
  w: number;
  h: number;
  /** Scaled, rounded, kerf-grown loops relative to `bb`'s lower-left corner: outers counter-clockwise, holes clockwise. */
  shape: Path64[];
  /** When the angle is a multiple of 90°: shape = rotate(typeShape, angle) − (ox, oy) exactly. */
  grid: boolean;
  ox: number;
  oy: number;
  /** Box of `shape` (scaled). */
  sMinX: number;
  sMinY: number;
  sMaxX: number;
  sMaxY: number;
  area: number;
}

export interface Prepared {
  problem: IrregularProblem;
  scale: number;
  variants: Variant[];
  /** Variant indices per item type (rotations giving the same shape appear once). */
  variantsOf: number[][];
  /** Item type of each piece (copies expanded). */
  pieceType: number[];
  pieceCopy: number[];
  /** Item types no rotation of which fits the strip's width. */
  tooWide: number[];
  /** Per item type: its scaled, rounded, kerf-grown loops in the item's own frame (no rotation). */
  typeShape: Path64[][];
}

/**
 * A point rotated by a multiple of 90° (exact on integers).
 * @example rot90(2, 1, 1) // → { x: -1, y: 2 }
 */
export function rot90(x: number, y: number, quarter: number): { x: number; y: number } {
  switch (((quarter % 4) + 4) % 4) {
    case 0:
      return { x, y };
    case 1:
      return { x: -y + 0, y: x };
    case 2:
      return { x: -x + 0, y: -y + 0 };
    default:
      return { x: y, y: -x + 0 };
  }
}

/**
 * Quarter turns of an angle that is a multiple of 90°, else undefined.
 * @example quarterTurns(270) // → 3
 */
export function quarterTurns(deg: number): number | undefined {
  const d = ((deg % 360) + 360) % 360;
  return d % 90 === 0 ? d / 90 : undefined;
}

/**
 * Prepares the variants and pieces of a (parsed) problem.
 * @example const prep = prepare(problem); prep.variants.length // items × distinct rotations
 */
export function prepare(problem: IrregularProblem): Prepared {
  const { kerf, margin, width } = problem;
  let maxDim = 0;
  for (const it of problem.items) {
    for (const r of it.rotations) {
      const b = bboxOf([rotateLoop(it.outer, r)]);
      maxDim = Math.max(maxDim, b.maxX - b.minX, b.maxY - b.minY);
    }
  }
  maxDim += kerf + 1e-9;
  const scale = 2 ** Math.floor(Math.log2(2 ** 29 / maxDim));
  const half = (kerf / 2) * scale;
  const variants: Variant[] = [];
  const variantsOf: number[][] = [];
  const tooWide: number[] = [];
  const typeShape: Path64[][] = [];
  // Mitred offsets (squared past twice the offset) contain the round one: spacing is exactly the
  // kerf along edges and a little more off convex corners. 4 units more cover the rounding of the
  // offset's vertices and the overlap tolerance, so two pieces are never closer than the kerf.
  const grow = (shape: Path64[]): Path64[] =>
    half > 0 ? Clipper.inflatePaths(shape, half + 4, JoinType.Miter, EndType.Polygon, 2) : shape;
  const intLoops = (loops: readonly Pt[][], dx: number, dy: number): Path64[] =>
    loops.map((l, k) => {
      const p = l.map(([x, y]) => ({ x: Math.round((x - dx) * scale), y: Math.round((y - dy) * scale) }));
      const pos = signedArea(l) > 0;
      return (k === 0) === pos ? p : p.reverse();
    });
  problem.items.forEach((it, type) => {
    const base = grow(intLoops([it.outer, ...it.holes], 0, 0));
    typeShape.push(base);
    const seen = new Map<string, number>();
    const list: number[] = [];
    for (const angle of it.rotations) {
      const loops = [it.outer, ...it.holes].map((l) => rotateLoop(l, angle));
      const bb = bboxOf([loops[0]!]);
      const w = bb.maxX - bb.minX;
      const h = bb.maxY - bb.minY;
      if (h > width - 2 * margin + 1e-12) continue;
      const q = quarterTurns(angle);
      const ox = Math.round(bb.minX * scale);
      const oy = Math.round(bb.minY * scale);
      const shape: Path64[] =
        q === undefined
          ? grow(intLoops(loops, bb.minX, bb.minY))
          : base.map((l) =>
              l.map((p) => {
                const r = rot90(p.x, p.y, q);
                return { x: r.x - ox, y: r.y - oy };
              }),
            );
      const key = shape.map((p) => canonical(p)).join("|");
      if (seen.has(key)) continue;
      let sMinX = Infinity;
      let sMinY = Infinity;
      let sMaxX = -Infinity;
      let sMaxY = -Infinity;
      for (const p of shape)
        for (const pt of p) {
          sMinX = Math.min(sMinX, pt.x);
          sMinY = Math.min(sMinY, pt.y);
          sMaxX = Math.max(sMaxX, pt.x);
          sMaxY = Math.max(sMaxY, pt.y);
        }
      const v: Variant = {
        index: variants.length,
        type,
        angle,
        loops,
        bb,
        w,
        h,
        shape,
        grid: q !== undefined,
        ox,
        oy,
        sMinX,
        sMinY,
        sMaxX,
        sMaxY,
        area: outlineArea(it.outer, it.holes),
      };
      seen.set(key, v.index);
      variants.push(v);
      list.push(v.index);
    }
    if (list.length === 0) tooWide.push(type);
    variantsOf.push(list);
  });
  const pieceType: number[] = [];
  const pieceCopy: number[] = [];
  problem.items.forEach((it, type) => {
    if (variantsOf[type]!.length === 0) return;
    for (let c = 0; c < it.quantity; c++) {
      pieceType.push(type);
      pieceCopy.push(c);
    }
  });
  return { problem, scale, variants, variantsOf, pieceType, pieceCopy, tooWide, typeShape };
}

/** A loop written from its smallest vertex, so equal loops give equal strings. */
function canonical(p: Path64): string {
  let k = 0;
  for (let i = 1; i < p.length; i++) if (p[i]!.x < p[k]!.x || (p[i]!.x === p[k]!.x && p[i]!.y < p[k]!.y)) k = i;
  const out: string[] = [];
  for (let i = 0; i < p.length; i++) {
    const q = p[(k + i) % p.length]!;
    out.push(`${q.x},${q.y}`);
  }
  return out.join(";");
}
