import { describe, expect, it } from "vitest";
import {
  camber,
  parseNaca,
  partGeometry,
  polygonArea,
  sectionArea,
  sectionBox,
  surfaceAt,
  taperedVolume,
  thickness,
} from "@/lib/profiles";

// NACA 0012 ordinates, y/c in % of chord (upper surface; the lower is its mirror image).
// Source: NACA Report 824 (Abbott, von Doenhoff & Stivers, 1945), table of basic thickness forms;
// repeated in Abbott & von Doenhoff, "Theory of Wing Sections" (1959), Appendix I.
// Values from memory of the printed table — not checked against a copy of the text here.
// The table prints three decimals of % chord, so the tolerance is half a unit in the last place
// plus the table's own rounding of the station values: 0.005 % of the chord.
const NACA_0012: [number, number][] = [
  [1.25, 1.894],
  [2.5, 2.615],
  [5, 3.555],
  [7.5, 4.2],
  [10, 4.683],
  [15, 5.345],
  [20, 5.737],
  [25, 5.941],
  [30, 6.002],
  [40, 5.803],
  [50, 5.294],
  [60, 4.563],
  [70, 3.664],
  [80, 2.623],
  [90, 1.448],
  [95, 0.807],
  [100, 0.126],
];

describe("NACA 4-digit thickness distribution against NACA Report 824", () => {
  it.each(NACA_0012)(
    "NACA 0012 at x = %s percent c: y = ±%s percent c (Report 824 table, from memory)",
    (xPct, yPct) => {
      const s = parseNaca("0012");
      const { upper, lower } = surfaceAt(s, xPct / 100);
      expect(Math.abs(upper[1] * 100 - yPct)).toBeLessThan(0.005);
      expect(Math.abs(lower[1] * 100 + yPct)).toBeLessThan(0.005);
    },
  );

  // The trade brief names no NACA ordinates. Source: the NACA 4-digit thickness formula of NACA
  // Report 824 (Abbott, von Doenhoff & Stivers, 1945), y = 5t(0.2969√x − 0.1260x − 0.3516x² +
  // 0.2843x³ − 0.1015x⁴), evaluated here independently of the app for t = 0.12; the three values
  // also appear in the Report's NACA 0012 table above (from memory).
  it("three NACA 0012 ordinates by the 4-digit formula: 0.30c ±6.002 %, 0.10c ±4.683 %, 0.0125c ±1.894 % (NACA Report 824)", () => {
    const formula = (t: number, x: number) =>
      5 * t * (0.2969 * Math.sqrt(x) - 0.126 * x - 0.3516 * x ** 2 + 0.2843 * x ** 3 - 0.1015 * x ** 4);
    for (const [x, y] of [
      [0.3, 6.002],
      [0.1, 4.683],
      [0.0125, 1.894],
    ] as const) {
      expect(formula(0.12, x) * 100).toBeCloseTo(y, 2);
      expect(thickness(0.12, x) * 100).toBeCloseTo(y, 2);
    }
  });

  it("has its maximum thickness t at 30 % chord (Abbott & von Doenhoff §6.4: the 4-digit sections' maximum is near 0.3c)", () => {
    let best = 0;
    let at = 0;
    for (let i = 1; i < 1000; i++) {
      const y = thickness(0.12, i / 1000);
      if (y > best) [best, at] = [y, i / 1000];
    }
    expect(at).toBeCloseTo(0.3, 1);
    expect(2 * best).toBeCloseTo(0.12, 3);
  });
});

describe("NACA 4-digit section area", () => {
  // ∫₀¹ 2·yt dx = 10t·(0.2969·2/3 − 0.1260/2 − 0.3516/3 + 0.2843/4 − 0.1015/5) ≈ 0.685·t
  // (integral of the thickness polynomial; calculus, no further source).
  const closedForm = (t: number) => 10 * t * (0.2969 * (2 / 3) - 0.126 / 2 - 0.3516 / 3 + 0.2843 / 4 - 0.1015 / 5);

  it("the closed form is 0.685·t·c² to three figures (derivation above)", () => {
    expect(closedForm(1)).toBeCloseTo(0.685, 3);
  });

  // Laying the thickness off perpendicular to the camber line changes the area by a second-order
  // amount in the camber slope: nothing for symmetric sections, under 0.5 percent up to 4 percent
  // camber, about 0.8 percent for a 6 percent camber.
  it.each([
    ["0012", 1e-4],
    ["0009", 1e-4],
    ["0015", 1e-4],
    ["2412", 0.005],
    ["4415", 0.005],
    ["6409", 0.01],
  ] as const)("NACA %s: the outline's area matches 0.685·t·c² within a fraction %s (c = 250 mm)", (code, tol) => {
    const s = parseNaca(code);
    const c = 250;
    const expected = closedForm(s.t) * c * c;
    expect(Math.abs(sectionArea(s, c) - expected) / expected).toBeLessThan(tol);
  });

  it("a symmetric section's area converges to the closed form (shoelace on 800 points; derivation above)", () => {
    expect(sectionArea(parseNaca("0012"), 1)).toBeCloseTo(closedForm(0.12), 5);
  });
});

describe("NACA 2412 camber (Abbott & von Doenhoff §6.4: first digit m % c at second digit p/10 c)", () => {
  it("has maximum camber 2 % c at 0.4 c", () => {
    const s = parseNaca("NACA 2412");
    expect(s).toMatchObject({ m: 0.02, p: 0.4, t: 0.12 });
    expect(camber(s, 0.4).yc).toBeCloseTo(0.02, 12);
    expect(camber(s, 0.4).slope).toBeCloseTo(0, 12);
    for (let i = 0; i <= 100; i++) expect(camber(s, i / 100).yc).toBeLessThanOrEqual(0.02 + 1e-12);
    expect(camber(s, 0).yc).toBe(0);
    expect(camber(s, 1).yc).toBeCloseTo(0, 12);
  });

  it("its box is the chord by (max upper − min lower), taller above the chord line than below", () => {
    const b = sectionBox(parseNaca("2412"), 100);
    expect(b.length).toBeCloseTo(100, 0);
    expect(b.maxUpper).toBeGreaterThan(-b.minLower);
    expect(b.height).toBeGreaterThan(12);
    expect(b.height).toBeLessThan(12.5);
  });
});

describe("tapered panels (volume = A(1)·span·(cr² + cr·ct + ct²)/3; calculus on a section scaling with chord², no further source)", () => {
  it("equals the prism volume when root and tip chords are equal", () => {
    const a1 = sectionArea(parseNaca("0012"), 1);
    expect(taperedVolume(a1, 200, 200, 500)).toBeCloseTo(a1 * 200 * 200 * 500, 3);
  });

  it("matches a slice-by-slice integration of a linearly tapered panel", () => {
    const s = parseNaca("2412");
    const a1 = sectionArea(s, 1);
    const [cr, ct, span] = [250, 160, 700];
    let sum = 0;
    const n = 2000;
    for (let i = 0; i < n; i++) {
      const c = cr + ((ct - cr) * (i + 0.5)) / n;
      sum += a1 * c * c * (span / n);
    }
    const g = partGeometry({ kind: "naca", code: "2412", chordMm: cr, tipChordMm: ct, spanMm: span });
    expect(g.trueVolumeMm3 / sum).toBeCloseTo(1, 6);
    expect(g.size[0]).toBe(span);
    expect(g.size[1]).toBeGreaterThanOrEqual(cr);
    expect(g.size[2]).toBeCloseTo(sectionBox(s, 1).height * cr, 1);
  });
});

describe("polygon areas against hand-computed shapes (common practice, no source)", () => {
  it("a unit square has area 1, either way round", () => {
    expect(
      polygonArea([
        [0, 0],
        [1, 0],
        [1, 1],
        [0, 1],
      ]),
    ).toBe(1);
    expect(
      polygonArea([
        [0, 0],
        [0, 1],
        [1, 1],
        [1, 0],
      ]),
    ).toBe(-1);
  });

  it("a 3-4-5 right triangle has area 6", () => {
    expect(
      Math.abs(
        polygonArea([
          [0, 0],
          [3, 0],
          [0, 4],
        ]),
      ),
    ).toBe(6);
  });

  it("a 3-4-5 triangle extruded 10 gives a box [10, 3, 4] and a volume of 60", () => {
    expect(
      partGeometry({
        kind: "polygon",
        points: [
          [0, 0],
          [3, 0],
          [0, 4],
        ],
        extrudeMm: 10,
      }),
    ).toEqual({ size: [10, 3, 4], trueVolumeMm3: 60 });
  });
});
