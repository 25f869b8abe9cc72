import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { HttpError } from "@/lib/errors";
import { readFormUpload } from "@/lib/upload";
import { SHIPPED_FONT, shippedFont } from "@/lib/shipped-font";
import { DRAWING_UNITS, isDrawingUnit, type ImportResult } from "@/lib/profiles/import-common";
import { importDxf } from "@/lib/profiles/import-dxf";
import { importSvg, importSvgPath } from "@/lib/profiles/import-svg";
import { MAX_TEXT_LENGTH, fontName, parseFont, textProfiles, type Font } from "@/lib/profiles/text";

/** A drawing or font file: at most 5 MB; the whole form at most 6 MB. */
const MAX_FILE_BYTES = 5 * 1024 * 1024;
const MAX_FORM_BYTES = 6 * 1024 * 1024;
const MAX_PATH_CHARS = 200_000;

const FONT_MAGIC = ["wOFF", "wOF2", "OTTO", "true", "\0\x01\0\0"];

/**
 * `POST /api/profiles/import` (multipart/form-data) turns a drawing or text into profiles WITHOUT
 * storing anything, so the planner sees them to scale before adding parts:
 * - `file`: a DXF or SVG drawing; or `svgPath`: a bare SVG path `d`;
 * - or `text` with `heightMm`, `spacingMm?`, `joined?` ("1"), `heightOf?` ("cap" | "overall") and
 *   an optional `font` file (TTF, OTF or WOFF; the shipped Inter Bold otherwise);
 * - `unit?` (mm, cm, m, in, ft): the drawing's unit when the file does not say it.
 * → 200 `{ profiles: [{ name, points, holes, source, boxMm, areaMm2, originMm }], unit, notes }`, or
 * 422 `{ error, errors: [{ message, subject?, at?, field? }], fields, notes, needsUnit }` naming the
 * entity, element or letter.
 */
export const POST = api("POST /api/profiles/import", async ({ req }) => {
  const form = await readFormUpload(req, MAX_FORM_BYTES, 'a "file" (DXF or SVG), an "svgPath", or "text"');
  const str = (k: string) => {
    const v = form.get(k);
    return typeof v === "string" ? v : "";
  };
  const file = (k: string) => {
    const v = form.get(k);
    return v && typeof v !== "string" && v.size > 0 ? v : null;
  };
  const fields: Record<string, string> = {};

  const unitText = str("unit").trim();
  if (unitText && !isDrawingUnit(unitText)) fields.unit = `The unit is one of ${DRAWING_UNITS.join(", ")}.`;
  const unit = isDrawingUnit(unitText) ? unitText : undefined;

  const text = str("text");
  const svgPath = str("svgPath");
  const drawing = file("file");
  let result: ImportResult;

  if (text.trim()) {
    const height = Number(str("heightMm"));
    if (!str("heightMm").trim() || !Number.isFinite(height) || height <= 0 || height > 5_000)
      fields.heightMm = "Give the letter height in mm: more than 0 and at most 5,000.";
    const spacingText = str("spacingMm").trim();
    const spacing = spacingText ? Number(spacingText) : 0;
    if (!Number.isFinite(spacing) || Math.abs(spacing) > 1_000)
      fields.spacingMm = "Letter spacing is a number of mm, from −1,000 to 1,000.";
    const heightOf = str("heightOf").trim() || "cap";
    if (heightOf !== "cap" && heightOf !== "overall")
      fields.heightOf = "The height is the capital height (cap) or overall.";
    if (text.length > MAX_TEXT_LENGTH * 2) fields.text = `At most ${MAX_TEXT_LENGTH} characters at a time.`;
    if (Object.keys(fields).length) throw new HttpError(400, "Some fields need attention.", fields);

    const upload = file("font") ?? drawing;
    let font: Font;
    let name: string;
    if (upload) {
      if (upload.size > MAX_FILE_BYTES)
        throw new HttpError(413, "The font file is larger than 5 MB.", { font: "At most 5 MB." });
      const got = parseFont(new Uint8Array(await upload.arrayBuffer()));
      if ("error" in got)
        return refused({ ok: false, needsUnit: false, errors: [{ message: got.error, field: "font" }], notes: [] });
      font = got.font;
      name = fontName(font, upload.name.slice(0, 80) || "the uploaded font");
    } else {
      font = await shippedFont();
      name = SHIPPED_FONT.name;
    }
    result = textProfiles(font, {
      text,
      heightMm: height,
      spacingMm: spacing,
      joined: ["1", "true", "on", "yes"].includes(str("joined").trim().toLowerCase()),
      heightOf: heightOf as "cap" | "overall",
      fontName: name,
    });
    if (result.ok && !upload) result.notes.push(`Letters in ${SHIPPED_FONT.name} (${SHIPPED_FONT.licence}).`);
  } else if (svgPath.trim()) {
    if (Object.keys(fields).length) throw new HttpError(400, "Some fields need attention.", fields);
    if (svgPath.length > MAX_PATH_CHARS)
      throw new HttpError(413, "The path is too long.", {
        svgPath: `At most ${MAX_PATH_CHARS.toLocaleString("en")} characters.`,
      });
    result = importSvgPath(svgPath, { unit });
  } else if (drawing) {
    if (Object.keys(fields).length) throw new HttpError(400, "Some fields need attention.", fields);
    if (drawing.size > MAX_FILE_BYTES)
      throw new HttpError(413, "The drawing is larger than 5 MB.", {
        file: "At most 5 MB: simplify the drawing or split it.",
      });
    const bytes = new Uint8Array(await drawing.arrayBuffer());
    const fileName = drawing.name.replace(/[\\/]/g, "_").slice(0, 120);
    const head = new TextDecoder("utf-8", { fatal: false }).decode(bytes.subarray(0, 64 * 1024));
    const magic = String.fromCharCode(...bytes.subarray(0, 4));
    const body = () => new TextDecoder("utf-8", { fatal: false }).decode(bytes);
    if (
      /\.dxf$/i.test(fileName) ||
      /^\uFEFF?\s*(999\s*[\r\n]+[^\r\n]*[\r\n]+\s*)*0\s*[\r\n]+\s*SECTION/.test(head) ||
      /^AutoCAD Binary DXF/.test(head)
    ) {
      result = importDxf(body(), { fileName, unit });
    } else if (/\.svg$/i.test(fileName) || /<svg[\s>]/i.test(head)) {
      result = importSvg(body(), { fileName, unit });
    } else if (FONT_MAGIC.includes(magic)) {
      result = {
        ok: false,
        needsUnit: false,
        errors: [
          { message: "This is a font file: choose the Text shape and type the letters to cut in it.", field: "file" },
        ],
        notes: [],
      };
    } else {
      result = {
        ok: false,
        needsUnit: false,
        errors: [{ message: "This file is neither a DXF nor an SVG drawing.", field: "file" }],
        notes: [],
      };
    }
  } else {
    throw new HttpError(400, "Some fields need attention.", {
      ...fields,
      file: "Choose a DXF or SVG file, paste an SVG path, or type text.",
    });
  }

  if (!result.ok) return refused(result);
  return { profiles: result.profiles, unit: result.unit, notes: result.notes };
});

/** 422 with every problem, and the first message of each form field for the form to show beside it. */
function refused(r: Extract<ImportResult, { ok: false }>): NextResponse {
  const fields: Record<string, string> = {};
  for (const e of r.errors) fields[e.field ?? "file"] ??= e.message;
  const first = r.errors[0]?.message ?? "The drawing cannot be used.";
  return NextResponse.json(
    {
      error: r.errors.length > 1 ? `${first} (and ${r.errors.length - 1} more)` : first,
      errors: r.errors,
      fields,
      notes: r.notes,
      needsUnit: r.needsUnit,
    },
    { status: 422 },
  );
}
