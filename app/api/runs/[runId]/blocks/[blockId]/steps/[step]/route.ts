import { z } from "zod";
import { api, readJson } from "@/lib/auth/guard";
import { blockSteps, setStepDone } from "@/db/queries/at-the-machine";
import { getRun } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { runId: string; blockId: string; step: string };
const body = z.object({
  done: z.boolean({ error: "Say done: true or done: false." }),
  /** Parts found bad as they came off in this step. */
  rejects: z
    .array(
      z.object({
        jobPartId: z.number({ error: "Which part?" }).int().positive(),
        count: z.number({ error: "How many?" }).int().min(1, "At least 1.").max(10_000),
        reason: z.string({ error: "Say why." }).trim().min(1, "Say why it was rejected.").max(300),
      }),
    )
    .max(100)
    .default([]),
  /**
   * The check's own id, the same when the tablet sends it again (its answer was lost): rejects
   * are then not added twice. Any text of 8 to 100 letters, digits and dashes.
   */
  requestId: z
    .string()
    .regex(/^[A-Za-z0-9-]{8,100}$/, "requestId: 8 to 100 letters, digits and dashes, the same for a check sent again.")
    .optional(),
});

/** Checks a step off at the machine (done: true) or on again (done: false); stored, so work can go on elsewhere. */
export const PUT = api<P>("PUT /api/runs/[runId]/blocks/[blockId]/steps/[step]", async ({ req, params, user }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run?.plan) throw notFound("That plan");
  const blockId = idParam(params.blockId, "That block");
  const step = idParam(params.step, "That step");
  const { done, rejects, requestId } = await readJson(req, body);
  await setStepDone(run, blockId, step, done, user.id, rejects, requestId);
  const steps = await blockSteps(run, blockId);
  return { done: steps.done };
});
