/**
 * The wire's path round a profile (lib/profiles/toolpath.ts) against hand-worked geometry: offsets
 * of a square and a circle, a notch narrower than the kerf, lead-ins, slits, direction and dwells.
 */
import { describe, expect, it } from "vitest";
import { polygonArea, type Point } from "@/lib/profiles";
import { ARC_TOLERANCE_MM, toolpath, ToolpathError } from "@/lib/profiles/toolpath";

const rect = (x0: number, y0: number, x1: number, y1: number): Point[] => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
];
const circle = (r: number, n: number, c: Point = [0, 0]): Point[] =>
  Array.from({ length: n }, (_, i) => [
    c[0] + r * Math.cos((2 * Math.PI * i) / n),
    c[1] + r * Math.sin((2 * Math.PI * i) / n),
  ]);
const perimeter = (loop: readonly Point[]) =>
  loop.reduce(
    (s, p, i) => s + Math.hypot(loop[(i + 1) % loop.length]![0] - p[0], loop[(i + 1) % loop.length]![1] - p[1]),
    0,
  );
const dist = (a: Point, b: Point) => Math.hypot(a[0] - b[0], a[1] - b[1]);

describe("offsets against hand-worked geometry", () => {
  // Hand-worked geometry (Steiner's formula for the parallel body of a convex polygon at distance r):
  // area A + P·r + π·r², perimeter P + 2π·r. For a square of side s: s² + 4·s·r + π·r² and 4·s + 2π·r.
  it("a 100 mm square with a 2 mm kerf: area s² + 4sr + πr², perimeter 4s + 2πr (r = 1 mm)", () => {
    const s = 100;
    const r = 1;
    const t = toolpath(rect(0, 0, s, s), [], { kerf: 2 * r });
    const area = Math.abs(polygonArea(t.outer));
    // The round joins are chords of the true arcs: inside them by at most the arc tolerance.
    const arcs = 2 * Math.PI * r;
    expect(area).toBeLessThanOrEqual(s * s + 4 * s * r + Math.PI * r * r + 1e-6);
    expect(area).toBeGreaterThan(s * s + 4 * s * r + Math.PI * r * r - ARC_TOLERANCE_MM * arcs);
    // Chords of sagitta h shorten an arc of radius r by about θ²/24 of its length, θ² = 8h/r: 2πh/3 in all.
    expect(perimeter(t.outer)).toBeLessThanOrEqual(4 * s + 2 * Math.PI * r + 1e-6);
    expect(perimeter(t.outer)).toBeGreaterThan(4 * s + 2 * Math.PI * r - (2 * Math.PI * ARC_TOLERANCE_MM) / 3 - 1e-3);
    // Every point of the path is r from the square (outside it): on the arcs r from a corner, else r from a side.
    for (const p of t.outer) {
      const dx = Math.max(0 - p[0], 0, p[0] - s);
      const dy = Math.max(0 - p[1], 0, p[1] - s);
      expect(Math.hypot(dx, dy)).toBeCloseTo(r, 3);
    }
    expect(t.warnings).toEqual([]);
  });

  // Hand-worked geometry: a circle of radius R offset outward by r is the circle of radius R + r;
  // a hole of radius Rh offset inward (the foam grows into it) is the circle of radius Rh − r.
  it("a circle R = 50 mm becomes R + r; a round hole of 20 mm becomes 20 − r (kerf 1.5 mm)", () => {
    const r = 0.75;
    // 720 points: the chords sag R(1 − cos(π/720)) ≈ 0.0005 mm inside the true circle.
    const t = toolpath(circle(50, 720), [circle(20, 720)], { kerf: 2 * r });
    for (const p of t.outer) expect(Math.hypot(p[0], p[1])).toBeCloseTo(50 + r, 2);
    expect(t.holes).toHaveLength(1);
    for (const p of t.holes[0]!.loop) expect(Math.hypot(p[0], p[1])).toBeCloseTo(20 - r, 2);
    expect(Math.abs(polygonArea(t.outer))).toBeCloseTo(Math.PI * (50 + r) ** 2, 0);
    expect(Math.abs(polygonArea(t.holes[0]!.loop))).toBeCloseTo(Math.PI * (20 - r) ** 2, 0);
  });

  it("a notch 2 mm wide and 60 mm deep with a 3 mm kerf is bridged, and the warning says where", () => {
    const notched: Point[] = [
      [0, 0],
      [100, 0],
      [100, 100],
      [51, 100],
      [51, 40],
      [49, 40],
      [49, 100],
      [0, 100],
    ];
    const t = toolpath(notched, [], { kerf: 3 });
    expect(t.warnings).toHaveLength(1);
    expect(t.warnings[0]).toMatch(/^A notch near \(50, \d+(\.\d)?\) mm is narrower than the kerf \(3 mm\)/);
    // The path passes over the notch: along the top at y = 101.5 without going down into it.
    expect(t.outer.every((p) => !(p[0] > 48 && p[0] < 52 && p[1] < 99))).toBe(true);
    // A 5 mm notch takes the 3 mm kerf: no warning, and the path goes down into it.
    const wide: Point[] = notched.map(([x, y]) => [x === 51 ? 52.5 : x === 49 ? 47.5 : x, y]);
    const w = toolpath(wide, [], { kerf: 3 });
    expect(w.warnings).toEqual([]);
    expect(Math.min(...w.outer.filter((p) => p[0] > 47 && p[0] < 53).map((p) => p[1]))).toBeCloseTo(41.5, 3);
  });

  it("a hole narrower than the kerf everywhere stays foam, and says so", () => {
    const t = toolpath(rect(0, 0, 50, 50), [rect(20, 20, 21, 30)], { kerf: 2 });
    expect(t.holes).toEqual([]);
    expect(t.warnings).toEqual([
      "Hole 1 is narrower than the kerf (2 mm) everywhere: the wire cannot cut it, so it stays foam.",
    ]);
  });
});

describe("lead-in, slits, direction and dwells", () => {
  const blank = { min: [0, 0] as Point, max: [200, 100] as Point };

  it("enters from the nearest face of the blank, square to it, at the middle of the flat side facing it", () => {
    const t = toolpath(rect(150, 20, 190, 80), [], { kerf: 2, blank, faces: ["left", "right", "top"] });
    expect(t.leadIn).toEqual({ face: "right", from: [200, 50], to: [191, 50] });
    expect(t.leadOut).toEqual({ face: "right", from: [191, 50], to: [200, 50] });
    expect(t.route[0]!.p).toEqual([200, 50]);
    expect(t.route.at(-1)!.p).toEqual([200, 50]);
    expect(t.outer[0]).toEqual([191, 50]);
    // Lead-in + loop + lead-out: 9 + (2·40 + 2·60 + 2π) + 9 mm.
    expect(t.lengthMm).toBeCloseTo(18 + 200 + 2 * Math.PI, 1);
  });

  it("leaves out faces the wire cannot come from (the table under a horizontal wire)", () => {
    const t = toolpath(rect(80, 5, 120, 60), [], { kerf: 2, blank, faces: ["left", "right", "top"] });
    expect(t.leadIn.face).toBe("top");
    expect(t.leadIn.from).toEqual([100, 100]);
  });

  it("enters at the planner's point from the nearest face, or says the point cannot be reached", () => {
    const t = toolpath(rect(150, 20, 190, 80), [], { kerf: 2, blank, leadIn: [170, 90] });
    expect(t.leadIn.face).toBe("top");
    expect(t.leadIn.from).toEqual([170, 100]);
    expect(t.leadIn.to).toEqual([170, 81]);
    // A lead-in that would have to cut another part.
    expect(() =>
      toolpath(rect(80, 40, 120, 60), [], {
        kerf: 2,
        blank,
        faces: ["top"],
        leadIn: [100, 70],
        avoid: [rect(60, 70, 140, 90)],
      }),
    ).toThrow(/No straight lead-in from a face of the blank reaches the point chosen at \(100, 70\) mm/);
  });

  it("reaches a hole by the shortest slit from the outer loop, or from the planner's point", () => {
    const outer = rect(0, 0, 100, 100);
    const hole = rect(10, 40, 30, 60);
    const t = toolpath(outer, [hole], { kerf: 2 });
    expect(t.slits).toHaveLength(1);
    const s = t.slits[0]!;
    // From the outer path at x = −1 to the hole's path at x = 11: 12 mm, level.
    expect(s.from[0]).toBeCloseTo(-1, 6);
    expect(s.to[0]).toBeCloseTo(11, 6);
    expect(s.from[1]).toBeCloseTo(s.to[1], 6);
    // The route goes out along the slit and back the same way.
    const i = t.route.findIndex((q) => dist(q.p, s.to) < 1e-9);
    expect(dist(t.route[i - 1]!.p, s.from)).toBeLessThan(1e-9);
    const back = t.route.findIndex((q, k) => k > i + 1 && dist(q.p, s.to) < 1e-9);
    expect(dist(t.route[back + 1]!.p, s.from)).toBeLessThan(1e-9);
    // The planner's point on the top side: the slit starts right there and goes to the hole's nearest corner.
    const moved = toolpath(outer, [hole], { kerf: 2, slits: [[50, 100]] });
    expect(moved.slits[0]!.from).toEqual([50, 101]);
    expect(moved.slits[0]!.to[0]).toBeCloseTo(29, 6);
    expect(moved.slits[0]!.to[1]).toBeCloseTo(59, 6);
  });

  it("goes round the outer loop as asked and round holes the other way", () => {
    const ccw = toolpath(rect(0, 0, 100, 100), [rect(40, 40, 60, 60)], { kerf: 2 });
    expect(polygonArea(ccw.outer)).toBeGreaterThan(0);
    expect(polygonArea(ccw.holes[0]!.loop)).toBeLessThan(0);
    const cw = toolpath(rect(0, 0, 100, 100), [rect(40, 40, 60, 60)], { kerf: 2, direction: "cw" });
    expect(polygonArea(cw.outer)).toBeLessThan(0);
    expect(polygonArea(cw.holes[0]!.loop)).toBeGreaterThan(0);
  });

  // Common practice, no source: the wire lags behind in the foam and cuts a sharp corner round
  // unless it waits there a moment; the threshold angle and the wait are the planner's.
  it("dwells at the corners turning at least the threshold, where the outside arc begins", () => {
    const t = toolpath(rect(0, 0, 100, 50), [], { kerf: 2, dwell: { angleDeg: 45, seconds: 0.5 } });
    expect(t.corners).toHaveLength(4);
    // Anticlockwise from the middle of the left side (-1, 25): down to (-1, 0), where the corner's arc begins.
    expect(t.leadIn.face).toBe("left");
    const first = t.route.find((q) => q.dwell)!;
    expect(first.p[0]).toBeCloseTo(-1, 6);
    expect(first.p[1]).toBeCloseTo(0, 6);
    expect(first.dwell).toBe(0.5);
    const none = toolpath(rect(0, 0, 100, 50), [], { kerf: 2, dwell: { angleDeg: 100, seconds: 0.5 } });
    expect(none.corners).toEqual([]);
  });

  it("refuses a zero kerf and an outline that crosses itself, with the reason", () => {
    expect(() => toolpath(rect(0, 0, 10, 10), [], { kerf: 0 })).toThrow(ToolpathError);
    expect(() =>
      toolpath(
        [
          [0, 0],
          [10, 10],
          [10, 0],
          [0, 10],
        ],
        [],
        { kerf: 1 },
      ),
    ).toThrow(/Edges 1 and 3 cross or touch/);
  });
});
