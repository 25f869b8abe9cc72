/**
 * The wire's path in each placement of a cutting procedure, the G-code program that makes it,
 * and the cut time of a whole procedure. Pure: no I/O, no clock.
 *
 * Placement frame (mm, machine axes): the placed piece occupies X ∈ [c, c + its X extent] and,
 * for a horizontal wire, Y ∈ [0, its Y extent] (Y = 0 is the table top, never below); for a
 * vertical wire Y ∈ [c, c + its Y extent]; c = ENTRY_CLEARANCE. The wire starts and ends at
 * (0, top + c), the corner of the ring of air c wide around the piece.
 */
import { AXIS_NAMES } from "@/lib/nesting/geometry";
import { ENTRY_CLEARANCE, mm, type Machine } from "./machine";
import { gcodeWriter, HOT_WIRE_CAUTIONS } from "./gcode";
import type { OkProcedure, Step, StepCut } from "./procedure";

export type XY = [number, number];

export interface WireMove {
  kind: "rapid" | "feed";
  to: XY;
  /** Set on the move that makes this cut (its number in the block). */
  cut?: number;
}

/** The kerf centre line a cut's wire follows, across its region and on to the next kerf, the air or the table. */
export interface WireSegment {
  cut: number;
  a: XY;
  b: XY;
}

export interface WirePath {
  start: XY;
  moves: WireMove[];
  /** The placed piece in the placement frame. */
  piece: { min: XY; max: XY };
  feedMm: number;
  rapidMm: number;
}

const TOL = 1e-6;

/**
 * Where the placed piece lies in the placement frame, and a block-frame coordinate on one of the
 * step's in-plane block axes in that frame.
 * @example placementFrame(step, machine).local(0, 100) // → 110 when block x runs along X from 0
 */
export function placementFrame(step: Step, machine: Machine) {
  const c = ENTRY_CLEARANCE;
  const horizontal = machine.wire === "horizontal";
  const y0 = horizontal ? 0 : c;
  const ax = AXIS_NAMES.indexOf(step.orient.x);
  const ay = AXIS_NAMES.indexOf(step.orient.y);
  const min: XY = [c, y0];
  const max: XY = [c + step.placed[0], y0 + step.placed[2]];
  /** Block axis index → placement coordinate. */
  const local = (axis: number, v: number): number =>
    axis === ax ? v - step.origin[ax]! + c : v - step.origin[ay]! + y0;
  return { min, max, top: max[1] + c, right: max[0] + c, horizontal, ax, ay, local };
}

/**
 * The wire's line for every cut of a step, in the placement frame: the kerf centre (kerf start
 * + kerf / 2) across the cut's region; a side that is an earlier kerf extends to that kerf's
 * centre, an outer face extends ENTRY_CLEARANCE into the air, the table (Y = 0 under a
 * horizontal wire) is where it stops.
 * @example cutSegments(step, machine, 2)[0] // → { cut: 1, a: [0, 151], b: [1020, 151] }
 */
export function cutSegments(step: Step, machine: Machine, kerf: number): WireSegment[] {
  const f = placementFrame(step, machine);
  const c = ENTRY_CLEARANCE;
  return step.cuts.map((cut: StepCut) => {
    const m = cut.machineAxis === "X" ? 0 : 1;
    const other = 1 - m;
    const axis = AXIS_NAMES.indexOf(cut.axis);
    const across = other === 0 ? f.ax : f.ay;
    const p = f.local(axis, cut.at) + kerf / 2;
    const rlo = f.local(across, cut.region.origin[across]!);
    const rhi = f.local(across, cut.region.origin[across]! + cut.region.size[across]!);
    const lo =
      Math.abs(rlo - f.min[other]!) <= TOL ? (other === 1 && f.horizontal ? 0 : f.min[other]! - c) : rlo - kerf / 2;
    const hi = Math.abs(rhi - f.max[other]!) <= TOL ? f.max[other]! + c : rhi + kerf / 2;
    const pt = (v: number): XY => (m === 0 ? [p, v] : [v, p]);
    return { cut: cut.n, a: pt(lo), b: pt(hi) };
  });
}

interface Seg {
  a: XY;
  b: XY;
  kind: "rapid" | "feed";
}
interface Edge {
  to: number;
  cost: number;
  kind: "rapid" | "feed";
}

/** Points and the edges between neighbours on every segment: feed along kerfs, rapid along the ring of air. */
function buildGraph(segs: readonly Seg[], extra: readonly XY[], feed: number, rapid: number) {
  const nodes: XY[] = [];
  const cells = new Map<string, number[]>();
  const cell = (v: number) => Math.round(v * 1e4);
  const find = (p: XY): number | undefined => {
    const [cx, cy] = [cell(p[0]), cell(p[1])];
    for (let i = -1; i <= 1; i++)
      for (let j = -1; j <= 1; j++)
        for (const k of cells.get(`${cx + i},${cy + j}`) ?? []) {
          const q = nodes[k]!;
          if (Math.abs(q[0] - p[0]) <= TOL && Math.abs(q[1] - p[1]) <= TOL) return k;
        }
    return undefined;
  };
  const id = (p: XY): number => {
    const k = find(p);
    if (k !== undefined) return k;
    nodes.push(p);
    const key = `${cell(p[0])},${cell(p[1])}`;
    cells.set(key, [...(cells.get(key) ?? []), nodes.length - 1]);
    return nodes.length - 1;
  };
  for (const s of segs) {
    id(s.a);
    id(s.b);
  }
  for (const p of extra) id(p);
  // Segments by their line: vertical ones by x, horizontal ones by y.
  const lines = new Map<string, number[]>();
  segs.forEach((s, i) => {
    const key = s.a[0] === s.b[0] ? `v${cell(s.a[0])}` : `h${cell(s.a[1])}`;
    lines.set(key, [...(lines.get(key) ?? []), i]);
  });
  const on: number[][] = segs.map(() => []);
  nodes.forEach((p, k) => {
    for (const [d, v, w] of [
      ["v", 0, 1],
      ["h", 1, 0],
    ] as const)
      for (let i = -1; i <= 1; i++)
        for (const si of lines.get(`${d}${cell(p[v]) + i}`) ?? []) {
          const s = segs[si]!;
          if (Math.abs(s.a[v] - p[v]) > TOL) continue;
          const lo = Math.min(s.a[w], s.b[w]);
          const hi = Math.max(s.a[w], s.b[w]);
          if (p[w] >= lo - TOL && p[w] <= hi + TOL && !on[si]!.includes(k)) on[si]!.push(k);
        }
  });
  const adj: Edge[][] = nodes.map(() => []);
  segs.forEach((s, si) => {
    const w = s.a[0] === s.b[0] ? 1 : 0;
    const list = on[si]!.sort((p, q) => nodes[p]![w] - nodes[q]![w]);
    for (let i = 1; i < list.length; i++) {
      const u = list[i - 1]!;
      const v = list[i]!;
      const len = Math.abs(nodes[v]![w] - nodes[u]![w]);
      const cost = len / (s.kind === "feed" ? feed : rapid);
      adj[u]!.push({ to: v, cost, kind: s.kind });
      adj[v]!.push({ to: u, cost, kind: s.kind });
    }
  });
  return { nodes, adj, find };
}

/** Shortest times from `src` (binary heap Dijkstra), with the edge each node was reached by. */
function dijkstra(adj: readonly Edge[][], src: number) {
  const dist = adj.map(() => Infinity);
  const prev: ({ from: number; kind: Edge["kind"] } | null)[] = adj.map(() => null);
  dist[src] = 0;
  const heap: [number, number][] = [[0, src]];
  const up = (i: number) => {
    while (i > 0) {
      const j = (i - 1) >> 1;
      if (heap[j]![0] <= heap[i]![0]) break;
      [heap[i], heap[j]] = [heap[j]!, heap[i]!];
      i = j;
    }
  };
  const down = (i: number) => {
    for (;;) {
      const l = 2 * i + 1;
      const r = l + 1;
      let m = i;
      if (l < heap.length && heap[l]![0] < heap[m]![0]) m = l;
      if (r < heap.length && heap[r]![0] < heap[m]![0]) m = r;
      if (m === i) return;
      [heap[i], heap[m]] = [heap[m]!, heap[i]!];
      i = m;
    }
  };
  while (heap.length > 0) {
    const [d, u] = heap[0]!;
    const last = heap.pop()!;
    if (heap.length > 0) {
      heap[0] = last;
      down(0);
    }
    if (d > dist[u]!) continue;
    for (const e of adj[u]!) {
      const nd = d + e.cost;
      if (nd < dist[e.to]! - 1e-12) {
        dist[e.to] = nd;
        prev[e.to] = { from: u, kind: e.kind };
        heap.push([nd, e.to]);
        up(heap.length - 1);
      }
    }
  }
  return { dist, prev };
}

const len = (a: XY, b: XY) => Math.abs(a[0] - b[0]) + Math.abs(a[1] - b[1]);

/**
 * The wire's path in one placement: from (0, top + c) it makes the step's cuts in order, each
 * from whichever end it reaches sooner, reaching it along kerfs already cut (feed moves) or
 * round the piece through the air (rapid moves, never across the piece), and comes back to the
 * start. A vertical cut down to the table is a dead end: the wire comes back up its own kerf.
 * Feed and rapid rates in mm/min weigh the routes.
 * @example wirePath(step, machine, 2, 200).moves // → [{ kind: "rapid", to: [0, 151] }, { kind: "feed", to: [1020, 151], cut: 1 }, …]
 */
export function wirePath(step: Step, machine: Machine, kerf: number, feed: number): WirePath {
  const f = placementFrame(step, machine);
  const rapid = machine.rapid > 0 ? machine.rapid : feed;
  const R = f.right;
  const T = f.top;
  const start: XY = [0, T];
  const ring: Seg[] = [
    { a: [0, 0], b: [0, T], kind: "rapid" },
    { a: [0, T], b: [R, T], kind: "rapid" },
    { a: [R, 0], b: [R, T], kind: "rapid" },
  ];
  if (!f.horizontal) ring.push({ a: [0, 0], b: [R, 0], kind: "rapid" });
  const made: Seg[] = [...ring];
  const moves: WireMove[] = [];
  let pos: XY = start;
  const add = (m: WireMove) => {
    const from = moves.length > 0 ? moves.at(-1)!.to : start;
    if (len(from, m.to) <= TOL) return;
    const last = moves.at(-1);
    if (last && last.cut === undefined && m.cut === undefined && last.kind === m.kind) {
      const p0 = moves.length > 1 ? moves.at(-2)!.to : start;
      const sameLine = (p0[0] === from[0] && from[0] === m.to[0]) || (p0[1] === from[1] && from[1] === m.to[1]);
      const sameWay = (from[0] - p0[0]) * (m.to[0] - from[0]) + (from[1] - p0[1]) * (m.to[1] - from[1]) > 0;
      if (sameLine && sameWay) {
        last.to = m.to;
        return;
      }
    }
    moves.push(m);
  };
  /** Moves to the cheapest of `targets` from `pos`; returns the one reached. */
  const route = (targets: XY[]): XY => {
    const g = buildGraph(made, [pos, ...targets], feed, rapid);
    const src = g.find(pos)!;
    const { dist, prev } = dijkstra(g.adj, src);
    let best = -1;
    let bestT = -1;
    targets.forEach((t, i) => {
      const k = g.find(t)!;
      if (dist[k]! < Infinity && (best < 0 || dist[k]! < dist[best]! - 1e-12)) {
        best = k;
        bestT = i;
      }
    });
    if (best < 0) throw new Error(`step ${step.n}: the wire cannot reach a cut without crossing foam`);
    const path: { to: number; kind: Edge["kind"] }[] = [];
    for (let k = best; k !== src; ) {
      const p = prev[k]!;
      path.push({ to: k, kind: p.kind });
      k = p.from;
    }
    for (const e of path.reverse()) add({ kind: e.kind, to: [...g.nodes[e.to]!] as XY });
    return targets[bestT]!;
  };
  for (const s of cutSegments(step, machine, kerf)) {
    const from = route([s.a, s.b]);
    const to = from === s.a ? s.b : s.a;
    add({ kind: "feed", to: [...to] as XY, cut: s.cut });
    made.push({ a: s.a, b: s.b, kind: "feed" });
    pos = to;
  }
  route([start]);
  let feedMm = 0;
  let rapidMm = 0;
  let at = start;
  for (const m of moves) {
    if (m.kind === "feed") feedMm += len(at, m.to);
    else rapidMm += len(at, m.to);
    at = m.to;
  }
  return { start, moves, piece: { min: f.min, max: f.max }, feedMm, rapidMm };
}

export interface ProgramOptions {
  blockCode: string;
  kerf: number;
  /** Feed of the block's grade on this machine, mm/min. */
  feed: number;
  grade?: string;
  /** Number of steps in the procedure, for the header. */
  steps?: number;
}

/**
 * One placement's G-code program in the machine's dialect: comments naming the block, step and
 * piece and how to place it, the cautions, the unit word and G90, rapids (G0) and feeds (G1 with
 * F) on the dialect's axis letters, the wire heat switched on (with a G4 dwell of the heat-up
 * time) before the first feed and off after the last, M2 at the end. With the heat switched by
 * hand the program stops (M0) and says so instead.
 * @example program(step, wirePath(step, m, 1.5, 300), m, { blockCode: "HF-1001", kerf: 1.5, feed: 300 })
 * // → "(BLOCKYARD HOT-WIRE PROGRAM: BLOCK HF-1001, STEP 1, PIECE A)\n…G21\nG90\nG0 X0 Y620\nM3\nG4 P20\n…M2\n"
 */
export function program(step: Step, path: WirePath, machine: Machine, opts: ProgramOptions): string {
  const d = machine.dialect;
  const [X, Y] = d.axes.map((a) => a.toUpperCase());
  const w = gcodeWriter(d);
  const { code, note, num, units } = w;
  const of = opts.steps ? ` OF ${opts.steps}` : "";
  note(`Blockyard hot-wire program: block ${opts.blockCode}, step ${step.n}${of}, piece ${step.piece}`);
  note(`${machine.name}, ${machine.wire} wire`);
  note(`${step.kind === "turn" ? "Turn" : "Place"}: ${step.howToPlace}`);
  note(
    `Piece ${mm(step.size[0])} x ${mm(step.size[1])} x ${mm(step.size[2])} mm, kerf ${mm(opts.kerf)} mm, feed ${mm(opts.feed)} mm/min${opts.grade ? `, grade ${opts.grade}` : ""}`,
  );
  note("Caution: straight cuts only. Dry-run with the wire cold before cutting.");
  for (const c of HOT_WIRE_CAUTIONS) note(c);
  note(`Start with the wire at machine zero. Units: ${d.inch ? "inch" : "mm"}.`);
  code(units);
  code("G90");
  code(`G0 ${X}${num(path.start[0])} ${Y}${num(path.start[1])}`);
  const feeds = path.moves.map((m, i) => (m.kind === "feed" ? i : -1)).filter((i) => i >= 0);
  const first = feeds[0] ?? -1;
  const last = feeds.at(-1) ?? -1;
  const cuts = new Map(step.cuts.map((c) => [c.n, c]));
  path.moves.forEach((m, i) => {
    if (i === first) w.heatOn(machine.heatUpS);
    if (m.cut !== undefined) {
      const c = cuts.get(m.cut);
      if (c)
        note(
          `Cut ${c.n}: ${c.kind} across ${c.axis} at ${mm(c.pos)} mm from the piece face nearest zero along ${c.machineAxis}`,
        );
    }
    const word = m.kind === "feed" ? "G1" : "G0";
    const f = m.kind === "feed" ? ` F${num(opts.feed)}` : "";
    code(`${word} ${X}${num(m.to[0])} ${Y}${num(m.to[1])}${f}`);
    if (i === last) w.heatOff();
  });
  code("M2");
  return w.text();
}

export interface CutTime {
  feedMm: number;
  rapidMm: number;
  feedMin: number;
  rapidMin: number;
  heatMin: number;
  handlingMin: number;
  totalMin: number;
  placements: number;
  turns: number;
}

/**
 * Cut time of a procedure: every step's wire path, feed moves at `feed` (the grade's feed on
 * this machine, mm/min) and rapids at the machine's rapid rate; the wire heats up once per step
 * (each step's program switches the heat off at its end, so a turn heats up again); handling is
 * the machine's handling time per placement and half of it per turn (no lifting on and off).
 * @example cutTime(procedure(input) as OkProcedure, machine, 200, 2).totalMin // → 8.046
 */
export function cutTime(p: OkProcedure, machine: Machine, feed: number, kerf: number = p.kerf): CutTime {
  let feedMm = 0;
  let rapidMm = 0;
  for (const step of p.steps) {
    const path = wirePath(step, machine, kerf, feed);
    feedMm += path.feedMm;
    rapidMm += path.rapidMm;
  }
  const turns = p.steps.filter((s) => s.kind === "turn").length;
  const placements = p.steps.length - turns;
  const feedMin = feed > 0 ? feedMm / feed : 0;
  const rapidMin = machine.rapid > 0 ? rapidMm / machine.rapid : 0;
  const heatMin = (p.steps.length * machine.heatUpS) / 60;
  const handlingMin = ((placements + turns / 2) * machine.handlingS) / 60;
  const totalMin = feedMin + rapidMin + heatMin + handlingMin;
  return { feedMm, rapidMm, feedMin, rapidMin, heatMin, handlingMin, totalMin, placements, turns };
}
