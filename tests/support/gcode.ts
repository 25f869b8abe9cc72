// @ts-expect-error -- gcode-interpreter 3.0.0 ships no type declarations.
import GcodeInterpreter from "gcode-interpreter";

/**
 * G-code read back with an interpreter that is not ours (cncjs gcode-interpreter 3.0.0), for the
 * reference tests of the block cutter's and the profile cutter's programs.
 *
 *   readBack("G21\nG1 X10 F300 ; cut").events
 *   // → [{ kind: "word", cmd: "G21", args: {}, line: 0 }, { kind: "word", cmd: "G1", args: { X: 10, F: 300 }, line: 1 }, …]
 */
export type Args = Record<string, number>;
export type Event =
  | { kind: "word"; cmd: string; args: Args; line: number }
  | { kind: "comment"; text: string; line: number };

const Interpreter = GcodeInterpreter as new (opts: {
  handlers: Record<string, (args: Args) => void>;
  defaultHandler?: (cmd: string, args: Args) => void;
}) => {
  loadFromStringSync(text: string, cb?: (data: { ln?: number; comments?: string[] }, i: number) => void): unknown;
};

/** Every word and comment of a program in order, each with its line (0-based), and each line's N number. */
export function readBack(text: string): { events: Event[]; lineNumbers: (number | undefined)[] } {
  const events: Event[] = [];
  const lineNumbers: (number | undefined)[] = [];
  let line = 0;
  const word = (cmd: string) => (args: Args) => events.push({ kind: "word", cmd, args, line });
  const handlers = Object.fromEntries(
    ["G0", "G1", "G4", "G20", "G21", "G70", "G71", "G90", "M0", "M2", "M3", "M5"].map((c) => [c, word(c)]),
  );
  new Interpreter({
    handlers,
    defaultHandler: (cmd, args) => events.push({ kind: "word", cmd, args, line }),
  }).loadFromStringSync(text, (data, i) => {
    for (const c of data.comments ?? []) events.push({ kind: "comment", text: c, line: i });
    lineNumbers.push(data.ln);
    line = i + 1;
  });
  return { events, lineNumbers };
}

/** The first word of a code such as "M3" or "M03 S50", as the interpreter names it ("M3"). */
export const cmdOf = (code: string) => {
  const m = /^([A-Z])0*(\d+)/.exec(code.trim().toUpperCase())!;
  return `${m[1]}${m[2]}`;
};
