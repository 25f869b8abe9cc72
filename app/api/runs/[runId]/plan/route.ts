import { api } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { runId: string };

/** A run's problem and plan (format v1), with its blocks and parts as the app knows them. */
export const GET = api<P>("GET /api/runs/[runId]/plan", async ({ params }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run) throw notFound("That plan");
  return { run };
});
