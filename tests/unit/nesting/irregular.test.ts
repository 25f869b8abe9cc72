/**
 * True-shape nesting (lib/nesting/irregular): hand-worked layouts, the parser's messages, budget,
 * abort and progress. Every layout is checked by the engine's validator and again by
 * polygon-clipping (scripts/lib-bench/irregular.ts), which shares no code with the engine.
 */
import { describe, expect, it } from "vitest";
import {
  type IrregularProblem,
  type IrregularSolution,
  nestIrregular,
  nestIrregularSync,
  parseIrregular,
  type Pt,
  validateIrregular,
} from "@/lib/nesting/irregular";
import { boxStripLength, checkIndependently } from "@/scripts/lib-bench/irregular";

const sq = (s: number, x = 0, y = 0): Pt[] => [
  [x, y],
  [x + s, y],
  [x + s, y + s],
  [x, y + s],
];

function parsed(json: unknown): IrregularProblem {
  const r = parseIrregular(json);
  if (!r.ok) throw new Error(`bad fixture: ${r.errors.join("; ")}`);
  return r.problem;
}

/** Nests and insists the layout passes both checks. */
function nestValid(problem: IrregularProblem, maxMoves = 1500, seed = 1): IrregularSolution {
  const sol = nestIrregularSync(problem, { seed, maxMoves });
  expect(validateIrregular(problem, sol)).toEqual([]);
  expect(checkIndependently(problem, sol).errors).toEqual([]);
  return sol;
}

const L_TROMINO: Pt[] = [
  [0, 0],
  [2, 0],
  [2, 1],
  [1, 1],
  [1, 2],
  [0, 2],
];

describe("hand-worked layouts", () => {
  it("interlocks two L shapes into a 3 × 2 rectangle where their boxes need 4 × 2", () => {
    // Hand-worked: the L tromino and its half turn tile a 3 × 2 rectangle; each one's box is 2 × 2.
    const problem = parsed({ width: 2, items: [{ id: "L", outer: L_TROMINO, quantity: 2, rotations: [0, 180] }] });
    const sol = nestValid(problem);
    expect(sol.length).toBeCloseTo(3, 9);
    expect(sol.density).toBeCloseTo(1, 9);
    expect(new Set(sol.placements.map((p) => p.rotation))).toEqual(new Set([0, 180]));
    expect(boxStripLength(problem)).toBeCloseTo(4, 9);
  });

  it("puts the small square into the ring's hole", () => {
    // Hand-worked: a 10 × 10 ring around a 6 × 6 hole takes a 5 × 5 square inside; the strip is 10 wide, so 10 long.
    const problem = parsed({
      width: 10,
      items: [
        { id: "ring", outer: sq(10), holes: [sq(6, 2, 2)] },
        { id: "sq", outer: sq(5) },
      ],
    });
    const sol = nestValid(problem);
    expect(sol.length).toBeCloseTo(10, 9);
    const ring = sol.placements.find((p) => p.item === "ring")!;
    const s = sol.placements.find((p) => p.item === "sq")!;
    expect(s.x).toBeGreaterThanOrEqual(ring.x + 2 - 1e-9);
    expect(s.x + 5).toBeLessThanOrEqual(ring.x + 8 + 1e-9);
    expect(s.y).toBeGreaterThanOrEqual(ring.y + 2 - 1e-9);
    expect(s.y + 5).toBeLessThanOrEqual(ring.y + 8 + 1e-9);
  });

  it("uses the hole with a kerf that leaves room (5 + 2 × 0.4 ≤ 6) and not with one that does not (5 + 2 × 1.2 > 6)", () => {
    // Hand-worked: with kerf k the square needs 5 + 2k across the 6 wide hole.
    const items = [
      { id: "ring", outer: sq(10), holes: [sq(6, 2, 2)] },
      { id: "sq", outer: sq(5) },
    ];
    const fits = nestValid(parsed({ width: 10, kerf: 0.4, items }));
    expect(fits.length).toBeCloseTo(10, 9);
    const wide = nestValid(parsed({ width: 10, kerf: 1.2, items }));
    // The square goes beside the ring: 10 + 1.2 + 5.
    expect(wide.length).toBeGreaterThanOrEqual(16.2 - 1e-9);
    expect(wide.length).toBeLessThanOrEqual(16.2 + 1e-6);
  });

  it("tiles a strip exactly with squares (12 squares of 5 in a 15 wide strip: 20 long, density 1)", () => {
    const problem = parsed({ width: 15, items: [{ id: "s", outer: sq(5), quantity: 12, rotations: [0, 90] }] });
    const sol = nestValid(problem);
    expect(sol.length).toBeCloseTo(20, 9);
    expect(sol.density).toBeCloseTo(1, 9);
  });

  it("keeps parts a kerf apart and off the stock's edges by the margin", () => {
    // 12.001 wide: two rows need 0.5 + 5 + 1 + 5 + 0.5 = 12 (exactly 12 is left to rounding).
    const problem = parsed({ width: 12.001, kerf: 1, margin: 0.5, items: [{ id: "s", outer: sq(5), quantity: 4 }] });
    const sol = nestValid(problem);
    // Two rows of two: 12 along as well.
    expect(sol.length).toBeGreaterThanOrEqual(12 - 1e-9);
    expect(sol.length).toBeLessThanOrEqual(12 + 0.01);
    for (const p of sol.placements) {
      expect(p.y).toBeGreaterThanOrEqual(0.5 - 1e-9);
      expect(p.x).toBeGreaterThanOrEqual(0.5 - 1e-9);
    }
  });

  it("turns a part only by the listed angles", () => {
    // A 3 × 10 bar in a 4 wide strip fits only turned by 90°.
    const bar: Pt[] = [
      [0, 0],
      [3, 0],
      [3, 10],
      [0, 10],
    ];
    const must = nestValid(parsed({ width: 4, items: [{ id: "bar", outer: bar, rotations: [0, 90] }] }));
    expect(must.placements.map((p) => p.rotation)).toEqual([90]);
    expect(must.length).toBeCloseTo(10, 9);
    // In a 12 wide strip it would be shorter unturned (3 long), but only 90° is allowed.
    const only = nestValid(parsed({ width: 12, items: [{ id: "bar", outer: bar, rotations: [90] }] }));
    expect(only.placements.map((p) => p.rotation)).toEqual([90]);
    expect(only.length).toBeCloseTo(10, 9);
  });

  it("reports parts wider than the stock in every allowed rotation as unplaced and places the rest", () => {
    const problem = parsed({
      width: 5,
      items: [
        {
          id: "big",
          outer: [
            [0, 0],
            [10, 0],
            [10, 8],
            [0, 8],
          ],
          rotations: [0, 90],
        },
        { id: "small", outer: sq(2), quantity: 2 },
      ],
    });
    const sol = nestValid(problem);
    expect(sol.unplaced).toEqual([{ item: "big", count: 1, reason: expect.stringMatching(/wider than the stock/) }]);
    expect(sol.placements.filter((p) => p.item === "small")).toHaveLength(2);
  });

  it("in a rectangle too short for everything, places what fits inside it and lists the rest", () => {
    const problem = parsed({ width: 10, length: 12, items: [{ id: "s", outer: sq(5), quantity: 6 }] });
    const sol = nestValid(problem, 300);
    expect(sol.placements).toHaveLength(4);
    expect(sol.unplaced).toEqual([{ item: "s", count: 2, reason: expect.stringMatching(/does not fit/) }]);
    expect(sol.length).toBeLessThanOrEqual(12);
  });

  it("is deterministic for a seed and a move budget", () => {
    const problem = parsed({
      width: 7,
      items: [
        { id: "L", outer: L_TROMINO, quantity: 5, rotations: [0, 90, 180, 270] },
        {
          id: "t",
          outer: [
            [0, 0],
            [3, 0],
            [0, 2],
          ],
          quantity: 4,
          rotations: [0, 180],
        },
      ],
    });
    const a = nestIrregularSync(problem, { seed: 7, maxMoves: 600 });
    const b = nestIrregularSync(problem, { seed: 7, maxMoves: 600 });
    expect(b.placements).toEqual(a.placements);
    expect(b.length).toBe(a.length);
  });
});

describe("parseIrregular", () => {
  it("names every bad field and returns no problem", () => {
    const r = parseIrregular({
      width: -1,
      kerf: "x",
      items: [
        {
          id: "a",
          outer: [
            [0, 0],
            [4, 4],
            [4, 0],
            [0, 2],
          ],
        },
        { id: "a", outer: sq(3), quantity: 0 },
        { id: "c", outer: sq(3), holes: [sq(1, 5, 5)], rotations: [] },
        {
          id: "d",
          outer: [
            [0, 0],
            [1, "y"],
            [1, 1],
          ],
        },
      ],
    });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toEqual([
      "width: must be a number > 0",
      "kerf: must be a number ≥ 0",
      "items[0].outer: edges 0 and 2 cross or touch (the outline must be a simple loop)",
      'items[1].id: "a" is used twice',
      "items[1].quantity: must be a whole number ≥ 1",
      "items[2].holes[0]: must lie inside the outer loop without touching it",
      "items[2].rotations: must be a non-empty list of angles in degrees",
      "items[3].outer[1]: must be [x, y] with finite numbers",
    ]);
  });

  it("fills the defaults: rotation 0, quantity 1, kerf and margin 0; angles taken modulo 360", () => {
    const r = parseIrregular({
      width: 5,
      items: [
        { id: 1, outer: sq(1) },
        { id: "b", outer: sq(1), rotations: [-90, 270, 360] },
      ],
    });
    expect(r).toEqual({
      ok: true,
      problem: {
        width: 5,
        kerf: 0,
        margin: 0,
        items: [
          { id: "1", outer: sq(1), holes: [], quantity: 1, rotations: [0] },
          { id: "b", outer: sq(1), holes: [], quantity: 1, rotations: [270, 0] },
        ],
      },
    });
  });

  it("refuses a non-object, an empty item list and a margin that leaves no width", () => {
    expect(parseIrregular("nope")).toEqual({ ok: false, errors: ["(root): must be an object"] });
    expect(parseIrregular({ width: 2, items: [] })).toEqual({ ok: false, errors: ["items: must be a non-empty list"] });
    const r = parseIrregular({ width: 2, margin: 1, items: [{ id: "a", outer: sq(1) }] });
    expect(r).toEqual({ ok: false, errors: ["margin: leaves no room across the width"] });
  });
});

describe("validateIrregular", () => {
  const problem = parsed({ width: 10, kerf: 1, items: [{ id: "s", outer: sq(4), quantity: 2, rotations: [0] }] });
  const good: IrregularSolution = {
    width: 10,
    length: 9,
    density: 32 / 90,
    placements: [
      { item: "s", copy: 0, rotation: 0, x: 0, y: 0 },
      { item: "s", copy: 1, rotation: 0, x: 5, y: 0 },
    ],
    unplaced: [],
    stats: { elapsedMs: 0, firstLength: 9, evaluations: 0, moves: 0, improvements: 0 },
  };
  it("accepts a layout that keeps every rule", () => {
    expect(validateIrregular(problem, good)).toEqual([]);
  });
  it("catches overlap, kerf, containment, rotation and count errors", () => {
    const overlap = {
      ...good,
      length: 7,
      density: 32 / 70,
      placements: [good.placements[0]!, { ...good.placements[1]!, x: 3 }],
    };
    expect(validateIrregular(problem, overlap)[0]).toMatch(/s#0 and s#1 overlap/);
    const close = {
      ...good,
      length: 8.5,
      density: 32 / 85,
      placements: [good.placements[0]!, { ...good.placements[1]!, x: 4.5 }],
    };
    expect(validateIrregular(problem, close)).toEqual(["s#0 and s#1 are 0.5 apart, kerf 1"]);
    const out = { ...good, placements: [good.placements[0]!, { ...good.placements[1]!, y: 7 }] };
    expect(validateIrregular(problem, out)[0]).toMatch(/s#1: outside the strip/);
    const turned = { ...good, placements: [good.placements[0]!, { ...good.placements[1]!, rotation: 90, x: 9 }] };
    expect(validateIrregular(problem, turned)[0]).toMatch(/turned 90°, allowed 0/);
    const missing = { ...good, length: 4, density: 16 / 40, placements: [good.placements[0]!] };
    expect(validateIrregular(problem, missing)).toEqual(['item "s": 1 placed or unplaced, quantity 2']);
  });
});

describe("budget, abort and progress", () => {
  const problem = parsed({
    width: 9,
    items: [
      { id: "L", outer: L_TROMINO, quantity: 8, rotations: [0, 90, 180, 270] },
      {
        id: "t",
        outer: [
          [0, 0],
          [3, 0],
          [0, 2],
        ],
        quantity: 6,
        rotations: [0, 180],
      },
    ],
  });

  it("stops at the time budget of the clock it is handed, with a valid layout", async () => {
    let t = 0;
    const now = () => (t += 0.5);
    const fractions: number[] = [];
    const sol = await nestIrregular(problem, {
      seed: 1,
      now,
      timeLimitMs: 400,
      onProgress: (p) => fractions.push(p.fraction),
    });
    expect(validateIrregular(problem, sol)).toEqual([]);
    expect(sol.stats.elapsedMs).toBeGreaterThanOrEqual(400);
    expect(sol.stats.elapsedMs).toBeLessThan(400 + 200);
    expect(fractions.length).toBeGreaterThan(1);
    expect(fractions.every((f, i) => f >= 0 && f <= 1 && (i === 0 || f >= fractions[i - 1]!))).toBe(true);
    expect(fractions.at(-1)).toBe(1);
  });

  it("resolves with the best valid layout so far when aborted", async () => {
    const controller = new AbortController();
    let calls = 0;
    const sol = await nestIrregular(problem, {
      seed: 2,
      maxMoves: 1e9,
      signal: controller.signal,
      onProgress: () => {
        if (++calls === 5) controller.abort();
      },
    });
    expect(validateIrregular(problem, sol)).toEqual([]);
    expect(checkIndependently(problem, sol).errors).toEqual([]);
    expect(sol.stats.moves).toBeLessThan(1e9);
    expect(sol.length).toBeLessThanOrEqual(sol.stats.firstLength);
  });
});
