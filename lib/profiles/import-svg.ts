/**
 * Profiles from an SVG file or a bare path `d`. Pure: no I/O, no DOM (the server has none), so a
 * small tag and attribute scanner reads this subset of SVG 1.1:
 *
 * - shapes: path (`d` read with svg-path-parser, made absolute; arcs and quadratic/cubic Béziers
 *   flattened to the chord tolerance), rect (with rx/ry), circle, ellipse, polygon, polyline, line;
 * - `transform` on any element (matrix, translate, scale, rotate, skewX, skewY), nested <g> and
 *   nested <svg> (x, y and viewBox as a transform);
 * - `fill-rule` (attribute, or in `style`, inherited) for the subpaths of one path; separate
 *   elements nest by containment as in a DXF (a closed shape inside another is its hole);
 * - elements hidden with display="none" are left out; defs, symbol, clipPath, mask, pattern, marker,
 *   style, script, metadata, title, desc, text, use, image and foreign-namespace elements are not
 *   outlines: left out, and listed in a note where a person might expect them.
 * Entities: the five XML ones and numeric character references; DOCTYPE declarations are skipped,
 * never expanded.
 *
 * Units: the root's width/height in mm, cm, in, pt, pc or Q with its viewBox give mm per user unit;
 * px or no unit is CSS px at 96 to the inch (stated in a note), unless the person names the unit of
 * the drawing's numbers. y is flipped so the profile's y is up.
 */
import * as svgPathParserNs from "svg-path-parser";
import type { CommandMadeAbsolute } from "svg-path-parser";
import { ClipType, Clipper, FillRule, PolyTreeD, type PathD, type PolyPathD } from "@countertype/clipper2-ts";
import {
  CHORD_TOLERANCE_MM,
  IDENTITY,
  JOIN_TOLERANCE_MM,
  MM_PER_UNIT,
  UNIT_NAMES,
  apply,
  chainPieces,
  compose,
  cubicPoints,
  ellipsePoints,
  fail,
  findCrossing,
  maxScale,
  placeFormatter,
  profilesFromLoops,
  quadPoints,
  sourceList,
  type Affine,
  type DrawingUnit,
  type ImportProblem,
  type ImportResult,
  type Loop,
  type Piece,
  type UnitUsed,
} from "./import-common";
import type { Point } from "./polygon";

// svg-path-parser is CommonJS whose functions hang off its export: reach them the same way under
// Node's ESM loader (they sit on `default`) and under the bundler.
const svgPathParser: typeof svgPathParserNs =
  (svgPathParserNs as unknown as { default?: typeof svgPathParserNs }).default ?? svgPathParserNs;

export interface SvgImportOptions {
  fileName?: string;
  /** The unit of the drawing's numbers, when the file does not give its size in mm, cm, in, pt or pc. */
  unit?: DrawingUnit;
  chordToleranceMm?: number;
  joinToleranceMm?: number;
}

/** CSS absolute lengths in mm (CSS Values and Units: 1in = 96px = 72pt = 6pc = 2.54cm). */
const CSS_MM: Record<string, number> = {
  mm: 1,
  cm: 10,
  q: 0.25,
  in: 25.4,
  pt: 25.4 / 72,
  pc: 25.4 / 6,
  px: 25.4 / 96,
  "": 25.4 / 96,
};
const SKIP = new Set([
  "defs",
  "symbol",
  "clippath",
  "mask",
  "pattern",
  "marker",
  "style",
  "script",
  "metadata",
  "title",
  "desc",
  "text",
  "foreignobject",
  "lineargradient",
  "radialgradient",
  "filter",
  "switch",
]);
const NOTED = new Set(["text", "use", "image", "switch", "foreignobject"]);
const SHAPES = new Set(["path", "rect", "circle", "ellipse", "line", "polyline", "polygon"]);
const MAX_POINTS = 400_000;

class SvgProblem extends Error {}

// ---------------------------------------------------------------------------------------------
// Scanner

interface Tag {
  name: string;
  attrs: Record<string, string>;
  selfClosing: boolean;
  closing: boolean;
}

const decode = (v: string) =>
  v.replace(/&(#x[0-9a-f]+|#\d+|amp|lt|gt|quot|apos);/gi, (_, e: string) => {
    const k = e.toLowerCase();
    if (k.startsWith("#x")) return String.fromCodePoint(Number.parseInt(k.slice(2), 16));
    if (k.startsWith("#")) return String.fromCodePoint(Number.parseInt(k.slice(1), 10));
    return ({ amp: "&", lt: "<", gt: ">", quot: '"', apos: "'" } as Record<string, string>)[k]!;
  });

/** The tags of an XML text, in order, with comments, CDATA, processing instructions and DOCTYPE skipped. */
function* tags(xml: string): Generator<Tag> {
  let i = 0;
  while (i < xml.length) {
    const lt = xml.indexOf("<", i);
    if (lt < 0) return;
    if (xml.startsWith("<!--", lt)) {
      const end = xml.indexOf("-->", lt + 4);
      i = end < 0 ? xml.length : end + 3;
      continue;
    }
    if (xml.startsWith("<![CDATA[", lt)) {
      const end = xml.indexOf("]]>", lt + 9);
      i = end < 0 ? xml.length : end + 3;
      continue;
    }
    if (xml.startsWith("<?", lt)) {
      const end = xml.indexOf("?>", lt + 2);
      i = end < 0 ? xml.length : end + 2;
      continue;
    }
    if (xml.startsWith("<!", lt)) {
      // DOCTYPE, possibly with an internal subset in brackets: skipped whole, never expanded.
      let j = lt + 2,
        depth = 0;
      while (j < xml.length) {
        const c = xml[j];
        if (c === "[") depth++;
        else if (c === "]") depth--;
        else if (c === ">" && depth <= 0) break;
        j++;
      }
      i = j + 1;
      continue;
    }
    // A start or end tag: find its '>' outside quoted attribute values.
    let j = lt + 1,
      quote: string | null = null;
    while (j < xml.length) {
      const c = xml[j]!;
      if (quote) {
        if (c === quote) quote = null;
      } else if (c === '"' || c === "'") quote = c;
      else if (c === ">") break;
      j++;
    }
    const body = xml.slice(lt + 1, j);
    i = j + 1;
    const closing = body.startsWith("/");
    const m = /^\/?\s*([A-Za-z_][-A-Za-z0-9_.:]*)/.exec(body);
    if (!m) continue;
    const attrs: Record<string, string> = {};
    const re = /([A-Za-z_:][-A-Za-z0-9_:.]*)\s*=\s*(?:"([^"]*)"|'([^']*)')/g;
    const rest = body.slice(m[0].length);
    for (let a = re.exec(rest); a; a = re.exec(rest)) attrs[a[1]!] = decode(a[2] ?? a[3] ?? "");
    yield { name: m[1]!, attrs, selfClosing: /\/\s*$/.test(body), closing };
  }
}

// ---------------------------------------------------------------------------------------------
// Numbers, lengths, transforms

const NUM = /[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g;
const numbersIn = (s: string) => (s.match(NUM) ?? []).map(Number);

/** A length attribute in user units (CSS px); percentages are refused. */
function userLength(v: string | undefined, what: string, fallback?: number): number {
  if (v === undefined || v.trim() === "") {
    if (fallback !== undefined) return fallback;
    throw new SvgProblem(`${what} is missing.`);
  }
  const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([a-zA-Z%]*)\s*$/.exec(v);
  if (!m) throw new SvgProblem(`${what} “${v.slice(0, 30)}” is not a length.`);
  const unit = m[2]!.toLowerCase();
  if (unit === "%") throw new SvgProblem(`${what} is a percentage (“${v}”); give it in user units.`);
  const mm = CSS_MM[unit];
  if (mm === undefined) throw new SvgProblem(`${what} has a unit this reader does not know (“${v}”).`);
  return (Number(m[1]) * mm) / CSS_MM.px!;
}

/** A root size: its number and its unit's mm (null: px or no unit, i.e. no physical size stated). */
function rootLength(v: string | undefined): { mm: number; absolute: boolean } | null {
  if (!v) return null;
  const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([a-zA-Z%]*)\s*$/.exec(v);
  if (!m) return null;
  const unit = m[2]!.toLowerCase();
  const mm = CSS_MM[unit];
  if (mm === undefined || !(Number(m[1]) > 0)) return null;
  return { mm: Number(m[1]) * mm, absolute: unit !== "" && unit !== "px" };
}

/**
 * An SVG `transform` list as one affine map (applied right to left, as SVG says).
 *
 *   parseTransform("translate(10 20) scale(2)")  // [2, 0, 0, 2, 10, 20]
 */
export function parseTransform(s: string): Affine {
  let m: Affine = IDENTITY;
  const re = /(matrix|translate|scale|rotate|skewX|skewY)\s*\(([^)]*)\)/g;
  const stripped = s.replace(re, "").replace(/[\s,]/g, "");
  if (stripped) throw new SvgProblem(`its transform “${s.slice(0, 60)}” cannot be read.`);
  for (let t = re.exec(s); t; t = re.exec(s)) {
    const a = numbersIn(t[2]!);
    const bad = () => new SvgProblem(`its transform ${t![1]}(${t![2]}) has the wrong number of values.`);
    let n: Affine;
    switch (t[1]) {
      case "matrix":
        if (a.length !== 6) throw bad();
        n = a as Affine;
        break;
      case "translate":
        if (a.length < 1 || a.length > 2) throw bad();
        n = [1, 0, 0, 1, a[0]!, a[1] ?? 0];
        break;
      case "scale":
        if (a.length < 1 || a.length > 2) throw bad();
        n = [a[0]!, 0, 0, a[1] ?? a[0]!, 0, 0];
        break;
      case "rotate": {
        if (a.length !== 1 && a.length !== 3) throw bad();
        const r = (a[0]! * Math.PI) / 180;
        const c = Math.cos(r),
          sn = Math.sin(r);
        n = [c, sn, -sn, c, 0, 0];
        if (a.length === 3) n = compose(compose([1, 0, 0, 1, a[1]!, a[2]!], n), [1, 0, 0, 1, -a[1]!, -a[2]!]);
        break;
      }
      case "skewX":
        if (a.length !== 1) throw bad();
        n = [1, 0, Math.tan((a[0]! * Math.PI) / 180), 1, 0, 0];
        break;
      default:
        if (a.length !== 1) throw bad();
        n = [1, Math.tan((a[0]! * Math.PI) / 180), 0, 1, 0, 0];
    }
    m = compose(m, n);
  }
  return m;
}

// ---------------------------------------------------------------------------------------------
// Geometry of one element, in its own coordinates

interface Subpath {
  pts: Point[];
  closed: boolean;
}

/**
 * SVG arc endpoint parameters to centre form and flattened points (SVG 1.1, Implementation Notes
 * F.6.5 conversion and F.6.6 radius correction). The start point is left out, the end included.
 */
export function svgArcPoints(
  p0: Point,
  rxIn: number,
  ryIn: number,
  phiDeg: number,
  largeArc: boolean,
  sweep: boolean,
  p1: Point,
  tol: number,
): Point[] {
  let rx = Math.abs(rxIn),
    ry = Math.abs(ryIn);
  if (rx === 0 || ry === 0 || (p0[0] === p1[0] && p0[1] === p1[1])) return [p1];
  const phi = (phiDeg * Math.PI) / 180;
  const cph = Math.cos(phi),
    sph = Math.sin(phi);
  const dx = (p0[0] - p1[0]) / 2,
    dy = (p0[1] - p1[1]) / 2;
  const x1 = cph * dx + sph * dy,
    y1 = -sph * dx + cph * dy;
  const lambda = (x1 * x1) / (rx * rx) + (y1 * y1) / (ry * ry);
  if (lambda > 1) {
    rx *= Math.sqrt(lambda);
    ry *= Math.sqrt(lambda);
  }
  const num = rx * rx * ry * ry - rx * rx * y1 * y1 - ry * ry * x1 * x1;
  const den = rx * rx * y1 * y1 + ry * ry * x1 * x1;
  let coef = Math.sqrt(Math.max(0, num / den));
  if (largeArc === sweep) coef = -coef;
  const cx1 = (coef * rx * y1) / ry,
    cy1 = (-coef * ry * x1) / rx;
  const cx = cph * cx1 - sph * cy1 + (p0[0] + p1[0]) / 2;
  const cy = sph * cx1 + cph * cy1 + (p0[1] + p1[1]) / 2;
  const angle = (ux: number, uy: number, vx: number, vy: number) => Math.atan2(ux * vy - uy * vx, ux * vx + uy * vy);
  const t1 = angle(1, 0, (x1 - cx1) / rx, (y1 - cy1) / ry);
  let dt = angle((x1 - cx1) / rx, (y1 - cy1) / ry, (-x1 - cx1) / rx, (-y1 - cy1) / ry);
  if (!sweep && dt > 0) dt -= 2 * Math.PI;
  if (sweep && dt < 0) dt += 2 * Math.PI;
  const pts = ellipsePoints([cx, cy], [rx * cph, rx * sph], [-ry * sph, ry * cph], t1, dt, tol).slice(1);
  pts[pts.length - 1] = p1;
  return pts;
}

/** The subpaths of a path `d`, flattened with tolerance `tol` in its own units. */
export function pathSubpaths(d: string, tol: number): Subpath[] {
  let cmds: CommandMadeAbsolute[];
  try {
    cmds = svgPathParser.makeAbsolute(svgPathParser.parseSVG(d));
  } catch (e) {
    const at = (e as { location?: { start?: { offset?: number } } }).location?.start?.offset;
    throw new SvgProblem(
      `its path data cannot be read${at !== undefined ? ` at character ${at + 1} (“${d.slice(Math.max(0, at - 8), at + 8)}”)` : ""}.`,
    );
  }
  const out: Subpath[] = [];
  let cur: Subpath | null = null;
  let start: Point = [0, 0];
  let prevCtrl: Point | null = null;
  let prevKind = "";
  const pt = (x: number, y: number): Point => [x, y];
  for (const c of cmds) {
    const here = pt(c.x0, c.y0);
    if (c.code === "M") {
      if (cur && cur.pts.length > 1) out.push(cur);
      cur = { pts: [pt(c.x, c.y)], closed: false };
      start = pt(c.x, c.y);
      prevKind = "M";
      continue;
    }
    if (!cur) cur = { pts: [here], closed: false };
    if (cur.closed) {
      out.push(cur);
      cur = { pts: [here], closed: false };
      start = here;
    }
    let ctrl: Point | null = null;
    switch (c.code) {
      case "L":
      case "H":
      case "V":
        cur.pts.push(pt(c.x, c.y));
        break;
      case "C":
        ctrl = pt(c.x2, c.y2);
        cur.pts.push(...cubicPoints(here, pt(c.x1, c.y1), ctrl, pt(c.x, c.y), tol));
        break;
      case "S": {
        const first: Point =
          prevCtrl && "CS".includes(prevKind) ? [2 * here[0] - prevCtrl[0], 2 * here[1] - prevCtrl[1]] : here;
        ctrl = pt(c.x2, c.y2);
        cur.pts.push(...cubicPoints(here, first, ctrl, pt(c.x, c.y), tol));
        break;
      }
      case "Q":
        ctrl = pt(c.x1, c.y1);
        cur.pts.push(...quadPoints(here, ctrl, pt(c.x, c.y), tol));
        break;
      case "T":
        ctrl = prevCtrl && "QT".includes(prevKind) ? [2 * here[0] - prevCtrl[0], 2 * here[1] - prevCtrl[1]] : here;
        cur.pts.push(...quadPoints(here, ctrl, pt(c.x, c.y), tol));
        break;
      case "A":
        cur.pts.push(...svgArcPoints(here, c.rx, c.ry, c.xAxisRotation, c.largeArc, c.sweep, pt(c.x, c.y), tol));
        break;
      case "Z":
        cur.closed = true;
        if (cur.pts.length) {
          const last = cur.pts[cur.pts.length - 1]!;
          if (last[0] !== start[0] || last[1] !== start[1]) cur.pts.push(start);
        }
        break;
    }
    prevCtrl = ctrl;
    prevKind = c.code;
  }
  if (cur && cur.pts.length > 1) out.push(cur);
  return out;
}

function num(attrs: Record<string, string>, k: string, fallback?: number): number {
  return userLength(attrs[k], `its ${k}`, fallback);
}

/** The subpaths of one shape element in its own coordinates (tolerance `tol` there too). */
function shapeSubpaths(tag: string, a: Record<string, string>, tol: number): Subpath[] {
  switch (tag) {
    case "path":
      return pathSubpaths(a.d ?? "", tol);
    case "rect": {
      const x = num(a, "x", 0),
        y = num(a, "y", 0),
        w = num(a, "width"),
        h = num(a, "height");
      if (!(w > 0) || !(h > 0)) throw new SvgProblem("its width or height is not more than 0.");
      let rx = a.rx !== undefined ? num(a, "rx") : a.ry !== undefined ? num(a, "ry") : 0;
      let ry = a.ry !== undefined ? num(a, "ry") : rx;
      rx = Math.min(Math.max(rx, 0), w / 2);
      ry = Math.min(Math.max(ry, 0), h / 2);
      if (!rx || !ry)
        return [
          {
            pts: [
              [x, y],
              [x + w, y],
              [x + w, y + h],
              [x, y + h],
              [x, y],
            ],
            closed: true,
          },
        ];
      const corner = (cx: number, cy: number, t0: number) =>
        ellipsePoints([cx, cy], [rx, 0], [0, ry], t0, Math.PI / 2, tol);
      const pts = [
        ...corner(x + w - rx, y + ry, -Math.PI / 2),
        ...corner(x + w - rx, y + h - ry, 0),
        ...corner(x + rx, y + h - ry, Math.PI / 2),
        ...corner(x + rx, y + ry, Math.PI),
      ];
      pts.push(pts[0]!);
      return [{ pts, closed: true }];
    }
    case "circle":
    case "ellipse": {
      const cx = num(a, "cx", 0),
        cy = num(a, "cy", 0);
      const rx = tag === "circle" ? num(a, "r") : num(a, "rx", a.ry !== undefined ? num(a, "ry") : undefined);
      const ry = tag === "circle" ? rx : num(a, "ry", rx);
      if (!(rx > 0) || !(ry > 0)) throw new SvgProblem("its radius is not more than 0.");
      const pts = ellipsePoints([cx, cy], [rx, 0], [0, ry], 0, 2 * Math.PI, tol);
      pts[pts.length - 1] = pts[0]!;
      return [{ pts, closed: true }];
    }
    case "line":
      return [
        {
          pts: [
            [num(a, "x1", 0), num(a, "y1", 0)],
            [num(a, "x2", 0), num(a, "y2", 0)],
          ],
          closed: false,
        },
      ];
    default: {
      const v = numbersIn(a.points ?? "");
      if (v.length % 2) throw new SvgProblem("its points list has an odd count of numbers.");
      const pts: Point[] = [];
      for (let i = 0; i < v.length; i += 2) pts.push([v[i]!, v[i + 1]!]);
      if (pts.length < 2) throw new SvgProblem("its points list has fewer than two points.");
      if (tag === "polygon") pts.push(pts[0]!);
      return [{ pts, closed: tag === "polygon" }];
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Import

interface Element {
  label: string;
  subpaths: Subpath[];
  fillRule: "nonzero" | "evenodd";
}

const styleProp = (style: string | undefined, prop: string) =>
  style ? new RegExp(`(?:^|;)\\s*${prop}\\s*:\\s*([^;]+)`, "i").exec(style)?.[1]?.trim() : undefined;

/**
 * Reads a whole SVG file into profiles.
 *
 *   importSvg('<svg width="100mm" height="50mm" viewBox="0 0 100 50"><rect width="100" height="50"/></svg>')
 *   // { ok: true, profiles: [{ boxMm: [100, 50], areaMm2: 5000, … }], unit: { name: "mm", … } }
 */
export function importSvg(xml: string, opts: SvgImportOptions = {}): ImportResult {
  const tol = opts.chordToleranceMm ?? CHORD_TOLERANCE_MM;
  const fileName = opts.fileName?.trim() || "SVG drawing";
  const notes: string[] = [];
  const errors: ImportProblem[] = [];
  const elements: Element[] = [];
  const skipped = new Map<string, number>();
  let shapeIndex = 0;
  let points = 0;

  interface Frame {
    name: string;
    ctm: Affine;
    fillRule: "nonzero" | "evenodd";
    hidden: boolean;
    skip: boolean;
  }
  const stack: Frame[] = [];
  let unit: UnitUsed | null = null;
  let root: Affine = IDENTITY;

  for (const t of tags(xml)) {
    const [prefix, local] = t.name.includes(":") ? t.name.split(":", 2) : ["", t.name];
    const name = (prefix === "" || prefix === "svg" ? local! : `${prefix}:${local}`).toLowerCase();
    if (t.closing) {
      // Close up to the matching element (tolerates a stray end tag).
      const at = stack.map((f) => f.name).lastIndexOf(name);
      if (at >= 0) stack.length = at;
      continue;
    }
    const parent = stack[stack.length - 1];
    if (!parent && name !== "svg") continue; // before the root: nothing to draw
    const label = () => {
      const id = t.attrs.id ? ` (id “${t.attrs.id.slice(0, 40)}”)` : "";
      return SHAPES.has(name) ? `${name} ${shapeIndex}${id}` : `<${name}>${id}`;
    };
    if (SHAPES.has(name)) shapeIndex++;
    const frame: Frame = {
      name,
      ctm: parent?.ctm ?? IDENTITY,
      fillRule: parent?.fillRule ?? "nonzero",
      hidden: parent?.hidden ?? false,
      skip: parent?.skip ?? false,
    };
    if (!frame.skip && (SKIP.has(name) || name.includes(":") || NOTED.has(name))) {
      frame.skip = true;
      if (NOTED.has(name)) skipped.set(name, (skipped.get(name) ?? 0) + 1);
    }
    const display = t.attrs.display ?? styleProp(t.attrs.style, "display");
    if (!frame.skip && !frame.hidden && display === "none") {
      frame.hidden = true;
      skipped.set("hidden (display: none)", (skipped.get("hidden (display: none)") ?? 0) + 1);
    }
    const rule = t.attrs["fill-rule"] ?? styleProp(t.attrs.style, "fill-rule");
    if (rule === "evenodd" || rule === "nonzero") frame.fillRule = rule;

    if (!frame.skip && !frame.hidden) {
      try {
        if (name === "svg" && !parent) {
          const made = rootUnits(t.attrs, opts.unit, notes);
          unit = made.unit;
          root = made.map;
          frame.ctm = root;
        } else if (name === "svg") {
          // A nested viewport: x, y and its viewBox as a transform (no clipping).
          const vb = numbersIn(t.attrs.viewBox ?? "");
          let m: Affine = [1, 0, 0, 1, num(t.attrs, "x", 0), num(t.attrs, "y", 0)];
          if (vb.length === 4 && vb[2]! > 0 && vb[3]! > 0) {
            const w = num(t.attrs, "width", vb[2]),
              h = num(t.attrs, "height", vb[3]);
            m = compose(m, [w / vb[2]!, 0, 0, h / vb[3]!, -(vb[0]! * w) / vb[2]!, -(vb[1]! * h) / vb[3]!]);
          }
          frame.ctm = compose(frame.ctm, m);
        }
        if (t.attrs.transform) frame.ctm = compose(frame.ctm, parseTransform(t.attrs.transform));
        if (SHAPES.has(name)) {
          const k = maxScale(frame.ctm);
          if (!(k > 0)) throw new SvgProblem("its transform squashes it flat.");
          const subs = shapeSubpaths(name, t.attrs, tol / k);
          const ctm = frame.ctm;
          const moved = subs.map((s) => ({ closed: s.closed, pts: s.pts.map((p) => flipY(apply(ctm, p))) }));
          points += moved.reduce((s, m) => s + m.pts.length, 0);
          if (points > MAX_POINTS)
            throw new SvgProblem(
              `the drawing has more than ${MAX_POINTS.toLocaleString("en")} points once curves are flattened.`,
            );
          elements.push({ label: label(), subpaths: moved, fillRule: frame.fillRule });
        }
      } catch (e) {
        if (!(e instanceof SvgProblem)) throw e;
        const who = name === "svg" && !parent ? "The <svg> element" : label();
        errors.push({ message: `${capital(who)}: ${e.message}`, subject: who });
      }
    }
    if (!t.selfClosing) stack.push(frame);
  }

  if (!unit && !errors.length)
    return fail([{ message: "This is not an SVG drawing: it has no <svg> element.", field: "file" }]);
  if (skipped.size) {
    notes.push(
      `Left out, not outlines: ${[...skipped.entries()].map(([k, n]) => `${n} ${k}`).join(", ")}${skipped.has("text") ? " (turn text into paths in the drawing, or use the Text shape)" : ""}.`,
    );
  }
  if (errors.length) return fail(errors, notes);
  if (!elements.length)
    return fail(
      [
        {
          message: "The SVG holds no shape: no path, rect, circle, ellipse, polygon, polyline or line.",
          field: "file",
        },
      ],
      notes,
    );
  return finish(elements, unit!, fileName, tol, opts.joinToleranceMm ?? JOIN_TOLERANCE_MM, notes);
}

/**
 * A bare SVG path `d` (no file): its numbers are in the unit the person names; without one the
 * result asks for it.
 *
 *   importSvgPath("M0 0 H100 V50 H0 Z", { unit: "mm" })  // one 100 × 50 mm profile
 */
export function importSvgPath(d: string, opts: SvgImportOptions = {}): ImportResult {
  const tol = opts.chordToleranceMm ?? CHORD_TOLERANCE_MM;
  if (!d.trim())
    return fail([
      { message: "Paste a path: the d attribute of an SVG path, such as “M0 0 H100 V50 H0 Z”.", field: "svgPath" },
    ]);
  if (!opts.unit)
    return fail(
      [
        {
          message: "A bare path has no unit: choose the unit its numbers are in (mm, cm, m, in or ft).",
          field: "unit",
        },
      ],
      [],
      true,
    );
  const k = MM_PER_UNIT[opts.unit];
  let subs: Subpath[];
  try {
    subs = pathSubpaths(d, tol / k);
  } catch (e) {
    if (!(e instanceof SvgProblem)) throw e;
    return fail([{ message: `The path: ${e.message}`, subject: "the path", field: "svgPath" }]);
  }
  if (!subs.length) return fail([{ message: "The path draws nothing.", field: "svgPath" }]);
  const elements: Element[] = [
    {
      label: "the path",
      subpaths: subs.map((s) => ({ closed: s.closed, pts: s.pts.map(([x, y]): Point => [x * k, -y * k]) })),
      fillRule: "nonzero",
    },
  ];
  return finish(
    elements,
    { name: opts.unit, mmPerUnit: k, from: "given" },
    opts.fileName?.trim() || "SVG path",
    tol,
    opts.joinToleranceMm ?? JOIN_TOLERANCE_MM,
    [],
  );
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
const flipY = ([x, y]: Point): Point => [x, -y];

/** The root <svg>'s map from user units to mm (before the y flip), and how the unit was found. */
function rootUnits(
  a: Record<string, string>,
  given: DrawingUnit | undefined,
  notes: string[],
): { map: Affine; unit: UnitUsed } {
  const vb = numbersIn(a.viewBox ?? "");
  const hasVb = vb.length === 4 && vb[2]! > 0 && vb[3]! > 0;
  if (a.viewBox !== undefined && !hasVb)
    throw new SvgProblem(`its viewBox “${a.viewBox}” is not four numbers with a positive width and height.`);
  const w = rootLength(a.width),
    h = rootLength(a.height);
  const absolute = Boolean(w?.absolute || h?.absolute);
  if (!absolute && given) {
    // The person says what one user unit is.
    const k = MM_PER_UNIT[given];
    notes.push(
      `The SVG does not give its size in mm, cm, in or pt; its numbers were read as ${UNIT_NAMES[given]}, as chosen.`,
    );
    return { map: [k, 0, 0, k, 0, 0], unit: { name: given, mmPerUnit: k, from: "given" } };
  }
  let sx: number, sy: number;
  if (hasVb && (w || h)) {
    const fx = w ? w.mm / vb[2]! : h!.mm / vb[3]!;
    const fy = h ? h.mm / vb[3]! : fx;
    const par = (a.preserveAspectRatio ?? "").trim();
    if (par.startsWith("none")) [sx, sy] = [fx, fy];
    else {
      const f = par.includes("slice") ? Math.max(fx, fy) : Math.min(fx, fy);
      [sx, sy] = [f, f];
    }
  } else {
    // No viewBox (user unit = 1 px) or no size (the viewBox in px).
    sx = sy = CSS_MM.px!;
  }
  const tx = hasVb ? -vb[0]! * sx : 0,
    ty = hasVb ? -vb[1]! * sy : 0;
  if (!absolute)
    notes.push("The SVG gives no size in mm, cm, in or pt: read as CSS pixels, 96 to the inch (0.2646 mm each).");
  const perUnit = Math.sqrt(Math.abs(sx * sy));
  return {
    map: [sx, 0, 0, sy, tx, ty],
    unit: absolute
      ? { name: w?.absolute ? unitName(a.width!) : unitName(a.height!), mmPerUnit: perUnit, from: "file" }
      : { name: "px", mmPerUnit: perUnit, from: "default" },
  };
}

const unitName = (v: string) => /([a-zA-Z]+)\s*$/.exec(v)?.[1]?.toLowerCase() ?? "px";

/**
 * Elements to profiles: each element's closed subpaths united by its fill rule (clipper2), open
 * runs chained across elements, then every loop nested by containment.
 */
function finish(
  elements: Element[],
  unit: UnitUsed,
  fileName: string,
  tol: number,
  joinTol: number,
  notes: string[],
): ImportResult {
  const place = placeFormatter();
  const errors: ImportProblem[] = [];
  const loops: Loop[] = [];
  const pieces: Piece[] = [];
  for (const el of elements) {
    const closed: { pts: Point[]; label: string }[] = [];
    el.subpaths.forEach((s, i) => {
      const label = el.subpaths.length > 1 ? `${el.label}, subpath ${i + 1}` : el.label;
      const first = s.pts[0]!,
        last = s.pts[s.pts.length - 1]!;
      const meets = Math.hypot(first[0] - last[0], first[1] - last[1]) <= joinTol;
      if (s.closed || (meets && s.pts.length > 3)) closed.push({ pts: s.pts.slice(0, -1), label });
      else pieces.push({ pts: s.pts, from: label });
    });
    if (closed.length <= 1) {
      for (const c of closed) loops.push({ pts: c.pts, from: c.pts.map(() => c.label) });
      continue;
    }
    // Several closed subpaths in one element: each must be simple, then the fill rule decides.
    let selfCrossing = false;
    for (const c of closed) {
      const hit = findCrossing([{ pts: c.pts, from: c.pts.map(() => c.label) }]);
      if (hit) {
        errors.push({
          message: `${capital(c.label)} crosses itself near ${place(hit.at)}.`,
          subject: c.label,
          at: hit.at,
        });
        selfCrossing = true;
      }
    }
    if (selfCrossing) continue;
    for (const pts of fillRegions(
      closed.map((c) => c.pts),
      el.fillRule,
    ))
      loops.push({ pts, from: pts.map(() => el.label) });
  }
  if (errors.length) return fail(errors, notes);
  const chained = chainPieces(pieces, joinTol);
  if (chained.tiny.length) notes.push(`Left out, shorter than ${joinTol} mm: ${sourceList(chained.tiny)}.`);
  for (const o of chained.open) {
    errors.push({
      message: `${capital(sourceList(o.from))} ${new Set(o.from).size > 1 ? "do" : "does"} not close — its ends are ${o.gapMm.toFixed(2)} mm apart, at ${place(o.start)} and ${place(o.end)}. Close the path (Z) or join the ends (within ${joinTol} mm).`,
      subject: o.from[0],
      at: o.end,
    });
  }
  if (errors.length) return fail(errors, notes);
  loops.push(...chained.loops);
  const made = profilesFromLoops(loops, {
    name: (i, n) => (n === 1 ? fileName : `${fileName}, shape ${i + 1}`),
    source: fileName,
    place,
    tol,
  });
  notes.push(...made.notes);
  if (made.errors.length) return fail(made.errors, notes);
  return { ok: true, profiles: made.profiles, unit, notes };
}

/** The filled regions of some closed loops under a fill rule, as loops (outer and hole boundaries). */
export function fillRegions(loops: Point[][], rule: "nonzero" | "evenodd"): Point[][] {
  const tree = new PolyTreeD();
  const subject: PathD[] = loops.map((l) => l.map(([x, y]) => ({ x, y })));
  Clipper.booleanOpDWithPolyTree(
    ClipType.Union,
    subject,
    null,
    tree,
    rule === "evenodd" ? FillRule.EvenOdd : FillRule.NonZero,
    3,
  );
  const out: Point[][] = [];
  const walk = (node: PolyPathD) => {
    for (let i = 0; i < node.count; i++) {
      const child = node.child(i);
      const poly = child.poly;
      if (poly && poly.length >= 3) out.push(poly.map((p) => [p.x, p.y] as Point));
      walk(child);
    }
  };
  walk(tree);
  return out;
}
