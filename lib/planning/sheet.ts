import type { Cut } from "@/lib/nesting";
import type { Vec3 } from "@/lib/nesting";

type V3 = Vec3;

/** One line of a cut sheet's parts table: a part in one orientation, how many, and where. */
export interface PartLine {
  part: string;
  size: V3;
  count: number;
  origins: V3[];
}

/**
 * A block's placements grouped by part and orientation, in the order they first appear, so a
 * block of 4,000 inserts reads as a few lines rather than 4,000.
 *
 *   groupPlacements([{ part: "a", origin: [0,0,0], size: [1,2,3] }, { part: "a", origin: [2,0,0], size: [1,2,3] }])
 *   // → [{ part: "a", size: [1,2,3], count: 2, origins: [[0,0,0], [2,0,0]] }]
 */
export function groupPlacements(placements: readonly { part: string; origin: V3; size: V3 }[]): PartLine[] {
  const lines = new Map<string, PartLine>();
  for (const p of placements) {
    const key = `${p.part}|${p.size.map((v) => Math.round(v * 1000)).join("x")}`;
    const line = lines.get(key);
    if (line) {
      line.count++;
      line.origins.push(p.origin);
    } else lines.set(key, { part: p.part, size: p.size, count: 1, origins: [p.origin] });
  }
  return [...lines.values()];
}

/** Consecutive cuts across one axis at one spacing: cuts `from`..`to` (1-based), kerf starting at `first`, then every `step` mm (0: the same place in each piece). */
export interface CutRun {
  from: number;
  to: number;
  axis: Cut["axis"];
  first: number;
  last: number;
  step: number;
}

/**
 * A block's through cuts with runs of at least `minRun` cuts across the same axis at an even
 * spacing (to 0.01 mm) taken together, as a cutter sets a fence once and repeats; spacing 0 is the
 * same cut through several pieces one after another. Every cut stays in the order given; a line
 * of one cut has `from` = `to` (and step 0).
 *
 *   cutRuns([{ axis: "x", at: 10 }, { axis: "x", at: 22 }, { axis: "x", at: 34 }, { axis: "z", at: 5 }])
 *   // → [{ from: 1, to: 3, axis: "x", first: 10, last: 34, step: 12 }, { from: 4, to: 4, axis: "z", first: 5, last: 5, step: 0 }]
 */
export function cutRuns(cuts: readonly Cut[], minRun = 3): CutRun[] {
  const out: CutRun[] = [];
  let i = 0;
  while (i < cuts.length) {
    let j = i + 1;
    if (j < cuts.length && cuts[j]!.axis === cuts[i]!.axis) {
      const step = cuts[j]!.at - cuts[i]!.at;
      while (
        j + 1 < cuts.length &&
        cuts[j + 1]!.axis === cuts[i]!.axis &&
        Math.abs(cuts[j + 1]!.at - cuts[j]!.at - step) <= 0.01
      )
        j++;
      if (step >= 0 && j - i + 1 >= minRun) {
        out.push({ from: i + 1, to: j + 1, axis: cuts[i]!.axis, first: cuts[i]!.at, last: cuts[j]!.at, step });
        i = j + 1;
        continue;
      }
    }
    out.push({ from: i + 1, to: i + 1, axis: cuts[i]!.axis, first: cuts[i]!.at, last: cuts[i]!.at, step: 0 });
    i++;
  }
  return out;
}
