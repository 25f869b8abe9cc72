/**
 * Slab placements of a true-shape plan (plan version 2, `placements[i].slab`) as the app reads
 * them. A slab's placement has `part: "slab-N"`, not a part key: the block cutter's through cuts
 * free the slab as one blank, and the profile cutter then cuts its members out of it. Every reader
 * that turns plan keys into job parts goes through here, so a slab counts as its members (approval,
 * owed parts, recording) and is named for people as "slab for N parts". Pure: no I/O.
 */
import type { Placement, Plan, Problem, Vec3 } from "@/lib/nesting";
export { profileOutline } from "@/lib/profiles/slabs";
import { partIdFromKey } from "./problem";

/** Slab key → its members' part keys, one entry per piece (a part twice in a slab is listed twice). */
export type SlabIndex = Readonly<Record<string, readonly string[]>>;

/**
 * Whether a plan key names a slab rather than a part.
 * @example isSlabKey("slab-3") // → true; isSlabKey("jp-12") // → false
 */
export const isSlabKey = (key: string): boolean => /^slab-/.test(key);

/**
 * The part keys a placement gives: a slab's members, else the placement's own part.
 * @example slabMembers({ part: "slab-1", slab: { members: [{ part: "jp-4" }, { part: "jp-4" }] } }) // → ["jp-4", "jp-4"]
 */
export function slabMembers(placement: Pick<Placement, "part" | "slab">): string[] {
  if (placement.slab) return placement.slab.members.map((m) => m.part);
  if (isSlabKey(placement.part)) throw new Error(`${placement.part} is a slab without its layout`);
  return [placement.part];
}

/**
 * Every slab of a plan by its key, for readers that meet keys alone (a cutting step's pieces).
 * @example slabIndex(plan) // → { "slab-1": ["jp-4", "jp-4", "jp-7"] }
 */
export function slabIndex(plan: Pick<Plan, "placements"> | null | undefined): SlabIndex {
  const out: Record<string, string[]> = {};
  for (const p of plan?.placements ?? []) if (p.slab) out[p.part] = slabMembers(p);
  return out;
}

/**
 * Plan keys with each slab replaced by its members' part keys. Throws on a slab the index lacks
 * (never a silent NaN further on).
 * @example expandKeys(["jp-2", "slab-1"], { "slab-1": ["jp-4", "jp-7"] }) // → ["jp-2", "jp-4", "jp-7"]
 */
export function expandKeys(keys: readonly string[], slabs: SlabIndex): string[] {
  return keys.flatMap((k) => {
    if (!isSlabKey(k)) return [k];
    const m = slabs[k];
    if (!m) throw new Error(`${k} is not a slab of this plan`);
    return [...m];
  });
}

/**
 * Job part id → pieces, over plan keys (slabs counted by their members).
 * @example countByPart(["jp-7", "slab-1"], { "slab-1": ["jp-7", "jp-9"] }) // → Map { 7 → 2, 9 → 1 }
 */
export function countByPart(keys: readonly string[], slabs: SlabIndex = {}): Map<number, number> {
  const n = new Map<number, number>();
  for (const k of expandKeys(keys, slabs)) n.set(partIdFromKey(k), (n.get(partIdFromKey(k)) ?? 0) + 1);
  return n;
}

/**
 * Job part id → pieces placed by a list of placements (a slab by its members).
 * @example placedByPart(plan.placements) // → Map { 4 → 6, 7 → 2 }
 */
export function placedByPart(placements: readonly Pick<Placement, "part" | "slab">[]): Map<number, number> {
  return countByPart(placements.flatMap(slabMembers));
}

/**
 * A piece's name for people: a part's name, or "slab for N parts" for a slab.
 * @example pieceName("slab-1", { "slab-1": ["jp-4", "jp-7"] }, name) // → "slab for 2 parts"
 */
export function pieceName(key: string, slabs: SlabIndex, partName: (key: string) => string): string {
  if (!isSlabKey(key)) return partName(key);
  const n = slabs[key]?.length ?? 0;
  return `slab for ${n} part${n === 1 ? "" : "s"}`;
}

/**
 * Names for a plan's keys: a part key by its job part's name (the key itself when unknown), a slab
 * as "slab for N parts". What pages and the cut list hand to drawings and lines.
 * @example keyNamer(plan, new Map([[4, "L"]]))("slab-1") // → "slab for 3 parts"
 */
export function keyNamer(
  plan: Pick<Plan, "placements"> | null | undefined,
  names: ReadonlyMap<number, string>,
): (key: string) => string {
  const slabs = slabIndex(plan);
  const partName = (k: string) => (/^jp-\d+$/.test(k) ? (names.get(partIdFromKey(k)) ?? k) : k);
  return (k) => pieceName(k, slabs, partName);
}

/**
 * A slab's members for people, alike ones counted: "2 × L, A".
 * @example memberList(["jp-4", "jp-4", "jp-7"], name) // → "2 × L, A"
 */
export function memberList(members: readonly string[], partName: (key: string) => string): string {
  const n = new Map<string, number>();
  for (const m of members) n.set(m, (n.get(m) ?? 0) + 1);
  return [...n].map(([k, c]) => (c > 1 ? `${c} × ${partName(k)}` : partName(k))).join(", ");
}

/**
 * Pieces that came off a block with each slab replaced by its members, each member holding a share
 * of the slab's blank in proportion to its part's box (the shares add up to the slab's blank, so
 * a loss breakdown still balances; only the last dimension is scaled). Part pieces pass unchanged.
 * @example memberPieces([{ part: "slab-1", box }], { "slab-1": ["jp-4", "jp-7"] }, sizeOf) // → 2 pieces, same total volume
 */
export function memberPieces<B extends { origin: Vec3; size: Vec3 }>(
  pieces: readonly { part: string; box: B }[],
  slabs: SlabIndex,
  sizeOf: (partKey: string) => Vec3 | undefined,
): { part: string; box: { origin: Vec3; size: Vec3 } }[] {
  return pieces.flatMap((p) => {
    if (!isSlabKey(p.part)) return [p];
    const members = expandKeys([p.part], slabs);
    const vols = members.map((m) => {
      const s = sizeOf(m);
      return s ? s[0] * s[1] * s[2] : 0;
    });
    const total = vols.reduce((a, b) => a + b, 0);
    return members.map((m, i) => ({
      part: m,
      box: {
        origin: p.box.origin,
        size: [
          p.box.size[0],
          p.box.size[1],
          p.box.size[2] * (total > 0 ? vols[i]! / total : 1 / members.length),
        ] as Vec3,
      },
    }));
  });
}

/** Foam a plan takes from stock, mm³: the blocks it uses less the offcuts it keeps. */
export const foamUsed = (plan: Pick<Plan, "stats">): number => plan.stats.stockVolume - plan.stats.offcutVolume;

/** The true-shape run's comparison with box nesting of the same parts (stored in the run's summary). */
export interface ShapeComparison {
  /** Foam used (blocks less offcuts kept), m³, by the true-shape plan and by the box plan. */
  trueShapeM3: number;
  boxM3: number;
  /** How much less foam true shape uses, % of the box plan's (negative: it uses more). */
  savedPct: number;
  blocks: { trueShape: number; box: number };
  /** Pieces left unplaced by each (the figures compare like with like only when both are 0 or equal). */
  unplaced: { trueShape: number; box: number };
  slabs: number;
}

/**
 * The comparison of a true-shape plan with the box plan of the same problem.
 * @example compareShapes(truePlan, boxPlan).savedPct // → 23.4
 */
export function compareShapes(trueShape: Plan, box: Plan): ShapeComparison {
  const t = foamUsed(trueShape) / 1e9;
  const b = foamUsed(box) / 1e9;
  const unplaced = (p: Plan) => p.unplaced.reduce((s, u) => s + u.count, 0);
  return {
    trueShapeM3: t,
    boxM3: b,
    savedPct: b > 0 ? ((b - t) / b) * 100 : 0,
    blocks: { trueShape: trueShape.stats.blocksUsed, box: box.stats.blocksUsed },
    unplaced: { trueShape: unplaced(trueShape), box: unplaced(box) },
    slabs: trueShape.placements.filter((p) => p.slab).length,
  };
}

/**
 * The same problem for box nesting: no `trueShape` or `slabMax`, no outlines (what the run compares against).
 * @example boxProblem(problem).parts.every((p) => !p.outline) // → true
 */
export function boxProblem(problem: Problem, timeLimitMs = problem.settings.timeLimitMs): Problem {
  const { trueShape: _ignored, slabMax: _max, ...settings } = problem.settings;
  return {
    ...problem,
    settings: { ...settings, timeLimitMs },
    parts: problem.parts.map(({ outline: _o, ...p }) => p),
  };
}
