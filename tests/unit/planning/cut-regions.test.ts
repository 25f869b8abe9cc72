import { describe, expect, it } from "vitest";
import { cutRegions, travelAcross } from "@/lib/planning/cut-regions";
import { cutEstimate } from "@/lib/planning/gcode";

type V3 = [number, number, number];
const box = (min: V3, max: V3) => ({ min, max });

describe("the piece each through cut crosses", () => {
  // Four 500×500×250 pieces in a 1002×500×502 block: first a cut across the length, then each half is cut across the height.
  const pieces = [box([0, 0, 0], [500, 500, 250]), box([0, 0, 252], [500, 500, 502]), box([502, 0, 0], [1002, 500, 250]), box([502, 0, 252], [1002, 500, 502])];
  const cuts = [{ axis: "x" as const, at: 500 }, { axis: "z" as const, at: 250 }, { axis: "z" as const, at: 250 }];

  it("gives the first cut the whole block and each later cut only its half", () => {
    const r = cutRegions([1002, 500, 502], cuts, 0, 2, pieces);
    expect(r[0]!.region).toEqual(box([0, 0, 0], [1002, 500, 502]));
    const halves = [r[1]!.region, r[2]!.region].map((b) => [b.min[0], b.max[0]]).sort((a, b) => a[0]! - b[0]!);
    expect(halves).toEqual([[0, 500], [502, 1002]]);
  });

  it("counts wire travel across those pieces, not the whole block", () => {
    const r = cutRegions([1002, 500, 502], cuts, 0, 2, pieces);
    expect(r.map(travelAcross)).toEqual([502, 500, 500]);
    const e = cutEstimate([1002, 500, 502], cuts, 100, 0, { kerf: 2, pieces });
    expect(e.lengthMm).toBe(1502);
    expect(cutEstimate([1002, 500, 502], cuts, 100, 0).lengthMm).toBe(502 + 1002 + 1002);
  });
});
