import { api, readJson } from "@/lib/auth/guard";
import { getBlock, releaseBlock } from "@/db/queries/blocks";
import { releaseSchema } from "@/lib/validations/claims";
import { idParam } from "@/lib/params";

type P = { blockId: string };

/**
 * `POST /api/blocks/12/release` `{ weightKg?, note? }` → `{ block }`: puts a held block back into
 * usable stock, re-weighed when a weight is given; a density still outside the grade needs a note.
 */
export const POST = api<P>("POST /api/blocks/[blockId]/release", async ({ req, params, user }) => {
  const id = idParam(params.blockId, "That block");
  const input = await readJson(req, releaseSchema);
  await releaseBlock(id, input, user.id);
  return { block: await getBlock(id) };
});
