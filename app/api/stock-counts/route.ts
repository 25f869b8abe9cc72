import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { reconcileScanCount } from "@/db/queries/stock-counts";
import { scanCountSchema } from "@/lib/validations/stock-count";

/**
 * `POST /api/stock-counts?commit=0|1` with `{ location, counted: [{ code, location?, size? }], missing? }`:
 * a count by scanning labels. Without commit: what it would do (moved, re-measured, not found);
 * with commit (and the not-found list the person confirmed): reconciled in the ledger, all or nothing.
 */
export const POST = api("POST /api/stock-counts", async ({ req, user }) => {
  const input = await readJson(req, scanCountSchema);
  const commit = req.nextUrl.searchParams.get("commit") === "1";
  const report = await reconcileScanCount(input, user.id, commit);
  return NextResponse.json(report, { status: commit ? 201 : 200 });
});
