/**
 * The drawing of a true-shape slab's face (lib/planning/slab-face.ts, components/plans/slab-face.tsx):
 * each member drawn where the plan puts it, numbers inside their outlines, corridors from a face.
 * Geometry checked by hand-worked coordinates and with polygon-clipping (an outside library).
 */
import polygonClipping from "polygon-clipping";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { SlabFace } from "@/components/plans/slab-face";
import { type FacePoint, nestSync, type PartOutline, parseProblem, type SlabLayout } from "@/lib/nesting";
import { winding } from "@/lib/nesting/irregular/geometry";
import { labelPoint, slabFaceDrawing } from "@/lib/planning/slab-face";
import { closedRing } from "../../support/plane";
import { L_OUTLINE } from "../../support/shapes";

/** A "C" of 100 × 100 with a 60 × 60 bite from the right (hand-drawn): its box's centre lies in the bite. */
const C: FacePoint[] = [
  [0, 0],
  [100, 0],
  [100, 20],
  [20, 20],
  [20, 80],
  [100, 80],
  [100, 100],
  [0, 100],
];
const L = L_OUTLINE;
const ring = closedRing;

describe("labelPoint", () => {
  it("puts a C's number inside the C, not in its bite", () => {
    const p = labelPoint(C, []);
    expect(winding(C, p[0], p[1])).not.toBe(0);
    // Inside the back of the C (x < 20) or an arm (y < 20 or y > 80): hand-worked from the outline.
    expect(p[0] < 20 || p[1] < 20 || p[1] > 80).toBe(true);
  });

  it("keeps out of a hole", () => {
    const sq: FacePoint[] = [
      [0, 0],
      [100, 0],
      [100, 100],
      [0, 100],
    ];
    const hole: FacePoint[] = [
      [30, 30],
      [70, 30],
      [70, 70],
      [30, 70],
    ];
    const p = labelPoint(sq, [hole]);
    expect(winding(hole, p[0], p[1])).toBe(0);
    expect(winding(sq, p[0], p[1])).not.toBe(0);
  });
});

describe("slabFaceDrawing", () => {
  it("turns and moves each member as the plan says (hand-worked: a quarter turn then a shift)", () => {
    const slab: SlabLayout = {
      size: [50, 300, 200],
      rotate: "any",
      members: [{ part: "L", rotation: 90, at: [150, 10], leadIn: { face: "top", to: [120, 60] } }],
    };
    const d = slabFaceDrawing(slab, new Map([["L", { outer: L }]]));
    const m = d.members[0]!;
    // (x, y) turned 90° anticlockwise is (−y, x); then + (150, 10): (120, 0) → (150, 130), (0, 90) → (60, 10).
    expect(m.outer).toContainEqual([150, 130]);
    expect(m.outer).toContainEqual([60, 10]);
    expect(m.corridor).toEqual([
      [120, 200],
      [120, 60],
    ]);
    expect(m.n).toBe(1);
  });

  it("draws a member whose outline is missing as missing, not as a shape", () => {
    const slab: SlabLayout = {
      size: [50, 300, 200],
      rotate: "any",
      members: [{ part: "gone", rotation: 0, at: [0, 0], leadIn: { face: "left", to: [5, 5] } }],
    };
    expect(slabFaceDrawing(slab, new Map()).members[0]!.outer).toBeUndefined();
  });

  it("draws every member of a real true-shape plan inside its slab, apart from the others, each number inside its own outline", () => {
    const r = parseProblem({
      settings: { kerf: 2, trueShape: true, timeLimitMs: 1000 },
      blocks: [{ id: "B1", size: [500, 600, 400], grade: "EPS" }],
      parts: [
        { id: "L", size: [60, 120, 90], quantity: 5, grade: "EPS", outline: { outer: L } },
        { id: "C", size: [60, 100, 100], quantity: 3, grade: "EPS", outline: { outer: C } },
      ],
    });
    if (!r.ok) throw new Error(r.errors.join("\n"));
    const plan = nestSync(r.problem, { seed: 3, iterations: 20 });
    const slabs = plan.placements.filter((p) => p.slab);
    expect(slabs.length).toBeGreaterThan(0);
    const outlines = new Map<string, PartOutline>(
      r.problem.parts.flatMap((p) => (p.outline ? [[p.id, p.outline]] : [])),
    );
    for (const s of slabs) {
      const slab = s.slab!;
      const d = slabFaceDrawing(slab, outlines);
      expect(d.members).toHaveLength(slab.members.length);
      const face = [
        ring([
          [0, 0],
          [slab.size[1], 0],
          [slab.size[1], slab.size[2]],
          [0, slab.size[2]],
        ]),
      ];
      for (const [i, m] of d.members.entries()) {
        const poly = [ring(m.outer!)];
        // Inside the face: nothing of the outline outside it (polygon-clipping difference).
        const outside = polygonClipping.difference(poly, face);
        expect(outside.length, `member ${i + 1} outside ${s.part}`).toBe(0);
        expect(winding(m.outer!, m.label[0], m.label[1]), `number of member ${i + 1}`).not.toBe(0);
        for (const other of d.members.slice(i + 1))
          expect(polygonClipping.intersection(poly, [ring(other.outer!)])).toHaveLength(0);
        // The corridor starts on the face it names, or beyond it where the wire's path (kerf / 2 out) passes outside the slab.
        const [foot] = m.corridor;
        if (m.face === "top") expect(foot[1]).toBeGreaterThanOrEqual(slab.size[2] - 1e-6);
        if (m.face === "left") expect(foot[0]).toBeLessThanOrEqual(1e-6);
        if (m.face === "right") expect(foot[0]).toBeGreaterThanOrEqual(slab.size[1] - 1e-6);
      }
      const html = renderToStaticMarkup(
        createElement(SlabFace, { id: s.part, slab, outlines, kerf: 2, partName: (k: string) => `part ${k}` }),
      );
      expect(html.match(/<path /g)?.length).toBe(slab.members.length);
      expect(html.match(/<li /g)?.length).toBe(slab.members.length);
      expect(html).toContain(`Face of ${s.part}`);
    }
  });
});
