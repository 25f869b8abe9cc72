/**
 * Text outlines: letters of the shipped font (Inter Bold, SIL Open Font License 1.1, from
 * @fontsource/inter) and of a small font made here with opentype.js (as a shop's upload).
 */
import fs from "node:fs";
import { createRequire } from "node:module";
import opentype from "opentype.js";
import { describe, expect, it } from "vitest";
import { CHORD_TOLERANCE_MM } from "@/lib/profiles/import-common";
import { RAIL_BELOW, RAIL_OVERLAP, parseFont, textProfiles, type Font } from "@/lib/profiles/text";
import { checkOutline } from "@/lib/profiles/polygon";

const require = createRequire(import.meta.url);
const bytes = fs.readFileSync(require.resolve("@fontsource/inter/files/inter-latin-700-normal.woff"));
const parsed = parseFont(bytes);
if (!("font" in parsed)) throw new Error(parsed.error);
const inter: Font = parsed.font;

function ok(r: ReturnType<typeof textProfiles>) {
  if (!r.ok) throw new Error(`expected profiles, got: ${r.errors.map((e) => e.message).join(" | ")}`);
  return r;
}

describe("text: letters of the shipped font", () => {
  it("“OPEN”, each letter its own part: four parts, holes in O and P only, every outline valid", () => {
    const r = ok(textProfiles(inter, { text: "OPEN", heightMm: 200, spacingMm: 10 }));
    expect(r.profiles.map((p) => [p.name, p.holes.length])).toEqual([
      ["Letter O", 1],
      ["Letter P", 1],
      ["Letter E", 0],
      ["Letter N", 0],
    ]);
    for (const p of r.profiles) expect(checkOutline(p.points, p.holes)).toBeNull();
    expect(r.profiles[0]!.source).toBe("text “OPEN” in Inter Bold, capital height 200 mm, letter O");
  });

  it("holes: A one, B two, L none", () => {
    const holes = (t: string) =>
      ok(textProfiles(inter, { text: t, heightMm: 100 })).profiles.map((p) => p.holes.length);
    expect(holes("A")).toEqual([1]);
    expect(holes("B")).toEqual([2]);
    expect(holes("L")).toEqual([0]);
  });

  it("capital height: L and H are exactly the height asked; O overshoots a little (common practice in type design, no source)", () => {
    const [L, H, O] = ok(textProfiles(inter, { text: "LHO", heightMm: 300 })).profiles;
    expect(L!.boxMm[1]).toBeCloseTo(300, 2);
    expect(H!.boxMm[1]).toBeCloseTo(300, 2);
    expect(O!.boxMm[1]).toBeGreaterThan(300);
    expect(O!.boxMm[1]).toBeLessThan(300 * 1.04);
    // Flat-topped letters sit on the baseline: their box starts at y = 0.
    expect(L!.originMm[1]).toBeCloseTo(0, 6);
  });

  it("overall height: the text from its lowest to its highest ink is the height asked", () => {
    const r = ok(textProfiles(inter, { text: "Hg", heightMm: 100, heightOf: "overall" }));
    const lo = Math.min(...r.profiles.map((p) => p.originMm[1]));
    const hi = Math.max(...r.profiles.map((p) => p.originMm[1] + p.boxMm[1]));
    expect(hi - lo).toBeGreaterThan(100 - 2 * CHORD_TOLERANCE_MM);
    expect(hi - lo).toBeLessThanOrEqual(100 + 1e-6);
  });

  it("letter spacing moves each next letter by exactly that many mm", () => {
    const tight = ok(textProfiles(inter, { text: "LL", heightMm: 100 })).profiles;
    const loose = ok(textProfiles(inter, { text: "LL", heightMm: 100, spacingMm: 25 })).profiles;
    expect(loose[1]!.originMm[0] - tight[1]!.originMm[0]).toBeCloseTo(25, 6);
    expect(loose[0]!.originMm[0]).toBeCloseTo(tight[0]!.originMm[0], 6);
  });

  it("“i” has two islands: two parts with a clear name", () => {
    const r = ok(textProfiles(inter, { text: "i", heightMm: 100 }));
    expect(r.profiles.map((p) => p.name)).toEqual(["Letter i, piece 1 of 2", "Letter i, piece 2 of 2"]);
  });

  it("joined: “OPEN” apart becomes one part on a base rail; holes: the O and P counters and the N's foot notch the rail closes", () => {
    const each = ok(textProfiles(inter, { text: "OPEN", heightMm: 200, spacingMm: 10 })).profiles;
    const r = ok(textProfiles(inter, { text: "OPEN", heightMm: 200, spacingMm: 10, joined: true }));
    expect(r.profiles).toHaveLength(1);
    const word = r.profiles[0]!;
    expect(word.name).toBe("“OPEN”");
    expect(word.holes).toHaveLength(3);
    expect(checkOutline(word.points, word.holes)).toBeNull();
    // The rail hangs RAIL_BELOW × height under the baseline.
    expect(word.originMm[1]).toBeCloseTo(-RAIL_BELOW * 200, 3);
    // More foam than the letters alone, less than letters plus the whole rail.
    const letters = each.reduce((s, p) => s + p.areaMm2, 0);
    const railWidth = word.boxMm[0];
    expect(word.areaMm2).toBeGreaterThan(letters);
    expect(word.areaMm2).toBeLessThan(letters + railWidth * (RAIL_BELOW + RAIL_OVERLAP) * 200);
    expect(r.notes.join(" ")).toMatch(/base rail 24 mm deep/);
  });

  it("joined letters that overlap (negative spacing) unite with no rail", () => {
    const r = ok(textProfiles(inter, { text: "OO", heightMm: 100, spacingMm: -20, joined: true }));
    expect(r.profiles).toHaveLength(1);
    expect(r.profiles[0]!.holes).toHaveLength(2);
    expect(r.profiles[0]!.originMm[1]).toBeGreaterThan(-5); // no rail under the baseline
    expect(r.notes.join(" ")).not.toMatch(/rail/);
  });

  it("refuses a letter the font lacks, line breaks and empty text, naming the text field", () => {
    const r = textProfiles(inter, { text: "OPEN 日", heightMm: 100 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]).toEqual({ message: "Inter Bold has no letter for “日”.", field: "text" });
    const nl = textProfiles(inter, { text: "A\nB", heightMm: 100 });
    expect(!nl.ok && nl.errors[0]!.message).toMatch(/One line of text only/);
    const empty = textProfiles(inter, { text: "   ", heightMm: 100 });
    expect(!empty.ok && empty.errors[0]!.message).toMatch(/Type the text/);
  });
});

describe("text: an uploaded font", () => {
  /** A font with one letter “O” drawn as a 600-unit square with a 200-unit square counter. */
  function squareFont(): ArrayBuffer {
    const o = new opentype.Path();
    // Outer anticlockwise… and the counter the other way round, as outline fonts draw holes.
    o.moveTo(100, 0);
    o.lineTo(700, 0);
    o.lineTo(700, 600);
    o.lineTo(100, 600);
    o.close();
    o.moveTo(300, 200);
    o.lineTo(300, 400);
    o.lineTo(500, 400);
    o.lineTo(500, 200);
    o.close();
    const notdef = new opentype.Glyph({ name: ".notdef", unicode: 0, advanceWidth: 500, path: new opentype.Path() });
    const glyphO = new opentype.Glyph({ name: "O", unicode: 79, advanceWidth: 800, path: o });
    const h = new opentype.Path();
    h.moveTo(0, 0);
    h.lineTo(10, 0);
    h.lineTo(10, 600);
    h.lineTo(0, 600);
    h.close();
    const glyphH = new opentype.Glyph({ name: "H", unicode: 72, advanceWidth: 100, path: h });
    const font = new opentype.Font({
      familyName: "Test Square",
      styleName: "Regular",
      unitsPerEm: 1000,
      ascender: 800,
      descender: -200,
      glyphs: [notdef, glyphO, glyphH],
    });
    return font.toArrayBuffer();
  }

  it("reads an OTF written here: the O is 60 × 60 mm at capital height 60 with a 20 mm square hole (3200 mm²)", () => {
    const got = parseFont(squareFont());
    if (!("font" in got)) throw new Error(got.error);
    // Cap height taken from the H (600 units): 60 mm makes 1 unit 0.1 mm; 600² − 200² units = 3200 mm².
    const r = ok(textProfiles(got.font, { text: "O", heightMm: 60, fontName: "square.otf" }));
    const p = r.profiles[0]!;
    expect(p.boxMm).toEqual([60, 60]);
    expect(p.holes).toHaveLength(1);
    expect(p.areaMm2).toBeCloseTo(3600 - 400, 6);
    expect(p.source).toMatch(/in square\.otf/);
  });

  it("refuses WOFF2 and files that are not fonts", () => {
    expect(parseFont(new TextEncoder().encode("wOF2\0\0\0\0"))).toEqual({
      error: "WOFF2 fonts are not read; use the font as TTF, OTF or WOFF.",
    });
    expect(parseFont(new TextEncoder().encode("<svg></svg>"))).toEqual({
      error: "This is not a font file Blockyard reads (TTF, OTF or WOFF).",
    });
    expect("error" in parseFont(new TextEncoder().encode("OTTO garbage that is not a font"))).toBe(true);
  });
});
