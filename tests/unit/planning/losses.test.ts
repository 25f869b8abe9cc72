import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { lossBreakdown } from "@/lib/planning/losses";

const sum = (l: ReturnType<typeof lossBreakdown>) =>
  l.goodBlanks + l.rejects + l.offcuts + l.trim + l.kerf + l.defect + l.unusable;

describe("where a block's volume goes", () => {
  it("splits a trimmed block with two slabs, one offcut and a defect", () => {
    const l = lossBreakdown({
      size: [1012, 1012, 1012],
      trim: 6,
      kerf: 2,
      cuts: [{ axis: "z", at: 500 + 6 }],
      blanks: [[1000, 1000, 500]],
      rejected: [],
      offcuts: [{ origin: [6, 6, 508], size: [1000, 1000, 498] }],
      defects: [],
    });
    expect(l.trim).toBeCloseTo((1012 ** 3 - 1000 ** 3) / 1e9, 9);
    expect(l.kerf).toBeCloseTo((2 * 1000 * 1000) / 1e9, 9);
    expect(l.unusable).toBeCloseTo(0, 9);
    expect(sum(l)).toBeCloseTo(l.block, 12);
  });

  it("counts a defect kept inside an offcut as offcut, not as a loss", () => {
    const base = {
      size: [1000, 1000, 1000] as [number, number, number],
      trim: 0,
      kerf: 0,
      cuts: [],
      blanks: [[1000, 1000, 400]] as [number, number, number][],
      rejected: [],
      offcuts: [
        { origin: [0, 0, 400] as [number, number, number], size: [1000, 1000, 600] as [number, number, number] },
      ],
    };
    expect(lossBreakdown({ ...base, defects: [{ min: [100, 100, 500], max: [200, 200, 600] }] }).defect).toBe(0);
    expect(
      lossBreakdown({ ...base, offcuts: [], defects: [{ min: [100, 100, 500], max: [200, 200, 600] }] }).defect,
    ).toBeCloseTo(0.001, 9);
  });

  it("always adds up to the block, whatever the inputs", () => {
    fc.assert(
      fc.property(
        fc.tuple(
          fc.integer({ min: 100, max: 3000 }),
          fc.integer({ min: 100, max: 3000 }),
          fc.integer({ min: 100, max: 3000 }),
        ),
        fc.integer({ min: 0, max: 20 }),
        fc.array(fc.constantFrom<"x" | "y" | "z">("x", "y", "z"), { maxLength: 12 }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        (size, trim, axes, fill) => {
          const side = size.map((s) => Math.max(1, (s - 2 * trim) * Math.cbrt(fill))) as [number, number, number];
          const l = lossBreakdown({
            size,
            trim,
            kerf: 1.5,
            cuts: axes.map((axis, i) => ({ axis, at: 10 * i })),
            blanks: [side],
            rejected: [],
            offcuts: [],
            defects: [{ min: [0, 0, 0], max: [50, 50, 50] }],
          });
          expect(sum(l)).toBeCloseTo(l.block, 9);
          for (const v of Object.values(l)) expect(v).toBeGreaterThanOrEqual(0);
        },
      ),
      { numRuns: 200 },
    );
  });
});
