import { describe, expect, it } from "vitest";
import { nest, nestSync, validatePlan, type Plan, type Placement, type Problem } from "@/lib/nesting";
import { clone, problem, solveValid } from "./helpers";

const base = problem({
  settings: { kerf: 2, trim: 5, defectMargin: 3, minOffcut: [10, 10, 10], layout: "guillotine" },
  blocks: [
    { id: "A", size: [100, 100, 100], grade: "EPS", defects: [{ id: "D", min: [80, 80, 80], max: [90, 90, 90] }] },
  ],
  parts: [{ id: "p", size: [40, 30, 20], quantity: 2, grade: "EPS", rotate: "none" }],
});

function plan(placements: Placement[], extra: Partial<Plan> = {}): Plan {
  return {
    version: 1,
    placements,
    unplaced: [],
    offcuts: [],
    cuts: {},
    stats: {
      blocksUsed: new Set(placements.map((p) => p.block)).size,
      partVolume: placements.length * 24000,
      stockVolume: 1e6,
      offcutVolume: 0,
      yield: 0,
      elapsedMs: 0,
      lowerBoundBlocks: 1,
    },
    ...extra,
  };
}
const at = (
  origin: [number, number, number],
  size: [number, number, number] = [40, 30, 20],
  part = "p",
  block = "A",
): Placement => ({ part, block, origin, size });
const good = plan([at([5, 5, 5]), at([47, 5, 5])]);

describe("validator: a correct plan passes", () => {
  it("accepts two parts a kerf apart inside the trimmed box", () => {
    expect(validatePlan(base, good)).toEqual([]);
  });
});

describe("rule 1: containment in the trimmed usable box (face trim)", () => {
  it("refuses a part reaching into the trimmed skin", () => {
    expect(validatePlan(base, plan([at([4, 5, 5]), at([47, 5, 5])]))).toEqual([
      expect.stringContaining("placements[0]: outside the usable box of block A on x (trim 5)"),
    ]);
  });
  it("refuses a part past the far face minus trim", () => {
    expect(validatePlan(base, plan([at([5, 5, 5]), at([56, 5, 5])])).join()).toContain(
      "placements[1]: outside the usable box of block A on x",
    );
  });
  it("solver: a part that fits only without trim is unplaced with a reason; offcut blocks need no trim", () => {
    const p = problem({
      settings: { trim: 3, kerf: 0 },
      blocks: [{ id: "raw", size: [100, 100, 100] }],
      parts: [{ id: "big", size: [95, 95, 95] }],
    });
    const planA = solveValid(p);
    expect(planA.placements).toHaveLength(0);
    expect(planA.unplaced).toEqual([
      { part: "big", count: 1, reason: expect.stringContaining("larger than the usable box") },
    ]);
    const q = problem({
      settings: { trim: 3, kerf: 0 },
      blocks: [{ id: "oc", size: [100, 100, 100], offcut: true }],
      parts: [{ id: "big", size: [95, 95, 95] }],
    });
    expect(solveValid(q).placements).toHaveLength(1);
  });
});

describe("rule 2: kerf between pieces", () => {
  it("refuses two parts closer than the kerf", () => {
    const errs = validatePlan(base, plan([at([5, 5, 5]), at([46, 5, 5])]));
    expect(errs[0]).toBe("placements[0] and placements[1] in block A: less than the kerf 2 apart");
    // Pieces closer than the kerf cannot be parted by a through cut either.
    expect(errs.slice(1)).toEqual([expect.stringContaining("cannot be separated by through cuts")]);
  });
  it("checks a plan of 2,400 pieces in one block and names the one pair closer than the kerf", () => {
    // 2,400 cubes a kerf apart fill most of a trimmed block: the check goes through its grid.
    const big = problem({
      settings: { kerf: 2, trim: 5, layout: "guillotine" },
      blocks: [{ id: "G", size: [500, 250, 50] }],
      parts: [{ id: "c", size: [10, 10, 10], quantity: 2400, rotate: "none" }],
    });
    const cubes: Placement[] = [];
    for (let x = 0; x < 40; x++)
      for (let y = 0; y < 20; y++)
        for (let z = 0; z < 3; z++) cubes.push(at([5 + 12 * x, 5 + 12 * y, 5 + 12 * z], [10, 10, 10], "c", "G"));
    const grid = plan(cubes, { stats: { ...good.stats, partVolume: 2400 * 1000 } });
    expect(validatePlan(big, grid)).toEqual([]);
    // One cube 1 mm closer to its neighbour along x than the kerf allows.
    const k = 10 * 60 + 4 * 3 + 1;
    const moved = cubes.map((c, i) =>
      i === k ? { ...c, origin: [c.origin[0] - 1, c.origin[1], c.origin[2]] as [number, number, number] } : c,
    );
    const errs = validatePlan(big, { ...grid, placements: moved });
    expect(errs[0]).toBe(`placements[${k - 60}] and placements[${k}] in block G: less than the kerf 2 apart`);
    expect(errs.filter((e) => e.includes("less than the kerf"))).toHaveLength(1);
  });
  it("refuses an offcut closer than the kerf to a part", () => {
    const bad = plan([at([5, 5, 5]), at([47, 5, 5])], {
      offcuts: [{ block: "A", origin: [5, 35.5, 5], size: [80, 40, 40] }],
    });
    expect(validatePlan(base, bad).join()).toContain("offcuts[0] in block A: less than the kerf 2 apart");
  });
  it("solver: two 50 mm parts need two 100 mm blocks once a kerf is cut, one without", () => {
    const mk = (kerf: number): Problem =>
      problem({
        settings: { kerf, trim: 0 },
        blocks: [
          { id: "a", size: [100, 50, 50] },
          { id: "b", size: [100, 50, 50] },
        ],
        parts: [{ id: "c", size: [50, 50, 50], quantity: 2 }],
      });
    expect(solveValid(mk(0)).stats.blocksUsed).toBe(1);
    const withKerf = solveValid(mk(2));
    expect(withKerf.stats.blocksUsed).toBe(2);
    expect(withKerf.unplaced).toEqual([]);
  });
});

describe("rule 3: defect zones grown by the margin", () => {
  const nearDefect = plan([at([5, 5, 5]), at([45, 60, 60])]);
  it("refuses a part that misses the defect but not its margin", () => {
    expect(validatePlan(base, nearDefect)).toEqual([
      expect.stringContaining("placements[1]: meets defect D of block A grown by the margin 3"),
    ]);
    const noMargin = clone(base);
    noMargin.settings.defectMargin = 0;
    expect(validatePlan(noMargin, nearDefect)).toEqual([]);
  });
  it("solver: cuts a defect away into a thin slab instead of giving up the block", () => {
    const p = problem({
      settings: { kerf: 1.5, trim: 0, defectMargin: 10 },
      blocks: [
        { id: "B", size: [1000, 1000, 1000], defects: [{ id: "void", min: [490, 200, 300], max: [510, 260, 340] }] },
      ],
      parts: [{ id: "half", size: [460, 1000, 1000], quantity: 2, rotate: "none" }],
    });
    const out = solveValid(p);
    expect(out.unplaced).toEqual([]);
    expect(out.stats.blocksUsed).toBe(1);
  });
});

describe("rule 4: grades, rotation, counts", () => {
  it("refuses a part in a block of another grade", () => {
    const other = clone(base);
    other.blocks[0]!.grade = "XPS";
    expect(validatePlan(other, good).join()).toContain("part p of grade EPS placed in block A of grade XPS");
  });
  it("refuses an orientation the rotate rule forbids", () => {
    expect(validatePlan(base, plan([at([5, 5, 5], [30, 40, 20]), at([47, 5, 5])])).join()).toContain(
      'is not an orientation of part p [40, 30, 20] allowed by rotate "none"',
    );
    const z = clone(base);
    z.parts[0]!.rotate = "z";
    expect(validatePlan(z, plan([at([5, 5, 5], [30, 40, 20]), at([47, 5, 5])]))).toEqual([]);
    expect(validatePlan(z, plan([at([5, 5, 5], [20, 30, 40]), at([47, 5, 5])])).join()).toContain(
      'allowed by rotate "z"',
    );
  });
  it("refuses a plan whose placed plus unplaced differ from the quantity", () => {
    expect(validatePlan(base, plan([at([5, 5, 5])], { stats: { ...good.stats, partVolume: 24000 } }))).toEqual([
      "part p: placed 1 + unplaced 0 differs from quantity 2",
    ]);
  });
  it("solver: sends each part to a block of its grade and says when no block has it", () => {
    const p = problem({
      settings: { kerf: 0 },
      blocks: [
        { id: "eps", size: [100, 100, 100], grade: "EPS" },
        { id: "xps", size: [100, 100, 100], grade: "XPS" },
      ],
      parts: [
        { id: "e", size: [10, 10, 10], grade: "EPS" },
        { id: "x", size: [10, 10, 10], grade: "XPS" },
        { id: "u", size: [10, 10, 10], grade: "EPP" },
      ],
    });
    const out = solveValid(p);
    expect(out.placements.find((pl) => pl.part === "e")?.block).toBe("eps");
    expect(out.placements.find((pl) => pl.part === "x")?.block).toBe("xps");
    expect(out.unplaced).toEqual([{ part: "u", count: 1, reason: "no block of grade EPP" }]);
  });
  it("solver: turns a part only as its rotate rule allows", () => {
    const mk = (rotate: string, block: [number, number, number]): Problem =>
      problem({
        settings: { kerf: 0 },
        blocks: [{ id: "b", size: block }],
        parts: [{ id: "r", size: [100, 10, 10], rotate }],
      });
    expect(solveValid(mk("none", [20, 200, 20])).placements).toHaveLength(0);
    expect(solveValid(mk("z", [20, 200, 20])).placements[0]?.size).toEqual([10, 100, 10]);
    expect(solveValid(mk("z", [20, 20, 200])).placements).toHaveLength(0);
    expect(solveValid(mk("any", [20, 20, 200])).placements[0]?.size).toEqual([10, 10, 100]);
  });
});

describe("rule 5: separability by layout", () => {
  // Four boards around a hole (a pinwheel), 2 mm apart: no through cut separates them.
  const mk = (layout: string): Problem =>
    problem({
      settings: { kerf: 2, trim: 0, layout },
      blocks: [{ id: "A", size: [100, 100, 100] }],
      parts: [
        { id: "w", size: [60, 30, 20], quantity: 2, rotate: "none" },
        { id: "t", size: [30, 60, 20], quantity: 2, rotate: "none" },
        { id: "thin", size: [30, 60, 10], quantity: 1, rotate: "none" },
      ],
    });
  const pinwheel = (thinLast: boolean): Plan => {
    const pl: Placement[] = [
      { part: "w", block: "A", origin: [0, 0, 0], size: [60, 30, 20] },
      { part: "t", block: "A", origin: [62, 0, 0], size: [30, 60, 20] },
      { part: "w", block: "A", origin: [32, 62, 0], size: [60, 30, 20] },
      thinLast
        ? { part: "thin", block: "A", origin: [0, 32, 0], size: [30, 60, 10] }
        : { part: "t", block: "A", origin: [0, 32, 0], size: [30, 60, 20] },
    ];
    const out = plan(pl, {
      unplaced: [{ part: thinLast ? "t" : "thin", count: 1, reason: "not enough room left in the blocks" }],
    });
    out.stats.partVolume = pl.reduce((s, x) => s + x.size[0] * x.size[1] * x.size[2], 0);
    return out;
  };

  it("guillotine: refuses a pinwheel", () => {
    const errs = validatePlan(mk("guillotine"), pinwheel(false));
    expect(errs).toEqual([
      expect.stringMatching(/^block A: .* cannot be separated by through cuts \(layout guillotine\)$/),
    ]);
    for (const i of [0, 1, 2, 3]) expect(errs[0]).toContain(`placements[${i}]`);
  });
  it("layers: accepts a pinwheel whose pieces share one layer, refuses it when one piece is thinner", () => {
    expect(validatePlan(mk("layers"), pinwheel(false))).toEqual([]);
    expect(validatePlan(mk("layers"), pinwheel(true)).join()).toContain(
      "cannot be separated by through cuts (layout layers)",
    );
  });
  it("free: only the kerf rule applies", () => {
    expect(validatePlan(mk("free"), pinwheel(true))).toEqual([]);
  });
  it("solver: every layout gets a plan that keeps its own rule", () => {
    for (const layout of ["guillotine", "layers", "free"]) {
      const p = problem({
        settings: { kerf: 1, trim: 2, layout },
        blocks: [
          { id: "A", size: [300, 200, 50] },
          { id: "B", size: [300, 200, 50] },
        ],
        parts: [
          { id: "a", size: [70, 40, 46], quantity: 9, rotate: "z" },
          { id: "b", size: [55, 35, 46], quantity: 7, rotate: "z" },
        ],
      });
      const out = solveValid(p);
      expect(out.unplaced).toEqual([]);
      // Guillotine plans list their through cuts; a single layer needs none.
      if (layout === "guillotine") expect(Object.values(out.cuts).flat().length).toBeGreaterThan(0);
    }
  });
});

describe("offcuts and ids", () => {
  it("refuses an offcut below minOffcut (sorted comparison)", () => {
    const bad = plan([at([5, 5, 5]), at([47, 5, 5])], {
      offcuts: [{ block: "A", origin: [5, 37, 5], size: [9, 50, 50] }],
    });
    expect(validatePlan(base, bad)).toEqual([
      expect.stringContaining("offcuts[0]: size [9, 50, 50] is smaller than minOffcut [10, 10, 10]"),
    ]);
  });
  it("refuses an offcut that no through cut separates from the parts", () => {
    // Three parts and an offcut in a pinwheel: each is a kerf apart, none can be cut free.
    const p = problem({
      settings: { kerf: 2, trim: 0, minOffcut: [10, 10, 10] },
      blocks: [{ id: "A", size: [100, 100, 100] }],
      parts: [
        { id: "w", size: [60, 30, 20], quantity: 2, rotate: "none" },
        { id: "t", size: [30, 60, 20], rotate: "none" },
      ],
    });
    const pl: Placement[] = [
      { part: "w", block: "A", origin: [0, 0, 0], size: [60, 30, 20] },
      { part: "t", block: "A", origin: [62, 0, 0], size: [30, 60, 20] },
      { part: "w", block: "A", origin: [32, 62, 0], size: [60, 30, 20] },
    ];
    const withOffcut = plan(pl, { offcuts: [{ block: "A", origin: [0, 32, 0], size: [30, 60, 20] }] });
    withOffcut.stats.partVolume = 3 * 36000;
    const errs = validatePlan(p, withOffcut);
    expect(errs).toEqual([
      expect.stringMatching(/^block A: .*offcuts\[0\].* cannot be separated by through cuts \(layout guillotine\)$/),
    ]);
    withOffcut.offcuts = [];
    expect(validatePlan(p, withOffcut)).toEqual([]);
  });
  it("refuses invented ids and a part placed twice", () => {
    expect(validatePlan(base, plan([at([5, 5, 5]), at([47, 5, 5], [40, 30, 20], "zz")])).join()).toContain(
      'placements[1]: unknown part "zz"',
    );
    expect(validatePlan(base, plan([at([5, 5, 5]), at([47, 5, 5], [40, 30, 20], "p", "ZZ")])).join()).toContain(
      'placements[1]: unknown block "ZZ"',
    );
    expect(validatePlan(base, plan([at([5, 5, 5]), at([5, 5, 5])])).join()).toContain("places part p in block A twice");
  });
});

describe("nest: anytime behaviour", () => {
  const p = problem({
    settings: { kerf: 1, timeLimitMs: 200 },
    blocks: Array.from({ length: 6 }, (_, i) => ({ id: `B${i}`, size: [500, 400, 300] })),
    parts: [
      { id: "a", size: [130, 90, 70], quantity: 40 },
      { id: "b", size: [210, 60, 45], quantity: 30 },
      { id: "c", size: [33, 33, 33], quantity: 50 },
    ],
  });
  it("is deterministic for a given seed and iteration budget", () => {
    expect(nestSync(p, { seed: 5, iterations: 20 })).toEqual(nestSync(p, { seed: 5, iterations: 20 }));
  });
  it("reports progress and stops when aborted, returning a valid plan", async () => {
    const controller = new AbortController();
    const fractions: number[] = [];
    const out = await nest(p, {
      seed: 2,
      iterations: 10_000,
      signal: controller.signal,
      onProgress: (pr) => {
        fractions.push(pr.fraction);
        expect(pr.best.placedVolume).toBeGreaterThan(0);
        if (fractions.length === 3) controller.abort();
      },
    });
    expect(fractions.length).toBeGreaterThanOrEqual(3);
    expect(fractions.length).toBeLessThan(20);
    expect(validatePlan(p, out)).toEqual([]);
  });
  it("stops at the time limit with a clock", async () => {
    let t = 0;
    const out = await nest(p, { now: () => (t += 10) });
    expect(validatePlan(p, out)).toEqual([]);
    expect(out.stats.elapsedMs).toBeLessThanOrEqual(400);
  });
});
