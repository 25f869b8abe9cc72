import { describe, expect, it } from "vitest";
import { GRADES } from "@/db/seeds/02_stock";
import { KG_M3_PER_LB_FT3 } from "@/lib/units";
import { gradeSchema } from "@/lib/validations/stock";

// ASTM C578 (2010 table) minimum densities for EPS types, as given in ../shared/domain-brief.md §1
// (confidence high): pcf and kg/m³.
const ASTM_C578_EPS_MIN = {
  "Type I": [0.9, 14.4],
  "Type VIII": [1.15, 18.4],
  "Type II": [1.35, 21.6],
  "Type IX": [1.8, 28.8],
} as const;

describe("grade catalogue against ASTM C578", () => {
  it.each(Object.entries(ASTM_C578_EPS_MIN))("EPS %s: minimum density %j (pcf, kg/m³)", (type, [pcf, kgm3]) => {
    const grade = GRADES.find((g) => g.material === "EPS" && g.grade === type);
    expect(grade, `the demo catalogue lists EPS ${type}`).toBeTruthy();
    expect(grade!.min).toBe(kgm3);
    // The standard's two columns agree through 1 lb/ft³ = 16.0185 kg/m³.
    expect(pcf * KG_M3_PER_LB_FT3).toBeCloseTo(kgm3, 0);
    expect(grade!.nominal).toBeGreaterThan(kgm3);
  });

  it("marks every polyurethane grade never-hot-wire (American Chemistry Council thermal degradation guidance, via the domain brief §5)", () => {
    const pu = {
      code: "PU-X",
      material: "PU",
      gradeSystem: "shop",
      grade: "15 lb",
      cureDays: 0,
      colour: "#d8b26e",
      priceUnit: "m3",
    };
    const refused = gradeSchema.safeParse({ ...pu, neverHotWire: false });
    expect(refused.success).toBe(false);
    expect(refused.error?.issues[0]?.path).toEqual(["neverHotWire"]);
    expect(gradeSchema.safeParse({ ...pu, neverHotWire: true }).success).toBe(true);
    expect(GRADES.filter((g) => g.material === "PU").length).toBeGreaterThan(0);
  });
});
