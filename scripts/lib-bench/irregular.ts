/**
 * The 2D irregular strip set (../shared/benchmarks/2d-irregular-strip, see its FORMAT.md and
 * SOURCES.md): reading the instances and records, the independent check of a layout with
 * polygon-clipping (not the library the engine uses), and the bounding-box packing that stands for
 * what Blockyard did before true-shape nesting.
 */
import { existsSync, readFileSync, readdirSync } from "node:fs";
import path from "node:path";
import { MaxRectsPacker, PACKING_LOGIC, Rectangle } from "maxrects-packer";
import polygonClipping, { type MultiPolygon, type Polygon } from "polygon-clipping";
import { type IrregularProblem, type IrregularSolution, parseIrregular, type Pt } from "@/lib/nesting/irregular";

export const STRIP_SET = "2d-irregular-strip";

/**
 * The folder holding `2d-irregular-strip`: `explicit` (--data) when given, else BENCH_DATA when
 * set, else ../shared/benchmarks beside the repo; undefined when that one folder lacks the set.
 */
export function irregularDataDir(explicit?: string): string | undefined {
  const dir = explicit ?? process.env.BENCH_DATA ?? path.resolve(process.cwd(), "../shared/benchmarks");
  return existsSync(path.join(dir, STRIP_SET, "records.csv")) ? dir : undefined;
}

export interface StripInstance {
  name: string;
  problem: IrregularProblem;
  /** Record length and density (records.csv; Gardeyn & Wauters 2025, see SOURCES.md). */
  record: number;
  recordDensityPct: number;
}

interface RawInstance {
  name: string;
  strip_height: number;
  items: { id: number; demand: number; allowed_orientations: number[]; shape: { type: string; data: Pt[] } }[];
}

/**
 * Reads the instances of the set with their records.
 * @example loadStripInstances(irregularDataDir()!).map((i) => i.name) // albano, dagli, ...
 */
export function loadStripInstances(dir: string): StripInstance[] {
  const base = path.join(dir, STRIP_SET);
  const records = new Map<string, { record: number; density: number }>();
  const lines = readFileSync(path.join(base, "records.csv"), "utf8").trim().split(/\r?\n/);
  const head = lines[0]!.split(",");
  const col = (n: string) => head.indexOf(n);
  for (const line of lines.slice(1)) {
    const c = line.split(",");
    records.set(c[col("instance")]!, {
      record: Number(c[col("record_length")]),
      density: Number(c[col("record_density_pct")]),
    });
  }
  const out: StripInstance[] = [];
  for (const f of readdirSync(path.join(base, "instances")).sort()) {
    if (!f.endsWith(".json")) continue;
    const raw = JSON.parse(readFileSync(path.join(base, "instances", f), "utf8")) as RawInstance;
    const rec = records.get(raw.name);
    if (!rec) throw new Error(`${f}: no record for "${raw.name}" in records.csv`);
    for (const it of raw.items)
      if (it.shape.type !== "simple_polygon") throw new Error(`${f}: item ${it.id} has shape type ${it.shape.type}`);
    // Through the parser: closing vertices repeated in the files are dropped, and every outline is checked.
    const parsed = parseIrregular({
      width: raw.strip_height,
      items: raw.items.map((it) => ({
        id: String(it.id),
        outer: it.shape.data,
        quantity: it.demand,
        rotations: it.allowed_orientations,
      })),
    });
    if (!parsed.ok) throw new Error(`${f}: ${parsed.errors.join("; ")}`);
    out.push({ name: raw.name, record: rec.record, recordDensityPct: rec.density, problem: parsed.problem });
  }
  return out;
}

function rotate(loop: Pt[], deg: number, dx: number, dy: number): Pt[] {
  const d = ((deg % 360) + 360) % 360;
  // Quarter turns exactly; any other angle by cos/sin.
  const c = d === 0 ? 1 : d === 90 ? 0 : d === 180 ? -1 : d === 270 ? 0 : Math.cos((d * Math.PI) / 180);
  const s = d === 0 ? 0 : d === 90 ? 1 : d === 180 ? 0 : d === 270 ? -1 : Math.sin((d * Math.PI) / 180);
  return loop.map(([x, y]) => [c * x - s * y + dx, s * x + c * y + dy]);
}

function ringArea(r: Pt[] | [number, number][]): number {
  let s = 0;
  for (let i = 0, j = r.length - 1; i < r.length; j = i++) s += r[j]![0] * r[i]![1] - r[i]![0] * r[j]![1];
  return Math.abs(s) / 2;
}

function multiArea(m: MultiPolygon): number {
  let a = 0;
  for (const poly of m) poly.forEach((ring, k) => (a += (k === 0 ? 1 : -1) * ringArea(ring)));
  return a;
}

export interface CheckResult {
  errors: string[];
  /** Largest overlap found, as a share of the smaller piece's area. */
  worstOverlap: number;
}

/**
 * Checks a layout with polygon-clipping, independently of the engine and its validator: every copy
 * placed once with an allowed rotation, inside 0 ≤ y ≤ width (and x ≥ 0, and the rectangle's
 * length when there is one), no two overlapping by more than `share` (1e-6) of the smaller's area,
 * and the reported length is the largest x.
 * @example checkIndependently(problem, solution).errors // → []
 */
export function checkIndependently(problem: IrregularProblem, sol: IrregularSolution, share = 1e-6): CheckResult {
  const errors: string[] = [];
  const items = new Map(problem.items.map((it) => [it.id, it]));
  const count = new Map<string, number>();
  const polys: { label: string; poly: Polygon; area: number; x0: number; x1: number; y0: number; y1: number }[] = [];
  let maxX = 0;
  let scaleRef = problem.width;
  for (const p of sol.placements) {
    const it = items.get(p.item);
    if (!it) {
      errors.push(`unknown item ${p.item}`);
      continue;
    }
    count.set(p.item, (count.get(p.item) ?? 0) + 1);
    const rot = ((p.rotation % 360) + 360) % 360;
    if (!it.rotations.some((r) => Math.abs((((r % 360) + 360) % 360) - rot) < 1e-9))
      errors.push(`${p.item}#${p.copy}: rotation ${p.rotation} not allowed`);
    const rings = [it.outer, ...it.holes].map((l) => rotate(l, p.rotation, p.x, p.y));
    const xs = rings[0]!.map((q) => q[0]);
    const ys = rings[0]!.map((q) => q[1]);
    const b = { x0: Math.min(...xs), x1: Math.max(...xs), y0: Math.min(...ys), y1: Math.max(...ys) };
    maxX = Math.max(maxX, b.x1);
    scaleRef = Math.max(scaleRef, b.x1);
    polys.push({
      label: `${p.item}#${p.copy}`,
      poly: rings as Polygon,
      area: ringArea(rings[0]!) - rings.slice(1).reduce((s, r) => s + ringArea(r), 0),
      ...b,
    });
  }
  const tol = 1e-9 * scaleRef;
  const placed = new Map<string, number>();
  for (const u of sol.unplaced) placed.set(u.item, (placed.get(u.item) ?? 0) + u.count);
  for (const it of problem.items) {
    const n = (count.get(it.id) ?? 0) + (placed.get(it.id) ?? 0);
    if (n !== it.quantity) errors.push(`${it.id}: ${n} copies accounted for, demand ${it.quantity}`);
  }
  for (const q of polys) {
    if (q.y0 < -tol || q.y1 > problem.width + tol || q.x0 < -tol) errors.push(`${q.label}: outside the strip`);
    if (problem.length !== undefined && q.x1 > problem.length + tol) errors.push(`${q.label}: past the stock's length`);
  }
  if (polys.length > 0 && Math.abs(maxX - sol.length) > tol + problem.margin)
    errors.push(`length ${sol.length} but outlines reach ${maxX}`);
  let worst = 0;
  const order = polys.map((_, i) => i).sort((a, b) => polys[a]!.x0 - polys[b]!.x0);
  for (let a = 0; a < order.length; a++) {
    const A = polys[order[a]!]!;
    for (let b = a + 1; b < order.length; b++) {
      const B = polys[order[b]!]!;
      if (B.x0 >= A.x1) break;
      if (B.y0 >= A.y1 || A.y0 >= B.y1) continue;
      const inter = multiArea(polygonClipping.intersection(A.poly, B.poly));
      const rel = inter / Math.min(A.area, B.area);
      worst = Math.max(worst, rel);
      if (rel > share)
        errors.push(
          `${A.label} and ${B.label} overlap: ${inter.toPrecision(3)} (${rel.toPrecision(3)} of the smaller)`,
        );
    }
  }
  return { errors, worstOverlap: worst };
}

/**
 * The strip length when every piece is replaced by its bounding box (in the orientations its
 * allowed rotations give) and the boxes are packed by maxrects-packer into a strip of the same
 * width — Blockyard's rectangle approach before true-shape nesting. Bisection on the length, each
 * length tried with both of the packer's sort rules; the shortest packing that holds every box wins.
 * @example boxStripLength(problem) // e.g. 12.5 for a problem whose pieces' boxes pack into 12.5
 */
export function boxStripLength(problem: IrregularProblem): number {
  const boxes: { w: number; h: number; turn: boolean }[] = [];
  for (const it of problem.items) {
    const xs = it.outer.map((p) => p[0]);
    const ys = it.outer.map((p) => p[1]);
    const w = Math.max(...xs) - Math.min(...xs);
    const h = Math.max(...ys) - Math.min(...ys);
    const quarter = it.rotations.some((r) => (((r % 360) + 360) % 360) % 180 === 90);
    const straight = it.rotations.some((r) => (((r % 360) + 360) % 360) % 180 === 0);
    // Only quarter turns allowed: the box always lies turned.
    const [bw, bh] = straight ? [w, h] : [h, w];
    for (let c = 0; c < it.quantity; c++) boxes.push({ w: bw, h: bh, turn: quarter && straight });
  }
  const W = problem.width;
  const pack = (L: number): number | undefined => {
    let best: number | undefined;
    for (const logic of [PACKING_LOGIC.MAX_AREA, PACKING_LOGIC.MAX_EDGE]) {
      const packer = new MaxRectsPacker(L, W, 0, {
        smart: false,
        pot: false,
        square: false,
        allowRotation: false,
        border: 0,
        logic,
      });
      packer.addArray(boxes.map((b) => new Rectangle(b.w, b.h, 0, 0, false, b.turn)));
      if (packer.bins.length !== 1) continue;
      const rects = packer.bins[0]!.rects;
      if (rects.length !== boxes.length) continue;
      const len = Math.max(...rects.map((r) => r.x + r.width));
      if (best === undefined || len < best) best = len;
    }
    return best;
  };
  let lo = boxes.reduce((s, b) => s + b.w * b.h, 0) / W;
  let hi = boxes.reduce((s, b) => s + Math.max(b.w, b.turn ? b.h : b.w), 0) + 1;
  let best = pack(hi) ?? Infinity;
  for (let k = 0; k < 40 && hi - lo > 1e-6 * hi; k++) {
    const mid = (lo + hi) / 2;
    const got = pack(mid);
    if (got !== undefined) {
      best = Math.min(best, got);
      hi = mid;
    } else lo = mid;
  }
  return best;
}
