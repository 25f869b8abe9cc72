import { describe, expect, it } from "vitest";
import { leftOutLine, whyUnusable } from "@/lib/planning/usable";

const rib = {
  size: [300, 200, 100] as [number, number, number],
  rotate: "any" as const,
  gradeCode: "EPS-II",
  quantity: 4,
};
const block = (size: [number, number, number], isOffcut = false, gradeCode = "EPS-II") => ({
  code: isOffcut ? "HF-1003.4" : "HF-1003",
  size,
  gradeCode,
  isOffcut,
});

describe("whether a block can hold any part", () => {
  it("keeps a block some part fits in after trim, turned as the part may be", () => {
    expect(whyUnusable(block([2000, 1000, 500]), [rib], 6)).toBeNull();
    // A 120 mm slab keeps 108 mm after trim: the rib lies flat in it; stood up (150 mm, no turning) it does not fit.
    expect(whyUnusable(block([2000, 1000, 120]), [rib], 6)).toBeNull();
    expect(whyUnusable(block([2000, 1000, 120]), [{ ...rib, rotate: "none" as const, size: [300, 200, 150] }], 6)).toBe(
      "too small for any part after trim (2000 × 1000 × 120 mm)",
    );
  });

  it("leaves out slivers, with the reason in the shop's words", () => {
    expect(whyUnusable(block([1200, 600, 18], true), [rib], 6)).toBe("too small for any part (1200 × 600 × 18 mm)");
    expect(whyUnusable(block([2440, 1220, 10]), [rib], 6)).toBe(
      "the 6 mm face trim leaves no usable material (2440 × 1220 × 10 mm)",
    );
    // An offcut is already square: no trim, so 100 mm is enough for the rib on its flat.
    expect(whyUnusable(block([400, 300, 100], true), [rib], 6)).toBeNull();
    expect(whyUnusable(block([400, 300, 100]), [rib], 6)).toBe(
      "too small for any part after trim (400 × 300 × 100 mm)",
    );
  });

  it("counts only parts still owed, of its grade", () => {
    expect(whyUnusable(block([2000, 1000, 500], false, "XPS-250"), [rib], 6)).toBe(
      "no part still owed is of its grade (XPS-250)",
    );
    expect(whyUnusable(block([2000, 1000, 500], false, "XPS-250"), [{ ...rib, gradeCode: null }], 6)).toBeNull();
    expect(whyUnusable(block([1200, 600, 18], true), [{ ...rib, quantity: 0 }], 6)).toBeNull();
  });

  it("names the block by its code", () => {
    expect(leftOutLine({ code: "HF-1003.4", reason: "too small for any part after trim" })).toBe(
      "HF-1003.4 left out: too small for any part after trim",
    );
  });
});
