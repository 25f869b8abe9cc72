/**
 * A hot-wire machine as the shop floor sees it: which way the wire runs, how long it is, how far
 * it travels, what the table takes, and the G-code dialect its controller reads. Stored per shop
 * (one row per machine) in exactly this shape; the procedure and the programs are made for one.
 */
import type { Vec3 } from "@/lib/nesting";

export type { Vec3 };

export interface GcodeDialect {
  /** "G21" (RS274/NGC, mm) / "G20" (inch) words, or "G71" (DIN 66025, mm) / "G70" (inch). */
  unitWords: "G20/G21" | "G70/G71";
  /** Program coordinates in inches instead of millimetres. */
  inch: boolean;
  /** Wire heat on / off codes, e.g. "M3" / "M5"; null when the heat is switched by hand. */
  heatOn: string | null;
  heatOff: string | null;
  /** Axis letters of the cutting plane: horizontal travel and the second axis (vertical for a horizontal wire). */
  axes: [string, string];
  /** A 4-axis profile cutter's second tower, e.g. ["U", "V"] (the first tower moves on `axes`); absent: 2-axis. */
  towerAxes?: [string, string] | null;
  /** N words before each line. */
  lineNumbers: boolean;
}

export interface Machine {
  id?: number;
  name: string;
  kind: "block" | "profile";
  /** horizontal: the wire spans across the table; the cutting plane is machine X (along the table) by Y (up from the table).
   *  vertical: the wire stands upright through the table; the cutting plane is X by Y, both across the table. */
  wire: "horizontal" | "vertical";
  /** Usable wire span, mm. */
  wireLength: number;
  /** Travel of the wire in the cutting plane [X, Y], mm, from machine zero (0,0) — X=0 at the machine's zero end, Y=0 on the table top for a horizontal wire. */
  travel: [number, number];
  /** Largest piece the table takes [length, width, height] mm, compared sorted. */
  maxPiece: Vec3;
  turntable: boolean;
  /** Rapid rate, mm/min. */
  rapid: number;
  /** Heat-up time of the wire per placement, s. */
  heatUpS: number;
  /** Handling time per placement (place, square up, take off), s. */
  handlingS: number;
  /** A profile cutter whose two towers move apart (tapered parts); its towers stand `wireLength` apart. Absent: no. */
  fourAxis?: boolean;
  dialect: GcodeDialect;
}

/** mm of air between the wire's start and the piece. */
export const ENTRY_CLEARANCE = 10;

const EPS = 1e-6;

/** A length in mm as people write it: at most 3 decimals, no trailing zeros. */
export const mm = (v: number): string => String(Math.round(v * 1000) / 1000);

/** "2440 × 1220 × 610" */
export const dims = (s: readonly number[]): string => s.map(mm).join(" × ");

/**
 * Why a piece placed with extents `placed` = [along X, along the wire, along Y] does not fit the
 * machine, or null when it fits: the table's largest piece, the wire span, then the travel with
 * ENTRY_CLEARANCE of air to enter (on both sides; a horizontal wire needs none under the piece).
 * @example placementProblem(m, [2440, 1220, 610]) // → null on a 1300 mm wire with 2600 × 1000 travel
 */
export function placementProblem(m: Machine, placed: Vec3): string | null {
  const s = [...placed].sort((a, b) => a - b);
  const t = [...m.maxPiece].sort((a, b) => a - b);
  if (s.some((v, i) => v > t[i]! + EPS)) return `the table takes pieces up to ${dims(m.maxPiece)} mm`;
  if (placed[1] > m.wireLength + EPS) return `the wire spans ${mm(m.wireLength)} mm`;
  if (placed[0] + 2 * ENTRY_CLEARANCE > m.travel[0] + EPS)
    return `the wire travels ${mm(m.travel[0])} mm along X (${ENTRY_CLEARANCE} mm of air each side included)`;
  const yAir = m.wire === "horizontal" ? ENTRY_CLEARANCE : 2 * ENTRY_CLEARANCE;
  if (placed[2] + yAir > m.travel[1] + EPS)
    return `the wire travels ${mm(m.travel[1])} mm along Y (${ENTRY_CLEARANCE} mm of air ${m.wire === "horizontal" ? "above" : "each side"} included)`;
  return null;
}

/**
 * The largest true-shape slab a profile cutter takes, [thickness along the wire, face u (across),
 * face v (up)] mm, for `settings.slabMax`: the wire's span, the travel less ENTRY_CLEARANCE each
 * side (the profile program's frame: air to enter, and on a horizontal wire air above and a waste
 * sheet below), and the table's largest piece taken as [along X, along the wire, up] (within it
 * axis by axis, a slab also fits the table's sorted check in `placementProblem`).
 * @example slabMaxFor(bay2) // → [1000, 1200, 600] for a 1000 mm wire, 1250 × 650 travel, table 1200 × 1000 × 600
 */
export function slabMaxFor(m: Pick<Machine, "wireLength" | "travel" | "maxPiece">): Vec3 {
  return [
    Math.min(m.wireLength, m.maxPiece[1]),
    Math.min(m.travel[0] - 2 * ENTRY_CLEARANCE, m.maxPiece[0]),
    Math.min(m.travel[1] - 2 * ENTRY_CLEARANCE, m.maxPiece[2]),
  ];
}

/**
 * One line describing a machine for a printout.
 * @example describeMachine(m) // → "Block cutter 1: block cutter, horizontal wire 1300 mm, travel 2600 × 1000 mm, table up to 2500 × 1300 × 1000 mm"
 */
export function describeMachine(m: Machine): string {
  const kind = m.kind === "block" ? "block cutter" : "profile cutter";
  const turn = m.turntable ? ", turntable" : "";
  return `${m.name}: ${kind}, ${m.wire} wire ${mm(m.wireLength)} mm, travel ${dims(m.travel)} mm, table up to ${dims(m.maxPiece)} mm${turn}`;
}
