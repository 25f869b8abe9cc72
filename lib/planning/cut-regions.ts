import type { Cut } from "@/lib/nesting";
import { separate } from "@/lib/nesting/geometry";

type V3 = [number, number, number];
export interface Box { min: V3; max: V3 }
export interface RegionCut extends Cut { n: number; region: Box }

const AX = { x: 0, y: 1, z: 2 } as const;

/**
 * Replays a block's through cuts in order to find the piece of foam each one crosses: a cut
 * splits the region that holds pieces on both sides of it. The wire travels only across that
 * region, which is what the plan view draws and what the cut-time estimate counts.
 *
 *   cutRegions([1000, 500, 500], [{ axis: "x", at: 400 }], 0, 2, [])[0].region  // the whole block
 */
export function cutRegions(size: V3, cuts: Cut[], trim: number, kerf: number, pieces: Box[]): RegionCut[] {
  let regions: Box[] = [{ min: [trim, trim, trim], max: [size[0] - trim, size[1] - trim, size[2] - trim] }];
  const eps = 1e-6;
  const inside = (p: Box, r: Box) => p.min.every((v, i) => v >= r.min[i]! - eps) && p.max.every((v, i) => v <= r.max[i]! + eps);
  return cuts.map((cut, i) => {
    const a = AX[cut.axis];
    const crosses = regions.filter((r) => r.min[a]! < cut.at + eps && cut.at < r.max[a]! - eps);
    const splitting = crosses.find((r) => {
      const held = pieces.filter((p) => inside(p, r));
      return held.some((p) => p.max[a]! <= cut.at + eps) && held.some((p) => p.min[a]! >= cut.at + kerf - eps);
    });
    const region = splitting ?? crosses[0] ?? regions[0]!;
    const lower: Box = { min: [...region.min], max: [...region.max] };
    const upper: Box = { min: [...region.min], max: [...region.max] };
    lower.max[a] = cut.at;
    upper.min[a] = Math.min(region.max[a]!, cut.at + kerf);
    regions = regions.filter((r) => r !== region).concat([lower, upper]);
    return { ...cut, n: i + 1, region };
  });
}

/** The distance the wire feeds through a region for a cut on `axis` (x and y cuts feed down the height; z cuts along the length). */
export function travelAcross(cut: RegionCut): number {
  const ext = (i: number) => cut.region.max[i]! - cut.region.min[i]!;
  return cut.axis === "z" ? ext(0) : ext(2);
}

/** The pieces of a plan: placed parts and kept offcuts, each in a block. */
type PlanPieces = { placements: { block: string; origin: V3; size: V3 }[]; offcuts: { block: string; origin: V3; size: V3 }[] };

const inBlock = (plan: PlanPieces, blockId: string) => [...plan.placements, ...plan.offcuts].filter((p) => p.block === blockId);

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
