import { api, readJson } from "@/lib/auth/guard";
import { getBlock, scrapBlock } from "@/db/queries/blocks";
import { scrapSchema } from "@/lib/validations/stock";
import { idParam } from "@/lib/params";

type P = { blockId: string };

/** Writes a block off with a reason (there are no hard deletes of stock). */
export const POST = api<P>("POST /api/blocks/[blockId]/scrap", async ({ req, params, user }) => {
  const id = idParam(params.blockId, "That block");
  const { reason } = await readJson(req, scrapSchema);
  await scrapBlock(id, reason, user.id);
  return { block: await getBlock(id) };
});
