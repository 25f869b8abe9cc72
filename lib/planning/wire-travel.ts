import type { Cut } from "@/lib/nesting";
import { cutRegions, travelAcross, type Box } from "./cut-regions";
import type { Vec3 } from "@/lib/nesting";

/**
 * Wire travel for a block's through cuts (mm) and the time at `feed` mm/min: each cut crosses the
 * piece of foam it splits (see cutRegions), plus entry and exit clearance. Without the pieces the
 * whole block is assumed for every cut, which errs high.
 */
export function cutEstimate(
  size: Vec3,
  cuts: Cut[],
  feed: number,
  clearance = 10,
  opts: { trim?: number; kerf?: number; pieces?: Box[] } = {},
): { lengthMm: number; minutes: number } {
  const regions = cutRegions(size, cuts, opts.trim ?? 0, opts.kerf ?? 0, opts.pieces ?? []);
  const lengthMm = regions.reduce(
    (s, c) => s + (opts.pieces ? travelAcross(c) : c.axis === "z" ? size[0] : size[2]) + 2 * clearance,
    0,
  );
  return { lengthMm, minutes: feed > 0 ? lengthMm / feed : 0 };
}
