import { describe, expect, it } from "vitest";
import {
  BOARD_FEET_PER_M3,
  CM3_PER_BOARD_FOOT,
  KG_M3_PER_LB_FT3,
  KPA_PER_PSI,
  boardFeet,
  cubicMetres,
  densityKgM3,
  formatLength,
  formatSize,
  inToMm,
  kgM3ToLbFt3,
  psiToKpa,
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

describe("pressure and density", () => {
  // NIST SP 811 (Guide for the Use of the SI), Appendix B: 1 psi (lbf/in²) = 6.894 757 E+00 kPa.
  // Not in Blockyard's trade brief: the factor is named from NIST SP 811 from memory, and re-derived
  // here from the exact pound (0.45359237 kg), standard gravity (9.80665 m/s²) and inch (0.0254 m).
  it("1 psi = 6.894757 kPa (NIST SP 811), through the app's own conversion", () => {
    expect(KPA_PER_PSI).toBeCloseTo(6.894757, 6);
    expect(psiToKpa(1)).toBeCloseTo(6.894757, 6);
    expect(psiToKpa(1)).toBeCloseTo((0.45359237 * 9.80665) / 0.0254 ** 2 / 1000, 12);
    // ASTM C578 Type II's 15 psi is 103.4 kPa; the standard's table prints 104 (domain brief §1).
    expect(psiToKpa(15)).toBeCloseTo(103.42, 2);
  });

  // ASTM D1622 (apparent density of rigid cellular plastics): the density of a conditioned specimen
  // is its mass divided by its volume measured from its dimensions (domain brief §3 names D1622 for
  // weighing a measured piece). The cases are arithmetic, checked by hand beside each.
  it("takes density as mass ÷ volume of a conditioned specimen (ASTM D1622), through the app's own density function", () => {
    // 300 × 300 × 50 mm = 0.0045 m³; 97.2 g ÷ 0.0045 m³ = 21.6 kg/m³ (ASTM C578 Type II minimum, brief check value 1).
    expect(densityKgM3(0.0972, [300, 300, 50])).toBeCloseTo(21.6, 9);
    // A 50 mm cube, 6.25 g: 0.00625 kg ÷ 0.000125 m³ = 50 kg/m³.
    expect(densityKgM3(0.00625, [50, 50, 50])).toBeCloseTo(50, 9);
    // Brief check value 5 backwards: a 4×4×16 ft block weighing 104.5 kg is 104.5 ÷ 7.249 = 14.4 kg/m³ (Type I minimum).
    expect(densityKgM3(104.5, [ft(16), ft(4), ft(4)])).toBeCloseTo(14.4, 1);
  });
});

describe("formatting", () => {
  it("shows lengths in the chosen unit", () => {
    expect(formatLength(25.4, "in")).toBe("1 in");
    expect(formatLength(1.5, "mm")).toBe("1.5 mm");
    expect(formatSize([1219.2, 609.6, 50.8], "in")).toBe("48 × 24 × 2 in");
  });
});
