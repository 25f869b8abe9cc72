import { api, readJson } from "@/lib/auth/guard";
import { removeJobPart, updateJobPart } from "@/db/queries/jobs";
import { jobPartPatchSchema } from "@/lib/validations/jobs";
import { idParam } from "@/lib/params";

type P = { jobId: string; partId: string };

/** `PATCH /api/jobs/3/parts/17` `{ quantity?, name?, gradeId?, rotate? }` → `{ part }` (open jobs only: 409 otherwise). */
export const PATCH = api<P>("PATCH /api/jobs/[jobId]/parts/[partId]", async ({ req, params, user }) => {
  const jobId = idParam(params.jobId, "That job");
  const partId = idParam(params.partId, "That part");
  const patch = await readJson(req, jobPartPatchSchema);
  return { part: await updateJobPart(jobId, partId, patch, user.id) };
});

/** `DELETE /api/jobs/3/parts/17` → `{ ok: true }` (open jobs only). */
export const DELETE = api<P>("DELETE /api/jobs/[jobId]/parts/[partId]", async ({ params, user }) => {
  await removeJobPart(idParam(params.jobId, "That job"), idParam(params.partId, "That part"), user.id);
  return { ok: true };
});
