import { api } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { approveRun } from "@/db/queries/run-approval";
import { idParam } from "@/lib/params";

type P = { runId: string };

export const POST = api<P>("POST /api/runs/[runId]/approve", async ({ params, user }) => {
  const id = idParam(params.runId, "That plan");
  await approveRun(id, user.id);
  return { run: await getRun(id) };
});
