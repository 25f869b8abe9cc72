import { api, readJson } from "@/lib/auth/guard";
import { getJob, listJobParts, updateJob } from "@/db/queries/jobs";
import { jobPartProgress } from "@/db/queries/owed";
import { jobPatchSchema } from "@/lib/validations/jobs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { jobId: string };

/** `GET /api/jobs/3` → `{ job, parts, progress }`: progress per part line is ordered, cut (good), rejected, owed. */
export const GET = api<P>("GET /api/jobs/[jobId]", async ({ params }) => {
  const job = await getJob(idParam(params.jobId, "That job"));
  if (!job) throw notFound("That job");
  const [parts, progress] = await Promise.all([listJobParts([job.id]), jobPartProgress(job.id)]);
  return { job, parts, progress };
});

/** `PATCH /api/jobs/3` `{ name?, customer?, dueOn?, notes?, status? }` → `{ job }` */
export const PATCH = api<P>("PATCH /api/jobs/[jobId]", async ({ req, params, user }) => {
  const id = idParam(params.jobId, "That job");
  const patch = await readJson(req, jobPatchSchema);
  return { job: await updateJob(id, patch, user.id) };
});
