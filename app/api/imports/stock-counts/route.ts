import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { importStockCount } from "@/db/queries/imports";
import { readCsvBody } from "@/lib/upload";

/** `POST /api/imports/stock-counts?commit=0|1&name=file.csv`: preview or commit a stock count, all or nothing. */
export const POST = api("POST /api/imports/stock-counts", async ({ req, user }) => {
  const bytes = await readCsvBody(req);
  const commit = req.nextUrl.searchParams.get("commit") === "1";
  const report = await importStockCount(
    bytes,
    req.nextUrl.searchParams.get("name")?.slice(0, 200) ?? null,
    user.id,
    commit,
  );
  const status = report.problemCount ? 422 : commit ? 201 : 200;
  return NextResponse.json(report, { status });
});
