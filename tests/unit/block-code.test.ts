import { describe, expect, it } from "vitest";
import { codeFromScan, labelPayload, receivedCodeProblem } from "@/lib/block-code";
import { blankRow, copyRow, removeRow, updateRow, type Row } from "@/components/stock/receive-form";

describe("reading a block code back from a scanned label", () => {
  it("accepts the bare code a label holds", () => {
    expect(codeFromScan(labelPayload("HF-1001"))).toBe("HF-1001");
    expect(codeFromScan("  hf-1001.2 \n")).toBe("HF-1001.2");
  });

  it("accepts a /stock/CODE path and a full URL to a block page", () => {
    expect(codeFromScan("/stock/HF-1001")).toBe("HF-1001");
    expect(codeFromScan("stock/HF-1001/")).toBe("HF-1001");
    expect(codeFromScan("https://yard.example.test/stock/HF-1001.1?from=label")).toBe("HF-1001.1");
    expect(codeFromScan("http://10.0.0.5:3000/stock/hf%2D77")).toBe("HF-77");
  });

  it("refuses text that is not a block code", () => {
    expect(codeFromScan("")).toBeNull();
    expect(codeFromScan("hello world")).toBeNull();
    expect(codeFromScan("https://elsewhere.test/about")).toBeNull();
    expect(codeFromScan("/stock/../admin")).toBeNull();
    expect(codeFromScan("x".repeat(41))).toBeNull();
  });
});

describe("the code of a received block", () => {
  it("takes letters, digits and '-', 1 to 40 characters, starting with a letter or a digit", () => {
    for (const ok of ["HF-1001", "hf-1001", "1047", "A", "NG-2026-11-07", "X".repeat(40)])
      expect(receivedCodeProblem(ok), ok).toBeNull();
  });

  it("names an invisible character by its position and name", () => {
    expect(receivedCodeProblem("HF-1\u200b001")).toBe(
      'Character 5 is a zero-width space: use letters, digits and "-" only.',
    );
    expect(receivedCodeProblem("HF-\u200f1001")).toBe(
      'Character 4 is a right-to-left mark: use letters, digits and "-" only.',
    );
    expect(receivedCodeProblem("\u202eHF-1001")).toMatch(/^Character 1 is a right-to-left override:/);
    expect(receivedCodeProblem("HF-10\ufeff01")).toMatch(/^Character 6 is a zero-width no-break space/);
    expect(receivedCodeProblem("HF-1001\u00a0")).toMatch(/^Character 8 is a no-break space:/);
  });

  it("refuses spaces, look-alike letters and dashes, naming them", () => {
    expect(receivedCodeProblem("HF 1001")).toBe('Character 3 is a space: use letters, digits and "-" only.');
    // A Cyrillic А looks exactly like the Latin A.
    expect(receivedCodeProblem("\u0410B-1")).toMatch(/^Character 1 is “А” \(U\+0410\), not a plain letter A–Z/);
    expect(receivedCodeProblem("HF\u20131001")).toMatch(/^Character 3 is an en dash/);
    expect(receivedCodeProblem("HF_1001")).toMatch(/^Character 3 is an underscore/);
    // Positions count characters as seen, not UTF-16 units: the emoji is one character.
    expect(receivedCodeProblem("\u{1F600}x")).toMatch(/^Character 1 is/);
    expect(receivedCodeProblem("a\u{1F600}x")).toMatch(/^Character 2 is/);
  });

  it("keeps '.' for the offcut codes Blockyard makes", () => {
    expect(receivedCodeProblem("X.1")).toBe(
      'Character 2 is a full stop ("."): offcut codes (X.1, X.2, …) are made by Blockyard when a block is cut; use letters, digits and "-" only.',
    );
  });

  it("refuses a leading '-' and codes over 40 characters", () => {
    expect(receivedCodeProblem("-1001")).toBe('Character 1 is "-": a code starts with a letter or a digit.');
    expect(receivedCodeProblem("X".repeat(41))).toBe("At most 40 characters (this one has 41).");
  });

  it("still reads offcut codes back from their labels", () => {
    expect(codeFromScan("HF-1001.3")).toBe("HF-1001.3");
  });
});

describe("the rows of the delivery form", () => {
  const filled = (key: number): Row => ({
    ...blankRow(key),
    gradeId: "2",
    x: "4877",
    y: "1219",
    z: "1219",
    weight: "170",
    cost: "610",
    code: "NG-1",
  });

  it("gives a copied row its own identity: editing or removing the copy leaves the original", () => {
    let rows = copyRow([filled(1)], 1, 2);
    expect(rows.map((r) => r.key)).toEqual([1, 2]);
    expect(rows[1]).toMatchObject({ x: "4877", weight: "170", code: "" });
    rows = updateRow(rows, 2, { weight: "120" });
    expect(rows[0]!.weight).toBe("170");
    expect(rows[1]!.weight).toBe("120");
    rows = removeRow(rows, 2);
    expect(rows).toEqual([filled(1)]);
  });

  it("copies a copy after itself, and never removes the last row", () => {
    let rows = copyRow(copyRow([filled(1), blankRow(9)], 1, 2), 2, 3);
    expect(rows.map((r) => r.key)).toEqual([1, 2, 3, 9]);
    rows = removeRow(removeRow(removeRow(rows, 1), 2), 3);
    expect(rows.map((r) => r.key)).toEqual([9]);
    expect(removeRow(rows, 9)).toHaveLength(1);
  });
});
