import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { FaceViews } from "@/components/stock/face-views";

const render = (props: Parameters<typeof FaceViews>[0]) => renderToStaticMarkup(createElement(FaceViews, props));
const viewBox = (html: string, view: string) =>
  html
    .match(new RegExp(`viewBox="0 0 ([\\d.]+) ([\\d.]+)"[^>]*data-view="${view}"`))!
    .slice(1)
    .map(Number);

describe("face views", () => {
  const defects = [
    {
      id: 7,
      kind: "void",
      min: [400, 300, 100] as [number, number, number],
      max: [460, 380, 150] as [number, number, number],
    },
  ];

  it("draws the top, front and right-end faces, each zone once per face, labelled by kind", () => {
    const html = render({ size: [2440, 1220, 610], defects, unit: "mm" });
    for (const view of ["top", "front", "side"]) expect(html).toContain(`data-view="${view}"`);
    expect(html.match(/data-defect="7"/g)).toHaveLength(3);
    expect(html.match(/>Void</g)?.length).toBeGreaterThanOrEqual(3);
  });

  it("dimensions the block in the person's unit", () => {
    const mm = render({ size: [2440, 1220, 610], defects: [], unit: "mm" });
    expect(mm).toContain("x 2440 mm");
    expect(mm).toContain("z 610 mm");
    const inches = render({ size: [2438.4, 1219.2, 609.6], defects: [], unit: "in" });
    expect(inches).toContain("x 96 in");
    expect(inches).toContain("y 48 in");
    expect(inches).toContain("z 24 in");
  });

  it("keeps each face to scale: a 2:1 top face is drawn twice as wide as it is tall", () => {
    const html = render({ size: [2440, 1220, 610], defects: [], unit: "mm" });
    const [w, h] = viewBox(html, "top");
    // Margins for the dimension lines: left 40 + right 14, top 16 + bottom 38.
    expect((w! - 54) / (h! - 54)).toBeCloseTo(2, 2);
    const [fw, fh] = viewBox(html, "front");
    expect((fw! - 54) / (fh! - 54)).toBeCloseTo(4, 2);
  });

  it("shows a zone being entered on every face, and nothing for a box that is not one yet", () => {
    const drafted = render({
      size: [2440, 1220, 610],
      defects: [],
      unit: "mm",
      draft: { min: [10, 10, 0], max: [200, 300, 610] },
    });
    expect(drafted.match(/data-draft=""/g)).toHaveLength(3);
    expect(drafted).toContain("New zone");
    const unfinished = render({
      size: [2440, 1220, 610],
      defects: [],
      unit: "mm",
      draft: { min: [10, 10, 0], max: [5, 300, 610] },
    });
    expect(unfinished).not.toContain("data-draft");
  });
});
