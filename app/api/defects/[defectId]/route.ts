import { api, readJson } from "@/lib/auth/guard";
import { listDefects, removeDefect, updateDefect } from "@/db/queries/defects";
import { defectPatchSchema } from "@/lib/validations/stock";
import { idParam } from "@/lib/params";

type P = { defectId: string };

/**
 * `PATCH /api/defects/12` `{ kind?, min?, max?, note? }` → `{ changed, items }` (the block's zones).
 * The cutter who flagged the zone or a planner; kept in the audit log with who and when.
 */
export const PATCH = api<P>("PATCH /api/defects/[defectId]", async ({ req, params, user }) => {
  const id = idParam(params.defectId, "That defect zone");
  const patch = await readJson(req, defectPatchSchema);
  const { blockId, changed } = await updateDefect(id, patch, user);
  return { changed, items: await listDefects(blockId) };
});

/** `DELETE /api/defects/12` → `{ ok: true, items }`: the zone is taken back (kept for the record). */
export const DELETE = api<P>("DELETE /api/defects/[defectId]", async ({ params, user }) => {
  const blockId = await removeDefect(idParam(params.defectId, "That defect zone"), user);
  return { ok: true, items: await listDefects(blockId) };
});
