import { describe, expect, it } from "vitest";
import {
  BOARD_FEET_PER_M3,
  CM3_PER_BOARD_FOOT,
  KG_M3_PER_LB_FT3,
  boardFeet,
  cubicMetres,
  formatLength,
  formatSize,
  inToMm,
  kgM3ToLbFt3,
} from "@/lib/units";

// Check values from ../shared/domain-brief.md "Check values for tests" (arithmetic on exact unit definitions).
const ft = (n: number) => inToMm(12 * n);

describe("units against published conversions", () => {
  it("1 m³ = 423.78 board feet and 1 BF = 2,359.74 cm³ (domain brief check value 4; NIST SP 811 unit definitions)", () => {
    expect(BOARD_FEET_PER_M3).toBeCloseTo(423.78, 2);
    expect(CM3_PER_BOARD_FOOT).toBeCloseTo(2359.74, 2);
  });

  it("a 4×4×16 ft block is 256 ft³ = 3,072 BF = 7.249 m³ (domain brief check value 3)", () => {
    const mm3 = ft(4) * ft(4) * ft(16);
    expect(boardFeet(mm3)).toBeCloseTo(3072, 6);
    expect(cubicMetres(ft(4), ft(4), ft(16))).toBeCloseTo(7.249, 3);
  });

  it("1 in = 25.4 mm exactly (international yard and pound agreement, 1959; NIST SP 811); typed inches are kept to the micrometre", () => {
    expect(inToMm(1)).toBe(25.4);
    expect(inToMm(24)).toBe(609.6); // 24 × 25.4 in floating point is 609.5999999999999
    expect(inToMm(48)).toBe(1219.2);
    expect(inToMm(0.001)).toBe(0.025); // 25.4 µm, to the micrometre
  });

  it("1 lb/ft³ = 16.0185 kg/m³ (domain brief check value 4)", () => {
    expect(KG_M3_PER_LB_FT3).toBeCloseTo(16.0185, 4);
    expect(kgM3ToLbFt3(21.6)).toBeCloseTo(1.35, 2); // ASTM C578 Type II minimum, 1.35 pcf = 21.6 kg/m³
  });

  it("a 4×4×16 ft Type I block at minimum density weighs 230.4 lb (104.5 kg) (domain brief check value 5)", () => {
    const kg = cubicMetres(ft(4), ft(4), ft(16)) * 0.9 * KG_M3_PER_LB_FT3;
    expect(kg).toBeCloseTo(104.5, 1);
    expect(kg / 0.45359237).toBeCloseTo(230.4, 1);
  });
});

describe("formatting", () => {
  it("shows lengths in the chosen unit", () => {
    expect(formatLength(25.4, "in")).toBe("1 in");
    expect(formatLength(1.5, "mm")).toBe("1.5 mm");
    expect(formatSize([1219.2, 609.6, 50.8], "in")).toBe("48 × 24 × 2 in");
  });
});
