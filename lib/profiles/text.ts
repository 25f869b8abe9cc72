/**
 * Profiles from text: the outlines of letters in a font (read with opentype.js: TTF, OTF or WOFF;
 * not WOFF2), at a height in mm, with letter spacing in mm. Pure: the font's bytes are handed in.
 *
 * Rules:
 * - height: "cap" makes a capital H exactly `heightMm` tall (the font's OS/2 cap height, else its
 *   H); "overall" makes the typed text, from its lowest to its highest ink, exactly `heightMm`;
 * - letters are laid out by their advance widths (and the font's kern pairs where opentype.js
 *   finds them), plus `spacingMm` between neighbours (negative closes them up);
 * - glyph contours are filled by the nonzero rule (as TrueType and CFF outlines are drawn) and
 *   united with clipper2, so overlapping contours merge and counters ("O", "A", "B") become holes;
 *   curves are flattened to the chord tolerance;
 * - each letter: every letter its own part; a letter of several islands ("i", "j", "!", "ä")
 *   gives one part per island ("Letter i, piece 1 of 2");
 * - joined: all letters united into one outline; letters that still stand apart are tied by a base
 *   rail under the baseline, RAIL_BELOW of the height deep and overlapping the letters' feet by
 *   RAIL_OVERLAP (common practice for free-standing sign letters, no source); pieces the rail does
 *   not reach (the dot of an i, accents) stay parts of their own, and a note says so.
 */
import * as opentypeNs from "opentype.js";
import {
  CHORD_TOLERANCE_MM,
  cubicPoints,
  fail,
  nestLoops,
  placeFormatter,
  profilesFromLoops,
  quadPoints,
  type ImportResult,
  type Loop,
} from "./import-common";
import { fillRegions } from "./import-svg";
import type { Point } from "./polygon";

// opentype.js is UMD for Node (its API on `default`) and plain ESM for the bundler (named exports).
const opentype: typeof opentypeNs = (opentypeNs as unknown as { default?: typeof opentypeNs }).default ?? opentypeNs;

export type Font = opentypeNs.Font;

/** The base rail of joined text: depth below the baseline and overlap above it, as shares of the height. */
export const RAIL_BELOW = 0.1;
export const RAIL_OVERLAP = 0.02;
export const MAX_TEXT_LENGTH = 60;

export interface TextOptions {
  text: string;
  heightMm: number;
  /** Extra space between neighbouring letters, mm (negative: closer). */
  spacingMm?: number;
  /** One profile for the whole word (see the rail rule) instead of one per letter. */
  joined?: boolean;
  heightOf?: "cap" | "overall";
  /** For the parts' source line: "Inter Bold", "shop-font.ttf". */
  fontName?: string;
  chordToleranceMm?: number;
}

/**
 * Reads a font file's bytes; WOFF2 and anything unreadable come back as a message.
 *
 *   const r = parseFont(bytes)  // { font } or { error: "…" }
 */
export function parseFont(bytes: ArrayBuffer | Uint8Array): { font: Font } | { error: string } {
  const u8 = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  const magic = String.fromCharCode(...u8.slice(0, 4));
  if (magic === "wOF2") return { error: "WOFF2 fonts are not read; use the font as TTF, OTF or WOFF." };
  if (!["wOFF", "OTTO", "true", "\0\x01\0\0"].includes(magic))
    return { error: "This is not a font file Blockyard reads (TTF, OTF or WOFF)." };
  try {
    const ab = u8.buffer.slice(u8.byteOffset, u8.byteOffset + u8.byteLength) as ArrayBuffer;
    const font = opentype.parse(ab);
    if (!font.glyphs || font.glyphs.length < 2 || !(font.unitsPerEm > 0))
      return { error: "The font file holds no letters." };
    return { font };
  } catch (e) {
    return { error: `The font file could not be read: ${(e as Error).message.slice(0, 160)}.` };
  }
}

/** A font's name for people: "Inter Bold". */
export function fontName(font: Font, fallback: string): string {
  const names = font.names as unknown as Record<string, Record<string, Record<string, string>> | undefined>;
  for (const table of [names.windows, names.macintosh, names.unicode, names as never]) {
    const full = table?.fullName?.en;
    if (full) return full.slice(0, 80);
  }
  return fallback;
}

/** The contours of a glyph in font units (y up), flattened, each closed (first point not repeated). */
function glyphContours(glyph: opentypeNs.Glyph, tol: number): Point[][] {
  const out: Point[][] = [];
  let cur: Point[] = [];
  const close = () => {
    if (cur.length >= 3) {
      const [a, b] = [cur[0]!, cur[cur.length - 1]!];
      if (a[0] === b[0] && a[1] === b[1]) cur.pop();
      if (cur.length >= 3) out.push(cur);
    }
    cur = [];
  };
  for (const c of glyph.path.commands) {
    const here = cur[cur.length - 1] ?? [0, 0];
    switch (c.type) {
      case "M":
        close();
        cur = [[c.x, c.y]];
        break;
      case "L":
        cur.push([c.x, c.y]);
        break;
      case "Q":
        cur.push(...quadPoints(here, [c.x1, c.y1], [c.x, c.y], tol));
        break;
      case "C":
        cur.push(...cubicPoints(here, [c.x1, c.y1], [c.x2, c.y2], [c.x, c.y], tol));
        break;
      case "Z":
        close();
        break;
    }
  }
  close();
  return out;
}

function capHeight(font: Font): number {
  const os2 = (font.tables as { os2?: { sCapHeight?: number } }).os2;
  if (os2?.sCapHeight && os2.sCapHeight > 0) return os2.sCapHeight;
  const h = font.charToGlyph("H");
  const box = h.index ? h.getBoundingBox() : null;
  if (box && box.y2 > 0) return box.y2;
  return font.ascender * 0.7;
}

const rect = (x0: number, y0: number, x1: number, y1: number): Point[] => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
];

/**
 * Text as profiles in mm (baseline at y = 0 before each profile is moved to 0, 0).
 *
 *   textProfiles(font, { text: "OPEN", heightMm: 300, spacingMm: 10 })
 *   // 4 profiles: "Letter O" (1 hole), "Letter P" (1 hole), "Letter E", "Letter N"
 *   textProfiles(font, { text: "OPEN", heightMm: 300, joined: true })  // one profile on a base rail
 */
export function textProfiles(font: Font, o: TextOptions): ImportResult {
  const tol = o.chordToleranceMm ?? CHORD_TOLERANCE_MM;
  const text = o.text.trim();
  const chars = Array.from(text);
  const name = o.fontName ?? fontName(font, "the font");
  if (!chars.length) return fail([{ message: "Type the text to cut.", field: "text" }]);
  if (chars.length > MAX_TEXT_LENGTH)
    return fail([
      { message: `At most ${MAX_TEXT_LENGTH} characters at a time (this is ${chars.length}).`, field: "text" },
    ]);
  if (chars.some((c) => /[\p{Cc}\u2028\u2029]/u.test(c)))
    return fail([{ message: "One line of text only: no line breaks or control characters.", field: "text" }]);
  const missing = [...new Set(chars.filter((c) => !/\s/.test(c) && font.charToGlyph(c).index === 0))];
  if (missing.length)
    return fail([
      {
        message: `${name} has no ${missing.length > 1 ? "letters" : "letter"} for ${missing.map((c) => `“${c}”`).join(", ")}.`,
        field: "text",
      },
    ]);
  if (!(o.heightMm > 0)) return fail([{ message: "The height must be more than 0 mm.", field: "text" }]);

  const glyphs = chars.map((c) => font.charToGlyph(c));
  let scale: number;
  if (o.heightOf === "overall") {
    let lo = Infinity,
      hi = -Infinity;
    for (const g of glyphs) {
      if (!g.path.commands.length) continue;
      const b = g.getBoundingBox();
      lo = Math.min(lo, b.y1);
      hi = Math.max(hi, b.y2);
    }
    if (!(hi > lo)) return fail([{ message: "The text has no letters to cut, only spaces.", field: "text" }]);
    scale = o.heightMm / (hi - lo);
  } else {
    scale = o.heightMm / capHeight(font);
  }
  const spacing = o.spacingMm ?? 0;
  const unitsTol = tol / scale;

  // Lay out: each letter's filled regions in mm, baseline y = 0.
  const letters: { char: string; regions: Point[][] }[] = [];
  let pen = 0;
  glyphs.forEach((g, i) => {
    if (i > 0) {
      let kern = 0;
      try {
        kern = font.getKerningValue(glyphs[i - 1]!, g) || 0;
      } catch {
        kern = 0;
      }
      pen += kern * scale + spacing;
    }
    const contours = glyphContours(g, unitsTol).map((c) => c.map(([x, y]): Point => [pen + x * scale, y * scale]));
    if (contours.length) letters.push({ char: chars[i]!, regions: fillRegions(contours, "nonzero") });
    pen += (g.advanceWidth ?? 0) * scale;
  });
  if (!letters.length) return fail([{ message: "The text has no letters to cut, only spaces.", field: "text" }]);

  const notes: string[] = [];
  const source = (what: string) =>
    `text “${text}” in ${name}, ${o.heightOf === "overall" ? "overall" : "capital"} height ${round(o.heightMm)} mm${what}`;
  const place = placeFormatter();
  const asLoops = (regions: Point[][], label: string): Loop[] =>
    regions.map((pts) => ({ pts, from: pts.map(() => label) }));

  if (!o.joined) {
    const profiles = [];
    for (const l of letters) {
      const made = profilesFromLoops(asLoops(l.regions, `letter “${l.char}”`), {
        name: (i, n) => (n === 1 ? `Letter ${l.char}` : `Letter ${l.char}, piece ${i + 1} of ${n}`),
        source: source(`, letter ${l.char}`),
        place,
        tol,
      });
      notes.push(...made.notes);
      if (made.errors.length) return fail(made.errors, notes);
      profiles.push(...made.profiles);
    }
    if (spacing < 0) notes.push("With negative spacing the letters may overlap; each is still its own part.");
    return { ok: true, profiles, unit: { name: "mm", mmPerUnit: 1, from: "given" }, notes };
  }

  // Joined: unite all letters; tie islands with a base rail when they stand apart.
  const all = letters.flatMap((l) => l.regions);
  let regions = fillRegions(all, "nonzero");
  const outers = (rs: Point[][]) => nestLoops(asLoops(rs, "")).length;
  if (outers(regions) > 1) {
    let x0 = Infinity,
      x1 = -Infinity;
    for (const r of all)
      for (const [x] of r) {
        x0 = Math.min(x0, x);
        x1 = Math.max(x1, x);
      }
    const h = o.heightMm;
    regions = fillRegions([...all, rect(x0, -RAIL_BELOW * h, x1, RAIL_OVERLAP * h)], "nonzero");
    notes.push(
      `The letters do not all touch: a base rail ${round(RAIL_BELOW * h + RAIL_OVERLAP * h)} mm deep joins them under the baseline.`,
    );
    const left = outers(regions);
    if (left > 1)
      notes.push(
        `${left - 1} ${left - 1 === 1 ? "piece stands" : "pieces stand"} clear of the rail (a dot or an accent) and ${left - 1 === 1 ? "is its own part" : "are parts of their own"}.`,
      );
  }
  const made = profilesFromLoops(asLoops(regions, `text “${text}”`), {
    name: (i, n) => (n === 1 ? `“${text}”` : `“${text}”, piece ${i + 1} of ${n}`),
    source: source(", joined"),
    place,
    tol,
  });
  notes.push(...made.notes);
  if (made.errors.length) return fail(made.errors, notes);
  return { ok: true, profiles: made.profiles, unit: { name: "mm", mmPerUnit: 1, from: "given" }, notes };
}

const round = (v: number) => Math.round(v * 100) / 100;
