import type { Plan, Problem, Vec3 } from "@/lib/nesting";
import type { Machine } from "./machine";
import { procedure, type Procedure, type ProcedurePiece } from "./procedure";

/** The plan's pieces in one block as the procedure takes them: parts, and offcuts by their index in that block. */
export function blockPieces(plan: Pick<Plan, "placements" | "offcuts">, blockCode: string): ProcedurePiece[] {
  return [
    ...plan.placements
      .filter((p) => p.block === blockCode)
      .map((p): ProcedurePiece => ({ kind: "part", part: p.part, origin: p.origin, size: p.size })),
    ...plan.offcuts
      .filter((o) => o.block === blockCode)
      .map((o, index): ProcedurePiece => ({ kind: "offcut", index, origin: o.origin, size: o.size })),
  ];
}

/**
 * The cutting procedure of one block of a plan on a machine, with the plan's kerf.
 *
 *   blockProcedure(run.problem, run.plan, "HF-1001", machine, run.settings.kerf).steps.length
 */
export function blockProcedure(
  problem: Pick<Problem, "blocks">,
  plan: Pick<Plan, "placements" | "offcuts">,
  blockCode: string,
  machine: Machine,
  kerf: number,
): Procedure | undefined {
  const b = problem.blocks.find((x) => x.id === blockCode);
  if (!b) return undefined;
  return procedure({ blockCode, size: b.size, trim: b.trim, kerf, pieces: blockPieces(plan, blockCode), machine });
}

/**
 * A block cutter large enough for every block given, for plans made for no machine in particular:
 * a horizontal wire spanning the widest block, travel and table for the longest, a turntable,
 * and typical rates (common practice, no source). Its programs say "any block cutter".
 */
export function anyBlockCutter(sizes: readonly Vec3[]): Machine {
  const longest = Math.max(1000, ...sizes.flat());
  return {
    name: "any block cutter",
    kind: "block",
    wire: "horizontal",
    wireLength: longest,
    travel: [longest + 100, longest + 100],
    maxPiece: [longest, longest, longest],
    turntable: true,
    rapid: 2000,
    heatUpS: 20,
    handlingS: 90,
    dialect: { unitWords: "G20/G21", inch: false, heatOn: null, heatOff: null, axes: ["X", "Y"], lineNumbers: false },
  };
}
