import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listLibraryParts } from "@/db/queries/library";
import { listGrades, partGradeChoices } from "@/db/queries/grades";
import { displayUnit } from "@/lib/display";
import { Card, PageHeader } from "@/components/ui/card";
import { LibraryList } from "@/components/jobs/library-list";
import { PartForm } from "@/components/jobs/part-form";

export const metadata: Metadata = { title: "Part library" };

export default async function LibraryPage() {
  const user = await requirePage("/library");
  const canEdit = allows(["planner"], user.roles);
  const [parts, grades, unit] = await Promise.all([
    listLibraryParts({ includeRetired: canEdit }),
    listGrades(),
    displayUnit(user),
  ]);
  const kits = [...new Set(parts.map((p) => p.kit).filter((k): k is string => !!k))];
  const gradeOptions = partGradeChoices(grades);
  return (
    <>
      <PageHeader
        title="Part library"
        lead="Parts the shop cuts again and again, grouped by kit. Add them to a job with a quantity."
      />
      <div className={`grid gap-5 ${canEdit ? "xl:grid-cols-[1fr_26rem]" : ""}`}>
        <LibraryList parts={JSON.parse(JSON.stringify(parts))} unit={unit} canEdit={canEdit} grades={gradeOptions} />
        {canEdit && (
          <Card title="Add a library part">
            <PartForm target={{ kind: "library" }} unit={unit} kits={kits} grades={gradeOptions} />
          </Card>
        )}
      </div>
    </>
  );
}
