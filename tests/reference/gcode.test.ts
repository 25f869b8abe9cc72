import { describe, expect, it } from "vitest";
import { cutEstimate, gcode } from "@/lib/planning/gcode";

// ISO 6983-1 word-address format: a block (line) is a sequence of words, each an address letter
// followed by a number; comments in parentheses. Meanings checked (from memory of the standard's
// preparatory and miscellaneous functions, as common controllers implement them): G0 rapid
// positioning, G1 linear interpolation, G21 millimetre input, G90 absolute dimensions, F feed,
// M0 program stop, M2 end of program.
const WORD = /^[A-Z]-?\d+(\.\d+)?$/;
const ALLOWED = new Set(["G0", "G1", "G21", "G90", "M0", "M2"]);

describe("G-code for straight through cuts (ISO 6983 subset)", () => {
  const program = gcode({
    code: "HF-1001",
    size: [2440, 1220, 610],
    cuts: [
      { axis: "z", at: 300 },
      { axis: "x", at: 1200 },
      { axis: "y", at: 600 },
    ],
    kerf: 1.5,
    feed: 300,
  });
  const lines = program.trim().split("\n");

  it("is made only of comments and address-letter words", () => {
    for (const line of lines) {
      if (line.startsWith("(")) {
        expect(line).toMatch(/^\([^()]*\)$/);
        continue;
      }
      for (const word of line.split(" ")) expect(word, line).toMatch(WORD);
    }
  });

  it("sets millimetres and absolute coordinates before any move, and ends with M2", () => {
    const code = lines.filter((l) => !l.startsWith("("));
    expect(code.slice(0, 2)).toEqual(["G21", "G90"]);
    expect(code.at(-1)).toBe("M2");
    for (const l of code) expect(ALLOWED.has(l.split(" ")[0]!), l).toBe(true);
  });

  it("feeds every cutting move and places the wire half a kerf past the cut position", () => {
    const feeds = lines.filter((l) => l.startsWith("G1"));
    expect(feeds).toHaveLength(3);
    for (const f of feeds) expect(f).toMatch(/ F300$/);
    expect(program).toContain("G0 X-10 Y300.75");
    expect(program).toContain("G0 X1200.75 Y620");
  });

  it("stops for the quarter turn before the first cut across the width", () => {
    const turn = lines.indexOf("M0");
    expect(turn).toBeGreaterThan(lines.findIndex((l) => l.includes("CUT 2")));
    expect(lines[turn - 1]).toMatch(/TURN THE BLOCK/);
  });

  it("estimates cut time from wire travel and feed (common practice, no source)", () => {
    const e = cutEstimate([2440, 1220, 610], [{ axis: "z", at: 300 }], 300);
    expect(e.lengthMm).toBe(2460);
    expect(e.minutes).toBeCloseTo(8.2, 6);
  });
});
