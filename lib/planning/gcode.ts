/**
 * Writing G-code in a machine's dialect: the unit word, numbers in its units, N words when it
 * numbers lines, comments in the characters every controller reads, the wire heat switched on
 * and off (or a stop for a person to do it), and the cautions every hot-wire program carries.
 * Shared by the block cutter's programs (wire-path.ts) and the profile programs (lib/profiles).
 * Pure: no I/O.
 */
import type { GcodeDialect } from "./machine";

/**
 * A comment's text as controllers read it: capitals, no parentheses or semicolons inside.
 * @example sanitize("Piece 120 × 80 (A)") // → "PIECE 120 X 80 - A)"
 */
export const sanitize = (s: string): string =>
  s
    .toUpperCase()
    .replace(/×/g, "X")
    .replace(/;/g, ",")
    .replace(/\(/g, "- ")
    .replace(/[^A-Z0-9 .,:=\-/]/g, "");

/** The cautions every hot-wire program states in its header (see lib/safety and the safety page). */
export const HOT_WIRE_CAUTIONS = [
  "Caution: ventilate. Never leave a hot wire unattended.",
  "Caution: never hot-wire polyurethane, PVC or PIR foams.",
] as const;

export interface GcodeWriter {
  /** A program line: numbered with N words when the dialect numbers lines. */
  code(s: string): void;
  /** A comment line, sanitized. */
  note(s: string): void;
  /** A length in mm as the program writes it: in inches (4 decimals) or mm (3 decimals), no trailing zeros. */
  num(mm: number): string;
  /** The dialect's unit word: G21 / G20 or G71 / G70. */
  units: string;
  /** Wire heat on before the first feed: the dialect's code and a dwell of the heat-up time, or a stop. */
  heatOn(heatUpS: number): void;
  /** Wire heat off after the last feed: the dialect's code, or a stop. */
  heatOff(): void;
  /** The program so far, one line each, with a final newline. */
  text(): string;
}

/**
 * A writer for one program in a dialect.
 * @example const w = gcodeWriter(m.dialect); w.code(w.units); w.code(`G0 X${w.num(10)}`); w.text() // → "G21\nG0 X10\n"
 */
export function gcodeWriter(d: GcodeDialect): GcodeWriter {
  const scale = d.inch ? 1 / 25.4 : 1;
  const digits = d.inch ? 4 : 3;
  const out: string[] = [];
  let n = 0;
  const code = (s: string) => {
    n += 10;
    out.push(d.lineNumbers ? `N${n} ${s}` : s);
  };
  const note = (s: string) => {
    out.push(`(${sanitize(s)})`);
  };
  return {
    code,
    note,
    num: (v: number) => {
      const s = (v * scale).toFixed(digits).replace(/\.?0+$/, "");
      return s === "-0" || s === "" ? "0" : s;
    },
    units: d.unitWords === "G20/G21" ? (d.inch ? "G20" : "G21") : d.inch ? "G70" : "G71",
    heatOn: (heatUpS: number) => {
      if (d.heatOn) {
        code(sanitize(d.heatOn));
        code(`G4 P${heatUpS}`);
      } else {
        note(`Switch the wire heat on, let it heat up ${heatUpS} s, then press start`);
        code("M0");
      }
    },
    heatOff: () => {
      if (d.heatOff) code(sanitize(d.heatOff));
      else {
        note("Switch the wire heat off, then press start");
        code("M0");
      }
    },
    text: () => `${out.join("\n")}\n`,
  };
}
