import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { createGrade, listGrades } from "@/db/queries/grades";
import { gradeSchema } from "@/lib/validations/stock";

export const GET = api("GET /api/grades", async () => ({ items: await listGrades() }));

export const POST = api("POST /api/grades", async ({ req, user }) => {
  const input = await readJson(req, gradeSchema);
  return NextResponse.json({ grade: await createGrade(input, user.id) }, { status: 201 });
});
