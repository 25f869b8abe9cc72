import { describe, expect, it } from "vitest";
import { atLeastSorted, grow, isLayer, orientations, overlaps, separate } from "@/lib/nesting/geometry";

describe("geometry", () => {
  it("lists the orientations each rotate rule allows", () => {
    expect(orientations([1, 2, 3], "none")).toEqual([[1, 2, 3]]);
    expect(orientations([1, 2, 3], "z")).toEqual([[1, 2, 3], [2, 1, 3]]);
    expect(orientations([1, 2, 3], "any")).toHaveLength(6);
    expect(orientations([2, 2, 2], "any")).toHaveLength(1);
    expect(orientations([1, 1, 3], "any")).toHaveLength(3);
  });

  it("treats touching boxes as not overlapping and a sliver of overlap as overlapping", () => {
    const a = { origin: [0, 0, 0] as [number, number, number], size: [10, 10, 10] as [number, number, number] };
    expect(overlaps(a, { origin: [10, 0, 0], size: [5, 5, 5] })).toBe(false);
    expect(overlaps(a, { origin: [9.9, 0, 0], size: [5, 5, 5] })).toBe(true);
    expect(grow(a, 1)).toEqual({ origin: [-1, -1, -1], size: [12, 12, 12] });
  });

  it("compares offcut sizes sorted, smallest to smallest", () => {
    expect(atLeastSorted([25, 300, 150], [150, 150, 25])).toBe(true);
    expect(atLeastSorted([24, 300, 150], [150, 150, 25])).toBe(false);
    expect(atLeastSorted([100, 100, 100], [150, 150, 25])).toBe(false);
  });

  it("finds through cuts between pieces a kerf apart and refuses a pinwheel", () => {
    const b = (o: [number, number, number], s: [number, number, number]) => ({ origin: o, size: s });
    const two = [b([0, 0, 0], [10, 10, 10]), b([11, 0, 0], [10, 10, 10])];
    expect(separate(two, 1, "guillotine")).toEqual({ cuts: [{ axis: "x", at: 10 }], stuck: [] });
    expect(separate(two, 2, "guillotine").stuck).toHaveLength(1);
    // Four boards around a hole: no through cut separates them.
    const pinwheel = [b([0, 0, 0], [20, 10, 5]), b([20, 0, 0], [10, 20, 5]), b([10, 20, 0], [20, 10, 5]), b([0, 10, 0], [10, 20, 5])];
    expect(separate(pinwheel, 0, "guillotine").stuck).toHaveLength(1);
    // The same boards all span z = [0, 5]: one layer, fine for "layers".
    expect(isLayer(pinwheel, [0, 1, 2, 3])).toBe(true);
    expect(separate(pinwheel, 0, "layers").stuck).toHaveLength(0);
  });
});
