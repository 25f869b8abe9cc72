import { api, readJson } from "@/lib/auth/guard";
import { listReorder, saveGradeReorder } from "@/db/queries/reorder";
import { gradeReorderSchema } from "@/lib/validations/purchasing";
import { idParam } from "@/lib/params";

type P = { gradeId: string };

/** Sets a grade's overrides (null clears one) and answers with its recomputed figures. */
export const PUT = api<P>("PUT /api/reorder/[gradeId]", async ({ req, params, user }) => {
  const id = idParam(params.gradeId, "That grade");
  const input = await readJson(req, gradeReorderSchema);
  await saveGradeReorder(id, input, user.id);
  const [item] = await listReorder({ gradeIds: [id] });
  return { item };
});
