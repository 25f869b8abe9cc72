import Papa from "papaparse";
import { afterEach, describe, expect, it, vi } from "vitest";
import { parseCsv } from "@/lib/csv";

const SPEC = { required: ["code", "location"], optional: ["note"], maxRows: 500 };

/** A CSV of `rows` data rows (3 cells each), made line by line. */
function* lines(rows: number, blankEvery = 0): Generator<string> {
  yield "code,location,note";
  for (let i = 1; i <= rows; i++) {
    yield `HF-${i},Bay ${i % 9},row ${i}`;
    if (blankEvery && i % blankEvery === 0) yield ",,"; // a spreadsheet's empty row
  }
}
const file = (rows: number, blankEvery = 0) => new TextEncoder().encode(`${[...lines(rows, blankEvery)].join("\n")}\n`);

/** Counts the cells papaparse hands to `transform` (every cell of every row it reads). */
function countCells() {
  const real = Papa.parse.bind(Papa) as (input: string, config: Papa.ParseConfig) => unknown;
  const seen = { cells: 0 };
  vi.spyOn(Papa, "parse").mockImplementation(((input: string, config: Papa.ParseConfig) => {
    const transform = config.transform;
    if (!transform) return real(input, config); // the delimiter guess on the first 64 KB
    return real(input, {
      ...config,
      transform: (value: string, field: string | number) => {
        seen.cells++;
        return transform(value, field);
      },
    });
  }) as unknown as typeof Papa.parse);
  return seen;
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe("CSV row limit", () => {
  it("stops reading a 100,000-row file at the limit and refuses it, naming the limit", () => {
    const bytes = file(100_000);
    const seen = countCells();
    const parsed = parseCsv(bytes, SPEC);
    // Reading stopped one row past the limit: 501 rows × 3 cells, not 100,000 × 3.
    expect(seen.cells).toBeLessThanOrEqual((SPEC.maxRows + 1) * 3);
    expect(parsed.rowsRead).toBe(SPEC.maxRows + 1);
    // Nothing to write: no rows come back, and the one problem names the limit.
    expect(parsed.rows).toEqual([]);
    expect(parsed.problems).toEqual([
      {
        row: SPEC.maxRows + 2,
        message: "The file has more than 500 rows; at most 500 rows per file — split it and import each part.",
      },
    ]);
  });

  it("names the real limits of the imports with thousands separators", () => {
    const parsed = parseCsv(file(20_001), { ...SPEC, maxRows: 20_000 });
    expect(parsed.problems.map((p) => p.message)).toEqual([
      "The file has more than 20,000 rows; at most 20,000 rows per file — split it and import each part.",
    ]);
  });

  it("takes a file of exactly the limit whole, with empty rows not counted", () => {
    const parsed = parseCsv(file(SPEC.maxRows, 7), SPEC);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows).toHaveLength(SPEC.maxRows);
    expect(parsed.rowsRead).toBe(SPEC.maxRows);
    expect(parsed.rows.at(-1)).toEqual({ code: "HF-500", location: "Bay 5", note: "row 500" });
  });

  it("still reports row problems with their spreadsheet row numbers, and header problems over the limit", () => {
    const text = "code,location,note\nA,Bay 1,x\n\nB,Bay 2\nC,Bay 3,x,extra\n";
    expect(parseCsv(new TextEncoder().encode(text), SPEC).problems).toEqual([
      // The blank row 3 is skipped but still counted, as a spreadsheet shows it.
      { row: 4, message: "This row has fewer cells than the header." },
      { row: 5, message: "This row has more cells than the header." },
    ]);
    const over = parseCsv(new TextEncoder().encode(text.replace("note", "colour")), { ...SPEC, maxRows: 2 });
    expect(over.problems.map((p) => p.row)).toEqual([1, 5]);
    expect(over.problems[0]!.message).toBe("The column “colour” is not one Blockyard reads.");
  });
});
