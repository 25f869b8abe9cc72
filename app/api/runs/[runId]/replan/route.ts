import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { replanRun } from "@/db/queries/run-approval";
import { enqueue } from "@/lib/jobs/boss";
import { QUEUES } from "@/lib/jobs/queues";
import { idParam } from "@/lib/params";

type P = { runId: string };

/** Re-plans, in one step, what a plan still owes (rejects and unplaced parts). */
export const POST = api<P>("POST /api/runs/[runId]/replan", async ({ params, user }) => {
  const id = await replanRun(idParam(params.runId, "That plan"), user.id);
  await enqueue(QUEUES.nestingRun, { runId: id }, { retryLimit: 1 });
  return NextResponse.json({ id }, { status: 201 });
});
