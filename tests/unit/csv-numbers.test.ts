import { describe, expect, it } from "vitest";
import { cellReader, readCsvNumber, type CsvProblem } from "@/lib/csv";

const value = (text: string, money = false) => {
  const r = readCsvNumber(text, { money });
  return "value" in r ? r.value : r.problem;
};

describe("numbers in an imported CSV", () => {
  it("reads plain numbers with a decimal point", () => {
    expect(value("1.5")).toBe(1.5);
    expect(value("2440")).toBe(2440);
    expect(value("-3.25")).toBe(-3.25);
    expect(value(".5")).toBe(0.5);
    expect(value("+7")).toBe(7);
    expect(value(" 610 ")).toBe(610);
  });

  it("refuses a decimal comma as ambiguous, offering both readings", () => {
    expect(value("1,5")).toBe('"1,5" is ambiguous — write 1.5 (decimal point) or 15.');
    expect(value("0,75")).toBe('"0,75" is ambiguous — write 0.75 (decimal point) or 75.');
    expect(value("1,5", true)).toBe('"1,5" is ambiguous — write 1.5 (decimal point) or 15.');
  });

  it("refuses 1,500, which is 1500 to some and 1.5 to others, in every column", () => {
    expect(value("1,500")).toBe('"1,500" is ambiguous — write 1500 (no thousands separator) or 1.5 (decimal point).');
    expect(value("1,500", true)).toMatch(/^"1,500" is ambiguous/);
  });

  it("refuses thousands separators in sizes and weights", () => {
    expect(value("1,234.5")).toBe(
      '"1,234.5" has thousands separators — write 1234.5 (no separators in sizes and weights).',
    );
    expect(value("1,234,567")).toMatch(/thousands separators — write 1234567/);
    expect(value("1 500")).toBe('"1 500" has thousands separators — write 1500.');
    expect(value("1\u202f500")).toMatch(/thousands separators — write 1500/);
    expect(value("1'500")).toMatch(/thousands separators — write 1500/);
    expect(value("1.234.567")).toMatch(/thousands separators — write 1234567/);
  });

  it("takes comma thousands in money columns only where they cannot be a decimal comma", () => {
    expect(value("1,234.50", true)).toBe(1234.5);
    expect(value("1,234,567", true)).toBe(1234567);
    expect(value("12,34.5", true)).toMatch(/not a number/);
  });

  it("names a European decimal comma with thousands points", () => {
    expect(value("1.234,5")).toBe(
      '"1.234,5" uses a decimal comma — write 1234.5 (decimal point, no thousands separator).',
    );
  });

  it("says when a cell is not a number at all", () => {
    for (const bad of ["abc", "1e3", "0x10", "Infinity", "NaN", "1,5,0", "$95", "--1", "1.2.3"])
      expect(value(bad), bad).toMatch(/is not a number|thousands separators/);
    expect(value("abc")).toBe("“abc” is not a number.");
  });

  it("records the problem against the row and column, and no number", () => {
    const problems: CsvProblem[] = [];
    const c = cellReader(problems, 3, { length_mm: "1,5", cost: "1,234.50" });
    expect(c.number("length_mm", { required: true, positive: true })).toBeNull();
    expect(c.number("cost", { money: true })).toBe(1234.5);
    expect(problems).toEqual([
      { row: 3, column: "length_mm", message: '"1,5" is ambiguous — write 1.5 (decimal point) or 15.' },
    ]);
  });
});
