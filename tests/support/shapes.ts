/**
 * Hand-drawn shapes the true-shape tests share, with the figures worked out by hand beside them.
 */
import type { FacePoint } from "@/lib/nesting";
import type { Profile } from "@/lib/profiles/part";

/**
 * An L of legs 120 × 40 and 40 × 90 (hand-drawn), in its box 120 × 90, anticlockwise: two interlock
 * where their boxes cannot. Area 120 × 40 + 40 × 50 = 6,800 mm².
 */
export const L_OUTLINE: FacePoint[] = [
  [0, 0],
  [120, 0],
  [120, 40],
  [40, 40],
  [40, 90],
  [0, 90],
];

/** The L extruded `extrudeMm` along the wire, as a part's profile. */
export const lProfile = (extrudeMm = 60): Profile => ({
  kind: "polygon",
  points: L_OUTLINE.map(([u, v]) => [u, v]),
  extrudeMm,
});
