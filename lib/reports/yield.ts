/**
 * Material yield, as the trade reckons it (../shared/domain-brief.md §7, common practice):
 * part volume ÷ (stock issued − usable offcuts returned). Any one unit, as long as it is the same.
 *
 *   materialYield(2000, 3072)  // 0.651: 2,000 BF of parts from one 3,072 BF block
 */
export function materialYield(partVolume: number, issued: number, offcutReturned = 0): number | null {
  const net = issued - offcutReturned;
  if (!(net > 0)) return null;
  return partVolume / net;
}

/** Which volume a figure was measured on: a part's true profile, its bounding box, or both. */
export type VolumeBasis = "profile" | "box" | "mixed";

/** Combines the bases of several figures: "mixed" as soon as they differ. */
export function combineBasis(bases: readonly (string | null | undefined)[]): VolumeBasis | null {
  const seen = new Set(bases.filter((b): b is string => b === "profile" || b === "box" || b === "mixed"));
  if (seen.size === 0) return null;
  if (seen.size === 1) return [...seen][0] as VolumeBasis;
  return "mixed";
}

export const BASIS_LABEL: Record<VolumeBasis, string> = {
  profile: "true part volume (profile)",
  box: "bounding box (no profile)",
  mixed: "mixed: profile where one exists, else bounding box",
};
