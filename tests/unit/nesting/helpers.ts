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
