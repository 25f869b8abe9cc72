import { api, readJson } from "@/lib/auth/guard";
import { adjustBlock, getBlock } from "@/db/queries/blocks";
import { adjustSchema } from "@/lib/validations/stock";
import { idParam } from "@/lib/params";

type P = { blockId: string };

/** Re-measures a block; the ledger records the volume change with the reason. */
export const POST = api<P>("POST /api/blocks/[blockId]/adjust", async ({ req, params, user }) => {
  const id = idParam(params.blockId, "That block");
  const { size, reason } = await readJson(req, adjustSchema);
  await adjustBlock(id, size, reason, user.id);
  return { block: await getBlock(id) };
});
