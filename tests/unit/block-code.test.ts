import { describe, expect, it } from "vitest";
import { codeFromScan, labelPayload } from "@/lib/block-code";

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
