/**
 * The program input of a true-shape nested slab (a plan placement carrying `slab`, see
 * lib/nesting/README.md, "Slabs of true-shape nested profiles"): every member's root and tip
 * sections where the slab holds them, each entered at its planned lead-in corridor. The slab lies on
 * the profile cutter as its face frame says (u across, v up), so its corridors, which never start
 * at the bottom face, suit a horizontal wire as well as an upright one. Pure: no I/O.
 */
import type { FacePoint, Part, SlabLayout } from "@/lib/nesting";
import { bboxOf, signedArea } from "@/lib/nesting/irregular/geometry";
import { leadIns, memberLoop, type PlacedMember } from "@/lib/nesting/slab";
import type { Point } from "./polygon";
import { type ProfileProgram, type ProfileProgramInput, type ProgramPart, profileProgram } from "./program";
import type { Machine } from "@/lib/planning/machine";
import { ToolpathError } from "./toolpath";
import type { Section } from "./slabs";

/** A section's loop where the slab holds it: the same turn and move as the member's occupied loop. */
const place: (loop: readonly FacePoint[], rotation: number, at: FacePoint) => Point[] = memberLoop;

/**
 * The parts of one program for a slab: names from `names` (part id → a name for people), sections
 * turned and moved as the slab's members are, lead-ins at their corridors' ends.
 *
 *   slabProgramParts(placement.slab, partsById, (id) => `part ${id}`)
 *   // → [{ name: "part L", root: { outer: [...], holes: [] }, tip: …, tapered: false, leadIn: [61, 91.75] }, …]
 */
export function slabProgramParts(
  slab: SlabLayout,
  parts: ReadonlyMap<string, Part>,
  names: (partId: string, k: number) => string,
): ProgramPart[] {
  return slab.members.map((m, k): ProgramPart => {
    const o = parts.get(m.part)?.outline;
    if (!o) throw new Error(`slab member ${k}: part ${m.part} has no outline`);
    const root: Section = {
      outer: place(o.outer, m.rotation, m.at),
      holes: (o.holes ?? []).map((h) => place(h, m.rotation, m.at)),
    };
    const tip: Section = o.tip
      ? {
          outer: place(o.tip.outer, m.rotation, m.at),
          holes: (o.tip.holes ?? []).map((h) => place(h, m.rotation, m.at)),
        }
      : root;
    const { via, from } = m.leadIn;
    return {
      name: names(m.part, k),
      root,
      tip,
      tapered: !!o.tip,
      leadIn: [m.leadIn.to[0], m.leadIn.to[1]],
      // A chained lead-in: entered from an earlier member's cut path by its bridge.
      ...(via !== undefined && from ? { via: { part: via, from: [from[0], from[1]] as Point } } : {}),
    };
  });
}

/**
 * The whole program input of a slab (its face as the program's size, its thickness along the wire).
 *
 *   profileProgram(slabProgramInput("plan 15, block HF-1001, slab-1", slab, parts, name, { kerf: 1.5, feed: 250 }), machine)
 */
export function slabProgramInput(
  title: string,
  slab: SlabLayout,
  parts: ReadonlyMap<string, Part>,
  names: (partId: string, k: number) => string,
  cut: { kerf: number; feed: number; grade?: string | null },
): ProfileProgramInput {
  return {
    title,
    size: [slab.size[1], slab.size[2]],
    thickness: slab.size[0],
    parts: slabProgramParts(slab, parts, names),
    kerf: cut.kerf,
    feed: cut.feed,
    ...(cut.grade !== undefined ? { grade: cut.grade } : {}),
  };
}

/**
 * A box-nested layer's parts (each in its blank) with a chained lead-in for every part the others
 * wall in: no straight slot from the left, right or top face reaches it without crossing another
 * part, so it is entered through a neighbour's kerf by a straight bridge across the waste, as
 * true-shape slabs are (`leadIns` of lib/nesting/slab.ts; tapered parts are never chained). The
 * others keep the lead-in their program finds. Null when no part needs a chain, or some part is
 * reached neither way.
 *
 *   chainWalledIn(parts, [304.5, 183], 1.5) // → the 9 plates of a 3 × 3 grid, the middle one with `via`
 */
export function chainWalledIn(parts: readonly ProgramPart[], size: Point, kerf: number): ProgramPart[] | null {
  const placed: PlacedMember[] = parts.map((p) => {
    const loop = p.root.outer.map((q): FacePoint => [q[0], q[1]]);
    return { loop, bb: bboxOf([loop]), area: Math.abs(signedArea(loop)) };
  });
  const { order, leads, blocked } = leadIns(placed, [size[0], size[1]], kerf, (k) => !parts[k]!.tapered);
  if (blocked.length || !leads.some((l) => l.via !== undefined)) return null;
  return parts.map((p, k) => {
    const l = leads[order.indexOf(k)]!;
    if (l.via === undefined || !l.from) return p;
    return { ...p, leadIn: [l.to[0], l.to[1]], via: { part: order[l.via]!, from: [l.from[0], l.from[1]] } };
  });
}

/**
 * The program of a box-nested layer (parts in their blanks, each finding its own lead-in): where a
 * part has none because the others wall it in, the same layer with that part entered through a
 * neighbour's kerf (`chainWalledIn`). Throws as `profileProgram` does when that does not help either.
 */
export function layerProgram(input: ProfileProgramInput, machine: Machine): ProfileProgram {
  try {
    return profileProgram(input, machine);
  } catch (e) {
    const chained = e instanceof ToolpathError ? chainWalledIn(input.parts, input.size, input.kerf) : null;
    if (!chained) throw e;
    return profileProgram({ ...input, parts: chained }, machine);
  }
}
