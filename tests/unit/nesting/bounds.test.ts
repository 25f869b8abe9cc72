import { describe, expect, it } from "vitest";
import { largeItemBound, lowerBoundBlocks, volumeBound } from "@/lib/nesting";
import { problem } from "./helpers";

describe("lower bounds", () => {
  it("volume bound L0 rounds the volume ratio up", () => {
    expect(volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 3 }])).toBe(2);
    expect(volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 2 }])).toBe(1);
    // Kerf inflates both sides: two 5-wide parts and a 1 mm kerf no longer fit one 10-wide bin.
    expect(volumeBound([10, 10, 10], [{ size: [5, 10, 10], rotate: "any", count: 2 }], 1)).toBe(2);
  });

  it("large-item bound counts parts that exceed half the bin on every axis", () => {
    // Three 6-cubes: volume says 1 bin, but no two share a 10-cube.
    expect(volumeBound([10, 10, 10], [{ size: [6, 6, 6], rotate: "any", count: 3 }])).toBe(1);
    expect(largeItemBound([10, 10, 10], [{ size: [6, 6, 6], rotate: "any", count: 3 }])).toBe(3);
    // A 6x6x4 part can lie flat beside another only if rotated; with rotate "none" it is
    // still small on z, so it is not a large item.
    expect(largeItemBound([10, 10, 10], [{ size: [6, 6, 4], rotate: "none", count: 3 }])).toBe(1);
  });

  it("is rotation-aware: a part that may turn is large only if large in every orientation", () => {
    // 12 x 6 x 6 in a 20 x 8 x 8 bin: fixed, it exceeds half on every axis (one per bin);
    // rotated it would not fit other ways anyway, but a 12 x 6 x 3 may stand 3 wide.
    expect(largeItemBound([20, 8, 8], [{ size: [12, 6, 6], rotate: "none", count: 4 }])).toBe(4);
    expect(largeItemBound([20, 8, 8], [{ size: [12, 6, 3], rotate: "any", count: 4 }])).toBeLessThan(4);
  });

  it("uses the trimmed usable box and sums over grades", () => {
    const p = problem({
      settings: { kerf: 0, trim: 5 },
      blocks: [
        { id: "A", size: [110, 110, 110], grade: "g1" },
        { id: "B", size: [110, 110, 110], grade: "g1" },
        { id: "C", size: [110, 110, 110], grade: "g2" },
      ],
      parts: [
        { id: "p", size: [60, 60, 60], quantity: 2, grade: "g1" },
        { id: "q", size: [10, 10, 10], quantity: 1, grade: "g2" },
      ],
    });
    expect(lowerBoundBlocks(p)).toBe(3);
  });
});
