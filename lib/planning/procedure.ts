/**
 * The cutting procedure of one block on one machine: which piece goes on the table, how it lies,
 * which cuts the wire makes in that placement (in wire order, as positions from the piece's own
 * faces), and where everything that comes off goes. Pure: no I/O, no clock.
 */
import type { Axis, Vec3 } from "@/lib/nesting";
import { AXIS_NAMES, EPS, separate, splitAlong, type Box } from "@/lib/nesting/geometry";
import { dims, ENTRY_CLEARANCE, mm, placementProblem, type Machine } from "./machine";

export type ProcedurePiece =
  | { kind: "part"; part: string; origin: Vec3; size: Vec3 }
  | { kind: "offcut"; index: number; origin: Vec3; size: Vec3 };

export interface ProcedureInput {
  blockCode: string;
  /** Block size, mm: x = length, y = width, z = height. */
  size: Vec3;
  /** Face trim of this block (informative: the trim cuts follow from the pieces themselves). */
  trim: number;
  kerf: number;
  /** The plan's placements and kept offcuts in this block; the rest of the foam is scrap. */
  pieces: ProcedurePiece[];
  machine: Machine;
}

/** Where something that leaves the table goes. */
export type What =
  | { kind: "part"; part: string }
  | { kind: "offcut"; index: number }
  | { kind: "scrap" }
  | { kind: "step"; step: number; piece: string };

export interface Next {
  box: Box;
  what: What;
}

/** Block axis along machine X, along the wire, along machine Y. */
export interface Orient {
  x: Axis;
  w: Axis;
  y: Axis;
}

export interface StepCut {
  /** Cut number in the block, 1-based, in wire order. */
  n: number;
  kind: "split" | "trim";
  /** Block frame: the kerf starts at `at` on `axis` (as the plan's cuts). */
  axis: Axis;
  at: number;
  /** The cut plane is perpendicular to this machine axis. */
  machineAxis: "X" | "Y";
  /** Kerf start measured from the placed piece's face nearest machine zero on that axis, mm. */
  pos: number;
  /** The foam this cut crosses (block frame). */
  region: Box;
  /** What comes off with this cut. */
  frees: Next[];
}

export interface Step {
  n: number;
  /** "turn": on the turntable, without taking the piece off. */
  kind: "place" | "turn";
  piece: string;
  origin: Vec3;
  size: Vec3;
  orient: Orient;
  /** The piece's extents along [X, wire, Y]. */
  placed: Vec3;
  howToPlace: string;
  cuts: StepCut[];
  /** Where every piece leaving the table goes. */
  next: Next[];
}

export interface ProcedureProblem {
  piece: string;
  size: Vec3;
  limit: string;
}

export type Procedure =
  | {
      ok: true;
      block: string;
      size: Vec3;
      kerf: number;
      wire: Machine["wire"];
      steps: Step[];
      cutCount: number;
      placements: number;
      turns: number;
      /** Set when the block needs no cut at all (it is the part or offcut itself, or all scrap). */
      asIs?: What;
    }
  | { ok: false; block: string; problems: ProcedureProblem[] };

export type OkProcedure = Extract<Procedure, { ok: true }>;

/** Block axis indices along [X, wire, Y]. */
type O = Vec3;
const ORIENTS: readonly O[] = [
  [0, 1, 2],
  [1, 0, 2],
  [0, 2, 1],
  [2, 0, 1],
  [1, 2, 0],
  [2, 1, 0],
];

/** Above this many pieces in one piece of foam the choice of placement looks no further than itself. */
const LOOKAHEAD_PIECES = 150;

interface Foam {
  min: number[];
  max: number[];
  idx: number[];
}

type SimWhat = What | { kind: "later"; k: number };
interface SimCut {
  kind: "split" | "trim";
  axis: number;
  at: number;
  min: number[];
  max: number[];
  frees: { box: Box; what: SimWhat }[];
}
interface Sim {
  cuts: SimCut[];
  later: Foam[];
}

interface Ctx {
  boxes: Box[];
  pieces: ProcedurePiece[];
  kerf: number;
  horizontal: boolean;
  /** Whether neighbouring groups that need a later step may come off together (`mergeUnfinished`). */
  merge: boolean;
  /** Set when, without `merge`, some placement weighed could have taken groups off together. */
  mergeable: boolean;
}

const toBox = (min: readonly number[], max: readonly number[]): Box => ({
  origin: [min[0]!, min[1]!, min[2]!],
  size: [max[0]! - min[0]!, max[1]! - min[1]!, max[2]! - min[2]!],
});

const whatOf = (p: ProcedurePiece): What =>
  p.kind === "part" ? { kind: "part", part: p.part } : { kind: "offcut", index: p.index };

/**
 * Piece labels: 0 → "A", 25 → "Z", 26 → "AA", 27 → "AB".
 * @example pieceLabel(26) // → "AA"
 */
export function pieceLabel(i: number): string {
  let s = "";
  let n = i + 1;
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

function bbox(ctx: Ctx, idx: readonly number[]): [number[], number[]] {
  const lo = [Infinity, Infinity, Infinity];
  const hi = [-Infinity, -Infinity, -Infinity];
  for (const i of idx) {
    const b = ctx.boxes[i]!;
    for (let a = 0; a < 3; a++) {
      lo[a] = Math.min(lo[a]!, b.origin[a]!);
      hi[a] = Math.max(hi[a]!, b.origin[a]! + b.size[a]!);
    }
  }
  return [lo, hi];
}

/**
 * The cuts one placement of `foam` makes, depth first: trims (machine Y high then low, X low then
 * high) take off what lies outside the pieces, then a split across an in-plane axis, recursing
 * into each group right after the cut that frees it. Trims across the wire's axis are left to the
 * groups; a group that needs a cut across the wire's axis (or, on a horizontal wire, a bottom trim
 * whose wire would run below the table) comes off for a later step. With `merge`, neighbouring such
 * groups of one extent along the wire come off together (`mergeUnfinished`).
 */
function simulate(foam: Foam, o: O, ctx: Ctx, defer: boolean, merge = false): Sim {
  const { kerf } = ctx;
  const cuts: SimCut[] = [];
  const later: Foam[] = [];
  const order: [number, boolean][] = [
    [o[2], true],
    [o[2], false],
    [o[0], false],
    [o[0], true],
  ];
  const push = (kind: SimCut["kind"], axis: number, at: number, min: number[], max: number[]): number => {
    cuts.push({ kind, axis, at, min: [...min], max: [...max], frees: [] });
    return cuts.length - 1;
  };
  const free = (by: number, box: Box, what: SimWhat) => {
    if (by >= 0) cuts[by]!.frees.push({ box, what });
  };
  const visit = (min0: number[], max0: number[], idx: number[], by0: number, depth: number) => {
    const min = [...min0];
    const max = [...max0];
    let by = by0;
    const [bmin, bmax] = bbox(ctx, idx);
    for (const [a, high] of order) {
      if (high) {
        if (max[a]! - bmax[a]! <= EPS) continue;
        const at = bmax[a]!;
        by = push("trim", a, at, min, max);
        if (max[a]! - (at + kerf) > EPS) {
          const s = [...min];
          s[a] = at + kerf;
          free(by, toBox(s, max), { kind: "scrap" });
        }
        max[a] = at;
      } else {
        if (bmin[a]! - min[a]! <= EPS) continue;
        // The wire's centre runs half a kerf below the piece; on a horizontal wire it must stay on the table.
        if (ctx.horizontal && a === o[2] && bmin[a]! - kerf / 2 - foam.min[a]! < -1e-9) continue;
        const at = bmin[a]! - kerf;
        by = push("trim", a, at, min, max);
        if (at - min[a]! > EPS) {
          const s = [...max];
          s[a] = at;
          free(by, toBox(min, s), { kind: "scrap" });
        }
        min[a] = bmin[a]!;
      }
    }
    if (idx.length === 1) {
      const exact = [0, 1, 2].every((a) => bmin[a]! - min[a]! <= EPS && max[a]! - bmax[a]! <= EPS);
      if (exact) {
        const p = ctx.pieces[idx[0]!]!;
        free(by, { origin: [...p.origin], size: [...p.size] }, whatOf(p));
        return;
      }
    } else {
      for (const a of [o[0], o[2]]) {
        const { groups, cuts: at } = merge
          ? mergeUnfinished(ctx, splitAlong(ctx.boxes, idx, a, kerf), o[1], min, max)
          : splitAlong(ctx.boxes, idx, a, kerf);
        if (groups.length < 2) continue;
        const [cutsBefore, laterBefore] = [cuts.length, later.length];
        let lo = min[a]!;
        let last = by;
        groups.forEach((g, j) => {
          const sMin = [...min];
          sMin[a] = lo;
          const sMax = [...max];
          if (j < at.length) {
            sMax[a] = at[j]!;
            last = push("split", a, at[j]!, sMin, max);
            lo = at[j]! + kerf;
          }
          visit(sMin, sMax, g, last, depth + 1);
        });
        // Deferring: a group that would leave two or more pieces for later goes to a later step whole instead.
        if (!(defer && depth > 0 && later.length - laterBefore >= 2)) return;
        cuts.length = cutsBefore;
        later.length = laterBefore;
        break;
      }
    }
    later.push({ min, max, idx });
    free(by, toBox(min, max), { kind: "later", k: later.length - 1 });
  };
  visit(foam.min, foam.max, foam.idx, -1, 0);
  return { cuts, later };
}

/**
 * Neighbouring groups of a split that both need a cut along the wire (their pieces do not span the
 * foam there) and span the same extent along it stay together: one piece for a later step, whose
 * one trim along the wire serves them all, instead of one later step each (40 slices under a kept
 * offcut took 42 placements, each slice its own).
 */
function mergeUnfinished(
  ctx: Ctx,
  split: { groups: number[][]; cuts: number[] },
  w: number,
  min: readonly number[],
  max: readonly number[],
): { groups: number[][]; cuts: number[] } {
  const { groups, cuts } = split;
  if (groups.length < 2) return split;
  const span = (g: readonly number[]) => {
    const [lo, hi] = bbox(ctx, g);
    return [lo[w]!, hi[w]!] as const;
  };
  const unfinished = (g: readonly number[]) =>
    g.some((i) => {
      const b = ctx.boxes[i]!;
      return b.origin[w]! - min[w]! > EPS || max[w]! - (b.origin[w]! + b.size[w]!) > EPS;
    });
  const out: number[][] = [[...groups[0]!]];
  const at: number[] = [];
  for (let j = 1; j < groups.length; j++) {
    const [p, g] = [groups[j - 1]!, groups[j]!];
    const [ps, gs] = [span(p), span(g)];
    const together = unfinished(p) && unfinished(g) && Math.abs(ps[0] - gs[0]) <= EPS && Math.abs(ps[1] - gs[1]) <= EPS;
    if (together) out[out.length - 1]!.push(...g);
    else {
      at.push(cuts[j - 1]!);
      out.push([...g]);
    }
  }
  return { groups: out, cuts: at };
}

interface Candidate {
  o: O;
  sim: Sim;
  rank: number[];
}

const extents = (f: Foam): Vec3 => [f.max[0]! - f.min[0]!, f.max[1]! - f.min[1]!, f.max[2]! - f.min[2]!];
const placedOf = (f: Foam, o: O): Vec3 => {
  const e = extents(f);
  return [e[o[0]]!, e[o[1]]!, e[o[2]]!];
};
/** The axis standing up: machine Y for a horizontal wire, the wire itself for a vertical one. */
const upAxis = (o: O, horizontal: boolean) => (horizontal ? o[2] : o[1]);

/**
 * The placements of `foam` worth comparing: each orientation that fits, cutting as far as it can or
 * deferring groups, and (with `look`, where the steps ahead are counted) keeping neighbouring groups
 * that need a later step together — offered with `ctx.merge`, else only noted in `ctx.mergeable`.
 */
function options(foam: Foam, ctx: Ctx, m: Machine, look: boolean): { o: O; k: number; sim: Sim }[] {
  const out: { o: O; k: number; sim: Sim }[] = [];
  ORIENTS.forEach((o, k) => {
    if (placementProblem(m, placedOf(foam, o))) return;
    const full = simulate(foam, o, ctx, false);
    if (full.cuts.length === 0) return;
    out.push({ o, k, sim: full });
    const deferred = simulate(foam, o, ctx, true);
    if (deferred.cuts.length !== full.cuts.length) out.push({ o, k, sim: deferred });
    if (!look || (!ctx.merge && ctx.mergeable)) return;
    const merged = simulate(foam, o, ctx, false, true);
    if (merged.cuts.length === full.cuts.length || merged.cuts.length === 0) return;
    if (ctx.merge) out.push({ o, k, sim: merged });
    else ctx.mergeable = true;
  });
  return out;
}

/** Steps a greedy choice (fewest pieces left, then most cuts) needs for `foam`; Infinity when it gets stuck. */
function rollout(foam: Foam, ctx: Ctx, m: Machine): number {
  let best: Sim | undefined;
  // Without merged groups: the greedy choice (fewest pieces left) would always take them.
  for (const { sim } of options(foam, ctx, m, false))
    if (
      !best ||
      sim.later.length < best.later.length ||
      (sim.later.length === best.later.length && sim.cuts.length > best.cuts.length)
    )
      best = sim;
  if (!best) return Infinity;
  let steps = 1;
  for (const f of best.later) steps += rollout(f, ctx, m);
  return steps;
}

type Choice = { o: O; sim: Sim; turn: boolean } | { problem: string };

function choose(foam: Foam, prev: O | null, canTurn: boolean, ctx: Ctx, m: Machine): Choice {
  const cands: Candidate[] = [];
  const fits = ORIENTS.filter((o) => !placementProblem(m, placedOf(foam, o)));
  const look = foam.idx.length <= LOOKAHEAD_PIECES;
  // Merged groups only where the steps ahead are counted (a lower bound would always favour them).
  for (const { o, k, sim } of options(foam, ctx, m, look)) {
    // Steps in all (or, for big pieces, a lower bound of them: this one and one per piece left).
    const ahead = look ? sim.later.reduce((s, f) => s + rollout(f, ctx, m), 1) : 1 + sim.later.length;
    const same = prev?.every((v, i) => v === o[i]) ?? false;
    const turn = canTurn && prev !== null && !same && upAxis(prev, ctx.horizontal) === upAxis(o, ctx.horizontal);
    // Fewer steps in all, then more cuts now, then no change, then a turn rather than a re-place, then z up.
    cands.push({
      o,
      sim,
      rank: [ahead, -sim.cuts.length, same ? 0 : 1, turn ? 0 : 1, upAxis(o, ctx.horizontal) === 2 ? 0 : 1, k],
    });
  }
  if (cands.length > 0) {
    cands.sort((p, q) => {
      for (let i = 0; i < p.rank.length; i++) if (p.rank[i] !== q.rank[i]) return p.rank[i]! - q.rank[i]!;
      return 0;
    });
    const c = cands[0]!;
    return { o: c.o, sim: c.sim, turn: c.rank[3] === 0 && c.rank[2] === 1 };
  }
  const size = dims(extents(foam));
  if (fits.length === 0) {
    const table = placementProblem(m, extents(foam));
    if (table?.startsWith("the table")) return { problem: `${table}; this piece is ${size} mm` };
    const e = extents(foam);
    if (e.every((v) => v > m.wireLength + EPS))
      return {
        problem: `the wire spans ${mm(m.wireLength)} mm; this piece is ${size} mm and none of its sides fits along it`,
      };
    return {
      problem: `the wire travels ${dims(m.travel)} mm (${ENTRY_CLEARANCE} mm of air to enter included); this piece is ${size} mm and fits that no way round that also fits along the wire`,
    };
  }
  const along = [...new Set(fits.map((o) => `its ${AXIS_NAMES[o[1]]} side (${mm(extents(foam)[o[1]]!)} mm)`))];
  return {
    problem: `this piece (${size} mm) fits ${m.name} only with ${along.join(" or ")} along the wire, and that way the wire cannot make its next cut (wire ${mm(m.wireLength)} mm, travel ${dims(m.travel)} mm)`,
  };
}

function howToPlace(label: string, f: Foam, o: O, turn: boolean, m: Machine): string {
  const e = extents(f);
  const ax = (i: number) => `block ${AXIS_NAMES[i]} (${mm(e[i]!)} mm)`;
  const xPart = `${ax(o[0])} along X, its low-${AXIS_NAMES[o[0]]} end toward machine zero at X = ${ENTRY_CLEARANCE} mm`;
  if (turn)
    return `Turn ${label} a quarter turn on the turntable without lifting it: ${xPart}; ${ax(o[1])} along the wire.`;
  if (m.wire === "horizontal") {
    const face = `${mm(e[o[0]]!)} × ${mm(e[o[1]]!)} mm`;
    return `Lay ${label} on its ${face} face, ${mm(e[o[2]]!)} mm high (block ${AXIS_NAMES[o[2]]} up): ${xPart}; ${ax(o[1])} along the wire.`;
  }
  const face = `${mm(e[o[0]]!)} × ${mm(e[o[2]]!)} mm`;
  return `Lay ${label} on its ${face} face, ${mm(e[o[1]]!)} mm high along the wire (block ${AXIS_NAMES[o[1]]} up): ${xPart}; ${ax(o[2])} along Y, its low-${AXIS_NAMES[o[2]]} side at Y = ${ENTRY_CLEARANCE} mm.`;
}

/**
 * The cutting procedure of one block on one machine: steps (placements and turns), each with
 * its cuts in wire order and where every piece that comes off goes. Where choices exist, the
 * placement that needs the fewest steps in all wins, then the one making the most cuts now.
 * A block or piece the machine cannot take or cut is reported, naming the piece and the limit.
 * @example
 * procedure({ blockCode: "HF-1", size: [1000, 500, 300], trim: 0, kerf: 2, machine,
 *   pieces: [{ kind: "part", part: "P", origin: [0, 0, 0], size: [1000, 500, 150] }] })
 * // → { ok: true, steps: [{ piece: "A", cuts: [{ kind: "trim", axis: "z", at: 150, … }], … }], … }
 */
export function procedure(input: ProcedureInput): Procedure {
  // Worked out both ways, groups kept apart and (where that saves steps) taken off together: the
  // step-count estimate that decides each placement is greedy, so either can come out shorter.
  // Fewer placements win, then fewer steps; a tie keeps the groups apart.
  // The second way only where the first met groups that could come off together.
  const { procedure: apart, mergeable } = procedureWith(input, false);
  if (!mergeable || (apart.ok && apart.placements <= 1)) return apart;
  const { procedure: together } = procedureWith(input, true);
  if (!together.ok) return apart;
  if (!apart.ok) return together;
  const better =
    together.placements < apart.placements ||
    (together.placements === apart.placements && together.steps.length < apart.steps.length);
  return better ? together : apart;
}

function procedureWith(input: ProcedureInput, merge: boolean): { procedure: Procedure; mergeable: boolean } {
  const { kerf, machine: m, pieces } = input;
  const boxes: Box[] = pieces.map((p) => ({ origin: [...p.origin], size: [...p.size] }));
  const ctx: Ctx = { boxes, pieces, kerf, horizontal: m.wire === "horizontal", merge, mergeable: false };
  return { procedure: procedureSteps(input, ctx), mergeable: ctx.mergeable };
}

function procedureSteps(input: ProcedureInput, ctx: Ctx): Procedure {
  const { size, kerf, machine: m, pieces } = input;
  const { boxes } = ctx;
  const block: Foam = { min: [0, 0, 0], max: [...size], idx: pieces.map((_, i) => i) };
  const base = { ok: true as const, block: input.blockCode, size: [...size] as Vec3, kerf, wire: m.wire };
  const empty = { ...base, steps: [], cutCount: 0, placements: 0, turns: 0 };
  if (pieces.length === 0) return { ...empty, asIs: { kind: "scrap" } };
  const stuck = separate(boxes, kerf, "guillotine").stuck;
  if (stuck.length > 0) {
    const names = stuck[0]!.map((i) => {
      const p = pieces[i]!;
      return p.kind === "part" ? p.part : `offcut ${p.index}`;
    });
    return {
      ok: false,
      block: input.blockCode,
      problems: [
        {
          piece: "A",
          size: [...size],
          limit: `straight through cuts cannot separate ${names.join(", ")} (a wire cuts through the whole piece)`,
        },
      ],
    };
  }
  if (
    pieces.length === 1 &&
    [0, 1, 2].every((a) => boxes[0]!.origin[a]! <= EPS && boxes[0]!.size[a]! >= size[a]! - EPS)
  )
    return { ...empty, asIs: whatOf(pieces[0]!) };

  const steps: Step[] = [];
  const problems: ProcedureProblem[] = [];
  const waiting = new Map<string, Extract<What, { kind: "step" }>>();
  const stack: { label: string; foam: Foam; from: number; o: O | null }[] = [
    { label: "A", foam: block, from: 0, o: null },
  ];
  let labels = 1;
  let cutCount = 0;
  while (stack.length > 0) {
    const p = stack.pop()!;
    const canTurn = m.turntable && p.from > 0 && p.from === steps.length;
    const c = choose(p.foam, p.o, canTurn, ctx, m);
    if ("problem" in c) {
      problems.push({ piece: p.label, size: extents(p.foam), limit: c.problem });
      continue;
    }
    const n = steps.length + 1;
    const w = waiting.get(p.label);
    if (w) w.step = n;
    const laterLabels = c.sim.later.map(() => pieceLabel(labels++));
    const cuts: StepCut[] = c.sim.cuts.map((s) => ({
      n: ++cutCount,
      kind: s.kind,
      axis: AXIS_NAMES[s.axis]!,
      at: s.at,
      machineAxis: s.axis === c.o[0] ? "X" : "Y",
      pos: s.at - p.foam.min[s.axis]!,
      region: toBox(s.min, s.max),
      frees: s.frees.map((f) => {
        if (f.what.kind !== "later") return { box: f.box, what: f.what };
        const what = { kind: "step" as const, step: 0, piece: laterLabels[f.what.k]! };
        waiting.set(what.piece, what);
        return { box: f.box, what };
      }),
    }));
    steps.push({
      n,
      kind: c.turn ? "turn" : "place",
      piece: p.label,
      origin: toBox(p.foam.min, p.foam.max).origin,
      size: extents(p.foam),
      orient: { x: AXIS_NAMES[c.o[0]]!, w: AXIS_NAMES[c.o[1]]!, y: AXIS_NAMES[c.o[2]]! },
      placed: placedOf(p.foam, c.o),
      howToPlace: howToPlace(p.label, p.foam, c.o, c.turn, m),
      cuts,
      next: cuts.flatMap((x) => x.frees),
    });
    for (let k = c.sim.later.length - 1; k >= 0; k--)
      stack.push({ label: laterLabels[k]!, foam: c.sim.later[k]!, from: n, o: c.o });
  }
  if (problems.length > 0) return { ok: false, block: input.blockCode, problems };
  const turns = steps.filter((s) => s.kind === "turn").length;
  return { ...base, steps, cutCount, placements: steps.length - turns, turns };
}

/**
 * Makes every cut of a procedure on the block, in order, and returns the pieces of foam that
 * result (parts, offcuts and scrap). Throws when a cut's region is not a piece of foam at that
 * point, i.e. the procedure could not be followed.
 * @example replay(procedure(input)) // → the plan's parts and offcuts, plus the scrap pieces
 */
export function replay(p: OkProcedure): Box[] {
  let foams: Box[] = [{ origin: [0, 0, 0], size: [...p.size] }];
  const same = (a: Box, b: Box) =>
    [0, 1, 2].every((i) => Math.abs(a.origin[i]! - b.origin[i]!) <= 1e-6 && Math.abs(a.size[i]! - b.size[i]!) <= 1e-6);
  for (const step of p.steps)
    for (const cut of step.cuts) {
      const k = foams.findIndex((f) => same(f, cut.region));
      if (k < 0) throw new Error(`cut ${cut.n}: no piece of foam matches its region`);
      const f = foams[k]!;
      const a = AXIS_NAMES.indexOf(cut.axis);
      const out: Box[] = [];
      const end = f.origin[a]! + f.size[a]!;
      if (cut.at - f.origin[a]! > EPS) {
        const s = [...f.size] as Vec3;
        s[a] = cut.at - f.origin[a]!;
        out.push({ origin: [...f.origin], size: s });
      }
      if (end - (cut.at + p.kerf) > EPS) {
        const o = [...f.origin] as Vec3;
        const s = [...f.size] as Vec3;
        o[a] = cut.at + p.kerf;
        s[a] = end - o[a];
        out.push({ origin: o, size: s });
      }
      foams = [...foams.slice(0, k), ...out, ...foams.slice(k + 1)];
    }
  return foams;
}
