import { nestSync, parseProblem, validatePlan, type Plan, type Problem } from "@/lib/nesting";

/** Builds a problem through the parser, so defaults are the real ones. */
export function problem(json: Record<string, unknown>): Problem {
  const r = parseProblem({ version: 1, ...json });
  if (!r.ok) throw new Error(`bad fixture: ${r.errors.join("; ")}`);
  return r.problem;
}

/** Runs the solver on a small iteration budget and insists the plan is valid. */
export function solveValid(p: Problem, iterations = 30, seed = 1): Plan {
  const plan = nestSync(p, { seed, iterations });
  const errors = validatePlan(p, plan);
  if (errors.length > 0) throw new Error(`invalid plan: ${errors.join("; ")}`);
  return plan;
}

export const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

/**
 * The pinwheel (common knowledge, no source): two 20×10 and two 10×20 pieces, not to be turned,
 * around a 10×10 one fill a 30×30 layer exactly, and no through cut frees any of them.
 */
export const pinwheel = (layout: "free" | "layers" | "guillotine") =>
  problem({
    settings: { kerf: 0, trim: 0, layout, minOffcut: [1, 1, 1] },
    blocks: [{ id: "B", size: [30, 30, 10] }],
    parts: [
      { id: "H", size: [20, 10, 10], quantity: 2, rotate: "none" },
      { id: "V", size: [10, 20, 10], quantity: 2, rotate: "none" },
      { id: "C", size: [10, 10, 10], quantity: 1, rotate: "none" },
    ],
  });
