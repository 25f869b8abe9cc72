import type { Cut } from "@/lib/nesting";
import { AXIS_NAMES, separate } from "@/lib/nesting/geometry";
import type { Vec3 } from "@/lib/nesting";

type V3 = Vec3;
export interface Box {
  min: V3;
  max: V3;
}
export interface RegionCut extends Cut {
  n: number;
  region: Box;
}

const AX = { x: 0, y: 1, z: 2 } as const;

/**
 * The piece of foam each of a block's through cuts crosses: a cut splits the region that holds
 * pieces on both sides of it. The wire travels only across that region, which is what the plan
 * view draws and what the cut-time estimate counts.
 *
 * Cuts a plan made from its pieces (the nesting core derives them by `separate`) are followed
 * through that same recursion, so each cut gets exactly its region, in n log n; other cut lists
 * are replayed in order, each cut given the first region it splits.
 *
 *   cutRegions([1000, 500, 500], [{ axis: "x", at: 400 }], 0, 2, [])[0].region  // the whole block
 */
export function cutRegions(size: V3, cuts: Cut[], trim: number, kerf: number, pieces: Box[]): RegionCut[] {
  const block: Box = { min: [trim, trim, trim], max: [size[0] - trim, size[1] - trim, size[2] - trim] };
  return regionsBySeparation(block, cuts, kerf, pieces) ?? regionsByReplay(block, cuts, kerf, pieces);
}

const copy = (b: Box): Box => ({ min: [...b.min], max: [...b.max] });

/** The regions of `separate`'s own cuts, or undefined when they are not the cuts given. */
function regionsBySeparation(block: Box, cuts: Cut[], kerf: number, pieces: Box[]): RegionCut[] | undefined {
  if (cuts.length === 0 || pieces.length < 2) return undefined;
  const regionOf = new Map<readonly number[], Box>();
  const out: RegionCut[] = [];
  const boxes = pieces.map((p) => ({ origin: p.min, size: p.max.map((v, i) => v - p.min[i]!) as V3 }));
  separate(boxes, kerf, "layers", (parent, a, groups, at) => {
    const region = regionOf.get(parent) ?? block;
    let lo = region.min[a]!;
    groups.forEach((g, j) => {
      const sub = copy(region);
      sub.min[a] = lo;
      if (j < at.length) {
        sub.max[a] = at[j]!;
        const crossed = copy(region);
        crossed.min[a] = lo;
        out.push({ axis: AXIS_NAMES[a]!, at: at[j]!, n: out.length + 1, region: crossed });
        lo = Math.min(region.max[a]!, at[j]! + kerf);
      }
      regionOf.set(g, sub);
    });
  });
  const same =
    out.length === cuts.length && out.every((c, i) => c.axis === cuts[i]!.axis && Math.abs(c.at - cuts[i]!.at) <= 1e-6);
  return same ? out : undefined;
}

/** Cuts in order, each splitting the first region with pieces on both sides of it (else the first it crosses). */
function regionsByReplay(block: Box, cuts: Cut[], kerf: number, pieces: Box[]): RegionCut[] {
  const eps = 1e-6;
  const inside = (p: Box, r: Box) =>
    p.min.every((v, i) => v >= r.min[i]! - eps) && p.max.every((v, i) => v <= r.max[i]! + eps);
  // Each region keeps the pieces inside it, so a cut looks only at its own region's pieces.
  let regions: { box: Box; held: Box[] }[] = [{ box: block, held: pieces.filter((p) => inside(p, block)) }];
  return cuts.map((cut, i) => {
    const a = AX[cut.axis];
    const crosses = regions.filter((r) => r.box.min[a]! < cut.at + eps && cut.at < r.box.max[a]! - eps);
    const splitting = crosses.find(
      (r) => r.held.some((p) => p.max[a]! <= cut.at + eps) && r.held.some((p) => p.min[a]! >= cut.at + kerf - eps),
    );
    const region = splitting ?? crosses[0] ?? regions[0]!;
    const lower = copy(region.box);
    const upper = copy(region.box);
    lower.max[a] = cut.at;
    upper.min[a] = Math.min(region.box.max[a]!, cut.at + kerf);
    regions = regions
      .filter((r) => r !== region)
      .concat([lower, upper].map((box) => ({ box, held: region.held.filter((p) => inside(p, box)) })));
    return { ...cut, n: i + 1, region: region.box };
  });
}

/** The distance the wire feeds through a region for a cut on `axis` (x and y cuts feed down the height; z cuts along the length). */
export function travelAcross(cut: RegionCut): number {
  const ext = (i: number) => cut.region.max[i]! - cut.region.min[i]!;
  return cut.axis === "z" ? ext(0) : ext(2);
}

/** The pieces of a plan: placed parts and kept offcuts, each in a block. */
type PlanPieces = {
  placements: { block: string; origin: V3; size: V3 }[];
  offcuts: { block: string; origin: V3; size: V3 }[];
};

const inBlock = (plan: PlanPieces, blockId: string) =>
  [...plan.placements, ...plan.offcuts].filter((p) => p.block === blockId);

/** The pieces (placements and offcuts) a plan puts in one block, as boxes. */
export function piecesOf(plan: PlanPieces, blockId: string): Box[] {
  return inBlock(plan, blockId).map((p) => ({ min: p.origin, max: p.origin.map((v, i) => v + p.size[i]!) as V3 }));
}

/**
 * How many pieces of a block (parts and offcuts) neither through cuts nor a profile cutter in a
 * layer can free — not zero only for plans made with the free layout rule, which is for
 * comparison with box-packing results and not cuttable in general.
 *
 *   // a pinwheel: four oblong pieces around a lower square one
 *   stuckPieces(pinwheelPlan, "B", 0)  // → 5
 */
export function stuckPieces(plan: PlanPieces, blockId: string, kerf: number): number {
  return separate(inBlock(plan, blockId), kerf, "layers").stuck.reduce((n, group) => n + group.length, 0);
}
