import { NextResponse } from "next/server";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { createJob, listJobs } from "@/db/queries/jobs";
import { jobQuerySchema, jobSchema } from "@/lib/validations/jobs";

/** `GET /api/jobs?status=open&page=1&pageSize=25` → `{ items, total, page, pageSize }` (status: a job status, active or all). */
export const GET = api("GET /api/jobs", async ({ req }) => {
  return listJobs(parseWith(jobQuerySchema, Object.fromEntries(req.nextUrl.searchParams)));
});

/** `POST /api/jobs` `{ name, customer?, dueOn?, notes? }` → 201 `{ job }` */
export const POST = api("POST /api/jobs", async ({ req, user }) => {
  const input = await readJson(req, jobSchema);
  return NextResponse.json({ job: await createJob(input, user.id) }, { status: 201 });
});
