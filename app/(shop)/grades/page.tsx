import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { listGrades } from "@/db/queries/grades";
import { PageHeader } from "@/components/ui/card";
import { GradeEditor } from "@/components/stock/grade-editor";

export const metadata: Metadata = { title: "Grades" };

export default async function GradesPage() {
  await requirePage("/grades");
  const grades = await listGrades();
  return (
    <>
      <PageHeader
        title="Grades"
        lead="The foam grades the shop buys, with the density a block must reach and how long it settles before cutting."
      />
      <GradeEditor grades={grades} canEdit />
    </>
  );
}
