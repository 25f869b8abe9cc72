/**
 * Profiles from a DXF drawing (ASCII DXF, read with dxf-parser). Pure: no I/O; runs on the server
 * and in the browser.
 *
 * Taken: LWPOLYLINE and POLYLINE (closed flag, bulges as arcs), LINE and ARC (chained end to end
 * into loops within JOIN_TOLERANCE_MM), CIRCLE, ELLIPSE (full and partial), SPLINE (de Boor on its
 * control points and knots, rational weights honoured; fit points joined by lines when that is all
 * it has). Curves are flattened to CHORD_TOLERANCE_MM. Entities drawn with the extrusion direction
 * (0, 0, −1) are mirrored as the DXF arbitrary-axis rule says; anything not flat in XY is refused.
 * Everything else (TEXT, DIMENSION, HATCH, INSERT…) is listed in a note and ignored.
 *
 * Units: $INSUNITS 1 in, 2 ft, 4 mm, 5 cm, 6 m. Missing, 0 (unitless) or another code: the result
 * asks for the unit (`needsUnit`), and the importer is called again with the one the person gives.
 */
import DxfParser from "dxf-parser";
import {
  CHORD_TOLERANCE_MM,
  JOIN_TOLERANCE_MM,
  MM_PER_UNIT,
  UNIT_NAMES,
  arcPoints,
  chainPieces,
  ellipsePoints,
  fail,
  placeFormatter,
  profilesFromLoops,
  sourceList,
  type DrawingUnit,
  type ImportProblem,
  type ImportResult,
  type Piece,
} from "./import-common";
import type { Point } from "./polygon";
import type { Vec3 } from "@/lib/nesting";

export interface DxfImportOptions {
  /** The file's name, for the profiles' names and source. */
  fileName?: string;
  /** The unit the person chose, used when the drawing does not say its own. */
  unit?: DrawingUnit;
  chordToleranceMm?: number;
  joinToleranceMm?: number;
}

/** $INSUNITS codes (DXF reference, HEADER section) that a foam shop draws in. */
const INSUNITS: Record<number, DrawingUnit> = { 1: "in", 2: "ft", 4: "mm", 5: "cm", 6: "m" };
const OTHER_INSUNITS: Record<number, string> = {
  3: "miles",
  7: "kilometres",
  8: "microinches",
  9: "mils",
  10: "yards",
  11: "ångströms",
  12: "nanometres",
  13: "microns",
  14: "decimetres",
};
const SUPPORTED = new Set(["LINE", "ARC", "CIRCLE", "ELLIPSE", "LWPOLYLINE", "POLYLINE", "SPLINE"]);

interface RawEntity {
  type: string;
  handle?: string;
  groups: [number, string][];
}

/**
 * Every entity of the ENTITIES section, in file order, with its handle and raw group codes: the
 * parser skips kinds it does not know (so they could not be listed) and drops SPLINE weights.
 */
function scanEntities(text: string): RawEntity[] {
  const lines = text.split(/\r\n|\r|\n/);
  const out: RawEntity[] = [];
  let section: string | null = null;
  let expectName = false;
  let current: RawEntity | null = null;
  for (let i = 0; i + 1 < lines.length; i += 2) {
    const code = Number.parseInt(lines[i]!.trim(), 10);
    const value = lines[i + 1]!.trim();
    if (code === 0) {
      current = null;
      if (value === "SECTION") {
        expectName = true;
        continue;
      }
      if (value === "ENDSEC") {
        section = null;
        continue;
      }
      if (section === "ENTITIES" && !["VERTEX", "SEQEND", "ATTRIB"].includes(value)) {
        current = { type: value, groups: [] };
        out.push(current);
      }
      continue;
    }
    if (expectName && code === 2) {
      section = value;
      expectName = false;
      continue;
    }
    if (current) {
      if (code === 5 && current.handle === undefined) current.handle = value;
      current.groups.push([code, value]);
    }
  }
  return out;
}

const numbers = (raw: RawEntity | undefined, code: number) =>
  (raw?.groups ?? []).filter(([c]) => c === code).map(([, v]) => Number(v));

// biome-ignore lint/suspicious/noExplicitAny: dxf-parser's entity objects vary by kind
type AnyEntity = any;

/**
 * Reads a DXF drawing into profiles (one per outer loop, holes by containment).
 *
 *   importDxf(text, { fileName: "sign.dxf" })
 *   // { ok: true, profiles: [{ name: "sign.dxf, shape 1", points, holes, boxMm, areaMm2, … }], unit, notes }
 *   importDxf(unitlessText)  // { ok: false, needsUnit: true, errors: [{ field: "unit", … }] }
 */
export function importDxf(text: string, opts: DxfImportOptions = {}): ImportResult {
  const tol = opts.chordToleranceMm ?? CHORD_TOLERANCE_MM;
  const joinTol = opts.joinToleranceMm ?? JOIN_TOLERANCE_MM;
  const fileName = opts.fileName?.trim() || "DXF drawing";
  const notes: string[] = [];
  text = text.replace(/^\uFEFF/, "");

  if (/^AutoCAD Binary DXF/.test(text)) {
    return fail([{ message: "This is a binary DXF; save the drawing as an ASCII (text) DXF.", field: "file" }]);
  }
  if (!/^\s*(999\s*[\r\n]+[^\r\n]*[\r\n]+\s*)*0\s*[\r\n]+\s*SECTION/.test(text)) {
    return fail([{ message: "This is not a DXF drawing: it does not begin with a SECTION.", field: "file" }]);
  }
  let dxf: AnyEntity;
  try {
    dxf = new DxfParser().parseSync(text);
  } catch (e) {
    return fail([
      {
        message: `The DXF could not be read: ${(e as Error).message.slice(0, 200)}. Save it again as ASCII DXF.`,
        field: "file",
      },
    ]);
  }
  if (!dxf) return fail([{ message: "The DXF could not be read.", field: "file" }]);

  // Units.
  const code = Number(dxf.header?.$INSUNITS ?? Number.NaN);
  const fromFile = INSUNITS[code];
  let unit: DrawingUnit;
  let unitFrom: "file" | "given";
  if (fromFile) {
    unit = fromFile;
    unitFrom = "file";
    if (opts.unit && opts.unit !== fromFile)
      notes.push(
        `The drawing says it is in ${UNIT_NAMES[fromFile]} ($INSUNITS ${code}); that was used, not ${opts.unit}.`,
      );
  } else if (opts.unit) {
    unit = opts.unit;
    unitFrom = "given";
    notes.push(`The drawing does not say its unit; read in ${UNIT_NAMES[unit]} as chosen.`);
  } else {
    const said =
      Number.isFinite(code) && code !== 0
        ? ` (its unit code $INSUNITS ${code} is ${OTHER_INSUNITS[code] ?? "not a length unit"})`
        : "";
    return fail(
      [
        {
          message: `The drawing does not say its unit${said}. Choose the unit it was drawn in: mm, cm, m, in or ft.`,
          field: "unit",
        },
      ],
      notes,
      true,
    );
  }
  const k = MM_PER_UNIT[unit];
  const place = placeFormatter(unit === "mm" ? undefined : { name: unit, mmPerUnit: k });

  // What the parser gives, matched to the raw scan (by handle, else by order within the kind).
  const raw = scanEntities(text);
  const rawByType = new Map<string, RawEntity[]>();
  for (const r of raw) rawByType.set(r.type, [...(rawByType.get(r.type) ?? []), r]);
  const seen = new Map<string, number>();
  const errors: ImportProblem[] = [];
  const pieces: Piece[] = [];
  const ignored = new Map<string, string[]>();
  const ignore = (type: string, label: string) => ignored.set(type, [...(ignored.get(type) ?? []), label]);

  for (const r of raw) if (!SUPPORTED.has(r.type)) ignore(r.type, r.handle ? r.handle : "");

  for (const e of (dxf.entities ?? []) as AnyEntity[]) {
    const type = String(e.type);
    if (!SUPPORTED.has(type)) continue; // listed from the raw scan above
    const nth = seen.get(type) ?? 0;
    seen.set(type, nth + 1);
    const r = rawByType.get(type)?.[nth];
    const handle = typeof e.handle === "string" ? e.handle : r?.handle;
    const label = handle ? `${type} (handle ${handle})` : `${type} (number ${nth + 1} of its kind)`;
    if (e.inPaperSpace) {
      ignore(`${type} on the paper-space layout`, handle ?? "");
      continue;
    }

    // Extrusion direction: +Z as drawn, −Z mirrored in x (arbitrary-axis rule), else not flat.
    const nz = numbers(r, 230)[0] ?? e.extrusionDirectionZ ?? e.extrusionDirection?.z ?? 1;
    const nx = numbers(r, 210)[0] ?? e.extrusionDirectionX ?? e.extrusionDirection?.x ?? 0;
    const ny = numbers(r, 220)[0] ?? e.extrusionDirectionY ?? e.extrusionDirection?.y ?? 0;
    if (Math.abs(nx) > 1e-6 || Math.abs(ny) > 1e-6 || Math.abs(Math.abs(nz) - 1) > 1e-6) {
      errors.push({
        message: `${label} is not drawn flat in the XY plane (its extrusion direction is ${nx}, ${ny}, ${nz}); flatten the drawing to 2D first.`,
        subject: label,
      });
      continue;
    }
    const mirrored = nz < 0 && type !== "ELLIPSE" && type !== "SPLINE" && type !== "LINE";
    const mm = (p: { x: number; y: number }): Point => [(mirrored ? -p.x : p.x) * k, p.y * k];

    try {
      const pts = entityPoints(type, e, numbers(r, 41), nz < 0, tol / k, label, notes);
      if (typeof pts === "string") {
        errors.push({ message: pts, subject: label });
        continue;
      }
      if (pts === null) {
        ignore(`${type} (3D mesh)`, handle ?? "");
        continue;
      }
      pieces.push({ pts: pts.map((p) => mm({ x: p[0], y: p[1] })), from: label });
    } catch (err) {
      errors.push({ message: `${label} could not be read: ${(err as Error).message}`, subject: label });
    }
  }

  if (ignored.size) {
    const list = [...ignored.entries()].map(([type, hs]) => {
      const named = hs.filter(Boolean);
      const handles = named.length
        ? ` (handle${named.length > 1 ? "s" : ""} ${named.slice(0, 5).join(", ")}${named.length > 5 ? ", …" : ""})`
        : "";
      return `${hs.length} ${type}${handles}`;
    });
    notes.push(`Ignored, not outlines this reader takes: ${list.join("; ")}.`);
  }
  if (errors.length) return fail(errors, notes);
  if (!pieces.length) {
    return fail(
      [
        {
          message:
            "The drawing holds no closed shape: no lines, arcs, polylines, circles, ellipses or splines were found in its ENTITIES section.",
          field: "file",
        },
      ],
      notes,
    );
  }

  const { loops, open, tiny } = chainPieces(pieces, joinTol);
  if (tiny.length) notes.push(`Left out, shorter than ${joinTol} mm: ${sourceList(tiny)}.`);
  for (const o of open) {
    errors.push({
      message: `Open outline: ${sourceList(o.from)} ${new Set(o.from).size > 1 ? "do" : "does"} not close — its ends are ${o.gapMm.toFixed(2)} mm apart, at ${place(o.start)} and ${place(o.end)}. Close the gap in the drawing (ends within ${joinTol} mm are joined).`,
      subject: o.from[0],
      at: o.end,
    });
  }
  if (errors.length) return fail(errors, notes);
  if (!loops.length) return fail([{ message: "The drawing holds no closed shape.", field: "file" }], notes);

  const made = profilesFromLoops(loops, {
    name: (i, n) => (n === 1 ? fileName : `${fileName}, shape ${i + 1}`),
    source: fileName,
    place,
    tol,
  });
  notes.push(...made.notes);
  if (made.errors.length) return fail(made.errors, notes);
  return { ok: true, profiles: made.profiles, unit: { name: unit, mmPerUnit: k, from: unitFrom }, notes };
}

/**
 * One entity's points in drawing units (tolerance `tol` in drawing units too): closed shapes
 * repeat their first point at the end. A string is a problem to report; null, a kind left out.
 */
function entityPoints(
  type: string,
  e: AnyEntity,
  weights: number[],
  flipped: boolean,
  tol: number,
  label: string,
  notes: string[],
): Point[] | string | null {
  const P = (p: { x: number; y: number } | undefined): Point => {
    if (!p || !Number.isFinite(p.x) || !Number.isFinite(p.y)) throw new Error("a point is missing or not a number");
    return [p.x, p.y];
  };
  switch (type) {
    case "LINE": {
      const v = e.vertices ?? [];
      return [P(v[0]), P(v[1])];
    }
    case "CIRCLE": {
      if (!(e.radius > 0)) return `${label} has no radius.`;
      const pts = arcPoints(P(e.center), e.radius, 0, 2 * Math.PI, tol);
      pts[pts.length - 1] = pts[0]!;
      return pts;
    }
    case "ARC": {
      if (!(e.radius > 0)) return `${label} has no radius.`;
      const a0 = Number(e.startAngle ?? 0);
      let sweep = Number(e.endAngle ?? 2 * Math.PI) - a0;
      while (sweep <= 1e-12) sweep += 2 * Math.PI;
      while (sweep > 2 * Math.PI + 1e-12) sweep -= 2 * Math.PI;
      return arcPoints(P(e.center), e.radius, a0, sweep, tol);
    }
    case "ELLIPSE": {
      const c = P(e.center);
      const u = P(e.majorAxisEndPoint);
      const ratio = Number(e.axisRatio ?? 1);
      if (!(Math.hypot(u[0], u[1]) > 0) || !(ratio > 0)) return `${label} has no size.`;
      // Minor axis = normal × major: (−uy, ux)·ratio for +Z, (uy, −ux)·ratio for −Z.
      const v: Point = flipped ? [u[1] * ratio, -u[0] * ratio] : [-u[1] * ratio, u[0] * ratio];
      const t0 = Number(e.startAngle ?? 0);
      let sweep = Number(e.endAngle ?? 2 * Math.PI) - t0;
      while (sweep <= 1e-12) sweep += 2 * Math.PI;
      while (sweep > 2 * Math.PI + 1e-12) sweep -= 2 * Math.PI;
      const pts = ellipsePoints(c, u, v, t0, sweep, tol);
      if (Math.abs(sweep - 2 * Math.PI) < 1e-9) pts[pts.length - 1] = pts[0]!;
      return pts;
    }
    case "LWPOLYLINE":
    case "POLYLINE": {
      if (type === "POLYLINE" && (e.is3dPolygonMesh || e.isPolyfaceMesh)) return null;
      const verts = ((e.vertices ?? []) as AnyEntity[]).filter((v) => !v.splineControlPoint);
      if (verts.length < 2) return `${label} has fewer than two points.`;
      const closed = Boolean(e.shape);
      const out: Point[] = [P(verts[0])];
      const n = verts.length;
      for (let i = 0; i < (closed ? n : n - 1); i++) {
        const a = P(verts[i]),
          b = P(verts[(i + 1) % n]);
        const bulge = Number(verts[i].bulge ?? 0);
        if (bulge) out.push(...bulgeArc(a, b, bulge, tol).slice(1));
        else out.push(b);
      }
      return out;
    }
    case "SPLINE":
      return splinePoints(e, weights, tol, label, notes);
  }
  return null;
}

/**
 * The arc a polyline bulge makes from a to b: bulge = tan(θ/4), θ the included angle, positive
 * anticlockwise (DXF reference, LWPOLYLINE group 42). Both ends included.
 *
 *   bulgeArc([1, 0], [-1, 0], 1, 0.05)  // a half circle of radius 1 over the top, centre 0, 0
 */
export function bulgeArc(a: Point, b: Point, bulge: number, tol: number): Point[] {
  const theta = 4 * Math.atan(bulge);
  const c = Math.hypot(b[0] - a[0], b[1] - a[1]);
  if (c === 0) return [a, b];
  const half = c / 2;
  const ux = (b[0] - a[0]) / c,
    uy = (b[1] - a[1]) / c;
  const h = half / Math.tan(theta / 2); // signed: the centre sits left of a→b for |θ| < π anticlockwise
  const centre: Point = [(a[0] + b[0]) / 2 - uy * h, (a[1] + b[1]) / 2 + ux * h];
  const r = half / Math.abs(Math.sin(theta / 2));
  const a0 = Math.atan2(a[1] - centre[1], a[0] - centre[0]);
  const pts = arcPoints(centre, r, a0, theta, tol);
  pts[pts.length - 1] = b;
  return pts;
}

/**
 * A B-spline's point at u by de Boor's algorithm, in homogeneous coordinates so rational splines
 * (weights) come out right (Piegl & Tiller, The NURBS Book, algorithm A4.1 in spirit; from memory).
 */
export function deBoor(u: number, degree: number, knots: readonly number[], ctrl: readonly Vec3[]): Point {
  const n = ctrl.length;
  let s = degree;
  while (s < n - 1 && u >= knots[s + 1]!) s++;
  const d = Array.from({ length: degree + 1 }, (_, j) => [...ctrl[j + s - degree]!] as Vec3);
  for (let r = 1; r <= degree; r++) {
    for (let j = degree; j >= r; j--) {
      const i = j + s - degree;
      const den = knots[i + degree - r + 1]! - knots[i]!;
      const alpha = den === 0 ? 0 : (u - knots[i]!) / den;
      const a = d[j - 1]!,
        b = d[j]!;
      d[j] = [(1 - alpha) * a[0] + alpha * b[0], (1 - alpha) * a[1] + alpha * b[1], (1 - alpha) * a[2] + alpha * b[2]];
    }
  }
  const p = d[degree]!;
  return [p[0] / p[2], p[1] / p[2]];
}

function distToSegment(p: Point, a: Point, b: Point): number {
  const dx = b[0] - a[0],
    dy = b[1] - a[1];
  const l2 = dx * dx + dy * dy;
  const t = l2 ? Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / l2)) : 0;
  return Math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy);
}

/**
 * A SPLINE flattened: each knot span cut in at least four, then halved until the curve's middle
 * lies within `tol` of the chord (at most 2¹⁴ pieces a span). Fit points only: joined by lines.
 */
function splinePoints(e: AnyEntity, weights: number[], tol: number, label: string, notes: string[]): Point[] | string {
  const degree = Number(e.degreeOfSplineCurve ?? 3);
  const ctrlPts = (e.controlPoints ?? []) as { x: number; y: number }[];
  const knots = (e.knotValues ?? []) as number[];
  if (ctrlPts.length >= 2 && knots.length === ctrlPts.length + degree + 1 && degree >= 1) {
    const w = weights.length === ctrlPts.length ? weights : ctrlPts.map(() => 1);
    if (w.some((v) => !(v > 0))) return `${label} has a weight that is not positive.`;
    const ctrl = ctrlPts.map((p, i): Vec3 => [p.x * w[i]!, p.y * w[i]!, w[i]!]);
    const lo = knots[degree]!,
      hi = knots[ctrlPts.length]!;
    if (!(hi > lo)) return `${label} has no length: its knots do not span anything.`;
    const at = (u: number) => deBoor(u, degree, knots, ctrl);
    const out: Point[] = [at(lo)];
    const refine = (u0: number, p0: Point, u1: number, p1: Point, depth: number) => {
      const um = (u0 + u1) / 2;
      const pm = at(um);
      if ((depth >= 2 && distToSegment(pm, p0, p1) <= tol) || depth >= 14) {
        out.push(p1);
        return;
      }
      refine(u0, p0, um, pm, depth + 1);
      refine(um, pm, u1, p1, depth + 1);
    };
    const breaks = [...new Set(knots.filter((v) => v >= lo && v <= hi))].sort((a, b) => a - b);
    for (let i = 0; i + 1 < breaks.length; i++)
      refine(breaks[i]!, out[out.length - 1]!, breaks[i + 1]!, at(breaks[i + 1]!), 0);
    if (e.closed && Math.hypot(out[0]![0] - out[out.length - 1]![0], out[0]![1] - out[out.length - 1]![1]) < tol)
      out[out.length - 1] = out[0]!;
    return out;
  }
  const fit = (e.fitPoints ?? []) as { x: number; y: number }[];
  if (fit.length >= 2) {
    notes.push(`${label} has fit points only; they are joined by straight lines.`);
    const pts = fit.map((p): Point => [p.x, p.y]);
    if (e.closed) pts.push(pts[0]!);
    return pts;
  }
  return `${label} has neither control points with matching knots nor fit points to draw it from.`;
}
