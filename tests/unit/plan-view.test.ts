import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { PlanView, type PlanViewProps } from "@/components/plans/plan-view";

const render = (size: [number, number, number]) => {
  const props: PlanViewProps = {
    block: { id: "B-1", size, defects: [] },
    placements: [{ part: "p1", origin: [0, 0, 0], size: [400, 300, size[2]] }],
    offcuts: [],
    cuts: [],
    kerf: 1.5,
    partName: () => "Rib",
    showLayers: false,
  };
  return renderToStaticMarkup(createElement(PlanView, props));
};

/** Each view's figure: whether it takes a whole row, and the drawing's width in its own units. */
function views(html: string) {
  return [...html.matchAll(/<figure class="([^"]*)"><figcaption[^>]*>([^<]+)<\/figcaption><svg viewBox="0 0 ([\d.]+) ([\d.]+)"/g)].map((m) => ({
    title: m[2]!,
    wholeRow: m[1]!.includes("col-span-2"),
    width: Number(m[3]),
    height: Number(m[4]),
  }));
}

describe("plan views", () => {
  it("gives the long views of a 4 m slab whole rows at a larger scale, to scale still", () => {
    const v = views(render([3993, 1201, 150]));
    expect(v.map((x) => x.title)).toEqual(["Top (length × width)", "Front (length × height)", "Side (width × height)"]);
    expect(v.every((x) => x.wholeRow)).toBe(true);
    expect(v[1]!.width).toBeGreaterThan(900);
    // Drawn to scale (22 units of margin each side): the front is 3993 : 150.
    expect((v[1]!.width - 44) / (v[1]!.height - 44)).toBeCloseTo(3993 / 150, 1);
  });

  it("lets the views of a near-cube share a row, at the usual size", () => {
    const v = views(render([1200, 1000, 900]));
    expect(v.some((x) => x.wholeRow)).toBe(false);
    expect(Math.max(...v.map((x) => x.width))).toBeLessThan(500);
  });
});
