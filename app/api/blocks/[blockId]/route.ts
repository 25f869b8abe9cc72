import { api, readJson } from "@/lib/auth/guard";
import { getBlock, listChildren, updateBlock } from "@/db/queries/blocks";
import { listDefects } from "@/db/queries/defects";
import { blockPatchSchema } from "@/lib/validations/stock";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { blockId: string };

export const GET = api<P>("GET /api/blocks/[blockId]", async ({ params }) => {
  const block = await getBlock(idParam(params.blockId, "That block"));
  if (!block) throw notFound("That block");
  const [defects, offcuts] = await Promise.all([listDefects(block.id), listChildren(block.id)]);
  return { block, defects, offcuts };
});

export const PATCH = api<P>("PATCH /api/blocks/[blockId]", async ({ req, params, user }) => {
  const id = idParam(params.blockId, "That block");
  const patch = await readJson(req, blockPatchSchema);
  await updateBlock(id, patch, user.id);
  return { block: await getBlock(id) };
});
