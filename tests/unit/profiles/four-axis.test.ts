/**
 * 4-axis cutting (lib/profiles/four-axis.ts, lib/profiles/program.ts): the wire's line carried to
 * the towers by similar triangles, worked by hand here; root and tip matched by share of their
 * length; refusals naming the limit; NACA sections against the published ordinates.
 */
import { describe, expect, it } from "vitest";
import type { Machine } from "@/lib/planning/machine";
import { parseNaca, partGeometry, surfaceAt } from "@/lib/profiles";
import { FourAxisError, matchByShare, toTowers, towerProblem, wireAt } from "@/lib/profiles/four-axis";
import { ProgramError, profileProgram } from "@/lib/profiles/program";
import { partSections } from "@/lib/profiles/slabs";
import { toolpath } from "@/lib/profiles/toolpath";
import { profileCutter } from "../../support/procedure-fixtures";

const cutter = (over: Partial<Machine> = {}): Machine =>
  profileCutter({ fourAxis: true, ...over }, { towerAxes: ["U", "V"] });

describe("the wire's line carried to the towers", () => {
  // Worked by hand (similar triangles). Towers 1000 mm apart; the root face 200 mm from the first
  // tower, the tip face 700 mm from it (a 500 mm span). A root point (100, 50) and the tip point
  // it is matched with (80, 40): the line drops 20 mm in x and 10 mm in y over the 500 mm span,
  // that is 0.04 mm of x and 0.02 mm of y per mm along the wire.
  //   First tower, 200 mm before the root:  x = 100 + 200 · 0.04 = 108,  y = 50 + 200 · 0.02 = 54.
  //   Second tower, 300 mm past the tip:    x = 80 − 300 · 0.04 = 68,    y = 40 − 300 · 0.02 = 34.
  it("a root point (100, 50) and tip point (80, 40), faces at 200 and 700 mm, towers 1000 mm apart: (108, 54) and (68, 34)", () => {
    const t = toTowers([[100, 50]], [[80, 40]], { zRoot: 200, zTip: 700, towerSpacing: 1000 });
    expect(t.first[0]![0]).toBeCloseTo(108, 9);
    expect(t.first[0]![1]).toBeCloseTo(54, 9);
    expect(t.second[0]![0]).toBeCloseTo(68, 9);
    expect(t.second[0]![1]).toBeCloseTo(34, 9);
    // Halfway along the part the wire is halfway between the sections: (90, 45).
    expect(wireAt([100, 50], [80, 40], 200, 700, 450)).toEqual([90, 45]);
    // Back at the faces, the tower points give the sections again (the line is one line).
    expect(wireAt(t.first[0]!, t.second[0]!, 0, 1000, 200)[0]).toBeCloseTo(100, 9);
    expect(wireAt(t.first[0]!, t.second[0]!, 0, 1000, 700)[1]).toBeCloseTo(40, 9);
  });

  it("a straight panel (root = tip) puts both towers on the section", () => {
    const t = toTowers([[30, 12]], [[30, 12]], { zRoot: 300, zTip: 700, towerSpacing: 1000 });
    expect(t.first).toEqual([[30, 12]]);
    expect(t.second).toEqual([[30, 12]]);
  });

  // Hand-worked: a 200 mm square root and a 100 mm square tip, both from their lower left corner
  // and anticlockwise: every root point at a share of the way round pairs with the tip point at
  // the same share, which is the root point halved.
  it("matches a 200 mm square root with a 100 mm square tip point for point by share of the way round", () => {
    const root: [number, number][] = [
      [0, 0],
      [200, 0],
      [200, 200],
      [0, 200],
      [0, 0],
    ];
    const tip: [number, number][] = [
      [0, 0],
      [100, 0],
      [100, 50],
      [100, 100],
      [0, 100],
      [0, 0],
    ];
    const [a, b] = matchByShare(root, tip);
    expect(a).toHaveLength(6);
    a.forEach((p, i) => {
      expect(b[i]![0]).toBeCloseTo(p[0] / 2, 9);
      expect(b[i]![1]).toBeCloseTo(p[1] / 2, 9);
    });
    expect(a[2]).toEqual([200, 100]); // the tip's extra point, found on the root
  });

  it("names the limit: the part longer than the towers are apart, a tower outside its travel", () => {
    const letters = ["X", "Y", "U", "V"] as const;
    expect(
      towerProblem({ first: [], second: [] }, { zRoot: 0, zTip: 1200, towerSpacing: 1000 }, [1200, 600], letters),
    ).toBe("the part is 1200 mm long along the wire; the towers stand 1000 mm apart");
    expect(
      towerProblem(
        { first: [[-3.04, 10]], second: [[5, 10]] },
        { zRoot: 100, zTip: 600, towerSpacing: 1000 },
        [1200, 600],
        letters,
      ),
    ).toBe("the X axis would have to reach -3 mm; its travel is 0–1200 mm");
    expect(
      towerProblem(
        { first: [[5, 10]], second: [[5, 612]] },
        { zRoot: 100, zTip: 600, towerSpacing: 1000 },
        [1200, 600],
        letters,
      ),
    ).toBe("the V axis would have to reach 612 mm; its travel is 0–600 mm");
    expect(() => toTowers([[0, 0]], [[0, 0]], { zRoot: 500, zTip: 500, towerSpacing: 1000 })).toThrow(FourAxisError);
  });
});

describe("tapered panels as programs", () => {
  const panel = { kind: "naca" as const, code: "2412", chordMm: 240, tipChordMm: 150, spanMm: 500, sweepMm: 30 };
  const s = partSections(panel);
  const box = partGeometry(panel).size; // [500, 240.04, 29.19]: span, chord extent with the sweep, height
  const size: [number, number] = [box[1], box[2]];

  it("refuses a tapered panel on a 2-axis machine, naming both", () => {
    const flat = cutter({ fourAxis: false, dialect: { ...cutter().dialect, towerAxes: null } });
    expect(() =>
      profileProgram(
        {
          title: "wing",
          size,
          thickness: 500,
          parts: [{ name: "Wing root panel", ...s }],
          kerf: 1.5,
          feed: 250,
        },
        flat,
      ),
    ).toThrow(
      new ProgramError(
        "Wing root panel has different root and tip sections: it needs a 4-axis profile cutter, and Test profile cutter moves both ends of the wire together.",
      ),
    );
  });

  it("refuses a panel longer than the wire, and towers sent past their travel", () => {
    const input = {
      title: "wing",
      size,
      parts: [{ name: "Wing", ...s }],
      kerf: 1.5,
      feed: 250,
    };
    expect(() => profileProgram({ ...input, thickness: 1100 }, cutter())).toThrow(
      "The slab is 1100 mm long along the wire; Test profile cutter's wire spans 1000 mm.",
    );
    // The slab fits the travel (240.04 + 2 × 10 mm of air ≤ 270 mm), but the towers, reaching past
    // the faces as the panel tapers and sweeps, would have to go further.
    expect(() => profileProgram({ ...input, thickness: 500 }, cutter({ travel: [270, 600] }))).toThrow(
      /^Test profile cutter cannot cut this: the [XU] axis would have to reach 2[789]\d(\.\d)? mm; its travel is 0–270 mm\.$/,
    );
    expect(() => profileProgram({ ...input, thickness: 500, zRoot: 600 }, cutter())).toThrow(
      "Test profile cutter cannot cut this: the part would sit 100 mm outside the second tower; the towers stand 1000 mm apart.",
    );
  });

  it("cuts it with the towers where similar triangles put them, root and tip matched", () => {
    const p = profileProgram(
      { title: "wing", size, thickness: 500, parts: [{ name: "Wing", ...s }], kerf: 1.5, feed: 250 },
      cutter(),
    );
    const { zRoot, zTip, towerSpacing } = p.frame.towers;
    expect([zRoot, zTip, towerSpacing]).toEqual([250, 750, 1000]);
    for (const m of p.moves) {
      const back = wireAt(m.first, m.second, 0, towerSpacing, zRoot);
      expect(back[0]).toBeCloseTo(m.root[0], 6);
      expect(back[1]).toBeCloseTo(m.root[1], 6);
      const tip = wireAt(m.first, m.second, 0, towerSpacing, zTip);
      expect(tip[0]).toBeCloseTo(m.tip[0], 6);
      expect(tip[1]).toBeCloseTo(m.tip[1], 6);
    }
    // Every tower inside its travel: the set-up moved clear of machine zero as far as needed.
    for (const m of p.moves)
      for (const q of [m.first, m.second]) {
        expect(q[0]).toBeGreaterThanOrEqual(-1e-9);
        expect(q[1]).toBeGreaterThanOrEqual(-1e-9);
      }
    expect(p.gcode).toMatch(/^G1 X[\d.]+ Y[\d.]+ U[\d.]+ V[\d.]+ F[\d.]+$/m);
  });
});

describe("NACA sections cut to the published ordinates", () => {
  // NACA 0012 at 30 % of the chord: ±6.002 % (NACA Report 824, Abbott, von Doenhoff & Stivers, 1945,
  // table of the basic thickness form; from memory, as in tests/reference/profiles.test.ts). On a
  // 200 mm chord: ±12.004 mm; the table's last place is 0.001 % = 0.002 mm, and the surface is level
  // there, so the path of a 1.5 mm kerf passes 0.75 mm above and below it.
  it("NACA 0012 of 200 mm chord: the section and its path at 30 % chord (Report 824: ±6.002 % c)", () => {
    const sec = partSections({ kind: "naca", code: "0012", chordMm: 200, spanMm: 400 });
    const outer = sec.root.outer;
    const half = (Math.max(...outer.map((q) => q[1])) - Math.min(...outer.map((q) => q[1]))) / 2;
    const chordLine = Math.min(...outer.map((q) => q[1])) + half;
    const at = (loop: [number, number][], x: number, upper: boolean) => {
      const ys: number[] = [];
      for (let i = 0; i < loop.length; i++) {
        const a = loop[i]!;
        const b = loop[(i + 1) % loop.length]!;
        if ((a[0] - x) * (b[0] - x) <= 0 && a[0] !== b[0]) ys.push(a[1] + ((x - a[0]) / (b[0] - a[0])) * (b[1] - a[1]));
      }
      return upper ? Math.max(...ys) : Math.min(...ys);
    };
    expect(at(outer, 60, true) - chordLine).toBeCloseTo(12.004, 2);
    expect(chordLine - at(outer, 60, false)).toBeCloseTo(12.004, 2);
    // The formula the app uses agrees with the table at that station (a second, independent route).
    expect(surfaceAt(parseNaca("0012"), 0.3).upper[1] * 200).toBeCloseTo(12.004, 2);
    const t = toolpath(outer, [], { kerf: 1.5 });
    expect(at(t.outer, 60, true) - chordLine).toBeCloseTo(12.004 + 0.75, 2);
    expect(chordLine - at(t.outer, 60, false)).toBeCloseTo(12.004 + 0.75, 2);
  });
});
