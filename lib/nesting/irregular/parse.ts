/**
 * Reads an irregular nesting problem from plain JSON, filling defaults and reporting every
 * problem with its path (`items[2].outer[5]: ...`). Nothing is thrown for bad input.
 */
import { loopsMeet, selfCrossing, signedArea, winding, dedupe } from "./geometry";
import type { IrregularItem, IrregularProblem, Pt } from "./types";

export type IrregularParseResult = { ok: true; problem: IrregularProblem } | { ok: false; errors: string[] };

const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
const MAX_VERTICES = 5000;
const MAX_PIECES = 2000;

function readLoop(raw: unknown, path: string, errors: string[]): Pt[] | undefined {
  if (!Array.isArray(raw)) {
    errors.push(`${path}: must be a list of [x, y] points`);
    return undefined;
  }
  if (raw.length > MAX_VERTICES) {
    errors.push(`${path}: ${raw.length} points, at most ${MAX_VERTICES}`);
    return undefined;
  }
  const pts: Pt[] = [];
  for (let k = 0; k < raw.length; k++) {
    const p = raw[k];
    if (!Array.isArray(p) || p.length !== 2 || !isNum(p[0]) || !isNum(p[1])) {
      errors.push(`${path}[${k}]: must be [x, y] with finite numbers`);
      return undefined;
    }
    pts.push([p[0], p[1]]);
  }
  const loop = dedupe(pts);
  if (loop.length < 3) {
    errors.push(`${path}: needs at least 3 distinct points`);
    return undefined;
  }
  if (Math.abs(signedArea(loop)) <= 0) {
    errors.push(`${path}: encloses no area`);
    return undefined;
  }
  const cross = selfCrossing(loop);
  if (cross) {
    errors.push(`${path}: edges ${cross[0]} and ${cross[1]} cross or touch (the outline must be a simple loop)`);
    return undefined;
  }
  return loop;
}

/**
 * Parses `{ width, length?, kerf?, margin?, items: [{ id, outer, holes?, quantity?, rotations? }] }`.
 * Rotations default to [0] (degrees, counter-clockwise), quantity to 1, kerf and margin to 0.
 * @example parseIrregular({ width: 40, items: [{ id: "L", outer: [[0,0],[4,0],[4,1],[1,1],[1,3],[0,3]], quantity: 2, rotations: [0, 180] }] })
 */
export function parseIrregular(json: unknown): IrregularParseResult {
  const errors: string[] = [];
  if (typeof json !== "object" || json === null || Array.isArray(json))
    return { ok: false, errors: ["(root): must be an object"] };
  const o = json as Record<string, unknown>;
  const width = o.width;
  if (!isNum(width) || width <= 0) errors.push("width: must be a number > 0");
  let length: number | undefined;
  if (o.length !== undefined && o.length !== null) {
    if (!isNum(o.length) || o.length <= 0) errors.push("length: must be a number > 0 when given");
    else length = o.length;
  }
  const kerf = o.kerf ?? 0;
  if (!isNum(kerf) || kerf < 0) errors.push("kerf: must be a number ≥ 0");
  const margin = o.margin ?? 0;
  if (!isNum(margin) || margin < 0) errors.push("margin: must be a number ≥ 0");
  else if (isNum(width) && width > 0 && 2 * margin >= width) errors.push("margin: leaves no room across the width");
  if (!Array.isArray(o.items) || o.items.length === 0) {
    errors.push("items: must be a non-empty list");
    return { ok: false, errors };
  }
  const items: IrregularItem[] = [];
  const ids = new Set<string>();
  let pieces = 0;
  o.items.forEach((raw: unknown, idx: number) => {
    const path = `items[${idx}]`;
    if (typeof raw !== "object" || raw === null || Array.isArray(raw)) {
      errors.push(`${path}: must be an object`);
      return;
    }
    const it = raw as Record<string, unknown>;
    const id = typeof it.id === "number" ? String(it.id) : it.id;
    if (typeof id !== "string" || id.trim() === "") errors.push(`${path}.id: must be a non-empty string`);
    else if (ids.has(id)) errors.push(`${path}.id: "${id}" is used twice`);
    else ids.add(id);
    const outer = readLoop(it.outer, `${path}.outer`, errors);
    const holes: Pt[][] = [];
    if (it.holes !== undefined) {
      if (!Array.isArray(it.holes)) errors.push(`${path}.holes: must be a list of loops`);
      else
        it.holes.forEach((h: unknown, k: number) => {
          const hp = `${path}.holes[${k}]`;
          const loop = readLoop(h, hp, errors);
          if (!loop || !outer) return;
          if (loopsMeet(loop, outer) || loop.some(([x, y]) => winding(outer, x, y) === 0))
            errors.push(`${hp}: must lie inside the outer loop without touching it`);
          else {
            const other = holes.findIndex(
              (g) =>
                loopsMeet(g, loop) ||
                winding(g, loop[0]![0], loop[0]![1]) !== 0 ||
                winding(loop, g[0]![0], g[0]![1]) !== 0,
            );
            if (other >= 0) errors.push(`${hp}: meets or contains holes[${other}]`);
            else holes.push(loop);
          }
        });
    }
    const quantity = it.quantity ?? 1;
    if (!Number.isInteger(quantity) || (quantity as number) < 1)
      errors.push(`${path}.quantity: must be a whole number ≥ 1`);
    else pieces += quantity as number;
    let rotations: number[] = [0];
    if (it.rotations !== undefined) {
      if (!Array.isArray(it.rotations) || it.rotations.length === 0 || !it.rotations.every(isNum))
        errors.push(`${path}.rotations: must be a non-empty list of angles in degrees`);
      else {
        rotations = [];
        for (const r of it.rotations as number[]) {
          const d = ((r % 360) + 360) % 360;
          if (!rotations.some((q) => Math.abs(q - d) < 1e-9)) rotations.push(d);
        }
      }
    }
    if (outer && typeof id === "string")
      items.push({ id, outer, holes, quantity: Number.isInteger(quantity) ? (quantity as number) : 1, rotations });
  });
  if (pieces > MAX_PIECES) errors.push(`items: ${pieces} pieces in all, at most ${MAX_PIECES}`);
  if (errors.length > 0) return { ok: false, errors };
  return {
    ok: true,
    problem: {
      width: width as number,
      ...(length !== undefined ? { length } : {}),
      kerf: kerf as number,
      margin: margin as number,
      items,
    },
  };
}
