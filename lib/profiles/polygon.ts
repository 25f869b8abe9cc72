/**
 * Polygons in the cutting plane (a 2-axis cutter extrudes one such profile along the wire).
 * Pure: no I/O.
 */

/** A point in the cutting plane, mm (or chord fractions for unit sections). */
export type Point = [number, number];

/**
 * Signed shoelace area: positive when the points run anticlockwise. No checks; see `checkPolygon`.
 *
 *   polygonArea([[0, 0], [1, 0], [1, 1], [0, 1]])  // 1
 */
export function polygonArea(points: readonly Point[]): number {
  let twice = 0;
  for (let i = 0; i < points.length; i++) {
    const [x0, y0] = points[i]!;
    const [x1, y1] = points[(i + 1) % points.length]!;
    twice += x0 * y1 - x1 * y0;
  }
  return twice / 2;
}

/**
 * The smallest axis-aligned box holding every point.
 *
 *   polygonBounds([[0, 0], [3, 0], [0, 4]])  // { min: [0, 0], max: [3, 4], size: [3, 4] }
 */
export function polygonBounds(points: readonly Point[]): { min: Point; max: Point; size: Point } {
  let minX = Infinity,
    minY = Infinity,
    maxX = -Infinity,
    maxY = -Infinity;
  for (const [x, y] of points) {
    if (x < minX) minX = x;
    if (y < minY) minY = y;
    if (x > maxX) maxX = x;
    if (y > maxY) maxY = y;
  }
  return { min: [minX, minY], max: [maxX, maxY], size: [maxX - minX, maxY - minY] };
}

function orient(a: Point, b: Point, c: Point): number {
  return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
}

function onSegment(a: Point, b: Point, p: Point): boolean {
  return (
    Math.min(a[0], b[0]) <= p[0] &&
    p[0] <= Math.max(a[0], b[0]) &&
    Math.min(a[1], b[1]) <= p[1] &&
    p[1] <= Math.max(a[1], b[1])
  );
}

function segmentsMeet(a: Point, b: Point, c: Point, d: Point): boolean {
  const d1 = orient(c, d, a),
    d2 = orient(c, d, b),
    d3 = orient(a, b, c),
    d4 = orient(a, b, d);
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) return true;
  if (d1 === 0 && onSegment(c, d, a)) return true;
  if (d2 === 0 && onSegment(c, d, b)) return true;
  if (d3 === 0 && onSegment(a, b, c)) return true;
  if (d4 === 0 && onSegment(a, b, d)) return true;
  return false;
}

/**
 * Why these points are not a simple polygon a wire can follow, or null when they are: fewer than
 * three points, a point that is not a number, repeated neighbours, no area, or edges that cross.
 *
 *   checkPolygon([[0, 0], [1, 1], [1, 0], [0, 1]])  // "Edges 1 and 3 cross: …"
 */
export function checkPolygon(points: readonly Point[]): string | null {
  if (points.length < 3) return `A profile needs at least 3 points; this one has ${points.length}.`;
  for (const [i, p] of points.entries()) {
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) return `Point ${i + 1} is not a pair of numbers.`;
  }
  const n = points.length;
  for (let i = 0; i < n; i++) {
    const a = points[i]!,
      b = points[(i + 1) % n]!;
    if (a[0] === b[0] && a[1] === b[1]) return `Points ${i + 1} and ${((i + 1) % n) + 1} are the same point.`;
  }
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const adjacent = j === i + 1 || (i === 0 && j === n - 1);
      if (adjacent) continue;
      if (segmentsMeet(points[i]!, points[(i + 1) % n]!, points[j]!, points[(j + 1) % n]!)) {
        return `Edges ${i + 1} and ${j + 1} cross or touch: the outline must not cross itself.`;
      }
    }
  }
  if (Math.abs(polygonArea(points)) < 1e-9) return "The points enclose no area.";
  return null;
}

/** Is `p` strictly inside the polygon (even-odd ray cast; points on an edge count as outside)? */
export function pointInPolygon(p: Point, poly: readonly Point[]): boolean {
  let inside = false;
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
    const [xi, yi] = poly[i]!;
    const [xj, yj] = poly[j]!;
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/**
 * Why an outer loop with holes is not a profile a wire can cut, or null when it is: each loop a
 * simple polygon (`checkPolygon`), every hole inside the outer loop, no two loops crossing or
 * touching, no hole inside another hole.
 *
 *   checkOutline(square(100), [square(200)])  // "Hole 1 is not inside the outer loop."
 */
export function checkOutline(outer: readonly Point[], holes: readonly (readonly Point[])[] = []): string | null {
  const own = checkPolygon(outer);
  if (own) return holes.length ? `Outer loop: ${own}` : own;
  for (const [h, hole] of holes.entries()) {
    const problem = checkPolygon(hole);
    if (problem) return `Hole ${h + 1}: ${problem}`;
    const loops: [string, readonly Point[]][] = [
      ["the outer loop", outer],
      ...holes.slice(0, h).map((o, i): [string, readonly Point[]] => [`hole ${i + 1}`, o]),
    ];
    for (const [name, loop] of loops) {
      for (let i = 0; i < hole.length; i++) {
        for (let j = 0; j < loop.length; j++) {
          if (segmentsMeet(hole[i]!, hole[(i + 1) % hole.length]!, loop[j]!, loop[(j + 1) % loop.length]!)) {
            return `Hole ${h + 1} crosses or touches ${name}.`;
          }
        }
      }
    }
    if (!pointInPolygon(hole[0]!, outer)) return `Hole ${h + 1} is not inside the outer loop.`;
    for (const [i, other] of holes.slice(0, h).entries()) {
      if (pointInPolygon(hole[0]!, other) || pointInPolygon(other[0]!, hole))
        return `Holes ${i + 1} and ${h + 1} lie one inside the other.`;
    }
  }
  return null;
}

/** Area of an outer loop less its holes, unsigned. */
export function outlineArea(outer: readonly Point[], holes: readonly (readonly Point[])[] = []): number {
  return Math.abs(polygonArea(outer)) - holes.reduce((s, h) => s + Math.abs(polygonArea(h)), 0);
}

/**
 * Reads "x y; x y; …" (commas also accepted between the two numbers of a point).
 *
 *   parsePoints("0 0; 100 0; 100 50")  // [[0, 0], [100, 0], [100, 50]]
 */
export function parsePoints(text: string): Point[] {
  const pts: Point[] = [];
  const chunks = String(text ?? "")
    .split(";")
    .map((c) => c.trim())
    .filter(Boolean);
  for (const [i, chunk] of chunks.entries()) {
    const nums = chunk.split(/[\s,]+/).filter(Boolean);
    if (nums.length !== 2 || nums.some((v) => !/^-?\d+(\.\d+)?$/.test(v))) {
      throw new Error(`Point ${i + 1} (“${chunk.slice(0, 30)}”) is not two numbers “x y”.`);
    }
    pts.push([Number(nums[0]), Number(nums[1])]);
  }
  return pts;
}

/**
 * Writes points back as "x y; x y; …" (to a thousandth of a millimetre).
 *
 *   formatPoints([[0, 0], [100, 0], [100, 50.25]])  // "0 0; 100 0; 100 50.25"
 */
export function formatPoints(points: readonly Point[]): string {
  return points.map(([x, y]) => `${round(x)} ${round(y)}`).join("; ");
}

const round = (v: number) => Math.round(v * 1000) / 1000;
