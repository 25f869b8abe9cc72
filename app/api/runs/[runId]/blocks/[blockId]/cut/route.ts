import { api, readJson } from "@/lib/auth/guard";
import { recordCut } from "@/db/queries/cuts";
import { recordCutSchema } from "@/lib/validations/runs";
import { idParam } from "@/lib/params";

type P = { runId: string; blockId: string };

/** The cutter marks a block done: consumed, offcuts into stock, rejects recorded. */
export const POST = api<P>("POST /api/runs/[runId]/blocks/[blockId]/cut", async ({ req, params, user }) => {
  const input = await readJson(req, recordCutSchema);
  return recordCut(idParam(params.runId, "That plan"), idParam(params.blockId, "That block"), input, user.id);
});
