import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { PlanView, type PlanViewProps } from "@/components/plans/plan-view";
import { separate } from "@/lib/nesting/geometry";

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
  return [
    ...html.matchAll(
      /<figure class="([^"]*)"><figcaption[^>]*>([^<]+)<\/figcaption><svg viewBox="0 0 ([\d.]+) ([\d.]+)"/g,
    ),
  ].map((m) => ({
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

  it("draws pieces stacked along the line of sight once per view, and every piece of each layer", () => {
    // 10 × 10 × 4 cubes of 50 mm, a kerf apart: 100 columns seen from the top, 40 from the front and the side.
    const placements: PlanViewProps["placements"] = [];
    for (let x = 0; x < 10; x++)
      for (let y = 0; y < 10; y++)
        for (let z = 0; z < 4; z++)
          placements.push({ part: "c", origin: [x * 52, y * 52, z * 52], size: [50, 50, 50] });
    const html = renderToStaticMarkup(
      createElement(PlanView, {
        block: { id: "G", size: [520, 520, 210], defects: [] },
        placements,
        offcuts: [],
        cuts: [],
        kerf: 2,
        partName: () => "Cube",
        showLayers: true,
      }),
    );
    const figures = [...html.matchAll(/<figure[^>]*><figcaption[^>]*>([^<]+)<\/figcaption>(.*?)<\/figure>/g)].map(
      (m) => ({ title: m[1]!, rects: (m[2]!.match(/<rect /g) ?? []).length - 1 }),
    );
    expect(figures.map((f) => f.rects)).toEqual([100, 40, 40, 100, 100, 100, 100]);
    expect(figures[3]!.title).toBe("Layer 1: z 0–50 mm");
  });

  it("draws in each layer only the cuts through that layer", () => {
    // Four layers of 10 × 10 cubes, each layer shifted 5 mm: the block is first cut into layers
    // (no x or y cut runs through all of them), then each layer into columns and cubes.
    const placements: PlanViewProps["placements"] = [];
    for (let z = 0; z < 4; z++)
      for (let x = 0; x < 10; x++)
        for (let y = 0; y < 10; y++)
          placements.push({ part: "c", origin: [x * 52 + 5 * z, y * 52 + 5 * z, z * 52], size: [50, 50, 50] });
    const { cuts, stuck } = separate(placements, 2, "guillotine");
    expect(stuck).toEqual([]);
    expect(cuts.slice(0, 3).map((c) => c.axis)).toEqual(["z", "z", "z"]);
    const html = renderToStaticMarkup(
      createElement(PlanView, {
        block: { id: "L", size: [540, 540, 210], defects: [] },
        placements,
        offcuts: [],
        cuts,
        kerf: 2,
        partName: () => "Cube",
        showLayers: true,
      }),
    );
    const lines = [...html.matchAll(/<figure[^>]*><figcaption[^>]*>[^<]+<\/figcaption>(.*?)<\/figure>/g)].map(
      (m) => (m[1]!.match(/<line /g) ?? []).length,
    );
    // Each layer: 9 cuts across x, then 9 across y in each of its 10 slabs.
    expect(lines.slice(3)).toEqual([99, 99, 99, 99]);
    // The top view shows the x and y cuts of all four layers (they lie 5 mm apart).
    expect(lines[0]).toBe(4 * 99);
  });
});
