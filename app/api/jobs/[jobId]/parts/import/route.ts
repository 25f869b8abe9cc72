import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { importJobParts } from "@/db/queries/jobs";
import { readCsvBody } from "@/lib/upload";
import { idParam } from "@/lib/params";

type P = { jobId: string };

/**
 * `POST /api/jobs/3/parts/import?commit=0|1&name=parts.csv` with the CSV as the body.
 * Preview lists every row's problems and changes nothing; commit adds all rows or none (422).
 */
export const POST = api<P>("POST /api/jobs/[jobId]/parts/import", async ({ req, params, user }) => {
  const jobId = idParam(params.jobId, "That job");
  const bytes = await readCsvBody(req, 5 * 1024 * 1024);
  const commit = req.nextUrl.searchParams.get("commit") === "1";
  const report = await importJobParts(
    jobId,
    bytes,
    req.nextUrl.searchParams.get("name")?.slice(0, 200) ?? null,
    user.id,
    commit,
  );
  const status = report.problemCount ? 422 : commit ? 201 : 200;
  return NextResponse.json(report, { status });
});
