import { api, readJson } from "@/lib/auth/guard";
import { getGrade, updateGrade } from "@/db/queries/grades";
import { gradeSchema } from "@/lib/validations/stock";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { gradeId: string };

export const GET = api<P>("GET /api/grades/[gradeId]", async ({ params }) => {
  const grade = await getGrade(idParam(params.gradeId, "That grade"));
  if (!grade) throw notFound("That grade");
  return { grade };
});

export const PUT = api<P>("PUT /api/grades/[gradeId]", async ({ req, params, user }) => {
  const id = idParam(params.gradeId, "That grade");
  const input = await readJson(req, gradeSchema);
  return { grade: await updateGrade(id, input, user.id) };
});
