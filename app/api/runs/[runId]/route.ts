import { api } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { runId: string };

/** A run with its progress and, once finished, its plan. The progress bar polls this. */
export const GET = api<P>("GET /api/runs/[runId]", async ({ params }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run) throw notFound("That plan");
  return { run };
});
