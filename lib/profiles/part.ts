/**
 * From a part's profile to what nesting and yield need: the bounding box `[x, y, z]` in mm with
 * x along the wire (the extrusion or span), and the true volume of foam in the finished part.
 * Pure: no I/O.
 */
import { ProfileError, parseNaca, sectionArea, sectionBox } from "./naca";
import { checkOutline, outlineArea, polygonBounds, type Point } from "./polygon";
import type { Vec3 } from "@/lib/nesting";

/** A 2-axis part: one outline in the cutting plane, extruded along the wire. */
export interface PolygonProfile {
  kind: "polygon";
  /** Outer loop in the cutting plane, mm: first coordinate across the block, second up. */
  points: Point[];
  /** Holes (letters "O", "A", a window in a frame), each a loop inside `points`; absent: none. */
  holes?: Point[][];
  /** Where the outline came from, for people: "drawing.dxf", "SVG path", "text “OPEN” in Blockyard Sans". */
  source?: string;
  extrudeMm: number;
}

/**
 * A wing panel: a NACA 4-digit section cut with the wire along the span. With a tip chord different
 * from the root chord it is a tapered panel cut on a 4-axis machine (root and tip profiles differ).
 */
export interface NacaProfile {
  kind: "naca";
  code: string;
  chordMm: number;
  /** Tip chord; absent or equal to the root chord: a straight (2-axis) panel. */
  tipChordMm?: number | null;
  spanMm: number;
  /** How far the tip's leading edge sits behind the root's, mm (0 or absent: straight leading edge). */
  sweepMm?: number | null;
}

export type Profile = PolygonProfile | NacaProfile;

export interface PartGeometry {
  /** Bounding box for nesting, mm: x along the wire, y across, z up. */
  size: Vec3;
  /** Foam in the finished part, mm³. */
  trueVolumeMm3: number;
}

/**
 * Volume of a tapered panel of a section whose unit-chord area is `unitArea`: the section scales
 * with chord², so the volume is the frustum-like A(1)·span·(cr² + cr·ct + ct²)/3.
 *
 *   taperedVolume(0.0822, 200, 120, 600)  // ≈ 1.29e6 mm³
 */
export function taperedVolume(unitArea: number, rootChord: number, tipChord: number, span: number): number {
  return (unitArea * span * (rootChord ** 2 + rootChord * tipChord + tipChord ** 2)) / 3;
}

/**
 * A NACA panel's box and volume. The leading edge is taken as straight (root and tip leading edges
 * on one line along the span) unless `sweepMm` moves the tip back; the chord lines stay in one
 * plane (no twist, no dihedral), so the box height is the larger section's height.
 *
 *   nacaPanelGeometry({ kind: "naca", code: "0012", chordMm: 200, spanMm: 500 })
 *   // { size: [500, 200, ≈24], trueVolumeMm3: ≈ 0.0822·200²·500 }
 */
export function nacaPanelGeometry(p: NacaProfile): PartGeometry {
  const section = parseNaca(p.code);
  const cr = p.chordMm;
  const ct = p.tipChordMm ?? p.chordMm;
  const sweep = p.sweepMm ?? 0;
  if (!(cr > 0)) throw new ProfileError("The root chord must be more than 0 mm.");
  if (!(ct > 0)) throw new ProfileError("The tip chord must be more than 0 mm.");
  if (!(p.spanMm > 0)) throw new ProfileError("The span must be more than 0 mm.");
  const unit = sectionBox(section, 1);
  const maxChord = Math.max(cr, ct);
  // Along the chord: from the furthest-forward leading edge to the furthest-back trailing edge.
  const front = Math.min(0, sweep) + Math.min(0, unit.minX) * maxChord;
  const back = Math.max(cr * Math.max(1, unit.maxX), sweep + ct * Math.max(1, unit.maxX));
  return {
    size: [p.spanMm, back - front, unit.height * maxChord],
    trueVolumeMm3: taperedVolume(sectionArea(section, 1), cr, ct, p.spanMm),
  };
}

/**
 * A polygon extrusion's box and volume: (outer area − holes) × extrusion length.
 *
 *   polygonPartGeometry({ kind: "polygon", points: [[0, 0], [300, 0], [0, 400]], extrudeMm: 50 })
 *   // { size: [50, 300, 400], trueVolumeMm3: 3_000_000 }
 */
export function polygonPartGeometry(p: PolygonProfile): PartGeometry {
  const problem = checkOutline(p.points, p.holes ?? []);
  if (problem) throw new ProfileError(problem);
  if (!(p.extrudeMm > 0)) throw new ProfileError("The extrusion length must be more than 0 mm.");
  const b = polygonBounds(p.points);
  return {
    size: [p.extrudeMm, b.size[0], b.size[1]],
    trueVolumeMm3: outlineArea(p.points, p.holes ?? []) * p.extrudeMm,
  };
}

/**
 * The nesting box and true volume of any profile. Throws ProfileError with a message for a person.
 *
 *   partGeometry({ kind: "naca", code: "2412", chordMm: 250, tipChordMm: 160, spanMm: 700 })
 */
export function partGeometry(p: Profile): PartGeometry {
  const g = p.kind === "naca" ? nacaPanelGeometry(p) : polygonPartGeometry(p);
  // Rounded up to 0.01 mm (the database's precision) so the box always contains the part.
  return { size: g.size.map((v) => Math.ceil(v * 100 - 1e-6) / 100) as Vec3, trueVolumeMm3: g.trueVolumeMm3 };
}
