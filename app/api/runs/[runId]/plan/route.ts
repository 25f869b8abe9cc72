import { getRun } from "@/db/queries/runs";
import { api } from "@/lib/auth/guard";
import { HttpError, notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { PLAN_PAGE_PIECES, pagePlan } from "@/lib/planning/plan-page";

type P = { runId: string };

function count(req: { nextUrl: URL }, name: string, max: number): number | undefined {
  const v = req.nextUrl.searchParams.get(name);
  if (v === null) return undefined;
  if (!/^\d{1,7}$/.test(v) || Number(v) > max)
    throw new HttpError(400, `${name} must be a whole number from 0 to ${max.toLocaleString("en")}.`, {
      [name]: "Not a page number.",
    });
  return Number(v);
}

/**
 * A run's problem and plan (format v1), with its blocks and parts as the app knows them.
 * `?offset=N&limit=M` pages the plan by whole blocks (`page` says which and where the next starts);
 * without them a plan of more than PLAN_PAGE_PIECES pieces comes as its first page, so a huge run
 * never answers with one giant body. The polled `GET /api/runs/[runId]` carries figures only.
 */
export const GET = api<P>("GET /api/runs/[runId]/plan", async ({ params, req }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run) throw notFound("That plan");
  const offset = count(req, "offset", 1_000_000);
  const limit = count(req, "limit", 10_000);
  if (limit === 0) throw new HttpError(400, "limit must be at least 1.", { limit: "At least 1 block." });
  if (!run.plan) return { run, page: null };
  const pieces = run.plan.placements.length + run.plan.offcuts.length;
  if (offset === undefined && limit === undefined && pieces <= PLAN_PAGE_PIECES) return { run, page: null };
  const { plan, page } = pagePlan(run.plan, {
    offset,
    limit,
    maxPieces: limit === undefined ? PLAN_PAGE_PIECES : undefined,
  });
  return { run: { ...run, plan }, page };
});
