import { api, readJson } from "@/lib/auth/guard";
import { getJob, listJobParts, updateJob } from "@/db/queries/jobs";
import { jobPatchSchema } from "@/lib/validations/jobs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { jobId: string };

/** `GET /api/jobs/3` → `{ job, parts }` */
export const GET = api<P>("GET /api/jobs/[jobId]", async ({ params }) => {
  const job = await getJob(idParam(params.jobId, "That job"));
  if (!job) throw notFound("That job");
  return { job, parts: await listJobParts([job.id]) };
});

/** `PATCH /api/jobs/3` `{ name?, customer?, dueOn?, notes?, status? }` → `{ job }` */
export const PATCH = api<P>("PATCH /api/jobs/[jobId]", async ({ req, params, user }) => {
  const id = idParam(params.jobId, "That job");
  const patch = await readJson(req, jobPatchSchema);
  return { job: await updateJob(id, patch, user.id) };
});
