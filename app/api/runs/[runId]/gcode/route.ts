import { z } from "zod";
import { api, parseWith } from "@/lib/auth/guard";
import { blockSteps } from "@/db/queries/at-the-machine";
import { getRun } from "@/db/queries/runs";
import { HttpError, notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { program, wirePath } from "@/lib/planning/wire-path";

type P = { runId: string };
const NAME_BLOCK = "Name the block, e.g. block=HF-1001.";
const NAME_STEP = "Name the step, e.g. step=1: one program per placement.";
const query = z.object({
  block: z.string({ error: NAME_BLOCK }).min(1, NAME_BLOCK).max(40, NAME_BLOCK),
  step: z.coerce.number({ error: NAME_STEP }).int(NAME_STEP).positive(NAME_STEP),
});

/**
 * The G-code program of one placement (step) of one block, for the plan's machine, in its
 * dialect: the wire enters from the air, follows that placement's kerfs, heat on and off around
 * the feed moves. Dry-run with the wire cold first.
 */
export const GET = api<P>("GET /api/runs/[runId]/gcode", async ({ req, params }) => {
  const { block, step } = parseWith(query, Object.fromEntries(req.nextUrl.searchParams));
  const run = await getRun(idParam(params.runId, "That plan"));
  const b = run?.blocks.find((x) => x.code === block);
  if (!run?.plan || !b || !run.problem.blocks.some((x) => x.id === block)) throw notFound("That block in this plan");
  const s = await blockSteps(run, b.id);
  if (!s.procedure.ok)
    throw new HttpError(409, `${block} cannot be cut on ${s.machine.name}: ${s.procedure.problems[0]?.limit ?? ""}.`);
  const st = s.procedure.steps[step - 1];
  if (!st) throw notFound(`Step ${step} of ${block}`);
  const text = program(st, wirePath(st, s.machine, run.settings.kerf, s.feed), s.machine, {
    blockCode: block,
    kerf: run.settings.kerf,
    feed: s.feed,
    grade: s.grade ?? undefined,
    steps: s.procedure.steps.length,
  });
  return new Response(text, {
    headers: {
      "content-type": "text/plain; charset=utf-8",
      "content-disposition": `attachment; filename="plan-${run.id}-${block.replace(/[^\w.-]/g, "_")}-step-${step}.nc"`,
    },
  });
});
