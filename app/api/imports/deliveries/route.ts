import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { importDeliveries } from "@/db/queries/imports";
import { readCsvBody } from "@/lib/upload";

/**
 * `POST /api/imports/deliveries?commit=0|1&name=file.csv` with the CSV as the body.
 * Preview lists every row's problems and changes nothing; commit imports all rows or none (422).
 */
export const POST = api("POST /api/imports/deliveries", async ({ req, user }) => {
  const bytes = await readCsvBody(req);
  const commit = req.nextUrl.searchParams.get("commit") === "1";
  const report = await importDeliveries(
    bytes,
    req.nextUrl.searchParams.get("name")?.slice(0, 200) ?? null,
    user.id,
    commit,
  );
  const status = report.problemCount ? 422 : commit ? 201 : 200;
  return NextResponse.json(report, { status });
});
