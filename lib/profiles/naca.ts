/**
 * NACA 4-digit aerofoil sections (Abbott & von Doenhoff, "Theory of Wing Sections", 1959, §6.4;
 * NACA Report 824, 1945). Coordinates are fractions of the chord unless a chord is passed.
 * Pure: no I/O.
 */
import { polygonArea, type Point } from "./polygon";

export interface Naca4 {
  /** Designation as written, e.g. "2412". */
  code: string;
  /** Maximum camber, fraction of chord (first digit / 100). */
  m: number;
  /** Position of maximum camber, fraction of chord (second digit / 10). */
  p: number;
  /** Maximum thickness, fraction of chord (last two digits / 100). */
  t: number;
}

/** The reason a designation was refused; the message is written for a person. */
export class ProfileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ProfileError";
  }
}

/**
 * Reads "NACA 2412", "naca2412", "2412" or "0012".
 *
 *   parseNaca("NACA 2412")  // { code: "2412", m: 0.02, p: 0.4, t: 0.12 }
 */
export function parseNaca(input: string): Naca4 {
  const s = String(input ?? "")
    .trim()
    .replace(/^naca[\s-]*/i, "");
  if (!s) throw new ProfileError("Enter a NACA 4-digit code such as 2412 or 0012.");
  if (!/^\d+$/.test(s))
    throw new ProfileError(`“${String(input).slice(0, 20)}” is not a NACA 4-digit code: use four digits such as 2412.`);
  if (s.length !== 4)
    throw new ProfileError(
      `“${String(input).slice(0, 20)}” has ${s.length} digits; a NACA 4-digit code has exactly four (5-digit and 6-series sections are not supported).`,
    );
  const m = Number(s[0]) / 100;
  const p = Number(s[1]) / 10;
  const t = Number(s.slice(2)) / 100;
  if (t <= 0)
    throw new ProfileError(`NACA ${s} has zero thickness: the last two digits give the thickness in % of the chord.`);
  if (m > 0 && p === 0)
    throw new ProfileError(
      `NACA ${s} has camber but no camber position: the second digit must be 1–9 when the first is not 0.`,
    );
  if (m === 0 && p !== 0)
    throw new ProfileError(`NACA ${s}: a symmetric section (first digit 0) must have 0 as its second digit.`);
  return { code: s, m, p, t };
}

/**
 * Half-thickness at x (fraction of chord), fraction of chord; the classic open trailing edge.
 *
 *   thickness(0.12, 0.3)  // ≈ 0.06001 (NACA 0012 at 30 % chord)
 */
export function thickness(t: number, x: number): number {
  const xc = Math.min(1, Math.max(0, x));
  return 5 * t * (0.2969 * Math.sqrt(xc) - 0.126 * xc - 0.3516 * xc ** 2 + 0.2843 * xc ** 3 - 0.1015 * xc ** 4);
}

/**
 * Mean camber line height and slope at x, both in chord fractions.
 *
 *   camber({ m: 0.02, p: 0.4 }, 0.4)  // { yc: 0.02, slope: 0 }
 */
export function camber(s: Pick<Naca4, "m" | "p">, x: number): { yc: number; slope: number } {
  const { m, p } = s;
  if (m === 0 || p === 0) return { yc: 0, slope: 0 };
  if (x < p) return { yc: (m / p ** 2) * (2 * p * x - x * x), slope: ((2 * m) / p ** 2) * (p - x) };
  return { yc: (m / (1 - p) ** 2) * (1 - 2 * p + 2 * p * x - x * x), slope: ((2 * m) / (1 - p) ** 2) * (p - x) };
}

/**
 * Upper and lower surface points at chord station x, the thickness laid off perpendicular to the
 * camber line (so a cambered section's points move slightly fore and aft of x).
 *
 *   surfaceAt(parseNaca("0012"), 0.3)  // { upper: [0.3, 0.06001], lower: [0.3, -0.06001] }
 */
export function surfaceAt(s: Naca4, x: number): { upper: Point; lower: Point } {
  const yt = thickness(s.t, x);
  const { yc, slope } = camber(s, x);
  const th = Math.atan(slope);
  return {
    upper: [x - yt * Math.sin(th), yc + yt * Math.cos(th)],
    lower: [x + yt * Math.sin(th), yc - yt * Math.cos(th)],
  };
}

/**
 * The closed outline, scaled to `chord`: from the trailing edge along the upper surface to the
 * leading edge and back along the lower one. Cosine spacing crowds points at the nose where the
 * curvature is. The open trailing edge is closed by the straight segment between its two ends.
 *
 *   outline(parseNaca("0012"), 200, 40).length  // 79
 */
export function outline(s: Naca4, chord = 1, n = 120): Point[] {
  const xs: number[] = [];
  for (let i = 0; i <= n; i++) xs.push(0.5 * (1 - Math.cos((Math.PI * i) / n)));
  const upper = xs.map((x) => surfaceAt(s, x).upper);
  const lower = xs.map((x) => surfaceAt(s, x).lower);
  const pts = [...upper.reverse(), ...lower.slice(1)];
  return pts.map(([x, y]) => [x * chord, y * chord] as Point);
}

/**
 * Area of the section for a chord `c` (mm → mm²), by the shoelace formula on a dense outline.
 * For any 4-digit section this is close to 0.685·t·c² (the integral of the thickness polynomial).
 *
 *   sectionArea(parseNaca("0012"), 100)  // ≈ 822 mm²
 */
export function sectionArea(s: Naca4, chord = 1): number {
  return Math.abs(polygonArea(outline(s, chord, 400)));
}

/**
 * The section's extent for a chord `c`: its length along the chord line and its height
 * (highest upper point minus lowest lower point), plus where those lie relative to the chord line.
 *
 *   sectionBox(parseNaca("0012"), 100)  // { length: ≈100, height: ≈12, maxUpper: ≈6, minLower: ≈-6 }
 */
export function sectionBox(
  s: Naca4,
  chord = 1,
): { length: number; height: number; maxUpper: number; minLower: number; minX: number; maxX: number } {
  const pts = outline(s, chord, 400);
  let maxUpper = -Infinity;
  let minLower = Infinity;
  let minX = Infinity;
  let maxX = -Infinity;
  for (const [x, y] of pts) {
    if (y > maxUpper) maxUpper = y;
    if (y < minLower) minLower = y;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
  }
  return { length: maxX - minX, height: maxUpper - minLower, maxUpper, minLower, minX, maxX };
}
