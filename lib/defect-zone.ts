import type { Vec3 } from "@/lib/nesting";
/**
 * A defect zone marked on one face of a block: the face gives two sides of the box; the third (the
 * depth) cannot be drawn. Until the cutter types it, the zone goes in from the face it was marked
 * on as deep as the mark is wide (the longer of its two sides): a cube-ish box at the surface where
 * the defect showed, clipped to the block. Never the whole block: a fist-sized void is not a column.
 *
 *   zoneFromMark({ view: "top", axes: [0, 1], min: [400, 300], max: [460, 380] }, [2440, 1220, 610])
 *   // → { min: [400, 300, 530], max: [460, 380, 610], depthAxis: 2, depth: 80 }
 */
export type Axis = 0 | 1 | 2;
export type FaceName = "top" | "front" | "side";

export interface FaceMark {
  view: FaceName;
  axes: [Axis, Axis];
  min: [number, number];
  max: [number, number];
}

/**
 * Where each view's face lies on its depth axis (the face-views drawing: origin at the front lower
 * left corner; top seen from above, front from y = 0, right end from x = length).
 */
export const FACE_AT: Record<FaceName, { axis: Axis; end: "min" | "max"; name: string }> = {
  top: { axis: 2, end: "max", name: "top" },
  front: { axis: 1, end: "min", name: "front" },
  side: { axis: 0, end: "max", name: "right end" },
};

/** The depth a mark gets before anyone types one: the longer side of the mark (mm, whole). */
export function defaultDepth(mark: Pick<FaceMark, "min" | "max">): number {
  return Math.max(1, Math.ceil(Math.max(mark.max[0] - mark.min[0], mark.max[1] - mark.min[1])));
}

/**
 * The depth range (mm along the depth axis) of a zone `depth` mm deep from the face, clipped to the
 * block: [length − depth, length] for a face at the far end of its axis, [0, depth] at the origin.
 */
export function depthRange(view: FaceName, depth: number, size: Vec3): [number, number] {
  const { axis, end } = FACE_AT[view];
  const d = Math.min(Math.max(depth, 0), size[axis]);
  return end === "max" ? [round(size[axis] - d), size[axis]] : [0, round(d)];
}

/** The box of a mark on a face with the given depth (default: `defaultDepth`), inside the block. */
export function zoneFromMark(
  mark: FaceMark,
  size: Vec3,
  depth = defaultDepth(mark),
): { min: Vec3; max: Vec3; depthAxis: Axis; depth: number } {
  const min: Vec3 = [0, 0, 0];
  const max: Vec3 = [...size];
  mark.axes.forEach((a, i) => {
    min[a] = Math.max(0, mark.min[i]!);
    max[a] = Math.min(size[a], mark.max[i]!);
  });
  const axis = FACE_AT[mark.view].axis;
  const [lo, hi] = depthRange(mark.view, depth, size);
  min[axis] = lo;
  max[axis] = hi;
  return { min, max, depthAxis: axis, depth: round(hi - lo) };
}

const round = (v: number) => Math.round(v * 100) / 100;
