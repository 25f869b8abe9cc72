import { z } from "zod";
import { api, readJson } from "@/lib/auth/guard";
import { blockSteps, setStepDone } from "@/db/queries/at-the-machine";
import { getRun } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { runId: string; blockId: string; step: string };
const body = z.object({ done: z.boolean({ error: "Say done: true or done: false." }) });

/** Checks a step off at the machine (done: true) or on again (done: false); stored, so work can go on elsewhere. */
export const PUT = api<P>("PUT /api/runs/[runId]/blocks/[blockId]/steps/[step]", async ({ req, params, user }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run?.plan) throw notFound("That plan");
  const blockId = idParam(params.blockId, "That block");
  const step = idParam(params.step, "That step");
  const { done } = await readJson(req, body);
  await setStepDone(run, blockId, step, done, user!.id);
  const steps = await blockSteps(run, blockId);
  return { done: steps.done };
});
