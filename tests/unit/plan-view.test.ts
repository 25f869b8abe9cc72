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
    // Drawn to scale (26 units of margin each side): the front is 3993 : 150.
    expect((v[1]!.width - 52) / (v[1]!.height - 52)).toBeCloseTo(3993 / 150, 1);
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

describe("plan views for people who cannot see them, or see them on a tablet", () => {
  const busy = (): PlanViewProps => {
    // 40 cuts of a 2400 mm block into 41 slabs of about 57 mm: a busy plan.
    const cuts = Array.from({ length: 40 }, (_, i) => ({ axis: "x" as const, at: 58.5 * (i + 1) - 1.5 }));
    const placements = Array.from({ length: 41 }, (_, i) => ({
      part: `p${i % 3}`,
      origin: [58.5 * i, 0, 0] as [number, number, number],
      size: [57, 1200, 600] as [number, number, number],
    }));
    return {
      block: { id: "HF-2001", size: [2400, 1200, 600], defects: [{ min: [10, 10, 10], max: [60, 60, 60] }] },
      placements,
      offcuts: [],
      cuts,
      kerf: 1.5,
      partName: (k) => ({ p0: "Wall panel", p1: "Rib", p2: "Spar" })[k] ?? k,
      showLayers: false,
    };
  };

  it("titles every drawing and lists every cut and part in words beside them", () => {
    const html = renderToStaticMarkup(createElement(PlanView, busy()));
    const titles = [...html.matchAll(/<svg[^>]*>\s*<title>([^<]+)<\/title>/g)].map((m) => m[1]!);
    expect(titles).toHaveLength(3);
    expect(titles[0]).toMatch(/^Top \(length × width\) of HF-2001: /);
    const facts = html.slice(html.indexOf('data-testid="plan-facts-HF-2001"'));
    expect(facts).toContain("In words: 40 cuts and 41 parts of HF-2001");
    // Each of the 40 cuts, in order, with where the wire goes (the first: 57 mm + half a 1.5 mm kerf).
    const cutItems = [...facts.matchAll(/<li><span class="font-semibold tabular-nums">(\d+)\.<\/span>([^<]*)/g)];
    expect(cutItems.map((m) => Number(m[1]))).toEqual(Array.from({ length: 40 }, (_, i) => i + 1));
    expect(cutItems[0]![2]).toContain("across the length, wire at 57.8 mm");
    expect(facts.match(/Wall panel: 57 × 1200 × 600 mm at x 0, y 0, z 0/)).not.toBeNull();
    expect(facts).toContain("Defect zones: 50 × 50 × 50 mm");
  });

  it("sets no drawing text smaller than 12 drawing units, and numbers cuts in a darker orange than the lines", () => {
    const html = renderToStaticMarkup(createElement(PlanView, { ...busy(), cuts: busy().cuts.slice(0, 20) }));
    const sizes = [...html.matchAll(/font-size="([\d.]+)"/g)].map((m) => Number(m[1]));
    expect(sizes.length).toBeGreaterThan(20);
    expect(Math.min(...sizes)).toBeGreaterThanOrEqual(12);
    // Cut numbers are text: #a8401a on the block colour #f7f5ef is 5.6:1 (WCAG 2.1 AA asks 4.5:1 —
    // relative luminance as WCAG 2.1 defines it, computed in the test below).
    expect(html).toMatch(/fill="#a8401a" font-weight="600">1</);
    expect(contrast("#a8401a", "#f7f5ef")).toBeGreaterThanOrEqual(4.5);
  });

  it("can leave the words out where the page lists the cuts itself (the cut sheet)", () => {
    const html = renderToStaticMarkup(createElement(PlanView, { ...busy(), facts: false }));
    expect(html).not.toContain("plan-facts-");
  });
});

/** Contrast ratio by WCAG 2.1's definition of relative luminance (https://www.w3.org/TR/WCAG21/#dfn-contrast-ratio). */
function contrast(a: string, b: string): number {
  const lum = (hex: string) => {
    const [r, g, bl] = [1, 3, 5].map((i) => {
      const c = Number.parseInt(hex.slice(i, i + 2), 16) / 255;
      return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
    });
    return 0.2126 * r! + 0.7152 * g! + 0.0722 * bl!;
  };
  const [hi, lo] = [lum(a), lum(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}
