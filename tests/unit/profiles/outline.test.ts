/** Outer loops with holes: the checks and the area (hand-worked: square frames). */
import { describe, expect, it } from "vitest";
import { checkOutline, outlineArea, partGeometry, type Point } from "@/lib/profiles";
import { polygonProfileSchema } from "@/lib/validations/jobs";

const square = (side: number, at: Point = [0, 0]): Point[] => [
  [at[0], at[1]],
  [at[0] + side, at[1]],
  [at[0] + side, at[1] + side],
  [at[0], at[1] + side],
];

describe("outline with holes", () => {
  it("a 100 mm square frame with a 60 mm window has 100² − 60² mm² of foam", () => {
    expect(checkOutline(square(100), [square(60, [20, 20])])).toBeNull();
    expect(outlineArea(square(100), [square(60, [20, 20])])).toBe(6400);
    const g = partGeometry({ kind: "polygon", points: square(100), holes: [square(60, [20, 20])], extrudeMm: 10 });
    expect(g.trueVolumeMm3).toBe(64_000);
    expect(g.size).toEqual([10, 100, 100]);
  });

  it("names the hole that lies outside, crosses the outer loop or sits in another hole", () => {
    expect(checkOutline(square(100), [square(10, [200, 200])])).toBe("Hole 1 is not inside the outer loop.");
    expect(checkOutline(square(100), [square(10, [20, 20]), square(50, [95, 10])])).toBe(
      "Hole 2 crosses or touches the outer loop.",
    );
    expect(checkOutline(square(100), [square(60, [20, 20]), square(10, [30, 30])])).toBe(
      "Holes 1 and 2 lie one inside the other.",
    );
    expect(
      checkOutline(square(100), [
        [
          [10, 10],
          [20, 20],
          [30, 30],
        ],
      ]),
    ).toMatch(/^Hole 1: The points enclose no area/);
  });

  it("the part schema refuses a bad hole on the holes field and changes nothing else", () => {
    const r = polygonProfileSchema.safeParse({
      kind: "polygon",
      points: square(100),
      holes: [square(10, [200, 200])],
      extrudeMm: 5,
    });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual(["holes"]);
    expect(polygonProfileSchema.safeParse({ kind: "polygon", points: square(100), extrudeMm: 5 }).success).toBe(true);
  });
});
