import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";
import { GRADES } from "@/db/seeds/02_stock";
import { KG_M3_PER_LB_FT3, psiToKpa } from "@/lib/units";
import { c578Minimum, formatCompressive } from "@/lib/astm-c578";

vi.mock("next/navigation", () => ({ useRouter: () => ({ push() {}, refresh() {} }) }));
const { GradeEditor } = await import("@/components/stock/grade-editor");
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

  // ASTM C578 (2010 table) minimum compressive resistance, psi (kPa), from ../shared/domain-brief.md §1
  // and check values 1–2 (confidence high): I 10 (69), VIII 13 (90), II 15 (104), IX 25 (173).
  it.each([
    ["Type I", 10, 69],
    ["Type VIII", 13, 90],
    ["Type II", 15, 104],
    ["Type IX", 25, 173],
  ] as const)(
    "EPS %s: minimum compressive resistance %s psi (%s kPa) (ASTM C578 via the domain brief)",
    (type, psi, kpa) => {
      const grade = GRADES.find((g) => g.material === "EPS" && g.grade === type)!;
      const row = c578Minimum(grade.material, grade.grade_system, grade.grade);
      expect(row, `the demo grade ${grade.code} is found as a C578 type`).not.toBeNull();
      expect(row!.minPsi).toBe(psi);
      expect(row!.minKpa).toBe(kpa);
      expect(row!.minKgM3).toBe(grade.min);
      // Arithmetic: each printed kPa lies less than 1 kPa above its psi converted (1 psi = 6.894757 kPa, NIST SP 811).
      expect(row!.minKpa! - psiToKpa(psi)).toBeGreaterThanOrEqual(0);
      expect(row!.minKpa! - psiToKpa(psi)).toBeLessThan(1);
    },
  );

  it("finds a C578 type however it is typed, and nothing for other systems", () => {
    expect(c578Minimum("EPS", "ASTM C578", "II")?.minPsi).toBe(15);
    expect(c578Minimum("EPS", "astm  c578", "type ix")?.minPsi).toBe(25);
    const xpsIV = c578Minimum("XPS", "ASTM C578", "Type IV")!;
    expect(xpsIV.minPsi).toBe(25); // brief §1, XPS strengths H, given in psi only
    expect(formatCompressive(xpsIV)).toBe("25 psi (≈ 172 kPa)"); // 25 × 6.894757 = 172.4: converted, not the table's
    expect(c578Minimum("XPS", "ASTM C578", "Type II")).toBeNull(); // an EPS type, not XPS
    expect(c578Minimum("EPS", "EN 13163", "EPS 100")).toBeNull();
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

  it("shows each C578 grade's minimum compressive resistance on the grades page (ASTM C578 via the domain brief)", () => {
    const view = (id: number, code: string, grade: string, gradeSystem = "ASTM C578") => ({
      id,
      code,
      material: "EPS" as const,
      gradeSystem,
      grade,
      nominalDensity: null,
      minDensity: null,
      cureDays: 14,
      neverHotWire: false,
      colour: "#ffffff",
      priceUnit: "bf" as const,
      notes: null,
      active: true,
    });
    const html = renderToStaticMarkup(
      createElement(GradeEditor, {
        grades: [view(1, "EPS-II", "Type II"), view(2, "EPS-IX", "Type IX"), view(3, "EPS-150", "EPS 150", "EN 13163")],
        canEdit: false,
      }),
    );
    expect(html).toMatch(/data-testid="c578-EPS-II">15 psi \(104 kPa\)</);
    expect(html).toMatch(/data-testid="c578-EPS-IX">25 psi \(173 kPa\)</);
    expect(html).toMatch(/data-testid="c578-EPS-150">–</);
  });
});
