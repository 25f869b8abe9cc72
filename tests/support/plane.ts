/**
 * Plain plane geometry for the tests' independent checks, written here rather than taken from the
 * planner's code (hand-worked: the projection of a point onto a segment, clamped to its ends).
 */
export type XY = readonly [number, number];

/**
 * Distance from point p to the segment a–b.
 *
 *   segmentDistance([0, 1], [-1, 0], [1, 0])   // → 1
 *   segmentDistance([3, 0], [-1, 0], [1, 0])   // → 2 (to the end b)
 */
export function segmentDistance(p: XY, a: XY, b: XY): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const l2 = dx * dx + dy * dy;
  const t = l2 > 0 ? Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / l2)) : 0;
  return Math.hypot(a[0] + t * dx - p[0], a[1] + t * dy - p[1]);
}

/** Distance from p to the nearest edge of a closed loop. */
export function loopDistance(p: XY, loop: readonly XY[]): number {
  let d = Infinity;
  for (let i = 0; i < loop.length; i++) d = Math.min(d, segmentDistance(p, loop[i]!, loop[(i + 1) % loop.length]!));
  return d;
}

/**
 * Smallest vertex-to-edge distance between two outlines, each a list of loops (outer and holes):
 * two loops that do not cross come closest at a vertex of one of them.
 *
 *   outlineGap([[[0, 0], [1, 0], [1, 1], [0, 1]]], [[[3, 0], [4, 0], [4, 1], [3, 1]]])   // → 2
 */
export function outlineGap(a: readonly (readonly XY[])[], b: readonly (readonly XY[])[]): number {
  let d = Infinity;
  for (const la of a)
    for (const lb of b) {
      for (const p of la) d = Math.min(d, loopDistance(p, lb));
      for (const p of lb) d = Math.min(d, loopDistance(p, la));
    }
  return d;
}

/**
 * A loop as a closed ring (first point repeated at the end), as polygon-clipping takes it.
 *
 *   closedRing([[0, 0], [1, 0], [0, 1]])   // → [[0, 0], [1, 0], [0, 1], [0, 0]]
 */
export function closedRing(loop: readonly XY[]): [number, number][] {
  return [...loop.map(([x, y]) => [x, y] as [number, number]), [loop[0]![0], loop[0]![1]]];
}
