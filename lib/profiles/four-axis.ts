/**
 * 4-axis cutting of a panel whose two end sections differ (a tapered or swept wing core): the root
 * and tip paths matched point for point by their share of the path's length, and each wire line
 * carried out to the machine's two tower planes, where the axes actually move. Pure: no I/O.
 *
 * Frame: the wire runs along z from the first tower (z = 0, axes X Y) to the second (z = the tower
 * spacing, axes U V); the part's root face sits at zRoot and its tip face at zTip.
 */
import type { Point } from "./polygon";

/** Why a 4-axis cut cannot be made on a machine; the message names the limit. */
export class FourAxisError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "FourAxisError";
  }
}

const dist = (a: Point, b: Point) => Math.hypot(a[0] - b[0], a[1] - b[1]);

/** Cumulative length shares (0 … 1) of a polyline's points. */
function shares(line: readonly Point[]): number[] {
  const acc = [0];
  for (let i = 1; i < line.length; i++) acc.push(acc[i - 1]! + dist(line[i - 1]!, line[i]!));
  const total = acc.at(-1)!;
  return acc.map((v) => (total > 0 ? v / total : 0));
}

/** The point at share `s` of a polyline whose shares are `sh`. */
function pointAt(line: readonly Point[], sh: readonly number[], s: number): Point {
  let i = 1;
  while (i < sh.length - 1 && sh[i]! < s) i++;
  const s0 = sh[i - 1]!;
  const s1 = sh[i]!;
  const t = s1 > s0 ? (s - s0) / (s1 - s0) : 0;
  const a = line[i - 1]!;
  const b = line[i]!;
  return [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
}

/**
 * Two polylines that start at corresponding points and run the same way (a root and a tip path,
 * both from the trailing edge, say), resampled at the union of their points' shares of their own
 * lengths: the i-th points of the two answers are one wire line. Each answer keeps every point of
 * its own polyline; the first and last points stay matched.
 *
 *   matchByShare([[0, 0], [10, 0]], [[0, 0], [4, 0], [20, 0]])
 *   // → [[[0, 0], [2, 0], [10, 0]], [[0, 0], [4, 0], [20, 0]]]
 */
export function matchByShare(a: readonly Point[], b: readonly Point[]): [Point[], Point[]] {
  const sa = shares(a);
  const sb = shares(b);
  const all = [...sa, ...sb].sort((x, y) => x - y);
  const merged: number[] = [];
  for (const s of all) if (!merged.length || s - merged.at(-1)! > 1e-12) merged.push(s);
  return [merged.map((s) => pointAt(a, sa, s)), merged.map((s) => pointAt(b, sb, s))];
}

/**
 * Where the wire through `root` (in the plane z = zRoot) and `tip` (z = zTip) crosses the plane z:
 * similar triangles, P(z) = root + (tip − root)·(z − zRoot)/(zTip − zRoot).
 *
 *   wireAt([100, 50], [80, 50], 200, 700, 0)  // → [108, 50] (the first tower, 200 mm before the root)
 */
export function wireAt(root: Point, tip: Point, zRoot: number, zTip: number, z: number): Point {
  const t = (z - zRoot) / (zTip - zRoot);
  return [root[0] + (tip[0] - root[0]) * t, root[1] + (tip[1] - root[1]) * t];
}

export interface TowerPlacement {
  /** Distance from the first tower to the root face, mm. */
  zRoot: number;
  /** Distance from the first tower to the tip face, mm. */
  zTip: number;
  /** Distance between the towers (the wire's span), mm. */
  towerSpacing: number;
}

/**
 * The matched root and tip points carried to the two towers: for each, the first tower's
 * position (z = 0) and the second's (z = towerSpacing).
 *
 *   toTowers([[100, 50]], [[80, 50]], { zRoot: 200, zTip: 700, towerSpacing: 1000 })
 *   // → { first: [[108, 50]], second: [[68, 50]] }
 */
export function toTowers(
  root: readonly Point[],
  tip: readonly Point[],
  place: TowerPlacement,
): { first: Point[]; second: Point[] } {
  if (root.length !== tip.length) throw new Error("root and tip paths must be matched point for point");
  if (!(place.zTip > place.zRoot))
    throw new FourAxisError("The tip face must lie further along the wire than the root face.");
  return {
    first: root.map((p, i) => wireAt(p, tip[i]!, place.zRoot, place.zTip, 0)),
    second: root.map((p, i) => wireAt(p, tip[i]!, place.zRoot, place.zTip, place.towerSpacing)),
  };
}

/**
 * Why the towers cannot make these paths, or null: the part longer than the towers are apart or
 * sitting outside them, or a tower sent outside its travel (0 … travel on each axis); the answer
 * names the axis, how far it would have to go and the limit.
 *
 *   towerProblem({ first: [[-3, 10]], second: [[5, 10]] }, { zRoot: 100, zTip: 600, towerSpacing: 1000 }, [1200, 600], ["X", "Y", "U", "V"])
 *   // → "the X axis would have to reach -3 mm; its travel is 0–1200 mm"
 */
export function towerProblem(
  towers: { first: readonly Point[]; second: readonly Point[] },
  place: TowerPlacement,
  travel: readonly [number, number],
  letters: readonly [string, string, string, string],
): string | null {
  const tol = 1e-6;
  if (place.zTip - place.zRoot > place.towerSpacing + tol)
    return `the part is ${round(place.zTip - place.zRoot)} mm long along the wire; the towers stand ${round(place.towerSpacing)} mm apart`;
  if (place.zRoot < -tol || place.zTip > place.towerSpacing + tol)
    return `the part would sit ${place.zRoot < 0 ? `${round(-place.zRoot)} mm outside the first tower` : `${round(place.zTip - place.towerSpacing)} mm outside the second tower`}; the towers stand ${round(place.towerSpacing)} mm apart`;
  const sides: [readonly Point[], string, string][] = [
    [towers.first, letters[0], letters[1]],
    [towers.second, letters[2], letters[3]],
  ];
  for (const [pts, a, b] of sides)
    for (const p of pts)
      for (const [k, letter] of [
        [0, a],
        [1, b],
      ] as const) {
        const v = p[k]!;
        if (v < -tol || v > travel[k]! + tol)
          return `the ${letter} axis would have to reach ${round(v)} mm; its travel is 0–${round(travel[k]!)} mm`;
      }
  return null;
}

const round = (v: number) => Math.round(v * 10) / 10;
