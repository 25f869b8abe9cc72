import Papa from "papaparse";
import { NUL_REFUSED } from "./errors";

/**
 * CSV out: a cell that a spreadsheet would run as a formula (=, +, -, @, tab, CR at the start)
 * gets a leading apostrophe. Numbers stay numbers.
 *
 *   toCsv([{ code: "=cmd", m3: -1.5 }], ["code", "m3"])  // "code,m3\r\n'=cmd,-1.5"
 */
export function toCsv<T extends Record<string, unknown>>(rows: T[], columns: (keyof T & string)[]): string {
  const safe = rows.map((r) => columns.map((c) => escapeCell(r[c])));
  return Papa.unparse({ fields: columns, data: safe }, { newline: "\r\n" });
}

export function escapeCell(v: unknown): string | number {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? v : "";
  if (typeof v === "boolean") return v ? "yes" : "no";
  const s = String(v);
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

export function csvResponse(csv: string, fileName: string): Response {
  return new Response(`\uFEFF${csv}`, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName.replace(/[^\w.-]/g, "_")}"`,
      "cache-control": "no-store",
    },
  });
}

export interface CsvProblem {
  row: number; // as a spreadsheet numbers it: the header is row 1
  column?: string;
  message: string;
}

/** The one-line `error` of a refused import (its 422 answer is `{ error, problems, … }` like every 4xx). */
export function problemSummary(problems: CsvProblem[]): string {
  const first = problems[0];
  const where = first
    ? ` First: row ${first.row}${first.column ? `, column “${first.column}”` : ""}: ${first.message}`
    : "";
  return `The file has ${problems.length} problem${problems.length === 1 ? "" : "s"}; nothing was imported.${where}`;
}

export interface ParsedCsv {
  headers: string[];
  rows: Record<string, string>[];
  /** Each row's number as a spreadsheet shows it (header = 1; blank rows, skipped, still count). */
  rowNumbers: number[];
  problems: CsvProblem[];
  /** Data rows read before parsing stopped: at most `maxRows + 1` (one past the limit shows it was passed). */
  rowsRead: number;
}

/**
 * CSV in: bytes must be UTF-8 (a BOM is fine); headers are trimmed and lower-cased; every missing
 * required header and every unknown header is a problem on row 1. Parsing stops at the first row
 * past `maxRows`: a file over the limit is refused whole (no rows returned, one problem naming
 * the limit) without reading the rest of it.
 */
export function parseCsv(
  bytes: Uint8Array,
  spec: { required: string[]; optional: string[]; maxRows: number },
): ParsedCsv {
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return {
      headers: [],
      rows: [],
      rowNumbers: [],
      rowsRead: 0,
      problems: [
        { row: 1, message: "The file is not UTF-8 text. Save it from your spreadsheet as “CSV UTF-8” and try again." },
      ],
    };
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (!text.trim())
    return {
      headers: [],
      rows: [],
      rowNumbers: [],
      rowsRead: 0,
      problems: [{ row: 1, message: "The file is empty." }],
    };
  // Papaparse guesses the delimiter and line ending from the first rows, but splits the whole text
  // once per candidate delimiter to do so: guess them from the first 64 KB (its first rows) instead.
  const guessed = Papa.parse<string[]>(text.slice(0, 64 * 1024), { preview: 10, skipEmptyLines: "greedy" }).meta;
  // Row by row (papaparse's step), so reading stops at the limit; `preview` would count blank lines too.
  const headers: string[] = [];
  const rows: Record<string, string>[] = [];
  const rowNumbers: number[] = [];
  let line = 1; // the header's row
  const errors: { code: string; message: string; row: number }[] = [];
  let overLimit = 0; // the row past the limit, where reading stopped
  Papa.parse<Record<string, string>>(text, {
    delimiter: guessed.delimiter,
    newline: guessed.linebreak as Papa.ParseConfig["newline"],
    // Fast mode splits the whole text into lines before the first row; the full parser stops at once.
    fastMode: false,
    header: true,
    // Blank rows are skipped below, not by papaparse, so the rows after them keep their numbers.
    skipEmptyLines: false,
    transformHeader: (h) => {
      const name = h.trim().toLowerCase();
      headers.push(name); // as written (papaparse renames a repeated header to "name_1")
      return name;
    },
    transform: (v) => v.trim(),
    step: (result, parser) => {
      line++;
      // A blank row (or one of empty cells, as spreadsheets write them) is no row of data.
      if (Object.values(result.data).every((v) => v === "" || (Array.isArray(v) && v.every((x) => x === "")))) return;
      if (rows.length >= spec.maxRows) {
        overLimit = line;
        parser.abort();
        return;
      }
      for (const e of result.errors) errors.push({ code: e.code, message: e.message, row: line });
      rows.push(result.data);
      rowNumbers.push(line);
    },
  });
  const problems: CsvProblem[] = [];
  for (const h of spec.required)
    if (!headers.includes(h)) problems.push({ row: 1, column: h, message: `The column “${h}” is missing.` });
  const known = new Set([...spec.required, ...spec.optional]);
  for (const h of headers)
    if (!known.has(h))
      problems.push({ row: 1, column: h, message: `The column “${h || "(blank)"}” is not one Blockyard reads.` });
  const seen = new Set<string>();
  for (const h of headers) {
    if (h && seen.has(h)) problems.push({ row: 1, column: h, message: `The column “${h}” appears twice.` });
    seen.add(h);
  }
  const rowsRead = rows.length + (overLimit ? 1 : 0);
  if (overLimit) {
    const limit = spec.maxRows.toLocaleString("en");
    problems.push({
      row: overLimit,
      message: `The file has more than ${limit} rows; at most ${limit} rows per file — split it and import each part.`,
    });
    return { headers, rows: [], rowNumbers: [], problems, rowsRead };
  }
  for (const e of errors) {
    if (e.code === "TooFewFields" || e.code === "TooManyFields") {
      problems.push({
        row: e.row,
        message:
          e.code === "TooFewFields"
            ? "This row has fewer cells than the header."
            : "This row has more cells than the header.",
      });
    } else if (e.code !== "UndetectableDelimiter") {
      problems.push({ row: e.row, message: e.message });
    }
  }
  return { headers, rows, rowNumbers, problems, rowsRead };
}

export type CsvNumber = { value: number } | { problem: string };

const PLAIN = /^[+-]?(\d+(\.\d+)?|\.\d+)$/;
/** Comma-grouped thousands: 1,234 · 12,345,678.5 */
const GROUPED = /^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/;

/**
 * A number cell of an import, read one way only: digits with a decimal point (`1.5`, `-3`,
 * `.25`). A comma is never guessed at, since "1,5" is 1.5 to half the world and 15 to the
 * other half. Size and weight columns (the default) refuse every thousands separator; money
 * columns (`money: true`) take comma thousands only where they cannot be a decimal comma —
 * with a decimal point after them (`1,234.50`) or in more than one group (`1,234,567`).
 *
 *   readCsvNumber("1.5")                  → { value: 1.5 }
 *   readCsvNumber("1,5")                  → { problem: '"1,5" is ambiguous — write 1.5 (decimal point) or 15.' }
 *   readCsvNumber("1,234.50", { money })  → { value: 1234.5 }
 */
export function readCsvNumber(text: string, opts: { money?: boolean } = {}): CsvNumber {
  const v = text.trim();
  const shown = `"${v.slice(0, 20)}"`;
  if (PLAIN.test(v)) return { value: Number(v) };
  const commas = (v.match(/,/g) ?? []).length;
  if (GROUPED.test(v)) {
    const plain = v.replace(/,/g, "");
    if (opts.money && (v.includes(".") || commas > 1)) return { value: Number(plain) };
    if (commas === 1 && !v.includes(".")) {
      // 1,500: a thousands separator or a decimal comma — either reading is a real number.
      return {
        problem: `${shown} is ambiguous — write ${plain} (no thousands separator) or ${Number(v.replace(",", "."))} (decimal point).`,
      };
    }
    return {
      problem: `${shown} has thousands separators — write ${plain}${opts.money ? "" : " (no separators in sizes and weights)"}.`,
    };
  }
  // One comma between digits and no point: a decimal comma (1,5 · 0,75) or a slip for 15 / 075.
  if (/^[+-]?\d+,\d+$/.test(v)) {
    const asPoint = v.replace(",", ".");
    const asWhole = String(Number(v.replace(",", "")));
    return { problem: `${shown} is ambiguous — write ${asPoint} (decimal point) or ${asWhole}.` };
  }
  // 1.234,5 or 1 234,5: European thousands with a decimal comma.
  if (/^[+-]?\d{1,3}([. \u00a0\u202f']\d{3})+,\d+$/.test(v)) {
    const fixed = v.replace(/[. \u00a0\u202f']/g, "").replace(",", ".");
    return { problem: `${shown} uses a decimal comma — write ${fixed} (decimal point, no thousands separator).` };
  }
  // 1 500, 1'500, 1.234.567: spaces, apostrophes or points as thousands separators.
  if (/^[+-]?\d{1,3}([ \u00a0\u202f']\d{3})+(\.\d+)?$/.test(v) || /^[+-]?\d{1,3}(\.\d{3}){2,}$/.test(v)) {
    const fixed = v.replace(/[ \u00a0\u202f']/g, "").replace(/\.(?=\d{3}(\.|$))/g, "");
    return { problem: `${shown} has thousands separators — write ${fixed}.` };
  }
  return { problem: `“${v.slice(0, 20)}” is not a number.` };
}

/** Cell readers that record a problem naming the row and column instead of throwing. */
export function cellReader(problems: CsvProblem[], row: number, r: Record<string, string>) {
  const add = (column: string, message: string) => problems.push({ row, column, message });
  return {
    text(column: string, opts: { required?: boolean; max?: number } = {}): string | null {
      const v = r[column] ?? "";
      if (!v) {
        if (opts.required) add(column, "Required.");
        return null;
      }
      if (v.length > (opts.max ?? 200)) add(column, `At most ${opts.max ?? 200} characters.`);
      if (v.includes("\u0000")) add(column, NUL_REFUSED);
      return v;
    },
    /** See `readCsvNumber`: `money` allows unambiguous comma thousands. */
    number(
      column: string,
      opts: { required?: boolean; positive?: boolean; min?: number; max?: number; money?: boolean } = {},
    ): number | null {
      const v = r[column] ?? "";
      if (!v) {
        if (opts.required) add(column, "Required.");
        return null;
      }
      const read = readCsvNumber(v, { money: opts.money });
      if ("problem" in read) {
        add(column, read.problem);
        return null;
      }
      const n = read.value;
      if (opts.positive && n <= 0) add(column, "Must be more than 0.");
      else if (opts.min !== undefined && n < opts.min) add(column, `Must be at least ${opts.min}.`);
      else if (opts.max !== undefined && n > opts.max) add(column, `Must be at most ${opts.max}.`);
      return n;
    },
    date(column: string, opts: { required?: boolean } = {}): string | null {
      const v = r[column] ?? "";
      if (!v) {
        if (opts.required) add(column, "Required.");
        return null;
      }
      if (
        !/^\d{4}-\d{2}-\d{2}$/.test(v) ||
        Number.isNaN(Date.parse(`${v}T00:00:00Z`)) ||
        new Date(`${v}T00:00:00Z`).toISOString().slice(0, 10) !== v
      ) {
        add(column, `“${v.slice(0, 20)}” is not a date (YYYY-MM-DD).`);
        return null;
      }
      return v;
    },
    bool(column: string, fallback: boolean): boolean {
      const v = (r[column] ?? "").toLowerCase();
      if (!v) return fallback;
      if (["yes", "y", "true", "1"].includes(v)) return true;
      if (["no", "n", "false", "0"].includes(v)) return false;
      add(column, `“${v.slice(0, 20)}” is not yes or no.`);
      return fallback;
    },
  };
}
