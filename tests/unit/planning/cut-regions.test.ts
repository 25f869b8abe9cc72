import { describe, expect, it } from "vitest";
import { cutRegions, stuckPieces, travelAcross } from "@/lib/planning/cut-regions";
import { cutEstimate } from "@/lib/planning/wire-travel";

type V3 = [number, number, number];
const box = (min: V3, max: V3) => ({ min, max });

describe("the piece each through cut crosses", () => {
  // Four 500×500×250 pieces in a 1002×500×502 block: first a cut across the length, then each half is cut across the height.
  const pieces = [
    box([0, 0, 0], [500, 500, 250]),
    box([0, 0, 252], [500, 500, 502]),
    box([502, 0, 0], [1002, 500, 250]),
    box([502, 0, 252], [1002, 500, 502]),
  ];
  const cuts = [
    { axis: "x" as const, at: 500 },
    { axis: "z" as const, at: 250 },
    { axis: "z" as const, at: 250 },
  ];

  it("gives the first cut the whole block and each later cut only its half", () => {
    const r = cutRegions([1002, 500, 502], cuts, 0, 2, pieces);
    expect(r[0]!.region).toEqual(box([0, 0, 0], [1002, 500, 502]));
    const halves = [r[1]!.region, r[2]!.region].map((b) => [b.min[0], b.max[0]]).sort((a, b) => a[0]! - b[0]!);
    expect(halves).toEqual([
      [0, 500],
      [502, 1002],
    ]);
  });

  it("counts wire travel across those pieces, not the whole block", () => {
    const r = cutRegions([1002, 500, 502], cuts, 0, 2, pieces);
    expect(r.map(travelAcross)).toEqual([502, 500, 500]);
    const e = cutEstimate([1002, 500, 502], cuts, 100, 0, { kerf: 2, pieces });
    expect(e.lengthMm).toBe(1502);
    expect(cutEstimate([1002, 500, 502], cuts, 100, 0).lengthMm).toBe(502 + 1002 + 1002);
  });
});

describe("which region each cut of a plan belongs to", () => {
  // Left part: a y cut, then its upper piece split by a z cut; right part: its own z cut at the same
  // height. A 152×100×10 block, kerf 2 — the order the nesting core derives (separate).
  const pieces = [
    box([0, 0, 0], [50, 30, 10]),
    box([0, 32, 0], [50, 100, 4]),
    box([0, 32, 6], [50, 100, 10]),
    box([52, 0, 0], [152, 100, 4]),
    box([52, 0, 6], [152, 100, 10]),
  ];
  const cuts = [
    { axis: "x" as const, at: 50 },
    { axis: "y" as const, at: 30 },
    { axis: "z" as const, at: 4 },
    { axis: "z" as const, at: 4 },
  ];

  it("gives cut 3 the left part's upper piece and cut 4 the right part, as they are made", () => {
    // Replaying cuts by "first region split" gave cut 3 to the right part (it too has pieces on both
    // sides of z = 4), so the sheet numbered the two z cuts the wrong way round.
    const r = cutRegions([152, 100, 10], cuts, 0, 2, pieces);
    expect(r.map((c) => [c.n, c.axis, c.region])).toEqual([
      [1, "x", box([0, 0, 0], [152, 100, 10])],
      [2, "y", box([0, 0, 0], [50, 100, 10])],
      [3, "z", box([0, 32, 0], [50, 100, 10])],
      [4, "z", box([52, 0, 0], [152, 100, 10])],
    ]);
    expect(r.map(travelAcross)).toEqual([10, 10, 50, 100]);
  });

  it("replays a cut list made in another order: each cut takes the first region it splits", () => {
    const other = [
      { axis: "z" as const, at: 4 },
      { axis: "x" as const, at: 50 },
    ];
    const two = [box([0, 0, 0], [50, 100, 4]), box([52, 0, 0], [152, 100, 4]), box([0, 0, 6], [152, 100, 10])];
    const r = cutRegions([152, 100, 10], other, 0, 2, two);
    expect(r.map((c) => c.region)).toEqual([box([0, 0, 0], [152, 100, 10]), box([0, 0, 0], [152, 100, 4])]);
  });
});

describe("pieces no cut can free", () => {
  const at = (block: string, origin: V3, size: V3) => ({ block, origin, size });
  it("counts the five pieces of a pinwheel (the textbook non-guillotine pattern; common knowledge, no source) with a lower middle piece, and none of a stack of slabs", () => {
    // With pieces all as high as each other the pinwheel would be one layer a profile cutter frees.
    const pinwheel = {
      placements: [
        at("B", [0, 0, 0], [20, 10, 10]),
        at("B", [20, 0, 0], [10, 20, 10]),
        at("B", [10, 20, 0], [20, 10, 10]),
        at("B", [0, 10, 0], [10, 20, 10]),
        at("B", [10, 10, 0], [10, 10, 5]),
      ],
      offcuts: [],
    };
    expect(stuckPieces(pinwheel, "B", 0)).toBe(5);
    const slabs = {
      placements: [at("C", [0, 0, 0], [30, 30, 10]), at("C", [0, 0, 12], [30, 30, 10])],
      offcuts: [at("C", [0, 0, 24], [30, 30, 6])],
    };
    expect(stuckPieces(slabs, "C", 2)).toBe(0);
    // Pieces of other blocks are not counted.
    expect(stuckPieces(pinwheel, "C", 0)).toBe(0);
  });
});
