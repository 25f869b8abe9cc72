import { describe, expect, it } from "vitest";
import { nestSync, parseProblem, validatePlan, type Problem } from "@/lib/nesting";
import { inToMm } from "@/lib/units";

/** A problem through the app's own parser, so every default is the real one. */
function problem(json: Record<string, unknown>): Problem {
  const r = parseProblem({ version: 1, ...json });
  if (!r.ok) throw new Error(r.errors.join("; "));
  return r.problem;
}

const ft = (n: number) => inToMm(12 * n);

describe("boards per block with face trim and kerf, counted by hand (common practice, no source)", () => {
  // Slicing a block into boards: after trimming every face, n boards of thickness t and the n − 1
  // kerfs between them must fit the trimmed height: n·t + (n − 1)·kerf ≤ H − 2·trim, so
  // n = floor((H − 2·trim + kerf) ÷ (t + kerf)). The by-hand arithmetic is written out beside each case.
  it.each([
    // 4 × 4 × 16 ft block (domain brief §2), trim 10 mm a face, kerf 1.5 mm, 50 mm boards:
    // (1219.2 − 20 + 1.5) ÷ 51.5 = 1200.7 ÷ 51.5 = 23.31 → 23 boards.
    { height: ft(4), trim: 10, kerf: 1.5, t: 50, boards: 23 },
    // Same block, 100 mm boards, kerf 2 mm, trim 6 mm: (1219.2 − 12 + 2) ÷ 102 = 1209.2 ÷ 102 = 11.85 → 11.
    { height: ft(4), trim: 6, kerf: 2, t: 100, boards: 11 },
    // A block 1000 mm high, no trim, kerf 1 mm, 99 mm boards: (1000 + 1) ÷ 100 = 10.01 → 10 (exactly fills).
    { height: 1000, trim: 0, kerf: 1, t: 99, boards: 10 },
    // …and one kerf too many for 11: 11 × 99 + 10 × 1 = 1099 > 1000.
  ])("$height mm high, trim $trim, kerf $kerf, $t mm boards → $boards boards", ({ height, trim, kerf, t, boards }) => {
    expect(Math.floor((height - 2 * trim + kerf) / (t + kerf))).toBe(boards);
    const length = ft(16);
    const width = ft(4);
    const p = problem({
      settings: { kerf, trim, layout: "guillotine", minOffcut: [100, 100, 10], timeLimitMs: 1000 },
      blocks: [{ id: "B", size: [length, width, height] }],
      parts: [{ id: "board", size: [length - 2 * trim, width - 2 * trim, t], quantity: boards + 5, rotate: "none" }],
    });
    const plan = nestSync(p, { seed: 1, iterations: 50 });
    expect(validatePlan(p, plan)).toEqual([]);
    expect(plan.placements.length).toBe(boards);
    expect(plan.unplaced.reduce((s, u) => s + u.count, 0)).toBe(5);
  });
});
