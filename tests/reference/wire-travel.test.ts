import { describe, expect, it } from "vitest";
import { cutEstimate } from "@/lib/planning/wire-travel";

// The programs themselves are checked in gcode-readback.test.ts (one per placement, read back
// with an interpreter that is not ours); this is the quick estimate kept with a run's figures.
describe("wire travel estimate of a plan's through cuts", () => {
  it("estimates cut time from wire travel and feed (common practice, no source)", () => {
    const e = cutEstimate([2440, 1220, 610], [{ axis: "z", at: 300 }], 300);
    expect(e.lengthMm).toBe(2460);
    expect(e.minutes).toBeCloseTo(8.2, 6);
  });
});
