import type { Vec3 } from "@/lib/nesting";
/**
 * Lengths are stored in millimetres; volumes derive from them. Display follows the user's choice.
 *
 *   boardFeet(1219.2 * 1219.2 * 4876.8)  // a 4×4×16 ft block → 3072
 */
export type LengthUnit = "mm" | "in";

export const MM_PER_INCH = 25.4; // exact, by the 1959 international yard and pound agreement
export const CM3_PER_BOARD_FOOT = 144 * 2.54 ** 3; // 144 in³ = 2,359.737216 cm³
export const BOARD_FEET_PER_M3 = 1e6 / CM3_PER_BOARD_FOOT; // ≈ 423.776
export const KG_M3_PER_LB_FT3 = 0.45359237 / 0.3048 ** 3; // ≈ 16.0185
/** 1 lbf/in² in kPa: 0.45359237 kg × 9.80665 m/s² over (0.0254 m)², exact definitions (≈ 6.894757). */
export const KPA_PER_PSI = (0.45359237 * 9.80665) / 0.0254 ** 2 / 1000;

/** The register keeps lengths to 0.01 mm (NUMERIC(10,2)): a size under this would be stored as 0. */
export const MIN_SIZE_MM = 0.01;

export const mmToIn = (mm: number) => mm / MM_PER_INCH;
/** Inches to mm, to the micrometre (so 24 in is stored as 609.6 mm, not 609.5999999999999). */
export const inToMm = (inch: number) => Math.round(inch * MM_PER_INCH * 1000) / 1000;
/** A length given in `unit`, in mm. */
export const lengthToMm = (n: number, unit: LengthUnit) => (unit === "in" ? inToMm(n) : n);
/** A length in mm as a number in `unit` (inches rounded to `places` decimals), e.g. for a form field. */
export const lengthInUnit = (mm: number, unit: LengthUnit, places = 3) =>
  unit === "in" ? Math.round(mmToIn(mm) * 10 ** places) / 10 ** places : mm;

/** Cubic metres from a size in mm. */
export const cubicMetres = (x: number, y: number, z: number) => (x * y * z) / 1e9;
/** Board feet from cubic millimetres. */
export const boardFeet = (mm3: number) => mm3 / 1e3 / CM3_PER_BOARD_FOOT;
export const m3ToBoardFeet = (m3: number) => m3 * BOARD_FEET_PER_M3;

/** kg/m³ from a weight in kg and a size in mm. */
export const densityKgM3 = (kg: number, size: Vec3) => kg / cubicMetres(...size);
export const kgM3ToLbFt3 = (kgm3: number) => kgm3 / KG_M3_PER_LB_FT3;
/** Pressure (compressive resistance) in psi as kPa. */
export const psiToKpa = (psi: number) => psi * KPA_PER_PSI;

/** A length in `unit` without the unit's name: millimetres to 0.1, inches to 0.01 (trailing zeros dropped). */
export function lengthNumber(mm: number, unit: LengthUnit): string {
  return unit === "in" ? trimZeros(mmToIn(mm).toFixed(2)) : trimZeros(mm.toFixed(1));
}

export function formatLength(mm: number, unit: LengthUnit): string {
  return `${lengthNumber(mm, unit)} ${unit}`;
}

export function formatSize(size: readonly number[], unit: LengthUnit): string {
  return `${size.map((v) => lengthNumber(v, unit)).join(" × ")} ${unit}`;
}

/**
 * A size at the machine: always in millimetres (the machines are driven in mm and the steps'
 * positions are in mm), with the inches beside it for someone who reads inches.
 *   formatMachineSize([1000, 500, 254], "in") // "1000 × 500 × 254 mm (39.37 × 19.69 × 10 in)"
 */
export function formatMachineSize(size: readonly number[], unit: LengthUnit): string {
  const mm = formatSize(size, "mm");
  return unit === "in" ? `${mm} (${formatSize(size, "in")})` : mm;
}

/**
 * A volume as the shop reads it, written once for every page: cubic metres to `digits` places
 * (thousands grouped), and board feet beside them when asked.
 *
 *   formatVolume(1.5)                                // "1.500 m³"
 *   formatVolume(0.576, { digits: 2, boardFeet: true }) // "0.58 m³ · 244 BF"
 */
export function formatVolume(m3: number, opts: { digits?: number; boardFeet?: boolean } = {}): string {
  const text = `${numberFormat(opts.digits ?? 3).format(m3)} m³`;
  return opts.boardFeet ? `${text} · ${numberFormat(0).format(Math.round(m3ToBoardFeet(m3)))} BF` : text;
}

/** One formatter per number of places (`toLocaleString` with options builds a new one on every call). */
const formats = new Map<number, Intl.NumberFormat>();
function numberFormat(digits: number): Intl.NumberFormat {
  let f = formats.get(digits);
  if (!f) {
    f = new Intl.NumberFormat("en", { minimumFractionDigits: digits, maximumFractionDigits: digits });
    formats.set(digits, f);
  }
  return f;
}

function trimZeros(s: string): string {
  return s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}
