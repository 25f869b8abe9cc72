import {
  EPS,
  atLeastSorted,
  fromMinMax,
  grow,
  orientations,
  overlappingPairs,
  overlaps,
  separate,
  type Box,
} from "./geometry";
import { checkSlab } from "./slab";
import type { Block, Part, Plan, Problem, Vec3 } from "./types";

const fmt = (v: readonly number[]): string => `[${v.map((x) => +x.toFixed(4)).join(", ")}]`;
const finiteVec = (v: unknown): v is Vec3 =>
  Array.isArray(v) && v.length === 3 && v.every((x) => typeof x === "number" && Number.isFinite(x));

interface Piece extends Box {
  name: string;
}

/**
 * Checks a plan against every rule of the format page (containment, kerf, defects, grades,
 * rotation, counts, separability by layout, offcut size and separation, ids). Empty = valid.
 * @example validatePlan(problem, await nest(problem)) // → []
 */
export function validatePlan(problem: Problem, plan: Plan): string[] {
  const errors: string[] = [];
  const { kerf, defectMargin, minOffcut, layout } = problem.settings;
  const blocks = new Map<string, Block>(problem.blocks.map((b) => [b.id, b]));
  const parts = new Map<string, Part>(problem.parts.map((p) => [p.id, p]));
  if (plan.version !== 1 && plan.version !== 2) errors.push("version: must be 1 or 2");
  else if (plan.version === 1 && (plan.placements ?? []).some((pl) => pl.slab !== undefined))
    errors.push("version: must be 2 when a placement is a slab (a v1 reader does not know slab ids)");
  const pieces = new Map<string, Piece[]>();
  const placedCount = new Map<string, number>();
  const seen = new Map<string, number>();
  let partVolume = 0;

  (plan.placements ?? []).forEach((pl, i) => {
    const name = `placements[${i}]`;
    // A slab of true-shape nested profiles (optional field): its members count as placed parts, and
    // its box is checked below like a part's.
    let slabPart: Part | undefined;
    if (pl.slab !== undefined) {
      if (typeof pl.slab !== "object" || pl.slab === null) return void errors.push(`${name}.slab: must be an object`);
      if (parts.has(pl.part))
        errors.push(`${name}.part: a slab needs its own id, "${pl.part}" is a part of the problem`);
      const check = checkSlab(problem, pl.slab, `${name}.slab`);
      errors.push(...check.errors);
      for (const [id, n] of check.counts) placedCount.set(id, (placedCount.get(id) ?? 0) + n);
      if (!finiteVec(pl.slab.size)) return;
      slabPart = {
        id: pl.part,
        size: pl.slab.size,
        quantity: 1,
        rotate: pl.slab.rotate,
        ...(pl.slab.grade !== undefined ? { grade: pl.slab.grade } : {}),
      };
    }
    const part = slabPart ?? parts.get(pl.part);
    const block = blocks.get(pl.block);
    if (!part) errors.push(`${name}: unknown part "${pl.part}"`);
    if (!block) errors.push(`${name}: unknown block "${pl.block}"`);
    if (!finiteVec(pl.origin) || !finiteVec(pl.size)) {
      errors.push(`${name}: origin and size must be 3 finite numbers`);
      return;
    }
    if (!part || !block) return;
    const key = `${pl.part}|${pl.block}|${fmt(pl.origin)}`;
    const dup = seen.get(key);
    if (dup !== undefined)
      errors.push(`${name}: places part ${pl.part} in block ${pl.block} twice (same as placements[${dup}])`);
    seen.set(key, i);
    placedCount.set(part.id, (placedCount.get(part.id) ?? 0) + 1);
    partVolume += part.size[0] * part.size[1] * part.size[2];

    if (part.grade !== undefined && part.grade !== block.grade)
      errors.push(
        `${name}: part ${part.id} of grade ${part.grade} placed in block ${block.id} of grade ${block.grade ?? "(none)"}`,
      );
    if (!orientations(part.size, part.rotate).some((o) => o.every((v, a) => Math.abs(v - pl.size[a]!) <= EPS)))
      errors.push(
        `${name}: size ${fmt(pl.size)} is not an orientation of part ${part.id} ${fmt(part.size)} allowed by rotate "${part.rotate}"`,
      );
    for (let a = 0; a < 3; a++) {
      if (pl.origin[a]! < block.trim - EPS || pl.origin[a]! + pl.size[a]! > block.size[a]! - block.trim + EPS) {
        errors.push(`${name}: outside the usable box of block ${block.id} on ${"xyz"[a]} (trim ${block.trim})`);
        break;
      }
    }
    for (const [j, d] of block.defects.entries()) {
      const zone = grow(fromMinMax(d.min, d.max), defectMargin);
      if (overlaps(pl, zone))
        errors.push(
          `${name}: meets defect ${d.id ?? `#${j}`} of block ${block.id} grown by the margin ${defectMargin}`,
        );
    }
    const list = pieces.get(block.id) ?? [];
    list.push({ origin: pl.origin, size: pl.size, name });
    pieces.set(block.id, list);
  });

  (plan.offcuts ?? []).forEach((oc, i) => {
    const name = `offcuts[${i}]`;
    const block = blocks.get(oc.block);
    if (!block) return void errors.push(`${name}: unknown block "${oc.block}"`);
    if (!finiteVec(oc.origin) || !finiteVec(oc.size))
      return void errors.push(`${name}: origin and size must be 3 finite numbers`);
    if (oc.size.some((v) => v <= 0)) errors.push(`${name}: size must be > 0`);
    if (!atLeastSorted(oc.size, minOffcut))
      errors.push(`${name}: size ${fmt(oc.size)} is smaller than minOffcut ${fmt(minOffcut)} (sorted comparison)`);
    for (let a = 0; a < 3; a++) {
      if (oc.origin[a]! < -EPS || oc.origin[a]! + oc.size[a]! > block.size[a]! + EPS) {
        errors.push(`${name}: outside block ${block.id} on ${"xyz"[a]}`);
        break;
      }
    }
    if (!pieces.has(block.id)) errors.push(`${name}: block ${block.id} has no placements, so it leaves no offcut`);
    const list = pieces.get(block.id) ?? [];
    list.push({ origin: oc.origin, size: oc.size, name });
    pieces.set(block.id, list);
  });

  for (const [blockId, list] of pieces) {
    // Rule 2: pieces grown by kerf/2 must not overlap.
    for (const [i, j] of overlappingPairs(list.map((p) => grow(p, kerf / 2))))
      errors.push(`${list[i]!.name} and ${list[j]!.name} in block ${blockId}: less than the kerf ${kerf} apart`);
    if (layout === "free") continue;
    const { stuck } = separate(list, kerf, layout);
    for (const idx of stuck)
      errors.push(
        `block ${blockId}: ${idx.map((i) => list[i]!.name).join(", ")} cannot be separated by through cuts (layout ${layout})`,
      );
  }

  const unplacedCount = new Map<string, number>();
  (plan.unplaced ?? []).forEach((u, i) => {
    if (!parts.has(u.part)) errors.push(`unplaced[${i}]: unknown part "${u.part}"`);
    if (!Number.isInteger(u.count) || u.count < 1) errors.push(`unplaced[${i}].count: must be a whole number >= 1`);
    if (typeof u.reason !== "string" || u.reason === "") errors.push(`unplaced[${i}].reason: must say why`);
    unplacedCount.set(u.part, (unplacedCount.get(u.part) ?? 0) + u.count);
  });
  for (const p of problem.parts) {
    const placed = placedCount.get(p.id) ?? 0;
    const unplaced = unplacedCount.get(p.id) ?? 0;
    if (placed + unplaced !== p.quantity)
      errors.push(`part ${p.id}: placed ${placed} + unplaced ${unplaced} differs from quantity ${p.quantity}`);
  }
  for (const blockId of Object.keys(plan.cuts ?? {}))
    if (!blocks.has(blockId)) errors.push(`cuts.${blockId}: unknown block`);

  const s = plan.stats;
  if (!s) errors.push("stats: is required");
  else {
    const used = new Set((plan.placements ?? []).map((p) => p.block)).size;
    if (s.blocksUsed !== used) errors.push(`stats.blocksUsed: ${s.blocksUsed} but the placements use ${used} blocks`);
    if (Math.abs(s.partVolume - partVolume) > 1e-6 * Math.max(1, partVolume))
      errors.push(`stats.partVolume: ${s.partVolume} but the placements hold ${partVolume}`);
  }
  return errors;
}
