/**
 * What the drawing of a true-shape slab's face shows (components/plans/slab-face.tsx): each member's
 * outline, holes and tip section where the slab holds them, its lead-in corridor from the face to
 * the wire's path (for a chained lead-in the bridge from the earlier member's path), and a point
 * well inside the outline for its number. Pure: no I/O.
 */
import type { FacePoint, LeadInFace, PartOutline, SlabLayout } from "@/lib/nesting";
import { bboxOf, segDist2, winding } from "@/lib/nesting/irregular/geometry";
import { leadInFoot, memberLoop, occupiedOutline } from "@/lib/nesting/slab";

export interface SlabFaceMember {
  /** 1-based, as numbered on the drawing and in the list. */
  n: number;
  rotation: number;
  face: LeadInFace;
  /** Outer loop and holes in the slab's face; absent when the part's outline is not known. */
  outer?: FacePoint[];
  holes: FacePoint[][];
  /** The tip section of a tapered part. */
  tip?: FacePoint[];
  /** From the slab face to the wire's path; for a chained lead-in, the bridge from the earlier member's path. */
  corridor: [FacePoint, FacePoint];
  /** A chained lead-in: the 1-based number of the member whose cut path the wire comes by. */
  via?: number;
  /** Where the member's number goes: the point of a coarse grid farthest inside the occupied loop. */
  label: FacePoint;
}

/** Distance from a point to a loop's edges. */
function edgeDistance(loop: readonly FacePoint[], x: number, y: number): number {
  let best = Infinity;
  for (let i = 0; i < loop.length; i++) {
    const a = loop[i]!;
    const b = loop[(i + 1) % loop.length]!;
    best = Math.min(best, segDist2(x, y, a[0], a[1], b[0], b[1]));
  }
  return Math.sqrt(best);
}

/**
 * A point inside the loop far from its edges (a letter "C"'s centre lies outside it): the best of
 * a 16 × 16 grid over the loop's box, by distance to the edges and the holes; the box's centre when
 * no grid point falls inside.
 * @example labelPoint([[0, 0], [10, 0], [10, 10], [0, 10]], []) // → about [5, 5]
 */
export function labelPoint(outer: readonly FacePoint[], holes: readonly (readonly FacePoint[])[]): FacePoint {
  const b = bboxOf([outer]);
  let best: FacePoint = [(b.minX + b.maxX) / 2, (b.minY + b.maxY) / 2];
  let bestD = -1;
  const N = 16;
  for (let i = 0; i <= N; i++)
    for (let j = 0; j <= N; j++) {
      const x = b.minX + ((b.maxX - b.minX) * (i + 0.5)) / (N + 1);
      const y = b.minY + ((b.maxY - b.minY) * (j + 0.5)) / (N + 1);
      if (winding(outer, x, y) === 0 || holes.some((h) => winding(h, x, y) !== 0)) continue;
      const d = Math.min(edgeDistance(outer, x, y), ...holes.map((h) => edgeDistance(h, x, y)));
      if (d > bestD) {
        bestD = d;
        best = [x, y];
      }
    }
  return best;
}

/**
 * The members of a slab as drawn in its face.
 *
 *   slabFaceDrawing(placement.slab, new Map([["jp-4", outline]])).members[0]
 *   // → { n: 1, rotation: 90, face: "top", outer: [...], holes: [], corridor: [[61, 200], [61, 91.75]], label: [40, 52] }
 */
export function slabFaceDrawing(
  slab: SlabLayout,
  outlines: ReadonlyMap<string, PartOutline>,
): { members: SlabFaceMember[] } {
  const uv: [number, number] = [slab.size[1], slab.size[2]];
  const members = slab.members.map((m, k): SlabFaceMember => {
    const o = outlines.get(m.part);
    const { via, from } = m.leadIn;
    const chained = via !== undefined && from ? { via: via + 1 } : {};
    const corridor: [FacePoint, FacePoint] = [
      via !== undefined && from ? from : leadInFoot(m.leadIn.to, m.leadIn.face, uv),
      m.leadIn.to,
    ];
    if (!o)
      return {
        n: k + 1,
        rotation: m.rotation,
        face: m.leadIn.face,
        holes: [],
        corridor,
        label: m.leadIn.to,
        ...chained,
      };
    const outer = memberLoop(o.outer, m.rotation, m.at);
    const holes = (o.holes ?? []).map((h) => memberLoop(h, m.rotation, m.at));
    const occupied = memberLoop(occupiedOutline(o), m.rotation, m.at);
    return {
      n: k + 1,
      rotation: m.rotation,
      face: m.leadIn.face,
      outer,
      holes,
      ...(o.tip ? { tip: memberLoop(o.tip.outer, m.rotation, m.at) } : {}),
      corridor,
      label: labelPoint(occupied, o.tip ? [] : holes),
      ...chained,
    };
  });
  return { members };
}
