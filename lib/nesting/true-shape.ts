/**
 * True-shape nesting for the shop (`settings.trueShape`): profile parts cut through the same slab
 * thickness (same grade, same extent along the wire) are nested by their outlines in the faces of
 * slabs with the irregular engine, kerf apart, each with a clear lead-in corridor; every slab then
 * enters the block nesting as one box. Pure: no I/O; the clock and the seed are handed in. See
 * README, "Slabs of true-shape nested profiles", and the rules in `./slab.ts`.
 */
import {
  EndType,
  FillRule,
  differenceD,
  inflatePathsD,
  JoinType,
  type PathD,
  simplifyPathsD,
} from "@countertype/clipper2-ts";
import { comparePlans } from "./objective";
import { NfpStore, nestIrregular, nestIrregularSync, type IrregularRunOptions } from "./irregular";
import { bboxOf, outwardSimplify, signedArea } from "./irregular/geometry";
import type { IrregularItem, IrregularProblem, IrregularSolution } from "./irregular/types";
import { checkSlab, faceRotations, leadIns, memberLoop, occupiedOutline, type PlacedMember, ROTATE_RANK } from "./slab";
import type {
  FacePoint,
  NestOptions,
  Part,
  Placement,
  Plan,
  Problem,
  Rotate,
  SlabLayout,
  SlabMember,
  Unplaced,
  Vec3,
} from "./types";

/** Share of the time budget the slab nesting gets (the block nesting has the rest). */
const SLAB_SHARE = 0.9;
/** Seeds of the block nesting tried in the time it leaves (the first with the run's seed). */
const BOX_TRIES = 16;
/** Improvement passes of each further seed when no clock is handed in (each stops at its bound). */
const BOX_TRY_ITERATIONS = 20;
/** Piece moves of each slab nesting when no clock is handed in (keeps a seed's plan the same). */
const SLAB_MOVES = 1500;
/** Strip widths tried per group of parts. */
const MAX_WIDTHS = 3;
/** Narrower strips tried after a strip's first nesting, each NARROW_STEP of the used width. */
const NARROW_TRIES = 4;
const NARROW_STEP = 0.85;
/** Share of a strip's time its first nesting gets, and each narrower retry (of what is then left). */
const NARROW_FIRST = 0.6;
const NARROW_RETRY = 0.35;
/** Slabs per group at most (a guard; each slab holds at least one part). */
const MAX_SLABS = 200;
/**
 * Share of a slab's face the parts' outlines are expected to fill (sets how many parts one slab is
 * given): the shop case's letters fill 0.59–0.70 of their slabs' faces (see README).
 */
const SLAB_FILL = 0.62;

/**
 * Whether a problem asks for true-shape nesting and has a part to nest so.
 * @example usesTrueShape({ ...problem, settings: { ...problem.settings, trueShape: true } }) // → true when a part has an outline
 */
export function usesTrueShape(problem: Problem): boolean {
  return problem.settings.trueShape === true && problem.parts.some((p) => p.outline);
}

type Step =
  | { kind: "slab"; problem: IrregularProblem; options: IrregularRunOptions }
  | { kind: "boxes"; problem: Problem; options: NestOptions };

interface Group {
  key: string;
  parts: Part[];
  thickness: number;
  grade: string | undefined;
  rotate: Rotate;
}

export interface SlabPlanned {
  id: string;
  layout: SlabLayout;
}

const toPath = (l: readonly FacePoint[]): PathD => l.map(([x, y]) => ({ x, y }));
const fromPath = (p: PathD): FacePoint[] => p.map((q) => [q.x, q.y]);

/** Vertices the engine's outline of a part aims at: no-fit polygons grow with the product of two parts' vertices. */
const NEST_VERTICES = 24;
/** Growth of the simplified outline that covers the rounding of its computed corners, mm. */
const NEST_GROW = 0.01;

const areaLeft = (inner: readonly FacePoint[], outer: readonly FacePoint[]) =>
  differenceD([toPath(inner)], [toPath(outer)], FillRule.NonZero, 6).reduce(
    (s, p) => s + Math.abs(signedArea(fromPath(p))),
    0,
  );

/**
 * The outline the engine nests for a part: the occupied loop itself when it has at most 24
 * vertices; else the loop simplified outwards to 24 vertices (`outwardSimplify`: only triangles
 * outside it are added, about 1 % of the letters' area) and grown by 0.01 mm to cover rounding.
 * When that does not contain the true loop, the older way: grown by e and simplified within e,
 * e from 0.4 % of the part's larger side doubling to 3 %. The true loop when nothing contains it.
 * @example nestingLoop(occupiedOutline(part.outline)).length // → at most 24 for the shop case's letters
 */
export function nestingLoop(occupied: readonly FacePoint[]): FacePoint[] {
  if (occupied.length <= NEST_VERTICES) return [...occupied];
  const simple = outwardSimplify(occupied, NEST_VERTICES);
  const grown = inflatePathsD([toPath(simple)], NEST_GROW, JoinType.Miter, EndType.Polygon, 3, 6)
    .map(fromPath)
    .filter((l) => l.length >= 3 && signedArea(l) > 0);
  if (grown.length === 1 && areaLeft(occupied, grown[0]!) <= 1e-9) return grown[0]!;
  const b = bboxOf([occupied]);
  const side = Math.max(b.maxX - b.minX, b.maxY - b.minY);
  let best: FacePoint[] = [...occupied];
  for (let e = Math.max(0.1, 0.004 * side); e <= 0.03 * side; e *= 2) {
    const grownE = inflatePathsD([toPath(occupied)], e, JoinType.Miter, EndType.Polygon, 3, 4);
    const outers = simplifyPathsD(grownE, e, true)
      .map(fromPath)
      .filter((l) => l.length >= 3 && signedArea(l) > 0);
    if (outers.length !== 1 || areaLeft(occupied, outers[0]!) > 1e-9) continue;
    best = outers[0]!;
    if (best.length <= NEST_VERTICES) break;
  }
  return best;
}

/** The least height of a loop over the given rotations (quarter turns: the smaller side of its box). */
function minCrossing(loop: readonly FacePoint[], rotations: readonly number[]): number {
  const b = bboxOf([loop]);
  const w = b.maxX - b.minX;
  const h = b.maxY - b.minY;
  return rotations.some((r) => ((Math.round(r) % 180) + 180) % 180 === 90) ? Math.min(w, h) : h;
}

const boxVolume = (p: Part) => p.size[0] * p.size[1] * p.size[2];

/** Strip widths and the longest slab for them, from the blocks the group may use, within `settings.slabMax`. */
function stripSizes(problem: Problem, g: Group): { width: number; length: number }[] {
  const seen = new Map<string, { width: number; length: number }>();
  const t = g.thickness;
  const max = problem.settings.slabMax;
  // Thicker than the profile cutter's wire spans: no slab (the parts are nested as boxes).
  if (max && t > max[0] + 1e-6) return [];
  for (const b of problem.blocks) {
    if (g.grade !== undefined && b.grade !== g.grade) continue;
    const D = b.size.map((v) => v - 2 * b.trim) as Vec3;
    const pairs: [number, number][] = [];
    if (g.rotate === "none") {
      if (D[0] >= t) pairs.push([D[2], D[1]]);
    } else if (g.rotate === "z") {
      if (D[0] >= t) pairs.push([D[2], D[1]]);
      if (D[1] >= t) pairs.push([D[2], D[0]]);
    } else
      for (let a = 0; a < 3; a++) {
        if (D[a]! < t) continue;
        const [p, q] = [0, 1, 2].filter((i) => i !== a).map((i) => D[i]!) as [number, number];
        pairs.push([p, q], [q, p]);
      }
    for (const [w, l] of pairs) {
      // A slab no larger than the profile cutter takes: its face v (the strip's width) and u (its length).
      const width = max ? Math.min(w, max[2]) : w;
      const length = max ? Math.min(l, max[1]) : l;
      if (!(width > 0 && length > 0)) continue;
      const k = `${width.toFixed(2)}|${length.toFixed(2)}`;
      if (!seen.has(k)) seen.set(k, { width, length });
    }
  }
  // One size per width (the longest), then spread over the widths: widest, narrowest, middle.
  const byWidth = new Map<string, { width: number; length: number }>();
  for (const s of seen.values()) {
    const k = s.width.toFixed(2);
    const had = byWidth.get(k);
    if (!had || s.length > had.length) byWidth.set(k, s);
  }
  const list = [...byWidth.values()].sort((a, b) => b.width - a.width || b.length - a.length);
  if (list.length <= MAX_WIDTHS) return list;
  // The two widest and the one nearest half of the widest (a narrower slab stands beside others in a block).
  const half = list.reduce(
    (best, s) => (Math.abs(s.width - list[0]!.width / 2) < Math.abs(best.width - list[0]!.width / 2) ? s : best),
    list[1]!,
  );
  return [...new Set([list[0]!, list[1]!, half])];
}

interface Pack {
  slabs: SlabLayout[];
  /** Volume of the slabs plus the boxes of the copies left (mm³). */
  volume: number;
  /** Copies no slab could take, or whose slab would not be smaller than their boxes (to be nested as boxes). */
  left: Map<string, number>;
}

/** Members of a layout with their corridors; members without one (or breaking a rule) are taken out, repeatedly. */
function settle(
  problem: Problem,
  g: Group,
  loops: { part: string; rotation: number; at: FacePoint; loop: FacePoint[] }[],
): { layout: SlabLayout | null; out: string[] } {
  const out: string[] = [];
  let keep = [...loops];
  const tapered = new Set(g.parts.filter((p) => p.outline?.tip).map((p) => p.id));
  for (let round = 0; round < 20 && keep.length; round++) {
    const bb = bboxOf(keep.map((m) => m.loop));
    // The used face, exactly (rounding up could make a slab longer than the block it was sized for).
    const uv: [number, number] = [bb.maxX, bb.maxY];
    const placed: PlacedMember[] = keep.map((m) => ({
      loop: m.loop,
      bb: bboxOf([m.loop]),
      area: Math.abs(signedArea(m.loop)),
    }));
    // Face corridors where clear, else chained through a member reached before (straight parts only).
    const {
      order,
      leads,
      blocked: walled,
    } = leadIns(placed, uv, problem.settings.kerf, (k) => !tapered.has(keep[k]!.part));
    let blocked = walled;
    if (blocked.length === keep.length) blocked = blocked.slice(1); // the first one stays; alone it is always reachable
    if (blocked.length) {
      out.push(...blocked.map((k) => keep[k]!.part));
      keep = keep.filter((_, k) => !blocked.includes(k));
      continue;
    }
    // Members in cutting order: every host before the members chained through it.
    keep = order.map((k) => keep[k]!);
    const layout: SlabLayout = {
      size: [g.thickness, uv[0], uv[1]],
      ...(g.grade !== undefined ? { grade: g.grade } : {}),
      rotate: g.rotate,
      members: keep.map((m, k): SlabMember => ({ part: m.part, rotation: m.rotation, at: m.at, leadIn: leads[k]! })),
    };
    const check = checkSlab(problem, layout, "slab");
    if (!check.errors.length) return { layout, out };
    const bad = check.bad.size ? check.bad : new Set([keep.length - 1]);
    out.push(...[...bad].map((k) => keep[k]!.part));
    keep = keep.filter((_, k) => !bad.has(k));
  }
  out.push(...keep.map((m) => m.part));
  return { layout: null, out };
}

/**
 * The parts of a group into slabs of one strip size: strip after strip, each cut to the longest
 * slab and nested again in narrower strips while its face shrinks, until every copy has a slab or
 * is left to the box nesting (a slab no smaller than its members' boxes is not made).
 */
function* packGroup(
  problem: Problem,
  g: Group,
  size: { width: number; length: number },
  items: Map<string, FacePoint[]>,
  budget: (share: number) => IrregularRunOptions,
  timeLeft: () => number,
  slabTimeLeft: () => number,
): Generator<Step, Pack, IrregularSolution | Plan> {
  const pool = new Map(g.parts.map((p) => [p.id, p.quantity]));
  const slabs: SlabLayout[] = [];
  const left = new Map<string, number>();
  const area = (id: string) => {
    const b = bboxOf([items.get(id)!]);
    return (b.maxX - b.minX) * (b.maxY - b.minY);
  };
  const outlineArea = (id: string) => Math.abs(signedArea(items.get(id)!));
  for (let n = 0; n < MAX_SLABS && [...pool.values()].some((q) => q > 0); n++) {
    // The slabs' time is spent: no new strip (the copies left go to the box nesting), so the run
    // keeps its budget whatever the input.
    if (slabTimeLeft() <= 0) break;
    // This slab's share: the copies left, split evenly over the slabs they need (their outlines at
    // SLAB_FILL of the slab's face): every n-th copy by size for n slabs, so each strip gets large
    // and small parts alike (taking one copy of each part in turn gave the first strip the largest
    // parts: its slab 0.66 full and 1,090 mm long, the second's 0.72 and 930 mm).
    const remaining = g.parts.reduce((s, p) => s + outlineArea(p.id) * (pool.get(p.id) ?? 0), 0);
    const slabsNeeded = Math.max(1, Math.ceil(remaining / (SLAB_FILL * size.width * size.length)));
    const order = g.parts
      .filter((p) => (pool.get(p.id) ?? 0) > 0)
      .sort((a, b) => area(b.id) - area(a.id) || a.id.localeCompare(b.id));
    const copies = order.flatMap((p) => Array.from({ length: pool.get(p.id)! }, () => p.id));
    const take = new Map<string, number>();
    for (let i = 0; i < copies.length; i += slabsNeeded) take.set(copies[i]!, (take.get(copies[i]!) ?? 0) + 1);
    const list = order.filter((p) => take.has(p.id));
    const byId = new Map(list.map((p) => [p.id, p]));
    const stripOf = (width: number): IrregularProblem => ({
      width,
      kerf: problem.settings.kerf,
      margin: 0,
      items: list.map(
        (p): IrregularItem => ({
          id: p.id,
          outer: items.get(p.id)!,
          holes: [],
          quantity: take.get(p.id)!,
          rotations: faceRotations(p.rotate),
        }),
      ),
    });
    // The strip is nested open (where the engine packs densest); what lies within the longest slab
    // is this slab, and the pieces beyond go back to the pool for the next strip.
    const withinOf = (sol: IrregularSolution) =>
      sol.placements
        .map((pl) => ({
          part: pl.item,
          rotation: pl.rotation,
          at: [pl.x, pl.y] as FacePoint,
          loop: memberLoop(occupiedOutline(byId.get(pl.item)!.outline!), pl.rotation, [pl.x, pl.y]),
        }))
        .filter((m) => bboxOf([m.loop]).maxX <= size.length);
    const faceArea = (w: ReturnType<typeof withinOf>) => {
      const b = bboxOf(w.map((m) => m.loop));
      return b.maxX * b.maxY;
    };
    // This strip's share of the time left for the size: its copies over the copies left; the first
    // nesting takes most of it, narrower strips the rest.
    const inPool = [...pool.values()].reduce((a, b) => a + b, 0);
    const part = [...take.values()].reduce((a, b) => a + b, 0) / Math.max(1, inPool);
    const first = (yield {
      kind: "slab",
      problem: stripOf(size.width),
      options: budget(part * NARROW_FIRST),
    }) as IrregularSolution;
    let within = withinOf(first);
    if (!within.length) break;
    // The engine shortens the strip and may spread the parts across its width, while a slab takes
    // both: nest again in narrower strips (NARROW_STEP of the used width) while the slab's face
    // shrinks with every part still inside it and time is left.
    const narrowest = Math.max(...list.map((p) => minCrossing(items.get(p.id)!, faceRotations(p.rotate))));
    for (let k = 0, cost = first.stats.firstMs ?? 0; k < NARROW_TRIES; k++) {
      const w = NARROW_STEP * bboxOf(within.map((m) => m.loop)).maxY;
      if (w < narrowest + problem.settings.kerf || timeLeft() * part < cost) break;
      const sol = (yield {
        kind: "slab",
        problem: stripOf(w),
        options: budget(part * NARROW_RETRY),
      }) as IrregularSolution;
      cost = Math.max(cost, sol.stats.firstMs ?? 0);
      const next = withinOf(sol);
      if (next.length < within.length || faceArea(next) >= faceArea(within)) break;
      within = next;
    }
    const { layout } = settle(problem, g, within);
    if (!layout) break;
    for (const m of layout.members) pool.set(m.part, pool.get(m.part)! - 1);
    // A slab no smaller than its members' boxes saves nothing: they are nested as boxes instead.
    const slabVolume = layout.size[0] * layout.size[1] * layout.size[2];
    const boxes = layout.members.reduce((s, m) => s + boxVolume(byId.get(m.part)!), 0);
    if (slabVolume >= boxes) {
      for (const m of layout.members) left.set(m.part, (left.get(m.part) ?? 0) + 1);
      continue;
    }
    slabs.push(layout);
  }
  for (const [id, q] of pool) if (q > 0) left.set(id, (left.get(id) ?? 0) + q);
  // What the group takes: its slabs, and the boxes of the copies left to the box nesting.
  const parts = new Map(g.parts.map((p) => [p.id, p]));
  const volume =
    slabs.reduce((s, l) => s + l.size[0] * l.size[1] * l.size[2], 0) +
    [...left].reduce((s, [id, q]) => s + q * boxVolume(parts.get(id)!), 0);
  return { slabs, volume, left };
}

/** The whole plan, as steps a driver runs (slab nestings, then the block nesting). */
function* trueShapeSteps(problem: Problem, options: NestOptions): Generator<Step, Plan, IrregularSolution | Plan> {
  const now = options.now;
  const t0 = now?.() ?? 0;
  const total = problem.settings.timeLimitMs;
  const seed = options.seed ?? 1;
  let calls = 0;
  // The strips of a group nest the same outlines again and again: their no-fit polygons are computed once.
  const nfpStore = new NfpStore();

  // Groups: profile parts by grade and thickness (to 0.01 mm).
  const groups = new Map<string, Group>();
  for (const p of problem.parts) {
    if (!p.outline) continue;
    const key = `${p.grade ?? ""}|${Math.round(p.size[0] * 100)}`;
    const g = groups.get(key) ?? { key, parts: [], thickness: 0, grade: p.grade, rotate: "any" as Rotate };
    g.parts.push(p);
    g.thickness = Math.max(g.thickness, p.size[0]);
    if (ROTATE_RANK[p.rotate] > ROTATE_RANK[g.rotate]) g.rotate = p.rotate;
    groups.set(key, g);
  }
  const pieces = [...groups.values()].reduce((s, g) => s + g.parts.reduce((t, p) => t + p.quantity, 0), 0);
  // The slabs' time ends at SLAB_SHARE of the budget; what a nesting leaves unused goes to the next
  // ones. Each (group, width) gets the time left in proportion to the group's boxes' volume (the
  // foam there is to save), each strip its share of the group's copies.
  const slabEnd = t0 + total * SLAB_SHARE;
  const slabTimeLeft = () => (now ? slabEnd - now() : Infinity);
  const copies = (g: Group) => g.parts.reduce((t, p) => t + p.quantity, 0);
  const weight = (g: Group) => g.parts.reduce((t, p) => t + p.quantity * boxVolume(p), 0);
  const sizesOf = new Map([...groups.values()].map((g) => [g.key, stripSizes(problem, g)]));
  let weightLeft = [...groups.values()].reduce((s, g) => s + weight(g) * sizesOf.get(g.key)!.length, 0);

  const chosen: { g: Group; pack: Pack }[] = [];
  let doneShare = 0;
  for (const g of groups.values()) {
    const items = new Map(g.parts.map((p) => [p.id, nestingLoop(occupiedOutline(p.outline!))]));
    const sizes = sizesOf.get(g.key)!;
    const share = copies(g) / Math.max(1, pieces);
    let best: Pack | null = null;
    for (const size of sizes) {
      const start = now?.() ?? 0;
      const perSize = weightLeft > 0 ? ((slabEnd - start) * weight(g)) / weightLeft : 0;
      weightLeft -= weight(g);
      const budget = (part: number): IrregularRunOptions => {
        calls++;
        const base = {
          seed: seed * 1000 + calls,
          nfpStore,
          ...(options.signal ? { signal: options.signal } : {}),
        };
        if (!now) return { ...base, maxMoves: SLAB_MOVES };
        const remaining = Math.max(0, perSize - (now() - start));
        return { ...base, now, timeLimitMs: Math.max(100, remaining * part) };
      };
      const timeLeft = () => (now ? Math.max(0, perSize - (now() - start)) : Infinity);
      const pack: Pack = yield* packGroup(problem, g, size, items, budget, timeLeft, slabTimeLeft);
      // Every copy is in a slab or left to the box nesting: the least volume wins.
      if (!best || pack.volume < best.volume) best = pack;
    }
    doneShare += share;
    options.onProgress?.({
      fraction: SLAB_SHARE * doneShare,
      best: { placedVolume: 0, blocksUsed: 0, yield: 0, unplacedCount: pieces, lowerBoundBlocks: 0 },
    });
    chosen.push({ g, pack: best ?? { slabs: [], volume: 0, left: new Map(g.parts.map((p) => [p.id, p.quantity])) } });
  }

  // The block problem: plain parts, copies no slab took (as boxes), and one box per slab.
  const taken = new Set(problem.parts.map((p) => p.id));
  const slabs: SlabPlanned[] = [];
  let n = 0;
  for (const { pack } of chosen)
    for (const layout of pack.slabs) {
      let id: string;
      do id = `slab-${++n}`;
      while (taken.has(id));
      slabs.push({ id, layout });
    }
  const leftOver = new Map<string, number>();
  for (const { pack } of chosen) for (const [id, q] of pack.left) leftOver.set(id, q);
  const boxParts: Part[] = [];
  for (const p of problem.parts) {
    if (!p.outline) boxParts.push(p);
    else if (leftOver.get(p.id)) boxParts.push({ ...p, quantity: leftOver.get(p.id)! });
  }
  for (const s of slabs)
    boxParts.push({
      id: s.id,
      size: s.layout.size,
      quantity: 1,
      rotate: s.layout.rotate,
      ...(s.layout.grade !== undefined ? { grade: s.layout.grade } : {}),
    });
  const { trueShape: _off, slabMax: _max, ...plainSettings } = problem.settings;
  const used = (now?.() ?? 0) - t0;
  const boxProblem: Problem = {
    version: 1,
    settings: { ...plainSettings, timeLimitMs: now ? Math.max(total - used, total * (1 - SLAB_SHARE)) : total },
    blocks: problem.blocks,
    parts: boxParts,
  };
  const f0 = SLAB_SHARE;
  const onProgress = options.onProgress;
  const b0 = now?.() ?? 0;
  let plan = (yield {
    kind: "boxes",
    problem: boxProblem,
    options: {
      ...options,
      ...(onProgress ? { onProgress: (p) => onProgress({ ...p, fraction: f0 + (1 - f0) * p.fraction }) } : {}),
    },
  }) as Plan;
  // The block nesting stops as soon as its plan uses as few blocks as its bound, and which plan
  // that is depends on its seed (on the shop case 0.275–0.296 m³ of foam over 12 seeds for the same
  // slabs). In the time it leaves, other seeds; the least foam consumed is kept.
  let longest = (now?.() ?? 0) - b0;
  for (let k = 1; k < BOX_TRIES && !options.signal?.aborted; k++) {
    const left = boxProblem.settings.timeLimitMs - ((now?.() ?? 0) - b0);
    if (now ? left <= 2 * longest : !atBound(plan)) break;
    const t = now?.() ?? 0;
    const other = (yield {
      kind: "boxes",
      problem: { ...boxProblem, settings: { ...boxProblem.settings, timeLimitMs: Math.min(left, 4 * longest + 200) } },
      options: {
        seed: seed + k,
        ...(now ? { now } : { iterations: BOX_TRY_ITERATIONS }),
        ...(options.signal ? { signal: options.signal } : {}),
      },
    }) as Plan;
    longest = Math.max(longest, (now?.() ?? 0) - t);
    if (comparePlans(boxProblem, other, plan) < 0) plan = other;
  }
  return withSlabs(plan, slabs);
}

/** Whether a plan places everything in as few blocks as its bound (the block nesting then stopped early). */
const atBound = (plan: Plan) => plan.unplaced.length === 0 && plan.stats.blocksUsed <= plan.stats.lowerBoundBlocks;

/** Puts each slab's layout on its placement, and turns unplaced slabs into their members, unplaced. */
function withSlabs(plan: Plan, slabs: readonly SlabPlanned[]): Plan {
  const byId = new Map(slabs.map((s) => [s.id, s]));
  const placements: Placement[] = plan.placements.map((pl) => {
    const s = byId.get(pl.part);
    return s ? { ...pl, slab: s.layout } : pl;
  });
  const unplaced: Unplaced[] = [];
  const extra = new Map<string, { count: number; reason: string }>();
  for (const u of plan.unplaced) {
    const s = byId.get(u.part);
    if (!s) {
      unplaced.push(u);
      continue;
    }
    for (const m of s.layout.members) {
      const e = extra.get(m.part) ?? {
        count: 0,
        // Sizes to 0.1 mm, and no slab id: an unplaced slab has no placement a reader could find it by.
        reason: `its slab (${s.layout.size.map((v) => Math.round(v * 10) / 10).join(" × ")} mm) found no room: ${u.reason}`,
      };
      e.count++;
      extra.set(m.part, e);
    }
  }
  for (const [part, e] of extra) {
    const had = unplaced.find((u) => u.part === part);
    if (had) had.count += e.count;
    else unplaced.push({ part, count: e.count, reason: e.reason });
  }
  // A plan with a slab placement is version 2 (a v1 reader would meet a part id not in the problem); without one it stays v1.
  const version = placements.some((pl) => pl.slab) ? 2 : plan.version;
  return { ...plan, version, placements, unplaced };
}

type BoxNest = (problem: Problem, options: NestOptions) => Promise<Plan>;
type BoxNestSync = (problem: Problem, options: NestOptions) => Plan;

/**
 * Nests a problem with `settings.trueShape`: slabs of profile parts first, then the block nesting
 * by `boxes` (the box nesting of `nest`). Deterministic for a seed and move budget.
 * @example const plan = await nestTrueShape(problem, { seed: 1 }, nestBoxes); validatePlan(problem, plan) // → []
 */
export async function nestTrueShape(problem: Problem, options: NestOptions, boxes: BoxNest): Promise<Plan> {
  const steps = trueShapeSteps(problem, options);
  let step = steps.next();
  while (!step.done) {
    const s = step.value;
    step = steps.next(
      s.kind === "slab" ? await nestIrregular(s.problem, s.options) : await boxes(s.problem, s.options),
    );
  }
  return step.value;
}

/**
 * The same as `nestTrueShape`, without yielding to the event loop.
 * @example const plan = nestTrueShapeSync(problem, { seed: 2 }, nestBoxesSync);
 */
export function nestTrueShapeSync(problem: Problem, options: NestOptions, boxes: BoxNestSync): Plan {
  const steps = trueShapeSteps(problem, options);
  let step = steps.next();
  while (!step.done) {
    const s = step.value;
    step = steps.next(s.kind === "slab" ? nestIrregularSync(s.problem, s.options) : boxes(s.problem, s.options));
  }
  return step.value;
}
