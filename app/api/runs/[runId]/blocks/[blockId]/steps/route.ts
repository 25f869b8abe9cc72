import { api } from "@/lib/auth/guard";
import { blockSteps } from "@/db/queries/at-the-machine";
import { getRun } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { runId: string; blockId: string };

/** A block's cutting steps on the plan's machine, the steps checked off, and its offcut codes. */
export const GET = api<P>("GET /api/runs/[runId]/blocks/[blockId]/steps", async ({ params }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run?.plan) throw notFound("That plan");
  return await blockSteps(run, idParam(params.blockId, "That block"));
});
