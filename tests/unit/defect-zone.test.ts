import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { FaceViews } from "@/components/stock/face-views";
import { defaultDepth, depthRange, zoneFromMark } from "@/lib/defect-zone";

const BLOCK: [number, number, number] = [2440, 1220, 610];

describe("a zone marked on one face", () => {
  it("goes in from that face as deep as the mark is wide, never through the whole block", () => {
    // A fist-sized void seen on the top face: 60 × 80 mm.
    const top = zoneFromMark({ view: "top", axes: [0, 1], min: [400, 300], max: [460, 380] }, BLOCK);
    expect(top).toEqual({ min: [400, 300, 530], max: [460, 380, 610], depthAxis: 2, depth: 80 });
    // Seen on the front face (y = 0): into the width from the front.
    const front = zoneFromMark({ view: "front", axes: [0, 2], min: [1000, 200], max: [1100, 250] }, BLOCK);
    expect(front).toEqual({ min: [1000, 0, 200], max: [1100, 100, 250], depthAxis: 1, depth: 100 });
    // Seen on the right end (x = length): into the length from that end.
    const end = zoneFromMark({ view: "side", axes: [1, 2], min: [500, 100], max: [540, 170] }, BLOCK);
    expect(end).toEqual({ min: [2370, 500, 100], max: [2440, 540, 170], depthAxis: 0, depth: 70 });
  });

  it("is clipped to the block, and takes the depth the cutter types", () => {
    // A mark wider than the block is high: as deep as the block, no deeper.
    const wide = zoneFromMark({ view: "top", axes: [0, 1], min: [0, 0], max: [900, 700] }, BLOCK);
    expect(wide.min[2]).toBe(0);
    expect(wide.max[2]).toBe(610);
    const typed = zoneFromMark({ view: "top", axes: [0, 1], min: [400, 300], max: [460, 380] }, BLOCK, 25);
    expect([typed.min[2], typed.max[2]]).toEqual([585, 610]);
    expect(depthRange("front", 40, BLOCK)).toEqual([0, 40]);
    expect(defaultDepth({ min: [10, 10], max: [10.4, 12] })).toBe(2);
  });

  it("shows on all three faces at its depth: a short box on the front and the end, not a column", () => {
    const zone = zoneFromMark({ view: "top", axes: [0, 1], min: [400, 300], max: [460, 380] }, BLOCK);
    const html = renderToStaticMarkup(
      createElement(FaceViews, { size: BLOCK, unit: "mm", defects: [{ id: 7, kind: "void", ...zone }] }),
    );
    for (const view of ["front", "side"]) {
      const svg = html.match(new RegExp(`<svg[^>]*data-view="${view}"[\\s\\S]*?</svg>`))![0];
      const foam = Number(svg.match(/<rect x="[\d.]+" y="[\d.]+" width="[\d.]+" height="([\d.]+)" fill="#f6f3ec"/)![1]);
      const zoneRect = svg.match(
        /data-defect="7"><title>[^<]*<\/title><rect x="[\d.]+" y="[\d.]+" width="[\d.]+" height="([\d.]+)"/,
      )!;
      // 80 mm of the block's 610 mm height.
      expect(Number(zoneRect[1]) / foam, view).toBeCloseTo(80 / 610, 2);
    }
  });
});
