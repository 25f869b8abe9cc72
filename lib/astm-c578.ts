import { psiToKpa } from "@/lib/units";

/**
 * ASTM C578 (rigid cellular polystyrene insulation, 2010 table) minimums by type, as given in
 * ../shared/domain-brief.md §1: density and compressive resistance (at yield or 10 % deformation,
 * whichever comes first). EPS rows carry the table's kPa; the brief gives XPS rows in psi only,
 * so their kPa is null and shown converted, marked "≈". Looked up from a grade's system and type, not stored per block: grade cannot be seen,
 * so a block's own measured density is what the shop records.
 *
 *   c578Minimum("EPS", "ASTM C578", "Type II")  // { minPsi: 15, minKpa: 104, … }
 */
export interface C578Minimum {
  material: "EPS" | "XPS";
  type: string;
  minPcf: number;
  /** Given for EPS types only. */
  minKgM3: number | null;
  minPsi: number;
  /** The table's own kPa, as the brief gives it (EPS only). */
  minKpa: number | null;
}

const eps = (type: string, minPcf: number, minKgM3: number, minPsi: number, minKpa: number): C578Minimum => ({
  material: "EPS",
  type,
  minPcf,
  minKgM3,
  minPsi,
  minKpa,
});
const xps = (type: string, minPcf: number, minPsi: number): C578Minimum => ({
  material: "XPS",
  type,
  minPcf,
  minKgM3: null,
  minPsi,
  minKpa: null,
});

export const ASTM_C578: readonly C578Minimum[] = [
  eps("Type XI", 0.7, 11.2, 5, 35),
  eps("Type I", 0.9, 14.4, 10, 69),
  eps("Type VIII", 1.15, 18.4, 13, 90),
  eps("Type II", 1.35, 21.6, 15, 104),
  eps("Type IX", 1.8, 28.8, 25, 173),
  eps("Type XIV", 2.4, 38.4, 40, 276),
  eps("Type XV", 2.85, 45.7, 60, 414),
  xps("Type X", 1.3, 15),
  xps("Type IV", 1.55, 25),
  xps("Type VI", 1.8, 40),
  xps("Type VII", 2.2, 60),
  xps("Type V", 3.0, 100),
];

/** "15 psi (104 kPa)", or "25 psi (≈ 172 kPa)" where the kPa is converted here rather than printed in the table. */
export function formatCompressive(row: C578Minimum): string {
  const kpa = row.minKpa ?? `≈ ${Math.round(psiToKpa(row.minPsi))}`;
  return `${row.minPsi} psi (${kpa} kPa)`;
}

const norm = (s: string) => s.trim().replace(/\s+/g, " ").toUpperCase();

/** The C578 row for a grade recorded as system "ASTM C578" and a type ("Type II" or "II"); null otherwise. */
export function c578Minimum(material: string, gradeSystem: string, grade: string): C578Minimum | null {
  if (norm(gradeSystem).replace(/\s/g, "") !== "ASTMC578") return null;
  const type = norm(grade).replace(/^(TYPE )?/, "TYPE ");
  return ASTM_C578.find((r) => r.material === material && norm(r.type) === type) ?? null;
}
