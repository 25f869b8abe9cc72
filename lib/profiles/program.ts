/**
 * G-code for a profile cutter: one program per part or per slab (every profile of the slab, each
 * with its own lead-in), in the machine's dialect and axis letters (X Y on a 2-axis machine, the
 * two towers' four letters on a 4-axis one), heat on before the first cut and off after the last,
 * the usual cautions in comments; and a drawing of the path to scale (SVG) to read beside it.
 * Pure: no I/O, no clock.
 *
 * Program frame (mm, machine axes): the slab lies at X, Y ∈ [c, c + its size] with c =
 * ENTRY_CLEARANCE. On a horizontal wire the slab lies on a waste sheet c thick, so the wire can
 * pass under a part's lowest edge without cutting the table; on an upright wire it stands c from
 * machine zero on both axes. The wire starts at machine zero (0, 0) and moves between parts on
 * the ring of air c wide round the slab (over the top for a horizontal wire, never under the
 * table), at the rapid rate, with the heat on.
 */
import { ENTRY_CLEARANCE, mm, type Machine } from "@/lib/planning/machine";
import { gcodeWriter, HOT_WIRE_CAUTIONS } from "@/lib/planning/gcode";
import { matchByShare, toTowers, towerProblem, type TowerPlacement } from "./four-axis";
import type { Point } from "./polygon";
import type { Section } from "./slabs";
import { type Dwell, type Face, FACES, type RoutePoint, type Toolpath, toolpath, ToolpathError } from "./toolpath";

/** Why a program cannot be made for a machine; the message is written for a person and names the limit. */
export class ProgramError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ProgramError";
  }
}

export interface ProgramPart {
  name: string;
  /** Root (and tip) sections in the slab's plane, mm from its corner (second coordinate up). */
  root: Section;
  tip: Section;
  tapered: boolean;
  /** The planner's lead-in point, slab plane mm; absent: the shortest lead-in. */
  leadIn?: Point | null;
  /** Per hole, the planner's slit point on the outer loop, slab plane mm. */
  slits?: (Point | null)[];
  /**
   * A chained lead-in (a true-shape slab's walled-in member): the wire reaches `leadIn` from the
   * path of an earlier part (`part`, its index here), by a straight bridge from `from` on that
   * path, after that part is cut; it runs in the kerf already cut (common practice, no source).
   */
  via?: { part: number; from: Point } | null;
}

export interface ProfileProgramInput {
  /** What the header names: "part 12 (Wing panel L), job Club trainer" or "plan 15, block HF-1001, slab 1 of 2". */
  title: string;
  /** The slab's size in the cutting plane [across, up] and along the wire, mm. */
  size: Point;
  thickness: number;
  parts: ProgramPart[];
  kerf: number;
  /** Feed of the grade on this machine, mm/min. */
  feed: number;
  grade?: string | null;
  direction?: "cw" | "ccw";
  dwell?: Dwell | null;
  /** 4-axis: the first tower to the slab's root face, mm; absent: the slab in the middle between the towers. */
  zRoot?: number | null;
}

/** One move as the program makes it: the wire's points at the root and tip faces and at the two towers. */
export interface ProgramMove {
  kind: "rapid" | "feed";
  root: Point;
  tip: Point;
  first: Point;
  second: Point;
  /** Feed word for this move (mm/min): the grade's feed, or the tower speed that gives it at the faster face. */
  f?: number;
  /** Seconds to wait after this move (a sharp corner). */
  dwell?: number;
  /** Index of the part this move belongs to (lead-in, loop, lead-out). */
  part?: number;
}

export interface ProfileProgram {
  gcode: string;
  svg: string;
  warnings: string[];
  /** Each part's paths in the machine frame, at the root face and the tip face. */
  parts: { name: string; root: Toolpath; tip: Toolpath; order: number; via?: { part: number; from: Point } }[];
  frame: {
    /** The slab in the machine frame. */
    slab: { min: Point; max: Point };
    /** The ring of air: X from origin[0] to `right`, Y from origin[1] to `top` (origin (0, 0) but for a 4-axis cut moved clear of the towers' reach). */
    origin: Point;
    right: number;
    top: number;
    horizontal: boolean;
    fourAxis: boolean;
    towers: TowerPlacement;
  };
  moves: ProgramMove[];
  /** Wire travel in the foam (the faster face on a 4-axis cut) and in the air, mm. */
  feedMm: number;
  rapidMm: number;
  minutes: { feed: number; rapid: number; dwell: number; heat: number; handling: number; total: number };
}

const c = ENTRY_CLEARANCE;
const dist = (a: Point, b: Point) => Math.hypot(a[0] - b[0], a[1] - b[1]);

/** Position along the ring of air (anticlockwise from machine zero for an upright wire; up, over and down for a horizontal one). */
function ringPos(p: Point, R: number, T: number): number {
  const on = (v: number, w: number) => Math.abs(v - w) < 1e-6;
  if (on(p[0], 0)) return p[1];
  if (on(p[1], T)) return T + p[0];
  if (on(p[0], R)) return T + R + (T - p[1]);
  return 2 * T + R + (R - p[0]); // on the bottom (upright wire only)
}

/** The corners of the ring the wire passes going from ring position a to b (the shorter way round a closed ring). */
function ringCorners(a: number, b: number, R: number, T: number, closed: boolean): Point[] {
  const list: { p: Point; s: number }[] = [
    { p: [0, T], s: T },
    { p: [R, T], s: T + R },
    { p: [R, 0], s: 2 * T + R },
  ];
  if (!closed) {
    const up = b >= a;
    return list
      .filter((k) => (up ? k.s > a + 1e-9 && k.s < b - 1e-9 : k.s < a - 1e-9 && k.s > b + 1e-9))
      .sort((x, y) => (up ? x.s - y.s : y.s - x.s))
      .map((k) => k.p);
  }
  const total = 2 * T + 2 * R;
  list.push({ p: [0, 0], s: 0 });
  const mod = (v: number) => ((v % total) + total) % total;
  const fwd = mod(b - a);
  const forward = fwd <= total - fwd;
  const span = forward ? fwd : total - fwd;
  return list
    .map((k) => ({ p: k.p, d: forward ? mod(k.s - a) : mod(a - k.s) }))
    .filter((k) => k.d > 1e-9 && k.d < span - 1e-9)
    .sort((x, y) => x.d - y.d)
    .map((k) => k.p);
}

/** The air point on the ring (from `lo` to [R, T]) straight out from a lead-in's start on a face. */
function airPoint(from: Point, face: Face, R: number, T: number, lo: Point = [0, 0]): Point {
  if (face === "left") return [lo[0], from[1]];
  if (face === "right") return [R, from[1]];
  if (face === "top") return [from[0], T];
  return [from[0], lo[1]];
}

/**
 * The program and its drawing for a slab (or one part's blank) on a profile cutter. Throws
 * ProgramError naming the limit: a block cutter, a tapered part on a 2-axis machine, the slab
 * longer than the wire or the towers' spacing, wider or taller than the travel, a tower sent
 * outside its travel; and ToolpathError for a profile that cannot be cut (lead-in, slit).
 *
 *   profileProgram({ title: "part 4", size: [120, 60], thickness: 40, parts: [{ name: "Tile", root, tip: root, tapered: false }], kerf: 1.5, feed: 250 }, machine).gcode
 *   // → "(BLOCKYARD PROFILE PROGRAM: PART 4)\n…G21\nG90\nG0 X0 Y0\n…M2\n"
 */
export function profileProgram(input: ProfileProgramInput, machine: Machine): ProfileProgram {
  if (machine.kind !== "profile") throw new ProgramError(`${machine.name} is a block cutter: choose a profile cutter.`);
  const fourAxis = !!machine.fourAxis && !!machine.dialect.towerAxes;
  const [W, H] = input.size;
  const R = W + 2 * c;
  const T = H + 2 * c;
  const horizontal = machine.wire === "horizontal";
  const tapered = input.parts.filter((p) => p.tapered);
  if (tapered.length && !fourAxis)
    throw new ProgramError(
      `${tapered[0]!.name} has different root and tip sections: it needs a 4-axis profile cutter, and ${machine.name} moves both ends of the wire together.`,
    );
  if (input.thickness > machine.wireLength + 1e-6)
    throw new ProgramError(
      `The slab is ${mm(input.thickness)} mm long along the wire; ${machine.name}'s wire spans ${mm(machine.wireLength)} mm.`,
    );
  const [ax, ay] = machine.dialect.axes.map((a) => a.toUpperCase()) as [string, string];
  if (R > machine.travel[0] + 1e-6)
    throw new ProgramError(
      `The slab needs ${mm(R)} mm along ${ax} (${c} mm of air each side); ${machine.name} travels ${mm(machine.travel[0])} mm.`,
    );
  if (T > machine.travel[1] + 1e-6)
    throw new ProgramError(
      `The slab needs ${mm(T)} mm along ${ay} (${c} mm of air ${horizontal ? `above and a ${c} mm waste sheet below` : "each side"}); ${machine.name} travels ${mm(machine.travel[1])} mm.`,
    );
  const L = machine.wireLength;
  const zRoot = input.zRoot ?? (L - input.thickness) / 2;
  const towers: TowerPlacement = { zRoot, zTip: zRoot + input.thickness, towerSpacing: L };
  const letters = [ax, ay, ...(machine.dialect.towerAxes ?? [ax, ay]).map((a) => a.toUpperCase())] as [
    string,
    string,
    string,
    string,
  ];
  if (fourAxis) {
    const p = towerProblem({ first: [], second: [] }, towers, machine.travel, letters);
    if (p) throw new ProgramError(`${machine.name} cannot cut this: ${p}.`);
  }

  // Paths in the machine frame.
  const tf = (s: Section): Section => ({
    outer: s.outer.map(([u, v]) => [c + u, c + v] as Point),
    holes: s.holes.map((h) => h.map(([u, v]) => [c + u, c + v] as Point)),
  });
  const slab: { min: Point; max: Point } = { min: [c, c], max: [c + W, c + H] };
  const faces: Face[] = horizontal ? ["left", "right", "top"] : [...FACES];
  const roots = input.parts.map((p) => tf(p.root));
  const tips = input.parts.map((p) => tf(p.tip));
  const warnings: string[] = [];
  const chained = (p: ProgramPart, i: number) => {
    const v = p.via;
    if (!v) return undefined;
    const host = input.parts[v.part];
    if (!Number.isInteger(v.part) || v.part === i || !host || host.via?.part === i || !p.leadIn)
      throw new ProgramError(`${p.name}: its chained lead-in names no other part to enter through.`);
    if (p.tapered || host.tapered)
      throw new ProgramError(`${p.name}: a chained lead-in needs both parts straight (not tapered).`);
    return { part: v.part, from: [c + v.from[0], c + v.from[1]] as Point };
  };
  const made: {
    name: string;
    root: Toolpath;
    tip: Toolpath;
    tapered: boolean;
    via?: { part: number; from: Point };
  }[] = input.parts.map((p, i) => {
    const where = input.parts.length > 1 ? `${p.name}: ` : "";
    try {
      const common = { kerf: input.kerf, blank: slab, direction: input.direction, dwell: input.dwell };
      const via = chained(p, i);
      // A chained part is entered by its bridge: its face lead-in is not used, so no face or other part limits it.
      const root = toolpath(roots[i]!.outer, roots[i]!.holes, {
        ...common,
        faces: via ? [...FACES] : faces,
        leadIn: p.leadIn ? ([c + p.leadIn[0], c + p.leadIn[1]] as Point) : null,
        slits: p.slits?.map((s) => (s ? ([c + s[0], c + s[1]] as Point) : null)),
        avoid: via ? [] : roots.filter((_, j) => j !== i).map((s) => s.outer),
      });
      const tip = p.tapered
        ? toolpath(tips[i]!.outer, tips[i]!.holes, {
            ...common,
            faces: [root.leadIn.face],
            avoid: tips.filter((_, j) => j !== i).map((s) => s.outer),
          })
        : root;
      warnings.push(...root.warnings.map((w) => `${where}${w}`));
      if (p.tapered) warnings.push(...tip.warnings.map((w) => `${where}at the tip: ${w}`));
      if (via) {
        // Its lead-in is the bridge: from the earlier part's path to the entry, and back out the same way.
        // (`face` is set to the face its chain starts from once every part's path is made.)
        const to = root.leadIn.to;
        const face = root.leadIn.face;
        const bridged: Toolpath = {
          ...root,
          leadIn: { face, from: via.from, to },
          leadOut: { face, from: to, to: via.from },
          route: [{ p: via.from }, ...root.loop, { p: via.from }],
        };
        return { name: p.name, root: bridged, tip: bridged, tapered: false, via };
      }
      return { name: p.name, root, tip, tapered: p.tapered };
    } catch (e) {
      if (e instanceof ToolpathError) throw new ToolpathError(`${where}${e.message}`);
      throw e;
    }
  });

  // Parts in the order the wire meets their lead-ins going round the ring from machine zero; a
  // chained part right after the part it is entered through (chains end at a face lead-in).
  const children = new Map<number, number[]>();
  for (const [i, m] of made.entries()) if (m.via) children.set(m.via.part, [...(children.get(m.via.part) ?? []), i]);
  const rootsOf = (i: number, seen = new Set<number>()): number => {
    const v = made[i]!.via;
    if (!v) return i;
    if (seen.has(i)) throw new ProgramError(`${made[i]!.name}: its chained lead-in goes round in a circle.`);
    seen.add(i);
    return rootsOf(v.part, seen);
  };
  for (const [i, m] of made.entries()) {
    const face = made[rootsOf(i)]!.root.leadIn.face;
    if (m.via) m.root = { ...m.root, leadIn: { ...m.root.leadIn, face }, leadOut: { ...m.root.leadOut, face } };
    if (m.via) m.tip = m.root;
  }
  const ringOrder = made
    .map((m, i) => ({ i, m }))
    .filter((x) => !x.m.via)
    .map(({ m, i }) => ({ i, s: ringPos(airPoint(m.root.leadIn.from, m.root.leadIn.face, R, T), R, T) }))
    .sort((a, b) => a.s - b.s)
    .map((x) => x.i);
  const order: number[] = [];
  const visitOrder = (i: number) => {
    order.push(i);
    for (const ch of children.get(i) ?? []) visitOrder(ch);
  };
  for (const i of ringOrder) visitOrder(i);

  // The moves, root and tip face points side by side; towers by similar triangles.
  const moves: ProgramMove[] = [];
  let at: { root: Point; tip: Point } = { root: [0, 0], tip: [0, 0] };
  const push = (kind: ProgramMove["kind"], root: Point, tip: Point, extra: Partial<ProgramMove> = {}) => {
    if (dist(at.root, root) < 1e-9 && dist(at.tip, tip) < 1e-9) {
      if (extra.dwell && moves.length) moves.at(-1)!.dwell = extra.dwell;
      return;
    }
    const [first, second] = fourAxis
      ? (() => {
          const t = toTowers([root], [tip], towers);
          return [t.first[0]!, t.second[0]!];
        })()
      : [root, root];
    moves.push({ kind, root, tip, first, second, ...extra });
    at = { root, tip };
  };
  const ring = (to: Point, toTip: Point) => {
    const closed = !horizontal;
    for (const k of ringCorners(ringPos(at.root, R, T), ringPos(to, R, T), R, T, closed)) push("rapid", k, k);
    push("rapid", to, toTip);
  };
  // The parts chained through part i (wire at i's entry, i cut): along i's cut path to the bridge,
  // over it, round the chained part (and its own chained parts), and back the same way.
  const cutChained = (i: number) => {
    const host = made[i]!;
    for (const ch of children.get(i) ?? []) {
      const m = made[ch]!;
      const way = alongPath(host.root.outer, m.via!.from);
      for (const q of way) push("feed", q, q, { part: ch });
      for (const q of m.root.loop) push("feed", q.p, q.p, { part: ch, dwell: q.dwell });
      cutChained(ch);
      for (const q of [...way].reverse()) push("feed", q, q, { part: ch });
      push("feed", host.root.outer[0]!, host.root.outer[0]!, { part: ch });
    }
  };
  for (const i of ringOrder) {
    const m = made[i]!;
    const airR = airPoint(m.root.leadIn.from, m.root.leadIn.face, R, T);
    const airT = airPoint(m.tip.leadIn.from, m.tip.leadIn.face, R, T);
    ring(airR, airT);
    const [lr, lt] = m.tapered ? matchLoops(m.root.loop, m.tip.loop) : [m.root.loop, m.root.loop];
    lr.forEach((q, k) => {
      push("feed", q.p, lt[k]!.p, { part: i, dwell: q.dwell ?? lt[k]!.dwell });
    });
    cutChained(i);
    push("feed", airR, airT, { part: i });
  }
  ring([0, 0], [0, 0]);

  // A 4-axis cut's towers reach past the faces: move the whole set-up away from machine zero until
  // no tower goes below 0 (the slab then sits further from X0 / Y0, and the program says how far).
  const o: Point = [0, 0];
  for (const m of moves)
    for (const q of [m.first, m.second]) {
      o[0] = Math.max(o[0], -q[0]);
      o[1] = Math.max(o[1], -q[1]);
    }
  o[0] = Math.ceil(o[0]);
  o[1] = Math.ceil(o[1]);
  if (o[0] > 0 || o[1] > 0) {
    const sh = (q: Point): Point => [q[0] + o[0], q[1] + o[1]];
    for (const m of moves) {
      m.root = sh(m.root);
      m.tip = sh(m.tip);
      m.first = sh(m.first);
      m.second = sh(m.second);
    }
    moves.unshift({ kind: "rapid", root: o, tip: o, first: o, second: o });
    moves.push({ kind: "rapid", root: [0, 0], tip: [0, 0], first: [0, 0], second: [0, 0] });
    for (const m of made) {
      m.root = shiftPath(m.root, o);
      if (m.tapered) m.tip = shiftPath(m.tip, o);
      else m.tip = m.root;
    }
    slab.min = sh(slab.min);
    slab.max = sh(slab.max);
  }

  // Tower limits, then feeds: the grade's feed at the faster face.
  if (fourAxis) {
    const p = towerProblem(
      { first: moves.map((m) => m.first), second: moves.map((m) => m.second) },
      towers,
      machine.travel,
      letters,
    );
    if (p) throw new ProgramError(`${machine.name} cannot cut this: ${p}.`);
  }
  let feedMm = 0;
  let rapidMm = 0;
  let dwellS = 0;
  let prev: ProgramMove = { kind: "rapid", root: [0, 0], tip: [0, 0], first: [0, 0], second: [0, 0] };
  for (const m of moves) {
    const face = Math.max(dist(prev.root, m.root), dist(prev.tip, m.tip));
    if (m.kind === "feed") {
      feedMm += face;
      const tower = dist(prev.first, m.first) > 1e-9 ? dist(prev.first, m.first) : dist(prev.second, m.second);
      m.f = fourAxis && face > 1e-9 ? (tower / face) * input.feed : input.feed;
    } else rapidMm += fourAxis ? Math.max(dist(prev.first, m.first), dist(prev.second, m.second)) : face;
    dwellS += m.dwell ?? 0;
    prev = m;
  }
  const minutes = {
    feed: input.feed > 0 ? feedMm / input.feed : 0,
    rapid: machine.rapid > 0 ? rapidMm / machine.rapid : 0,
    dwell: dwellS / 60,
    heat: machine.heatUpS / 60,
    handling: machine.handlingS / 60,
    total: 0,
  };
  minutes.total = minutes.feed + minutes.rapid + minutes.dwell + minutes.heat + minutes.handling;

  const frame = { slab, origin: o, right: o[0] + R, top: o[1] + T, horizontal, fourAxis, towers };
  const parts = made.map((m, i) => ({
    name: m.name,
    root: m.root,
    tip: m.tip,
    order: order.indexOf(i) + 1,
    ...(m.via ? { via: { part: m.via.part, from: [m.via.from[0] + o[0], m.via.from[1] + o[1]] as Point } } : {}),
  }));
  const program = { parts, frame, moves, feedMm, rapidMm, minutes, warnings };
  return {
    ...program,
    gcode: writeGcode(input, machine, program, letters),
    svg: drawSvg(input, machine, program),
  };
}

/**
 * The wire's way from the start of a cut closed path (its entry) along it to the point of it
 * nearest `to`, the shorter way round: the points to pass, ending at that point.
 */
function alongPath(path: readonly Point[], to: Point): Point[] {
  let best = 0;
  let bestD = Infinity;
  let at: Point = path[0]!;
  const n = path.length;
  for (let i = 0; i < n; i++) {
    const a = path[i]!;
    const b = path[(i + 1) % n]!;
    const dx = b[0] - a[0];
    const dy = b[1] - a[1];
    const l2 = dx * dx + dy * dy;
    const t = l2 > 0 ? Math.min(1, Math.max(0, ((to[0] - a[0]) * dx + (to[1] - a[1]) * dy) / l2)) : 0;
    const q: Point = [a[0] + t * dx, a[1] + t * dy];
    const d = dist(q, to);
    if (d < bestD) {
      bestD = d;
      best = i;
      at = q;
    }
  }
  const len = (pts: Point[]) => pts.reduce((s, q, k) => (k ? s + dist(pts[k - 1]!, q) : s), 0);
  const forward = [...path.slice(0, best + 1), at];
  const back = [path[0]!, ...path.slice(best + 1).reverse(), at];
  return len(forward) <= len(back) ? forward : back;
}

/** A toolpath moved by `o`. */
function shiftPath(t: Toolpath, o: Point): Toolpath {
  const sh = (q: Point): Point => [q[0] + o[0], q[1] + o[1]];
  const rp = (q: RoutePoint): RoutePoint => ({ ...q, p: sh(q.p) });
  return {
    ...t,
    outer: t.outer.map(sh),
    holes: t.holes.map((h) => ({ hole: h.hole, loop: h.loop.map(sh) })),
    leadIn: { face: t.leadIn.face, from: sh(t.leadIn.from), to: sh(t.leadIn.to) },
    leadOut: { face: t.leadOut.face, from: sh(t.leadOut.from), to: sh(t.leadOut.to) },
    slits: t.slits.map((x) => ({ hole: x.hole, from: sh(x.from), to: sh(x.to) })),
    route: t.route.map(rp),
    loop: t.loop.map(rp),
    corners: t.corners.map(sh),
  };
}

/** Root and tip loops (same start, same way round) matched by share of their lengths; dwells kept. */
function matchLoops(a: RoutePoint[], b: RoutePoint[]): [RoutePoint[], RoutePoint[]] {
  const [pa, pb] = matchByShare(
    a.map((q) => q.p),
    b.map((q) => q.p),
  );
  const dw = (src: RoutePoint[], pts: Point[]) => {
    const out: RoutePoint[] = pts.map((p) => ({ p }));
    let k = 0;
    for (const q of src) {
      while (k < pts.length && dist(pts[k]!, q.p) > 1e-9) k++;
      if (k < pts.length && q.dwell) out[k]!.dwell = q.dwell;
    }
    return out;
  };
  return [dw(a, pa), dw(b, pb)];
}

type Built = Omit<ProfileProgram, "gcode" | "svg">;

function writeGcode(
  input: ProfileProgramInput,
  machine: Machine,
  p: Built,
  letters: [string, string, string, string],
): string {
  const d = machine.dialect;
  const w = gcodeWriter(d);
  const { code, note, num } = w;
  const axes = p.frame.fourAxis ? `4-axis, ${letters.join(" ")}` : `2-axis, ${letters[0]} ${letters[1]}`;
  note(`Blockyard profile program: ${input.title}`);
  note(`${machine.name}, ${machine.wire} wire, ${axes}`);
  const [W, H] = input.size;
  note(
    `Place: the slab ${mm(W)} x ${mm(H)} mm in the cutting plane, ${mm(input.thickness)} mm along the wire, its ${p.frame.horizontal ? `lower face on a waste sheet or spacers ${mm(p.frame.slab.min[1])} mm high` : `lower face ${mm(p.frame.slab.min[1])} mm from ${letters[1]}0`}, its left face ${mm(p.frame.slab.min[0])} mm from ${letters[0]}0`,
  );
  if (p.frame.fourAxis)
    note(
      `Place: the root face ${mm(p.frame.towers.zRoot)} mm from the ${letters[0]} ${letters[1]} tower, the tip face ${mm(machine.wireLength - p.frame.towers.zTip)} mm from the ${letters[2]} ${letters[3]} tower (towers ${mm(machine.wireLength)} mm apart)`,
    );
  note(
    `Kerf ${mm(input.kerf)} mm: the wire runs ${mm(input.kerf / 2)} mm outside the part. Feed ${mm(input.feed)} mm/min${input.grade ? `, grade ${input.grade}` : ""}`,
  );
  if (p.frame.fourAxis)
    note(
      `F is the ${letters[0]} ${letters[1]} tower's speed (the ${letters[2]} ${letters[3]} tower's when it stands still), set per move so the faster foam face moves at ${mm(input.feed)} mm/min`,
    );
  note("Caution: dry-run with the wire cold before cutting, and check the path against the drawing.");
  for (const caution of HOT_WIRE_CAUTIONS) note(caution);
  for (const warning of p.warnings) note(`Note: ${warning}`);
  note(`Start with the wire at machine zero. Units: ${d.inch ? "inch" : "mm"}.`);
  code(w.units);
  code("G90");
  const pos = (m: ProgramMove) => {
    const xy = `${letters[0]}${num(m.first[0])} ${letters[1]}${num(m.first[1])}`;
    return p.frame.fourAxis ? `${xy} ${letters[2]}${num(m.second[0])} ${letters[3]}${num(m.second[1])}` : xy;
  };
  code(`G0 ${pos({ kind: "rapid", root: [0, 0], tip: [0, 0], first: [0, 0], second: [0, 0] })}`);
  const feeds = p.moves.map((m, i) => (m.kind === "feed" ? i : -1)).filter((i) => i >= 0);
  const first = feeds[0] ?? -1;
  const last = feeds.at(-1) ?? -1;
  let part = -1;
  // A part's note once, where its cut starts (the wire comes back through a part to leave by its lead-in).
  const noted = new Set<number>();
  p.moves.forEach((m, i) => {
    if (i === first) w.heatOn(machine.heatUpS);
    if (m.part !== undefined && m.part !== part && !noted.has(m.part)) {
      part = m.part;
      noted.add(part);
      const made = p.parts[part]!;
      const holes = made.root.slits.length;
      const entry = made.via
        ? `Entered by a bridge from the cut path of part ${p.parts[made.via.part]!.order}`
        : `Lead-in from the ${made.root.leadIn.face} face`;
      note(
        `Part ${made.order}: ${made.name}. ${entry}, ${input.direction === "cw" ? "clockwise" : "anticlockwise"}${holes ? `, ${holes} hole slit${holes === 1 ? "" : "s"}` : ""}`,
      );
    }
    if (m.kind === "feed") code(`G1 ${pos(m)} F${num(m.f ?? input.feed)}`);
    else code(`G0 ${pos(m)}`);
    if (m.dwell) code(`G4 P${m.dwell}`);
    if (i === last) w.heatOff();
  });
  code("M2");
  return w.text();
}

const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");

/** A drawing of the program to scale: the slab, the parts, the wire's path with the kerf's width, lead-ins, slits, start points, direction arrows, dwells. */
function drawSvg(input: ProfileProgramInput, machine: Machine, p: Built): string {
  const R = p.frame.right;
  const T = p.frame.top;
  const O = p.frame.origin;
  const S = p.frame.slab;
  const size = Math.max(R, T);
  const fs = Math.max(2.5, size / 45);
  const margin = fs * 2;
  const legend = fs * 11;
  const vw = Math.max(R + 2 * margin, fs * 26);
  const vh = T + 2 * margin + legend;
  const n = (v: number) => String(Math.round(v * 1000) / 1000);
  const X = (x: number) => n(x);
  const Y = (y: number) => n(T - y);
  const path = (loop: readonly Point[], close = true) =>
    `M${loop.map((q) => `${X(q[0])} ${Y(q[1])}`).join(" L")}${close ? " Z" : ""}`;
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${n(vw)}mm" height="${n(vh)}mm" viewBox="${n(-margin)} ${n(-margin)} ${n(vw)} ${n(vh)}" font-family="sans-serif" font-size="${n(fs)}">`,
    `<title>${esc(`Wire path: ${input.title}`)}</title>`,
    `<desc>${esc(`${machine.name}. Drawn to scale, 1 unit = 1 mm; ${p.frame.horizontal ? `${machine.dialect.axes[1]} up` : "seen from above"}.`)}</desc>`,
    `<rect x="${X(O[0])}" y="${Y(T)}" width="${n(R - O[0])}" height="${n(T - O[1])}" fill="none" stroke="#8a806f" stroke-width="${n(fs / 20)}" stroke-dasharray="${n(fs / 2)} ${n(fs / 2)}"/>`,
    `<rect x="${X(p.frame.slab.min[0])}" y="${Y(p.frame.slab.max[1])}" width="${n(p.frame.slab.max[0] - p.frame.slab.min[0])}" height="${n(p.frame.slab.max[1] - p.frame.slab.min[1])}" fill="#eeeae0" stroke="#8a806f" stroke-width="${n(fs / 12)}"/>`,
  );
  if (p.frame.horizontal)
    out.push(
      `<rect x="${X(S.min[0])}" y="${Y(S.min[1])}" width="${n(S.max[0] - S.min[0])}" height="${n(S.min[1])}" fill="#ddd6c6" opacity="0.6"/>`,
      `<text x="${X((S.min[0] + S.max[0]) / 2)}" y="${Y(S.min[1] / 2)}" dy="0.35em" text-anchor="middle" fill="#58676b">waste sheet</text>`,
    );
  for (const part of p.parts) {
    const input0 = input.parts[p.parts.indexOf(part)]!;
    const rootSec = {
      outer: input0.root.outer.map(([u, v]) => [S.min[0] + u, S.min[1] + v] as Point),
      holes: input0.root.holes.map((h) => h.map(([u, v]) => [S.min[0] + u, S.min[1] + v] as Point)),
    };
    out.push(
      `<path d="${[rootSec.outer, ...rootSec.holes].map((l) => path(l)).join(" ")}" fill="#d7ecee" fill-rule="evenodd" stroke="#1f6c75" stroke-width="${n(fs / 12)}"/>`,
    );
    if (input0.tapered) {
      const tipOuter = input0.tip.outer.map(([u, v]) => [S.min[0] + u, S.min[1] + v] as Point);
      out.push(
        `<path d="${path(tipOuter)}" fill="none" stroke="#1f6c75" stroke-width="${n(fs / 12)}" stroke-dasharray="${n(fs / 2)} ${n(fs / 4)}"/>`,
      );
    }
    const loops = [part.root.outer, ...part.root.holes.map((h) => h.loop)];
    // The kerf to scale, and the wire's centre line.
    out.push(
      `<path d="${loops.map((l) => path(l)).join(" ")}" fill="none" stroke="#b04418" stroke-opacity="0.3" stroke-width="${n(input.kerf)}" stroke-linejoin="round"/>`,
      `<path d="${loops.map((l) => path(l)).join(" ")}" fill="none" stroke="#b04418" stroke-width="${n(fs / 14)}"/>`,
    );
    if (input0.tapered)
      out.push(
        `<path d="${[part.tip.outer].map((l) => path(l)).join(" ")}" fill="none" stroke="#b04418" stroke-width="${n(fs / 14)}" stroke-dasharray="${n(fs / 3)} ${n(fs / 5)}"/>`,
      );
    // A chained part's lead-in is its bridge from the earlier part's path.
    const air = part.via ? part.via.from : airPoint(part.root.leadIn.from, part.root.leadIn.face, R, T, O);
    out.push(
      `<line x1="${X(air[0])}" y1="${Y(air[1])}" x2="${X(part.root.leadIn.to[0])}" y2="${Y(part.root.leadIn.to[1])}" stroke="#b04418" stroke-width="${n(fs / 8)}" stroke-dasharray="${n(fs / 3)} ${n(fs / 5)}"/>`,
    );
    for (const s of part.root.slits)
      out.push(
        `<line x1="${X(s.from[0])}" y1="${Y(s.from[1])}" x2="${X(s.to[0])}" y2="${Y(s.to[1])}" stroke="#8a600c" stroke-width="${n(fs / 6)}"/>`,
      );
    // Direction: arrowheads at quarters of the outer loop and halfway round each hole.
    for (const loop of loops) {
      const marks = loop === part.root.outer ? [0.2, 0.45, 0.7, 0.95] : [0.5];
      for (const a of arrows(loop, marks)) {
        const [q, dir] = a;
        const ang = (Math.atan2(-dir[1], dir[0]) * 180) / Math.PI;
        const s = fs * 0.6;
        out.push(
          `<path d="M${n(s)} 0 L${n(-s)} ${n(s * 0.6)} L${n(-s)} ${n(-s * 0.6)} Z" transform="translate(${X(q[0])} ${Y(q[1])}) rotate(${n(ang)})" fill="#b04418"/>`,
        );
      }
    }
    for (const k of part.root.corners)
      out.push(
        `<rect x="${n(k[0] - fs / 4)}" y="${n(T - k[1] - fs / 4)}" width="${n(fs / 2)}" height="${n(fs / 2)}" fill="#a8322a"/>`,
      );
    const start = part.root.leadIn.to;
    out.push(
      `<circle cx="${X(start[0])}" cy="${Y(start[1])}" r="${n(fs * 0.45)}" fill="#326e41"/>`,
      `<text x="${X(air[0])}" y="${Y(air[1])}" dx="${n(air[0] >= R - 1e-6 ? -fs * 0.4 : fs * 0.4)}" dy="${n(air[1] >= T - 1e-6 ? -fs * 0.4 : -fs * 0.3)}" text-anchor="${air[0] >= R - 1e-6 ? "end" : "start"}" font-weight="bold" fill="#16525a">${part.order}</text>`,
    );
    const b = input0.root.outer.reduce((m, q) => Math.max(m, q[1]), -Infinity);
    const left = input0.root.outer.reduce((m, q) => Math.min(m, q[0]), Infinity);
    if (p.parts.length > 1)
      out.push(
        `<text x="${X(S.min[0] + left)}" y="${Y(S.min[1] + b)}" dy="-0.3em" fill="#1c2a2e">${esc(`${part.order}. ${part.name}`)}</text>`,
      );
  }
  // Machine zero, the scale bar and the legend, one short line each.
  const ly = T + margin + fs * 1.5;
  const bar = niceBar(Math.max(R / 3, fs * 6));
  const [ax, ay] = machine.dialect.axes;
  const lines: [string, string][] = [
    ["start", "start of each part's cut; numbers give the order"],
    ["lead", "lead-in and lead-out (the same slit)"],
    ["kerf", `wire path, kerf ${mm(input.kerf)} mm shaded`],
    ...(p.parts.some((q) => q.root.slits.length) ? [["slit", "slit to a hole"] as [string, string]] : []),
    ...(p.parts.some((q) => q.root.corners.length) ? [["dwell", "dwell at a sharp corner"] as [string, string]] : []),
    ...(input.parts.some((q) => q.tapered) ? [["tip", "tip section and its path (dashed)"] as [string, string]] : []),
  ];
  const key = (kind: string, y: number) => {
    if (kind === "start") return `<circle cx="${n(fs / 2)}" cy="${n(y)}" r="${n(fs * 0.45)}" fill="#326e41"/>`;
    if (kind === "dwell")
      return `<rect x="${n(fs / 4)}" y="${n(y - fs / 4)}" width="${n(fs / 2)}" height="${n(fs / 2)}" fill="#a8322a"/>`;
    const style =
      kind === "lead" || kind === "tip"
        ? `stroke="${kind === "tip" ? "#1f6c75" : "#b04418"}" stroke-width="${n(fs / 8)}" stroke-dasharray="${n(fs / 3)} ${n(fs / 5)}"`
        : kind === "slit"
          ? `stroke="#8a600c" stroke-width="${n(fs / 6)}"`
          : `stroke="#b04418" stroke-opacity="0.5" stroke-width="${n(fs / 3)}"`;
    return `<line x1="0" y1="${n(y)}" x2="${n(fs)}" y2="${n(y)}" ${style}/>`;
  };
  out.push(
    `<path d="M${n(-fs / 2)} ${Y(0)} h${n(fs)} M0 ${n(T + fs / 2)} v${n(-fs)}" stroke="#1c2a2e" stroke-width="${n(fs / 10)}"/>`,
    `<text x="${n(fs / 3)}" y="${Y(0)}" dy="1em" fill="#1c2a2e">${esc(`${ax}0 ${ay}0`)}</text>`,
    `<g transform="translate(0 ${n(ly)})">`,
    `<line x1="0" y1="0" x2="${n(bar)}" y2="0" stroke="#1c2a2e" stroke-width="${n(fs / 6)}"/>`,
    `<line x1="0" y1="${n(-fs / 3)}" x2="0" y2="${n(fs / 3)}" stroke="#1c2a2e" stroke-width="${n(fs / 8)}"/>`,
    `<line x1="${n(bar)}" y1="${n(-fs / 3)}" x2="${n(bar)}" y2="${n(fs / 3)}" stroke="#1c2a2e" stroke-width="${n(fs / 8)}"/>`,
    `<text x="${n(bar + fs / 2)}" y="0" dy="0.35em" fill="#1c2a2e">${n(bar)} mm</text>`,
    ...lines.flatMap(([kind, text], i) => [
      key(kind, fs * (1.8 + 1.4 * i)),
      `<text x="${n(fs * 1.5)}" y="${n(fs * (1.8 + 1.4 * i))}" dy="0.35em" fill="#1c2a2e">${esc(text)}</text>`,
    ]),
    `</g>`,
    `</svg>`,
  );
  return `${out.join("\n")}\n`;
}

/** Points at shares of a loop's length, with the direction of travel there. */
function arrows(loop: readonly Point[], marks: readonly number[]): [Point, Point][] {
  const closed = [...loop, loop[0]!];
  const lens: number[] = [0];
  for (let i = 1; i < closed.length; i++) lens.push(lens[i - 1]! + dist(closed[i - 1]!, closed[i]!));
  const total = lens.at(-1)!;
  return marks.map((m) => {
    const s = m * total;
    let i = 1;
    while (i < closed.length - 1 && lens[i]! < s) i++;
    const a = closed[i - 1]!;
    const b = closed[i]!;
    const l = dist(a, b) || 1;
    const t = (s - lens[i - 1]!) / l;
    return [
      [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])],
      [(b[0] - a[0]) / l, (b[1] - a[1]) / l],
    ];
  });
}

/** A round length for a scale bar, at most `max`: 1, 2 or 5 times a power of ten. */
function niceBar(max: number): number {
  const p = 10 ** Math.floor(Math.log10(Math.max(max, 1)));
  return [5, 2, 1].map((k) => k * p).find((v) => v <= max) ?? p;
}
