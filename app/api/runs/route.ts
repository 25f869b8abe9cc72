import { NextResponse } from "next/server";
import { z } from "zod";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { listRuns, type RunStatus } from "@/db/queries/runs";
import { createRun } from "@/db/queries/run-plan";
import { createRunSchema } from "@/lib/validations/runs";
import { enqueue } from "@/lib/jobs/boss";
import { QUEUES } from "@/lib/jobs/queues";

const query = z.object({
  job: z.coerce.number().int().positive().optional(),
  status: z.enum(["queued", "running", "done", "failed", "cancelled", "approved", "closed"]).optional(),
  before: z.coerce.number().int().positive({ error: "before is a plan number." }).optional(),
  limit: z.coerce.number().int().min(1).max(200, { error: "limit is at most 200." }).optional(),
});

export const GET = api("GET /api/runs", async ({ req }) => {
  const q = parseWith(query, Object.fromEntries(req.nextUrl.searchParams));
  // Newest first, 50 unless `limit`; `before=<plan number>` pages back to older runs.
  return {
    items: await listRuns({
      jobId: q.job,
      statuses: q.status ? [q.status as RunStatus] : undefined,
      limit: q.limit,
      beforeId: q.before,
    }),
  };
});

/**
 * Starts a nesting run: stored as queued, then picked up by a background worker. Chosen blocks that
 * cannot be used are left out, not a reason to refuse: `{ id, leftOut: [{ id, code, reason }] }`.
 */
export const POST = api("POST /api/runs", async ({ req, user }) => {
  const input = await readJson(req, createRunSchema);
  const { id, leftOut } = await createRun(input, user.id);
  await enqueue(QUEUES.nestingRun, { runId: id }, { retryLimit: 1 });
  return NextResponse.json({ id, leftOut }, { status: 201 });
});
