/**
 * Where a part's profile lies in its box, and the slabs of a box-nested plan. Pure: no I/O.
 *
 * A part's box is [x, y, z] with x along the wire; its profile lies in the box's y–z face ("u" across,
 * "v" up). A **slab** is the profile parts of one block that the plan placed with the same axis of
 * the block along the wire and the same extent along it: one layer of the block. The block's
 * through cuts free each part's blank; the slab's blanks, laid on the profile cutter as they sat in
 * the block, are cut by one program (one set-up, one heat-up), each part with its own lead-in.
 */
import type { Axis, PartOutline, Plan, Vec3 } from "@/lib/nesting";
import { outline, parseNaca, sectionBox } from "./naca";
import type { Profile } from "./part";
import { polygonBounds, type Point } from "./polygon";

/** A profile's loops in its part frame (u across the box's y, v up the box's z, from the box's corner). */
export interface Section {
  outer: Point[];
  holes: Point[][];
}

/** The sections at the two ends of a part: equal for a straight extrusion, different for a tapered panel. */
export interface PartSections {
  root: Section;
  tip: Section;
  /** Root and tip differ: a 4-axis cut. */
  tapered: boolean;
}

/** Outline points of a NACA section in a program: 160 stations each side, crowded at the nose. */
const NACA_STATIONS = 160;

/**
 * The root and tip sections of a profile in its box's u–v frame (mm). A NACA panel's chord lines
 * lie in one plane, the root's leading edge at u = 0 unless the tip is swept forward of it.
 *
 *   partSections({ kind: "polygon", points: [[10, 10], [60, 10], [10, 40]], extrudeMm: 20 }).root.outer
 *   // → [[0, 0], [50, 0], [0, 30]]
 */
export function partSections(p: Profile): PartSections {
  if (p.kind === "polygon") {
    const b = polygonBounds(p.points);
    const shift = (loop: readonly Point[]) => loop.map(([x, y]) => [x - b.min[0], y - b.min[1]] as Point);
    const s = { outer: shift(p.points), holes: (p.holes ?? []).map(shift) };
    return { root: s, tip: s, tapered: false };
  }
  const section = parseNaca(p.code);
  const cr = p.chordMm;
  const ct = p.tipChordMm ?? p.chordMm;
  const sweep = p.sweepMm ?? 0;
  const unit = sectionBox(section, 1);
  const maxChord = Math.max(cr, ct);
  const front = Math.min(0, sweep) + Math.min(0, unit.minX) * maxChord;
  const bottom = unit.minLower * maxChord;
  const place = (chord: number, lead: number): Section => ({
    outer: dedupe(outline(section, chord, NACA_STATIONS)).map(([x, y]) => [x + lead - front, y - bottom] as Point),
    holes: [],
  });
  const root = place(cr, 0);
  const tapered = ct !== cr || sweep !== 0;
  return { root, tip: tapered ? place(ct, sweep) : root, tapered };
}

/** Neighbouring points closer than 1 µm merged (a NACA outline closes its open trailing edge with a short edge). */
function dedupe(loop: Point[]): Point[] {
  const out: Point[] = [];
  for (const p of loop) {
    const q = out.at(-1);
    if (!q || Math.hypot(p[0] - q[0], p[1] - q[1]) > 1e-6) out.push(p);
  }
  const first = out[0]!;
  const last = out.at(-1)!;
  if (out.length > 1 && Math.hypot(first[0] - last[0], first[1] - last[1]) <= 1e-6) out.pop();
  return out;
}

const AX: Record<Axis, number> = { x: 0, y: 1, z: 2 };
const NAMES: Axis[] = ["x", "y", "z"];
const near = (a: number, b: number) => Math.abs(a - b) <= 0.011;

/**
 * How a placed part's box sits in its block: which block axis runs along the part's x (the wire),
 * and whether its profile is turned a quarter (u up the block instead of across). The cutting
 * plane's axes are the other two block axes, z last when it is one of them (z stays up).
 *
 *   orientation([500, 200, 30], [500, 200, 30])  // → { wire: "x", plane: ["y", "z"], quarter: false }
 */
export function orientation(partSize: Vec3, placedSize: Vec3): { wire: Axis; plane: [Axis, Axis]; quarter: boolean } {
  for (const w of [0, 1, 2])
    if (near(placedSize[w]!, partSize[0])) {
      const [a, b] = [0, 1, 2].filter((i) => i !== w) as [number, number];
      if (near(placedSize[a]!, partSize[1]) && near(placedSize[b]!, partSize[2]))
        return { wire: NAMES[w]!, plane: [NAMES[a]!, NAMES[b]!], quarter: false };
      if (near(placedSize[a]!, partSize[2]) && near(placedSize[b]!, partSize[1]))
        return { wire: NAMES[w]!, plane: [NAMES[a]!, NAMES[b]!], quarter: true };
    }
  throw new Error(`a placed size ${placedSize.join(" × ")} is not a turn of the part's ${partSize.join(" × ")}`);
}

/**
 * A section placed in the cutting plane: at `origin` (plane coordinates of the box's corner), turned
 * a quarter anticlockwise when `quarter` (a turn, never a mirror image: (u, v) → (h − v, u)).
 *
 *   placeSection({ outer: [[0, 0], [40, 0], [0, 10]], holes: [] }, [100, 0], 10, false).outer[1]  // → [140, 0]
 */
export function placeSection(s: Section, origin: Point, height: number, quarter: boolean): Section {
  const tf = ([u, v]: Point): Point =>
    quarter ? [origin[0] + height - v, origin[1] + u] : [origin[0] + u, origin[1] + v];
  return { outer: s.outer.map(tf), holes: s.holes.map((h) => h.map(tf)) };
}

export interface SlabPart {
  /** The plan's part key ("jp-12"). */
  part: string;
  /** The placement's index in the plan. */
  placement: number;
  /** Root and tip sections in the slab's plane (mm, from the slab's corner). */
  root: Section;
  tip: Section;
  tapered: boolean;
  /** The part's blank (its box) in the slab's plane. */
  blank: { min: Point; max: Point };
}

export interface Slab {
  block: string;
  /** 1, 2, … within its block. */
  n: number;
  /** The block axis along the wire, and the block axes of the cutting plane (z last when present). */
  wire: Axis;
  plane: [Axis, Axis];
  /** The slab's extent along the wire, block mm. */
  along: [number, number];
  /** The slab's corner in the block's plane coordinates, and its size in the plane, mm. */
  origin: Point;
  size: Point;
  parts: SlabPart[];
}

/**
 * The slabs of a plan: its profile parts grouped by block, wire axis and extent along the wire
 * (to 0.01 mm), each slab's plane spanning its parts' blanks. Parts without a profile are left out.
 * With `maxFace` (the profile cutter's largest face, across × up: `slabMaxFor(m).slice(1)`), a
 * layer whose blanks span more is split into slabs that fit it.
 *
 *   planSlabs(plan, new Map([["jp-3", { size: [500, 200, 30], profile }]]))
 *   // → [{ block: "HF-1001", n: 1, wire: "x", plane: ["y", "z"], along: [6, 506], parts: [3 parts] }]
 */
export function planSlabs(
  plan: Pick<Plan, "placements">,
  parts: ReadonlyMap<string, { size: Vec3; profile: Profile | null }>,
  maxFace?: Point,
): Slab[] {
  const groups = new Map<
    string,
    { block: string; wire: Axis; plane: [Axis, Axis]; along: [number, number]; items: number[] }
  >();
  const orient = new Map<number, ReturnType<typeof orientation>>();
  plan.placements.forEach((pl, i) => {
    const part = parts.get(pl.part);
    if (!part?.profile) return;
    const o = orientation(part.size, pl.size);
    orient.set(i, o);
    const w = AX[o.wire];
    const along: [number, number] = [pl.origin[w]!, pl.origin[w]! + pl.size[w]!];
    const key = `${pl.block}|${o.wire}|${along.map((v) => Math.round(v * 100)).join("|")}`;
    if (!groups.has(key)) groups.set(key, { block: pl.block, wire: o.wire, plane: o.plane, along, items: [] });
    groups.get(key)!.items.push(i);
  });
  const slabs: Slab[] = [];
  const sorted = [...groups.values()].sort(
    (a, b) => a.block.localeCompare(b.block) || AX[a.wire] - AX[b.wire] || a.along[0] - b.along[0],
  );
  const count = new Map<string, number>();
  const slabOf = (g: (typeof sorted)[number], a: number, b: number): Slab => {
    const min: Point = [Infinity, Infinity];
    const max: Point = [-Infinity, -Infinity];
    for (const i of g.items) {
      const pl = plan.placements[i]!;
      min[0] = Math.min(min[0], pl.origin[a]!);
      min[1] = Math.min(min[1], pl.origin[b]!);
      max[0] = Math.max(max[0], pl.origin[a]! + pl.size[a]!);
      max[1] = Math.max(max[1], pl.origin[b]! + pl.size[b]!);
    }
    const slabParts = g.items.map((i): SlabPart => {
      const pl = plan.placements[i]!;
      const part = parts.get(pl.part)!;
      const o = orient.get(i)!;
      const s = partSections(part.profile!);
      const corner: Point = [pl.origin[a]! - min[0], pl.origin[b]! - min[1]];
      return {
        part: pl.part,
        placement: i,
        root: placeSection(s.root, corner, part.size[2], o.quarter),
        tip: placeSection(s.tip, corner, part.size[2], o.quarter),
        tapered: s.tapered,
        blank: { min: corner, max: [corner[0] + pl.size[a]!, corner[1] + pl.size[b]!] },
      };
    });
    const n = (count.get(g.block) ?? 0) + 1;
    count.set(g.block, n);
    return {
      block: g.block,
      n,
      wire: g.wire,
      plane: g.plane,
      along: g.along,
      origin: min,
      size: [max[0] - min[0], max[1] - min[1]],
      parts: slabParts,
    };
  };
  for (const whole of sorted) {
    const [a, b] = [AX[whole.plane[0]], AX[whole.plane[1]]];
    for (const items of fitFaces(whole.items, (i) => plan.placements[i]!, a, b, maxFace))
      slabs.push(slabOf({ ...whole, items }, a, b));
  }
  return slabs;
}

/**
 * The placements of one layer split into slabs whose faces (the span of their blanks in the plane
 * axes a, b) are at most `maxFace`: rows first (by b, then a), each into the first slab it still
 * fits. A blank larger than `maxFace` by itself is a slab of its own (its program names the limit).
 * Without `maxFace`, the layer is one slab.
 */
function fitFaces(
  items: readonly number[],
  at: (i: number) => Pick<Plan["placements"][number], "origin" | "size">,
  a: number,
  b: number,
  maxFace?: Point,
): number[][] {
  if (!maxFace) return [[...items]];
  const rect = (i: number) => {
    const p = at(i);
    return { lo: [p.origin[a]!, p.origin[b]!], hi: [p.origin[a]! + p.size[a]!, p.origin[b]! + p.size[b]!] };
  };
  const order = [...items].sort((x, y) => rect(x).lo[1]! - rect(y).lo[1]! || rect(x).lo[0]! - rect(y).lo[0]! || x - y);
  const groups: { lo: number[]; hi: number[]; items: number[] }[] = [];
  for (const i of order) {
    const r = rect(i);
    const fits = (g: (typeof groups)[number]) =>
      [0, 1].every((k) => Math.max(g.hi[k]!, r.hi[k]!) - Math.min(g.lo[k]!, r.lo[k]!) <= maxFace[k]! + 1e-6);
    const g = groups.find(fits);
    if (!g) groups.push({ lo: [...r.lo], hi: [...r.hi], items: [i] });
    else {
      g.items.push(i);
      for (const k of [0, 1]) {
        g.lo[k] = Math.min(g.lo[k]!, r.lo[k]!);
        g.hi[k] = Math.max(g.hi[k]!, r.hi[k]!);
      }
    }
  }
  // Placement order inside each slab, as before the split.
  return groups.map((g) => g.items.sort((x, y) => x - y));
}

/**
 * A profile as a nesting outline (`parts[i].outline`, in the part box's y–z face), or undefined when
 * its sections do not lie within the box `size` (the part was entered with a box other than its
 * profile's: it stays a box part). Tapered panels carry their tip section.
 * @example profileOutline({ kind: "polygon", points: [[0, 0], [40, 0], [0, 30]], extrudeMm: 20 }, [20, 40, 30])?.outer.length // → 3
 */
export function profileOutline(profile: Profile, size: Vec3): PartOutline | undefined {
  const s = partSections(profile);
  const tol = 0.011; // the box is kept to 0.01 mm (lib/nesting/slab.ts, OUTLINE_BOX_TOL)
  const loops = [s.root.outer, s.tip.outer];
  for (const loop of loops)
    for (const [u, v] of loop) if (u < -tol || v < -tol || u > size[1] + tol || v > size[2] + tol) return undefined;
  const holes = (h: [number, number][][]) =>
    h.length ? { holes: h.map((l) => l.map(([u, v]) => [u, v] as [number, number])) } : {};
  const outer = (l: [number, number][]) => l.map(([u, v]) => [u, v] as [number, number]);
  return {
    outer: outer(s.root.outer),
    ...holes(s.root.holes),
    ...(s.tapered ? { tip: { outer: outer(s.tip.outer), ...holes(s.tip.holes) } } : {}),
  };
}
