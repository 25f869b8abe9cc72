import { api, readJson } from "@/lib/auth/guard";
import { updateLibraryPart } from "@/db/queries/library";
import { libraryPatchSchema } from "@/lib/validations/jobs";
import { idParam } from "@/lib/params";

type P = { partId: string };

/** `PATCH /api/library/5` with the fields to change (`active: false` retires it) → `{ part }` */
export const PATCH = api<P>("PATCH /api/library/[partId]", async ({ req, params, user }) => {
  const id = idParam(params.partId, "That library part");
  const patch = await readJson(req, libraryPatchSchema);
  return { part: await updateLibraryPart(id, patch, user.id) };
});
