/**
 * SVG import: small drawings written here. Units and transforms follow SVG 1.1 (coordinate
 * systems, the transform attribute, viewBox) and CSS Values (1in = 96px = 72pt = 25.4mm); arc
 * conversion follows SVG 1.1 Implementation Notes F.6. Areas are hand-worked.
 */
import { describe, expect, it } from "vitest";
import { CHORD_TOLERANCE_MM } from "@/lib/profiles/import-common";
import { importSvg, importSvgPath, parseTransform } from "@/lib/profiles/import-svg";
import { checkOutline, polygonArea } from "@/lib/profiles/polygon";

const TOL = CHORD_TOLERANCE_MM;
const svg = (body: string, root = 'width="200mm" height="200mm" viewBox="0 0 200 200"') =>
  `<?xml version="1.0" encoding="UTF-8"?>\n<!-- drawn for the test -->\n<svg xmlns="http://www.w3.org/2000/svg" ${root}>${body}</svg>`;

function ok(r: ReturnType<typeof importSvg>) {
  if (!r.ok) throw new Error(`expected profiles, got: ${r.errors.map((e) => e.message).join(" | ")}`);
  return r;
}
function refused(r: ReturnType<typeof importSvg>) {
  if (r.ok) throw new Error("expected the SVG to be refused");
  return r;
}
const one = (r: ReturnType<typeof importSvg>) => {
  const got = ok(r);
  expect(got.profiles).toHaveLength(1);
  return got.profiles[0]!;
};

describe("SVG import: units and the y flip", () => {
  it("width/height in mm with a matching viewBox: one user unit is 1 mm; y is flipped so up is up", () => {
    const r = ok(
      importSvg(svg('<rect x="10" y="5" width="40" height="20"/>', 'width="100mm" height="50mm" viewBox="0 0 100 50"')),
    );
    const p = r.profiles[0]!;
    expect(p.boxMm).toEqual([40, 20]);
    expect(p.areaMm2).toBe(800);
    // SVG y runs down: the rect's top edge y = 5 is the profile's top, y = −5 before moving to 0, 0.
    expect(p.originMm).toEqual([10, -25]);
    expect(r.unit).toMatchObject({ name: "mm", mmPerUnit: 1, from: "file" });
  });

  it("a right triangle drawn with its square corner at the top left keeps it at the top left", () => {
    const p = one(importSvg(svg('<path d="M0 0 L10 0 L0 10 Z"/>')));
    expect(p.points).toContainEqual([0, 10]);
    expect(p.points).toContainEqual([10, 10]);
    expect(p.points).toContainEqual([0, 0]);
    expect(polygonArea(p.points)).toBeGreaterThan(0); // outer loops anticlockwise
  });

  it("viewBox scaling: width 200mm over a viewBox 100 wide is 2 mm a unit", () => {
    const p = one(
      importSvg(svg('<rect width="40" height="20"/>', 'width="200mm" height="100mm" viewBox="0 0 100 50"')),
    );
    expect(p.boxMm).toEqual([80, 40]);
  });

  it("inches, points and px at 96 to the inch", () => {
    expect(
      one(importSvg(svg('<rect width="4" height="2"/>', 'width="4in" height="2in" viewBox="0 0 4 2"'))).boxMm,
    ).toEqual([101.6, 50.8]);
    expect(
      one(importSvg(svg('<rect width="72" height="36"/>', 'width="72pt" height="36pt" viewBox="0 0 72 36"'))).boxMm,
    ).toEqual([25.4, 12.7]);
    const px = ok(importSvg(svg('<rect width="96" height="48"/>', 'width="96" height="48"')));
    expect(px.profiles[0]!.boxMm).toEqual([25.4, 12.7]);
    expect(px.unit.from).toBe("default");
    expect(px.notes.join(" ")).toMatch(/96 to the inch/);
  });

  it("without an absolute size the person may name the unit of its numbers", () => {
    const r = ok(importSvg(svg('<rect width="4" height="2"/>', 'viewBox="0 0 10 10"'), { unit: "in" }));
    expect(r.profiles[0]!.boxMm).toEqual([101.6, 50.8]);
    expect(r.unit).toMatchObject({ name: "in", from: "given" });
  });
});

describe("SVG import: transforms", () => {
  it("parses each kind and composes left to right", () => {
    expect(parseTransform("translate(10 20) scale(2)")).toEqual([2, 0, 0, 2, 10, 20]);
    expect(parseTransform("matrix(1,2,3,4,5,6)")).toEqual([1, 2, 3, 4, 5, 6]);
    const r = parseTransform("rotate(90 10 0)"); // (20, 0) turns about (10, 0) to (10, 10)
    expect(r[0] * 20 + r[2] * 0 + r[4]).toBeCloseTo(10, 12);
    expect(r[1] * 20 + r[3] * 0 + r[5]).toBeCloseTo(10, 12);
  });

  it("rotate(45) of a 10 mm square: same area, box 10√2 wide", () => {
    const p = one(
      importSvg(svg('<g transform="translate(100 100)"><rect width="10" height="10" transform="rotate(45)"/></g>')),
    );
    // Coordinates are kept to 0.001 mm: the area may move by perimeter × 0.0005 mm.
    expect(Math.abs(p.areaMm2 - 100)).toBeLessThan(40 * 0.0005);
    expect(p.boxMm[0]).toBeCloseTo(10 * Math.SQRT2, 2);
  });

  it("scale(2 3), skewX(45) and a matrix on 10 mm squares", () => {
    expect(one(importSvg(svg('<rect width="10" height="10" transform="scale(2 3)"/>'))).boxMm).toEqual([20, 30]);
    // skewX(45): x' = x + y·tan 45°: a parallelogram of the same area, 20 wide.
    const sk = one(importSvg(svg('<rect width="10" height="10" transform="skewX(45)"/>')));
    expect(sk.areaMm2).toBeCloseTo(100, 3);
    expect(sk.boxMm[0]).toBeCloseTo(20, 3);
    const skY = one(importSvg(svg('<rect width="10" height="10" transform="skewY(45)"/>')));
    expect(skY.boxMm[1]).toBeCloseTo(20, 3);
    // matrix(0.5 0 0 2 0 0): area × det = 100 × 1.
    const m = one(importSvg(svg('<rect width="10" height="10" transform="matrix(0.5 0 0 2 0 0)"/>')));
    expect(m.boxMm).toEqual([5, 20]);
  });

  it("nested groups apply the outer transform last", () => {
    // scale(2) of translate(10 0): the rect lands at x = 20..30.
    const p = one(
      importSvg(svg('<g transform="scale(2)"><g transform="translate(10 0)"><rect width="5" height="5"/></g></g>')),
    );
    expect(p.originMm[0]).toBe(20);
    expect(p.boxMm).toEqual([10, 10]);
  });
});

describe("SVG import: paths, arcs and Béziers", () => {
  it("a circle of two arcs has area πr² within the sagitta band", () => {
    const p = one(importSvg(svg('<path d="M 0 50 A 50 50 0 0 1 100 50 A 50 50 0 0 1 0 50 Z"/>')));
    const exact = Math.PI * 2500;
    expect(p.areaMm2).toBeLessThan(exact);
    expect(exact - p.areaMm2).toBeLessThan(2 * Math.PI * 50 * TOL);
  });

  it("sweep-flag 1 from left to right goes over the top on screen, so up after the flip; too-small radii are scaled up (F.6.6)", () => {
    for (const d of ["M0 100 A 50 50 0 0 1 100 100 Z", "M0 100 A 10 10 0 0 1 100 100 Z"]) {
      const p = one(importSvg(svg(`<path d="${d}"/>`)));
      expect(p.originMm[1]).toBeCloseTo(-100, 6); // the chord is the bottom edge
      expect(50 - p.boxMm[1]).toBeLessThanOrEqual(TOL);
      expect(Math.PI * 1250 - p.areaMm2).toBeLessThan(Math.PI * 50 * TOL);
    }
  });

  it("a quadratic Bézier closed by its chord: Archimedes' parabola area ⅔·base·height", () => {
    // Q peak at t = ½ is y = 50 (the control point at 100 pulls it half way): ⅔ × 100 × 50.
    const p = one(importSvg(svg('<path d="M0 100 Q 50 0 100 100 Z"/>')));
    const exact = (2 / 3) * 100 * 50;
    expect(p.areaMm2).toBeLessThan(exact);
    expect(exact - p.areaMm2).toBeLessThan(150 * TOL);
  });

  it("a cubic Bézier closed by its chord: ∫y dx = 18wh∫t²(1−t)²dt = 0.6·w·h (hand-worked)", () => {
    const abs = one(importSvg(svg('<path d="M0 100 C 0 0 100 0 100 100 Z"/>')));
    const rel = one(importSvg(svg('<path d="m0 100 c 0 -100 100 -100 100 0 z"/>')));
    const exact = 0.6 * 100 * 100;
    expect(abs.areaMm2).toBeLessThan(exact);
    expect(exact - abs.areaMm2).toBeLessThan(250 * TOL);
    expect(rel.areaMm2).toBeCloseTo(abs.areaMm2, 6);
  });

  it("S and T reflect the previous control point", () => {
    const s = one(importSvg(svg('<path d="M0 100 C 0 60 20 60 50 60 S 100 60 100 100 Z"/>')));
    const c = one(importSvg(svg('<path d="M0 100 C 0 60 20 60 50 60 C 80 60 100 60 100 100 Z"/>')));
    expect(s.areaMm2).toBeCloseTo(c.areaMm2, 6);
    const t = one(importSvg(svg('<path d="M0 100 Q 25 60 50 60 T 100 100 Z"/>')));
    const q = one(importSvg(svg('<path d="M0 100 Q 25 60 50 60 Q 75 60 100 100 Z"/>')));
    expect(t.areaMm2).toBeCloseTo(q.areaMm2, 6);
  });

  it("H, V and rounded rects", () => {
    expect(one(importSvg(svg('<path d="M10 10 H 60 V 30 H 10 Z"/>'))).areaMm2).toBe(1000);
    // A 40 × 20 rect with corner radius 5: 40·20 − (4 − π)·5² (hand-worked).
    const r = one(importSvg(svg('<rect width="40" height="20" rx="5"/>')));
    const exact = 800 - (4 - Math.PI) * 25;
    expect(r.areaMm2).toBeLessThan(exact + 1e-6);
    expect(exact - r.areaMm2).toBeLessThan(2 * Math.PI * 5 * TOL);
  });

  it("ellipse, polygon, and lines/polylines chained into a loop", () => {
    const e = one(importSvg(svg('<ellipse cx="50" cy="50" rx="40" ry="20"/>')));
    expect(Math.PI * 800 - e.areaMm2).toBeLessThan(2 * Math.PI * 40 * TOL);
    expect(one(importSvg(svg('<polygon points="0,0 30,0 30,40"/>'))).areaMm2).toBe(600);
    const chained = one(importSvg(svg('<polyline points="0,0 30,0 30,40"/><line x1="30" y1="40" x2="0" y2="0"/>')));
    expect(chained.areaMm2).toBe(600);
  });
});

describe("SVG import: holes", () => {
  const ring = (inner: string) => `M0 0 H100 V100 H0 Z ${inner}`;
  it("fill-rule evenodd: an inner square is a hole whatever its direction", () => {
    const p = one(importSvg(svg(`<path fill-rule="evenodd" d="${ring("M25 25 H75 V75 H25 Z")}"/>`)));
    expect(p.holes).toHaveLength(1);
    expect(p.areaMm2).toBe(10000 - 2500);
    expect(checkOutline(p.points, p.holes)).toBeNull();
  });

  it("fill-rule nonzero (the default): the same direction fills, the opposite direction is a hole", () => {
    const same = one(importSvg(svg(`<path d="${ring("M25 25 H75 V75 H25 Z")}"/>`)));
    expect(same.holes).toHaveLength(0);
    expect(same.areaMm2).toBe(10000);
    const opposite = one(
      importSvg(svg(`<path style="fill:#000;fill-rule:nonzero" d="${ring("M25 25 V75 H75 V25 Z")}"/>`)),
    );
    expect(opposite.holes).toHaveLength(1);
  });

  it("fill-rule is inherited from a group", () => {
    const p = one(importSvg(svg(`<g fill-rule="evenodd"><path d="${ring("M25 25 H75 V75 H25 Z")}"/></g>`)));
    expect(p.holes).toHaveLength(1);
  });

  it("separate elements nest by containment: a circle inside a rect is its hole; a dot in the hole is a part again", () => {
    const r = ok(
      importSvg(
        svg('<rect width="100" height="100"/><circle cx="50" cy="50" r="30"/><circle cx="50" cy="50" r="5"/>'),
        {
          fileName: "badge.svg",
        },
      ),
    );
    expect(r.profiles.map((p) => [p.name, p.holes.length])).toEqual([
      ["badge.svg, shape 1", 1],
      ["badge.svg, shape 2", 0],
    ]);
  });
});

describe("SVG import: bad drawings name the element", () => {
  it("unreadable path data: the path's number, id and where", () => {
    const r = refused(importSvg(svg('<rect width="5" height="5"/><path id="logo" d="M0 0 L 10 x"/>')));
    expect(r.errors[0]!.message).toMatch(/^Path 2 \(id “logo”\): its path data cannot be read at character 11/);
  });

  it("an open path with its gap; a bad transform; a percentage size", () => {
    const open = refused(importSvg(svg('<path id="edge" d="M0 0 L50 0 L50 50"/>')));
    expect(open.errors[0]!.message).toMatch(/^Path 1 \(id “edge”\) does not close — its ends are 70\.71 mm apart/);
    const tr = refused(importSvg(svg('<rect width="5" height="5" transform="twist(4)"/>')));
    expect(tr.errors[0]!.message).toMatch(/^Rect 1: its transform “twist\(4\)” cannot be read/);
    const pct = refused(importSvg(svg('<rect width="50%" height="5"/>')));
    expect(pct.errors[0]!.message).toMatch(/^Rect 1: its width is a percentage/);
  });

  it("two elements that overlap are both named; a self-crossing subpath is named with its number", () => {
    const r = refused(importSvg(svg('<rect id="a" width="10" height="10"/><circle id="b" cx="10" cy="5" r="3"/>')));
    expect(r.errors[0]!.message).toMatch(
      /rect 1 \(id “a”\).*circle 2 \(id “b”\)|circle 2 \(id “b”\).*rect 1 \(id “a”\)/,
    );
    expect(r.errors[0]!.message).toMatch(/cross or touch/);
    const bow = refused(importSvg(svg('<path d="M0 0 H100 V100 H0 Z M10 10 L30 30 L30 10 L10 25 Z"/>')));
    expect(bow.errors[0]!.message).toMatch(/^Path 1, subpath 2 crosses itself near/);
  });

  it("not an SVG; no shapes; text left out with a note; hidden shapes left out", () => {
    expect(refused(importSvg("hello")).errors[0]!.message).toMatch(/not an SVG drawing/);
    const r = refused(importSvg(svg("<text>OPEN</text>")));
    expect(r.errors[0]!.message).toMatch(/holds no shape/);
    expect(r.notes.join(" ")).toMatch(/1 text \(turn text into paths/);
    const hidden = ok(
      importSvg(svg('<rect width="10" height="10"/><rect display="none" x="50" width="10" height="10"/>')),
    );
    expect(hidden.profiles).toHaveLength(1);
    expect(hidden.notes.join(" ")).toMatch(/1 hidden/);
  });

  it("a DOCTYPE with an entity is skipped, never expanded", () => {
    const xml = `<?xml version="1.0"?><!DOCTYPE svg [<!ENTITY big "x">]><svg width="10mm" height="10mm" viewBox="0 0 10 10"><rect width="&big;" height="5"/></svg>`;
    expect(refused(importSvg(xml)).errors[0]!.message).toMatch(/^Rect 1: its width “&big;” is not a length/);
  });
});

describe("SVG import: a bare path", () => {
  it("asks for the unit, then reads its numbers in it", () => {
    const r = importSvgPath("M0 0 H4 V2 H0 Z");
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.needsUnit).toBe(true);
      expect(r.errors[0]!.field).toBe("unit");
    }
    const p = ok(importSvgPath("M0 0 H4 V2 H0 Z", { unit: "in" })).profiles[0]!;
    expect(p.boxMm).toEqual([101.6, 50.8]);
    expect(p.source).toBe("SVG path");
  });

  it("names the bad spot in bad path data", () => {
    const r = refused(importSvgPath("M0 0 L10 0 Q", { unit: "mm" }));
    expect(r.errors[0]).toMatchObject({ field: "svgPath" });
    expect(r.errors[0]!.message).toMatch(/^The path: its path data cannot be read at character/);
  });
});
