import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  ProfileError,
  checkPolygon,
  parseNaca,
  parsePoints,
  partGeometry,
  polygonArea,
  polygonBounds,
  outline,
  type Point,
} from "@/lib/profiles";

describe("reading NACA codes", () => {
  it("reads NACA 2412, naca0012 and 0012", () => {
    expect(parseNaca("NACA 2412").code).toBe("2412");
    expect(parseNaca("naca0012")).toEqual({ code: "0012", m: 0, p: 0, t: 0.12 });
    expect(parseNaca(" 0012 ").t).toBe(0.12);
  });

  it.each([
    ["", /Enter a NACA/],
    ["24A2", /not a NACA 4-digit code/],
    ["23012", /5 digits/],
    ["2400", /zero thickness/],
    ["2012", /camber but no camber position/],
    ["0412", /symmetric section/],
  ])("refuses %j with a clear message", (code, message) => {
    expect(() => parseNaca(code)).toThrow(ProfileError);
    expect(() => parseNaca(code)).toThrow(message);
  });
});

describe("polygons", () => {
  it("refuses fewer than 3 points, repeats, self-intersection and no area", () => {
    expect(
      checkPolygon([
        [0, 0],
        [1, 0],
      ]),
    ).toMatch(/at least 3 points/);
    expect(
      checkPolygon([
        [0, 0],
        [1, 0],
        [1, 0],
        [0, 1],
      ]),
    ).toMatch(/same point/);
    expect(
      checkPolygon([
        [0, 0],
        [1, 1],
        [1, 0],
        [0, 1],
      ]),
    ).toMatch(/cross/);
    expect(
      checkPolygon([
        [0, 0],
        [1, 0],
        [2, 0],
      ]),
    ).toMatch(/cross|no area/);
    expect(
      checkPolygon([
        [0, 0],
        [1, 0],
        [1, 1],
      ]),
    ).toBeNull();
  });

  it("reads and refuses point lists", () => {
    expect(parsePoints("0 0; 100 0; 100,50")).toEqual([
      [0, 0],
      [100, 0],
      [100, 50],
    ]);
    expect(() => parsePoints("0 0; 100; 5 5")).toThrow(/Point 2/);
  });

  it("refuses a bowtie profile and a zero extrusion through partGeometry", () => {
    expect(() =>
      partGeometry({
        kind: "polygon",
        points: [
          [0, 0],
          [1, 1],
          [1, 0],
          [0, 1],
        ],
        extrudeMm: 5,
      }),
    ).toThrow(/cross/);
    expect(() =>
      partGeometry({
        kind: "polygon",
        points: [
          [0, 0],
          [1, 0],
          [0, 1],
        ],
        extrudeMm: 0,
      }),
    ).toThrow(/extrusion/);
  });
});

// Random convex polygons: points on a circle at sorted angles (never self-intersecting).
const convex = fc
  .array(fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), { minLength: 3, maxLength: 24 })
  .map((as) => [...new Set(as.map((a) => Math.round(a * 1000) / 1000))].sort((a, b) => a - b))
  .filter((as) => as.length >= 3)
  .chain((as) =>
    fc.record({
      as: fc.constant(as),
      r: fc.double({ min: 1, max: 1000, noNaN: true }),
      cx: fc.double({ min: -500, max: 500, noNaN: true }),
      cy: fc.double({ min: -500, max: 500, noNaN: true }),
    }),
  )
  .map(({ as, r, cx, cy }) => as.map((a) => [cx + r * Math.cos(a), cy + r * Math.sin(a)] as Point))
  .filter((pts) => Math.abs(polygonArea(pts)) > 1e-6);

describe("properties", () => {
  it("scaling a polygon by k scales its area by k²", () => {
    fc.assert(
      fc.property(convex, fc.double({ min: 0.01, max: 100, noNaN: true }), (pts, k) => {
        const a = polygonArea(pts);
        const b = polygonArea(pts.map(([x, y]) => [x * k, y * k] as Point));
        expect(b).toBeCloseTo(a * k * k, Math.max(0, 6 - Math.ceil(Math.log10(Math.abs(a * k * k) + 1))));
      }),
    );
  });

  it("the bounding box contains every outline point (polygons)", () => {
    fc.assert(
      fc.property(convex, fc.double({ min: 1, max: 5000, noNaN: true }), (pts, extrude) => {
        const b = polygonBounds(pts);
        const g = partGeometry({ kind: "polygon", points: pts, extrudeMm: extrude });
        for (const [x, y] of pts) {
          expect(x - b.min[0]).toBeLessThanOrEqual(g.size[1] + 1e-9);
          expect(y - b.min[1]).toBeLessThanOrEqual(g.size[2] + 1e-9);
        }
        expect(g.size[0]).toBeGreaterThanOrEqual(extrude - 1e-6);
      }),
    );
  });

  it("the bounding box contains every point of a NACA panel's root and tip outlines", () => {
    const digits = fc.tuple(
      fc.integer({ min: 0, max: 9 }),
      fc.integer({ min: 1, max: 9 }),
      fc.integer({ min: 6, max: 24 }),
    );
    fc.assert(
      fc.property(
        digits,
        fc.double({ min: 20, max: 800, noNaN: true }),
        fc.double({ min: 20, max: 800, noNaN: true }),
        ([m, p, t], cr, ct) => {
          const code = `${m}${m === 0 ? 0 : p}${String(t).padStart(2, "0")}`;
          const g = partGeometry({ kind: "naca", code, chordMm: cr, tipChordMm: ct, spanMm: 500 });
          const s = parseNaca(code);
          const pts = [...outline(s, cr, 80), ...outline(s, ct, 80)];
          const b = polygonBounds(pts);
          expect(b.size[0]).toBeLessThanOrEqual(g.size[1] + 1e-6);
          expect(b.size[1]).toBeLessThanOrEqual(g.size[2] + 1e-6);
          expect(g.trueVolumeMm3).toBeLessThan(g.size[0] * g.size[1] * g.size[2]);
        },
      ),
    );
  });
});
