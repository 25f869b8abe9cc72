import { api } from "@/lib/auth/guard";
import { getRunSummary } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { runId: string };

/**
 * A run's status, progress and figures: what the progress bar polls, a few hundred bytes whatever
 * the size of the plan. The problem and the plan come from /api/runs/N/plan.
 */
export const GET = api<P>("GET /api/runs/[runId]", async ({ params }) => {
  const run = await getRunSummary(idParam(params.runId, "That plan"));
  if (!run) throw notFound("That plan");
  return { run };
});
