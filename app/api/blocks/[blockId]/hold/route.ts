import { api, readJson } from "@/lib/auth/guard";
import { getBlock, holdBlock } from "@/db/queries/blocks";
import { holdSchema } from "@/lib/validations/claims";
import { idParam } from "@/lib/params";

type P = { blockId: string };

/**
 * `POST /api/blocks/12/hold` `{ reason: "wet", note? }` → `{ block }`: holds a free block out of
 * usable stock (not on hand, not offered to planning) until the buyer releases it.
 */
export const POST = api<P>("POST /api/blocks/[blockId]/hold", async ({ req, params, user }) => {
  const id = idParam(params.blockId, "That block");
  const input = await readJson(req, holdSchema);
  await holdBlock(id, input, user.id);
  return { block: await getBlock(id) };
});
