/**
 * Checks an irregular layout against its problem, from the outlines alone (not from the search's
 * no-fit polygons): counts, allowed rotations, containment in the strip or rectangle (with the
 * margin), overlaps (intersection area by Clipper2 at most 1e-6 of the smaller piece, the
 * benchmark's rule), kerf spacing (edge-to-edge distance) and the reported length and density.
 * Tests and the benchmark check the same layouts once more with another library.
 */
import { Clipper, FillRule, type Path64 } from "@countertype/clipper2-ts";
import { bboxOf, type BBox, loopDistance, outlineArea, rotateLoop } from "./geometry";
import type { IrregularProblem, IrregularSolution, Pt } from "./types";

/** Largest overlap allowed, as a share of the smaller piece's area. */
export const OVERLAP_SHARE = 1e-6;

export interface PlacedOutline {
  label: string;
  loops: Pt[][];
  bb: BBox;
  area: number;
}

/**
 * The outlines of a layout where they lie (outer loop first, then holes).
 * @example placedOutlines(problem, solution)[0].loops[0] // the first piece's outer loop, placed
 */
export function placedOutlines(problem: IrregularProblem, sol: IrregularSolution): PlacedOutline[] {
  const byId = new Map(problem.items.map((it) => [it.id, it]));
  const out: PlacedOutline[] = [];
  for (const p of sol.placements) {
    const it = byId.get(p.item);
    if (!it) continue;
    const loops = [it.outer, ...it.holes].map((l) =>
      rotateLoop(l, p.rotation).map(([x, y]) => [x + p.x, y + p.y] as Pt),
    );
    out.push({ label: `${p.item}#${p.copy}`, loops, bb: bboxOf([loops[0]!]), area: outlineArea(it.outer, it.holes) });
  }
  return out;
}

/**
 * Area of the intersection of two placed outlines (Clipper64 in a local frame scaled to 2^30).
 * @example intersectionArea(a, b) // → 0 for outlines that only touch
 */
export function intersectionArea(a: PlacedOutline, b: PlacedOutline): number {
  const x0 = Math.min(a.bb.minX, b.bb.minX);
  const y0 = Math.min(a.bb.minY, b.bb.minY);
  const ext = Math.max(a.bb.maxX, b.bb.maxX) - x0 + Math.max(a.bb.maxY, b.bb.maxY) - y0;
  const s = 2 ** Math.floor(Math.log2(2 ** 30 / Math.max(ext, 1e-300)));
  const toPaths = (loops: Pt[][]): Path64[] =>
    loops.map((l) => l.map(([x, y]) => ({ x: Math.round((x - x0) * s), y: Math.round((y - y0) * s) })));
  const inter = Clipper.intersect(toPaths(a.loops), toPaths(b.loops), FillRule.EvenOdd);
  return Math.abs(Clipper.areaPaths(inter)) / (s * s);
}

/**
 * Every broken rule of a layout, as readable lines ([] when valid).
 * @example validateIrregular(problem, await nestIrregular(problem)) // → []
 */
export function validateIrregular(problem: IrregularProblem, sol: IrregularSolution): string[] {
  const errs: string[] = [];
  const byId = new Map(problem.items.map((it) => [it.id, it]));
  const placedCount = new Map<string, number>();
  const seen = new Set<string>();
  for (const [k, p] of sol.placements.entries()) {
    const it = byId.get(p.item);
    if (!it) {
      errs.push(`placements[${k}]: unknown item "${p.item}"`);
      continue;
    }
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) errs.push(`placements[${k}]: position must be finite`);
    if (!Number.isInteger(p.copy) || p.copy < 0 || p.copy >= it.quantity)
      errs.push(`placements[${k}]: copy ${p.copy} of "${p.item}" does not exist`);
    const key = `${p.item}#${p.copy}`;
    if (seen.has(key)) errs.push(`placements[${k}]: ${key} is placed twice`);
    seen.add(key);
    placedCount.set(p.item, (placedCount.get(p.item) ?? 0) + 1);
    const rot = ((p.rotation % 360) + 360) % 360;
    if (!it.rotations.some((r) => Math.abs(r - rot) < 1e-9 || Math.abs(r - rot) > 360 - 1e-9))
      errs.push(`placements[${k}]: ${key} turned ${p.rotation}°, allowed ${it.rotations.join(", ")}`);
  }
  const unplacedCount = new Map<string, number>();
  for (const u of sol.unplaced) {
    if (!byId.has(u.item)) errs.push(`unplaced: unknown item "${u.item}"`);
    unplacedCount.set(u.item, (unplacedCount.get(u.item) ?? 0) + u.count);
  }
  for (const it of problem.items) {
    const got = (placedCount.get(it.id) ?? 0) + (unplacedCount.get(it.id) ?? 0);
    if (got !== it.quantity) errs.push(`item "${it.id}": ${got} placed or unplaced, quantity ${it.quantity}`);
  }
  const outs = placedOutlines(problem, sol);
  let maxX = 0;
  let maxDim = 0;
  for (const o of outs) {
    maxX = Math.max(maxX, o.bb.maxX);
    maxDim = Math.max(maxDim, o.bb.maxX - o.bb.minX, o.bb.maxY - o.bb.minY);
  }
  const { width, margin, kerf } = problem;
  const tol = 1e-9 * Math.max(width, maxX, maxDim, 1e-9);
  for (const o of outs) {
    if (o.bb.minX < margin - tol || o.bb.minY < margin - tol || o.bb.maxY > width - margin + tol)
      errs.push(
        `${o.label}: outside the strip (box ${fmt(o.bb.minX)}..${fmt(o.bb.maxX)} × ${fmt(o.bb.minY)}..${fmt(o.bb.maxY)}, width ${width}, margin ${margin})`,
      );
    if (problem.length !== undefined && o.bb.maxX > problem.length - margin + tol)
      errs.push(`${o.label}: past the end of the ${problem.length} long stock (to x = ${fmt(o.bb.maxX)})`);
  }
  const used = outs.length > 0 ? maxX + margin : 0;
  if (Math.abs(sol.length - used) > tol) errs.push(`length: reported ${sol.length}, the outlines reach ${used}`);
  const area = outs.reduce((s, o) => s + o.area, 0);
  const density = used > 0 ? area / (width * used) : 0;
  if (Math.abs(sol.density - density) > 1e-6) errs.push(`density: reported ${sol.density}, computed ${density}`);
  const order = outs.map((_, i) => i).sort((a, b) => outs[a]!.bb.minX - outs[b]!.bb.minX);
  for (let a = 0; a < order.length; a++) {
    const A = outs[order[a]!]!;
    for (let b = a + 1; b < order.length; b++) {
      const B = outs[order[b]!]!;
      if (B.bb.minX >= A.bb.maxX + kerf) break;
      if (B.bb.minY >= A.bb.maxY + kerf || A.bb.minY >= B.bb.maxY + kerf || B.bb.maxX <= A.bb.minX - kerf) continue;
      const inter = intersectionArea(A, B);
      const limit = OVERLAP_SHARE * Math.min(A.area, B.area);
      if (inter > limit) {
        errs.push(
          `${A.label} and ${B.label} overlap (area ${fmt(inter)}, ${fmt(inter / Math.min(A.area, B.area))} of the smaller)`,
        );
        continue;
      }
      if (kerf > 0) {
        let d = Infinity;
        for (const la of A.loops) for (const lb of B.loops) d = Math.min(d, loopDistance(la, lb));
        if (d < kerf * (1 - 1e-6) - tol) errs.push(`${A.label} and ${B.label} are ${fmt(d)} apart, kerf ${kerf}`);
      }
    }
  }
  return errs;
}

const fmt = (v: number): string => String(Number(v.toPrecision(8)));
