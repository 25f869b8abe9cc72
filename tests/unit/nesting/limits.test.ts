import { describe, expect, it } from "vitest";
import { MAX_BLOCKS, MAX_PIECES, parseProblem } from "@/lib/nesting/parse";

const problem = (quantity: number, blocks = 1) => ({
  version: 1,
  blocks: Array.from({ length: blocks }, (_, i) => ({ id: `B${i}`, size: [1000, 1000, 1000] })),
  parts: [{ id: "p", size: [10, 10, 10], quantity }],
});

describe("problem size limits (shared by the command line and the app)", () => {
  it("takes up to MAX_PIECES pieces and refuses one more, naming the path and the limit", () => {
    expect(parseProblem(problem(MAX_PIECES)).ok).toBe(true);
    const r = parseProblem(problem(MAX_PIECES + 1));
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.errors).toEqual([
        `parts: ${MAX_PIECES + 1} pieces in all (the sum of the quantities); at most ${MAX_PIECES} in one problem: split the order`,
      ]);
  });

  it("refuses more than MAX_BLOCKS blocks", () => {
    const r = parseProblem(problem(1, MAX_BLOCKS + 1));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors).toEqual([`blocks: ${MAX_BLOCKS + 1} blocks; at most ${MAX_BLOCKS} in one problem`]);
  });
});
