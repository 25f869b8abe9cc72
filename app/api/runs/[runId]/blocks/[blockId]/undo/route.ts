import { api } from "@/lib/auth/guard";
import { undoCut } from "@/db/queries/cuts";
import { idParam } from "@/lib/params";

type P = { runId: string; blockId: string };

/** Undoes a block's recording for a while after it was made (see UNDO_MINUTES), by reversing ledger entries. */
export const POST = api<P>("POST /api/runs/[runId]/blocks/[blockId]/undo", async ({ params, user }) =>
  undoCut(idParam(params.runId, "That plan"), idParam(params.blockId, "That block"), user.id),
);
