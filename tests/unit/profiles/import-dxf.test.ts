/**
 * DXF import: small drawings written here, group code by group code (DXF reference: HEADER
 * $INSUNITS, ENTITIES LINE/ARC/CIRCLE/ELLIPSE/LWPOLYLINE/POLYLINE/SPLINE). Expected areas are
 * hand-worked plane geometry; flattened curves lie inside the true curve, so each check allows the
 * chord tolerance times the perimeter (the sagitta band) and no more.
 */
import { describe, expect, it } from "vitest";
import { CHORD_TOLERANCE_MM } from "@/lib/profiles/import-common";
import { bulgeArc, importDxf } from "@/lib/profiles/import-dxf";
import { checkOutline, polygonArea } from "@/lib/profiles/polygon";

const g = (code: number, value: string | number) => `${String(code).padStart(3, " ")}\n${value}`;
const ent = (type: string, handle: string, ...groups: string[]) =>
  [g(0, type), g(5, handle), g(8, "0"), ...groups].join("\n");

/** A drawing: optional $INSUNITS, then the entities. */
function dxf(entities: string[], insunits: number | null = 4): string {
  const header =
    insunits === null ? [] : [g(0, "SECTION"), g(2, "HEADER"), g(9, "$INSUNITS"), g(70, insunits), g(0, "ENDSEC")];
  return [...header, g(0, "SECTION"), g(2, "ENTITIES"), ...entities, g(0, "ENDSEC"), g(0, "EOF")].join("\n");
}
const line = (h: string, x1: number, y1: number, x2: number, y2: number) =>
  ent("LINE", h, g(10, x1), g(20, y1), g(30, 0), g(11, x2), g(21, y2), g(31, 0));
const arc = (h: string, cx: number, cy: number, r: number, a0: number, a1: number) =>
  ent("ARC", h, g(10, cx), g(20, cy), g(30, 0), g(40, r), g(50, a0), g(51, a1));
const circle = (h: string, cx: number, cy: number, r: number, extra: string[] = []) =>
  ent("CIRCLE", h, g(10, cx), g(20, cy), g(30, 0), g(40, r), ...extra);
/** LWPOLYLINE: points [x, y, bulge?]. */
const lwpoly = (h: string, pts: [number, number, number?][], closed: boolean) =>
  ent(
    "LWPOLYLINE",
    h,
    g(90, pts.length),
    g(70, closed ? 1 : 0),
    ...pts.flatMap(([x, y, b]) => [g(10, x), g(20, y), ...(b ? [g(42, b)] : [])]),
  );
const rect = (h: string, x: number, y: number, w: number, hgt: number) =>
  lwpoly(
    h,
    [
      [x, y],
      [x + w, y],
      [x + w, y + hgt],
      [x, y + hgt],
    ],
    true,
  );

const TOL = CHORD_TOLERANCE_MM;

function ok(r: ReturnType<typeof importDxf>) {
  if (!r.ok) throw new Error(`expected profiles, got: ${r.errors.map((e) => e.message).join(" | ")}`);
  return r;
}
function refused(r: ReturnType<typeof importDxf>) {
  if (r.ok) throw new Error("expected the drawing to be refused");
  return r;
}

describe("DXF import: entity kinds", () => {
  it("chains four LINEs and an ARC (given out of order and reversed) into one loop: a 100 × 50 slot end", () => {
    // Rectangle 0..100 × 0..50 whose right side is a half circle of radius 25 centred (100, 25):
    // area = 100·50 + π·25²/2 (hand-worked).
    const r = ok(
      importDxf(
        dxf([
          line("1A", 0, 50, 0, 0),
          arc("1B", 100, 25, 25, 270, 90),
          line("1C", 0, 0, 100, 0),
          line("1D", 0, 50, 100, 50), // reversed against the run
        ]),
        { fileName: "slot.dxf" },
      ),
    );
    expect(r.profiles).toHaveLength(1);
    const p = r.profiles[0]!;
    expect(p.name).toBe("slot.dxf");
    expect(p.holes).toEqual([]);
    const exact = 100 * 50 + (Math.PI * 25 * 25) / 2;
    expect(p.areaMm2).toBeLessThanOrEqual(exact + 1e-6);
    expect(p.areaMm2).toBeGreaterThan(exact - Math.PI * 25 * TOL);
    expect(125 - p.boxMm[0]).toBeGreaterThanOrEqual(0);
    expect(125 - p.boxMm[0]).toBeLessThanOrEqual(TOL);
    expect(p.boxMm[1]).toBeCloseTo(50, 2);
    expect(r.unit).toEqual({ name: "mm", mmPerUnit: 1, from: "file" });
  });

  it("joins ends up to 0.05 mm apart and no further", () => {
    const nearly = [line("1", 0, 0, 10, 0), line("2", 10.04, 0, 10, 10), line("3", 10, 10, 0, 0)];
    expect(ok(importDxf(dxf(nearly))).profiles).toHaveLength(1);
    const gap = [line("1", 0, 0, 10, 0), line("2", 10.2, 0, 10, 10), line("3", 10, 10, 0, 0)];
    const r = refused(importDxf(dxf(gap)));
    expect(r.errors[0]!.message).toMatch(
      /Open outline: LINE \(handle \d\), LINE \(handle \d\) and LINE \(handle \d\) do not close/,
    );
    expect(r.errors[0]!.message).toMatch(/ends are 0\.20 mm apart, at \(10(\.2)?, 0\) mm and \(10(\.2)?, 0\) mm/);
  });

  it("reads an LWPOLYLINE with a bulge as a half circle (bulge 1 = tan(180°/4))", () => {
    // 0,0 → 40,0 straight, 40,0 → 40,40 with bulge 1: a half circle of radius 20 bulging out to x = 60;
    // then 40,40 → 0,40 → close. Area = 40·40 + π·20²/2 (hand-worked).
    const r = ok(
      importDxf(
        dxf([
          lwpoly(
            "2F",
            [
              [0, 0],
              [40, 0, 1],
              [40, 40],
              [0, 40],
            ],
            true,
          ),
        ]),
      ),
    );
    const p = r.profiles[0]!;
    const exact = 1600 + (Math.PI * 400) / 2;
    expect(p.areaMm2).toBeLessThanOrEqual(exact + 1e-6);
    expect(p.areaMm2).toBeGreaterThan(exact - Math.PI * 20 * TOL);
    expect(60 - p.boxMm[0]).toBeGreaterThanOrEqual(0);
    expect(60 - p.boxMm[0]).toBeLessThanOrEqual(TOL);
  });

  it("bulge arcs: positive turns anticlockwise, negative clockwise, both through the right point", () => {
    const ccw = bulgeArc([1, 0], [-1, 0], 1, 0.001);
    const mid = ccw[Math.floor(ccw.length / 2)]!;
    expect(mid[0]).toBeCloseTo(0, 2);
    expect(mid[1]).toBeCloseTo(1, 3); // over the top
    const cw = bulgeArc([1, 0], [-1, 0], -1, 0.001);
    expect(cw[Math.floor(cw.length / 2)]![1]).toBeCloseTo(-1, 3);
    expect(cw[cw.length - 1]).toEqual([-1, 0]);
  });

  it("a CIRCLE of radius 50 has area πr² less at most the sagitta band 2πr·tol", () => {
    // πr² (Euclid XII.2); an inscribed polygon whose chords stay within tol of the circle loses
    // less than perimeter × tol.
    const r = ok(importDxf(dxf([circle("30", 10, 20, 50)])));
    const p = r.profiles[0]!;
    const exact = Math.PI * 50 * 50;
    expect(p.areaMm2).toBeLessThan(exact);
    expect(exact - p.areaMm2).toBeLessThan(2 * Math.PI * 50 * TOL);
    expect(100 - p.boxMm[0]).toBeLessThanOrEqual(2 * TOL);
    // Every vertex on the circle (the profile moved so its box starts at 0, 0).
    const [ox, oy] = p.originMm;
    for (const [x, y] of p.points) expect(Math.abs(Math.hypot(x + ox - 10, y + oy - 20) - 50)).toBeLessThan(0.002);
    expect(Math.abs(ox + 40)).toBeLessThanOrEqual(TOL);
  });

  it("a full ELLIPSE (a = 60, b = 30) has area πab within the band; a half ellipse closed by a LINE, half that", () => {
    // Area of an ellipse πab (Archimedes, On Conoids and Spheroids, prop. 4).
    const full = ent(
      "ELLIPSE",
      "40",
      g(10, 0),
      g(20, 0),
      g(30, 0),
      g(11, 60),
      g(21, 0),
      g(31, 0),
      g(40, 0.5),
      g(41, 0),
      g(42, 2 * Math.PI),
    );
    const p = ok(importDxf(dxf([full]))).profiles[0]!;
    const exact = Math.PI * 60 * 30;
    expect(p.areaMm2).toBeLessThan(exact);
    expect(exact - p.areaMm2).toBeLessThan(2 * Math.PI * 60 * TOL);
    expect(p.boxMm[0]).toBeCloseTo(120, 1);
    expect(p.boxMm[1]).toBeCloseTo(60, 1);

    const half = ent(
      "ELLIPSE",
      "41",
      g(10, 0),
      g(20, 0),
      g(30, 0),
      g(11, 60),
      g(21, 0),
      g(31, 0),
      g(40, 0.5),
      g(41, 0),
      g(42, Math.PI),
    );
    const q = ok(importDxf(dxf([half, line("42", -60, 0, 60, 0)]))).profiles[0]!;
    expect(q.areaMm2).toBeLessThan(exact / 2);
    expect(exact / 2 - q.areaMm2).toBeLessThan(Math.PI * 60 * TOL);
    expect(q.boxMm[1]).toBeCloseTo(30, 1);
  });

  it("a rational quadratic SPLINE that is exactly a quarter circle (weights 1, √2/2, 1) closes with two LINEs", () => {
    // The quarter circle as a rational quadratic Bézier: control points (r,0), (r,r), (0,r) with
    // weights 1, cos 45°, 1 (standard NURBS conic; Piegl & Tiller, The NURBS Book, ch. 7; from memory).
    const r = 40;
    const w = Math.SQRT1_2;
    const spline = ent(
      "SPLINE",
      "50",
      g(70, 8 + 4),
      g(71, 2),
      g(72, 6),
      g(73, 3),
      g(74, 0),
      ...[0, 0, 0, 1, 1, 1].map((k) => g(40, k)),
      g(10, r),
      g(20, 0),
      g(30, 0),
      g(41, 1),
      g(10, r),
      g(20, r),
      g(30, 0),
      g(41, w),
      g(10, 0),
      g(20, r),
      g(30, 0),
      g(41, 1),
    );
    const p = ok(importDxf(dxf([spline, line("51", 0, r, 0, 0), line("52", 0, 0, r, 0)]))).profiles[0]!;
    const exact = (Math.PI * r * r) / 4;
    expect(p.areaMm2).toBeLessThanOrEqual(exact + 1e-3);
    expect(exact - p.areaMm2).toBeLessThan((Math.PI * r * TOL) / 2 + 1e-3);
    // Every curved vertex on the circle of radius 40 about the corner.
    const curved = p.points.filter(([x, y]) => x > 0.01 && y > 0.01);
    expect(curved.length).toBeGreaterThan(5);
    for (const [x, y] of curved) expect(Math.abs(Math.hypot(x, y) - r)).toBeLessThan(0.002);
  });

  it("a cubic SPLINE through clamped knots is flattened within the chord tolerance of de Boor's curve", () => {
    // A clamped cubic with control points (0,0), (30,60), (70,60), (100,0) is the Bézier with those
    // points; its peak is at t = ½: y = ¾·60 = 45 (Bernstein weights 3/8 + 3/8).
    const spline = ent(
      "SPLINE",
      "60",
      g(70, 8),
      g(71, 3),
      g(72, 8),
      g(73, 4),
      ...[0, 0, 0, 0, 1, 1, 1, 1].map((k) => g(40, k)),
      ...[
        [0, 0],
        [30, 60],
        [70, 60],
        [100, 0],
      ].flatMap(([x, y]) => [g(10, x!), g(20, y!), g(30, 0)]),
    );
    const p = ok(importDxf(dxf([spline, line("61", 100, 0, 0, 0)]))).profiles[0]!;
    expect(p.boxMm[1]).toBeGreaterThan(45 - TOL);
    expect(p.boxMm[1]).toBeLessThanOrEqual(45 + 1e-3);
    expect(p.boxMm[0]).toBeCloseTo(100, 3);
  });

  it("nests loops by containment: a frame with two windows, an island in one window is a part of its own", () => {
    const r = ok(
      importDxf(
        dxf([
          rect("A1", 0, 0, 200, 100),
          rect("A2", 10, 10, 80, 80),
          rect("A3", 110, 10, 80, 80),
          circle("A4", 50, 50, 20),
        ]),
        { fileName: "frame.dxf" },
      ),
    );
    expect(r.profiles.map((p) => p.name)).toEqual(["frame.dxf, shape 1", "frame.dxf, shape 2"]);
    const [frame, island] = r.profiles;
    expect(frame!.holes).toHaveLength(2);
    expect(frame!.areaMm2).toBeCloseTo(200 * 100 - 2 * 80 * 80, 6);
    expect(island!.holes).toHaveLength(0);
    expect(island!.boxMm[0]).toBeCloseTo(40, 1);
    // Outer loops anticlockwise, holes clockwise, and each a valid outline.
    expect(polygonArea(frame!.points)).toBeGreaterThan(0);
    for (const h of frame!.holes) expect(polygonArea(h)).toBeLessThan(0);
    expect(checkOutline(frame!.points, frame!.holes)).toBeNull();
  });

  it("reads an old-style POLYLINE with VERTEX entities", () => {
    const v = (x: number, y: number) => [g(0, "VERTEX"), g(8, "0"), g(10, x), g(20, y), g(30, 0)].join("\n");
    const poly = [
      ent("POLYLINE", "70", g(66, 1), g(10, 0), g(20, 0), g(30, 0), g(70, 1)),
      v(0, 0),
      v(30, 0),
      v(30, 20),
      v(0, 20),
      [g(0, "SEQEND"), g(8, "0")].join("\n"),
    ].join("\n");
    const p = ok(importDxf(dxf([poly]))).profiles[0]!;
    expect(p.areaMm2).toBe(600);
  });

  it("mirrors an ARC drawn with extrusion (0, 0, −1) as the arbitrary-axis rule says", () => {
    // With normal −Z the object x axis is world −x: an arc centred at object (−50, 0) lies about world (50, 0).
    const flipped = ent("CIRCLE", "80", g(10, -50), g(20, 0), g(30, 0), g(40, 10), g(210, 0), g(220, 0), g(230, -1));
    const r = ok(importDxf(dxf([flipped])));
    expect(r.profiles[0]!.originMm[0]).toBeCloseTo(40, 6);
  });
});

describe("DXF import: units", () => {
  it("$INSUNITS 1 is inches: every length × 25.4 (exact, 1959 agreement)", () => {
    const r = ok(importDxf(dxf([rect("1", 0, 0, 4, 2)], 1)));
    expect(r.profiles[0]!.boxMm).toEqual([101.6, 50.8]);
    expect(r.profiles[0]!.areaMm2).toBeCloseTo(101.6 * 50.8, 6);
    expect(r.unit).toEqual({ name: "in", mmPerUnit: 25.4, from: "file" });
  });

  it("cm, m and ft by their codes (5, 6, 2)", () => {
    expect(ok(importDxf(dxf([rect("1", 0, 0, 3, 1)], 5))).profiles[0]!.boxMm).toEqual([30, 10]);
    expect(ok(importDxf(dxf([rect("1", 0, 0, 0.5, 0.25)], 6))).profiles[0]!.boxMm).toEqual([500, 250]);
    expect(ok(importDxf(dxf([rect("1", 0, 0, 1, 0.5)], 2))).profiles[0]!.boxMm).toEqual([304.8, 152.4]);
  });

  it("asks for the unit when the drawing has none or says unitless, and takes the one given", () => {
    for (const units of [null, 0]) {
      const r = refused(importDxf(dxf([rect("1", 0, 0, 4, 2)], units)));
      expect(r.needsUnit).toBe(true);
      expect(r.errors[0]).toMatchObject({ field: "unit" });
      expect(r.errors[0]!.message).toMatch(/does not say its unit/);
    }
    const given = ok(importDxf(dxf([rect("1", 0, 0, 4, 2)], null), { unit: "in" }));
    expect(given.profiles[0]!.boxMm).toEqual([101.6, 50.8]);
    expect(given.unit.from).toBe("given");
  });

  it("the file's own unit wins over a given one, with a note", () => {
    const r = ok(importDxf(dxf([rect("1", 0, 0, 4, 2)], 4), { unit: "in" }));
    expect(r.profiles[0]!.boxMm).toEqual([4, 2]);
    expect(r.notes.join(" ")).toMatch(/says it is in millimetres/);
  });
});

describe("DXF import: bad drawings are refused with the entity named", () => {
  it("an open loop: its entities, the gap in mm and where (in inches too for an inch drawing)", () => {
    const r = refused(importDxf(dxf([line("AA", 0, 0, 2, 0), line("AB", 2, 0, 2, 1), line("AC", 2, 1, 0, 1)], 1)));
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]!.message).toBe(
      "Open outline: LINE (handle AA), LINE (handle AB) and LINE (handle AC) do not close — its ends are 25.40 mm apart, at (0, 0) mm, (0, 0) in and (0, 25.4) mm, (0, 1) in. Close the gap in the drawing (ends within 0.05 mm are joined).",
    );
    expect(r.errors[0]!.subject).toBe("LINE (handle AA)");
  });

  it("crossing edges: a bow-tie polyline names itself and where it crosses", () => {
    const r = refused(
      importDxf(
        dxf([
          lwpoly(
            "B7",
            [
              [0, 0],
              [10, 10],
              [10, 0],
              [0, 6],
            ],
            true,
          ),
        ]),
      ),
    );
    // Edge (0,0)→(10,10) meets edge (10,0)→(0,6) where x = 6 − 0.6x: x = y = 3.75 (hand-worked).
    expect(r.errors[0]!.message).toMatch(
      /^LWPOLYLINE \(handle B7\) crosses or touches itself near \(3\.75, 3\.75\) mm/,
    );
  });

  it("two separate shapes that overlap: both named", () => {
    const r = refused(importDxf(dxf([rect("C1", 0, 0, 10, 10), circle("C2", 10, 5, 3)])));
    expect(r.errors[0]!.message).toMatch(
      /(LWPOLYLINE \(handle C1\) and CIRCLE \(handle C2\)|CIRCLE \(handle C2\) and LWPOLYLINE \(handle C1\)) cross or touch/,
    );
  });

  it("zero area: a closed polyline whose points lie on one line", () => {
    const r = refused(
      importDxf(
        dxf([
          lwpoly(
            "D4",
            [
              [0, 0],
              [10, 0],
              [20, 0],
            ],
            true,
          ),
        ]),
      ),
    );
    expect(r.errors[0]!.message).toMatch(/^LWPOLYLINE \(handle D4\) encloses no area \(0\.000 mm²\)/);
  });

  it("no closed shape at all: only text and a point; the ignored kinds are listed with their handles", () => {
    const r = refused(
      importDxf(
        dxf([ent("TEXT", "E1", g(10, 0), g(20, 0), g(40, 5), g(1, "hello")), ent("POINT", "E2", g(10, 1), g(20, 1))]),
      ),
    );
    expect(r.errors[0]!.message).toMatch(/holds no closed shape/);
    expect(r.notes.join(" ")).toMatch(
      /Ignored, not outlines this reader takes: 1 TEXT \(handle E1\); 1 POINT \(handle E2\)/,
    );
  });

  it("unsupported kinds next to good shapes are ignored with a note, the shapes still come in", () => {
    const hatch = ent("HATCH", "F9", g(10, 0), g(20, 0), g(30, 0), g(2, "SOLID"));
    const r = ok(importDxf(dxf([rect("F1", 0, 0, 10, 10), hatch])));
    expect(r.profiles).toHaveLength(1);
    expect(r.notes.join(" ")).toMatch(/1 HATCH \(handle F9\)/);
  });

  it("not a DXF, a binary DXF, an entity off the XY plane", () => {
    expect(refused(importDxf("<svg></svg>")).errors[0]!.message).toMatch(/not a DXF drawing/);
    expect(refused(importDxf("AutoCAD Binary DXF\r\n\x1a\0")).errors[0]!.message).toMatch(/binary DXF/);
    const tilted = ent("CIRCLE", "G1", g(10, 0), g(20, 0), g(30, 0), g(40, 5), g(210, 1), g(220, 0), g(230, 0));
    expect(refused(importDxf(dxf([tilted]))).errors[0]!.message).toMatch(
      /^CIRCLE \(handle G1\) is not drawn flat in the XY plane/,
    );
  });
});
