import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listLibraryParts } from "@/db/queries/library";
import { listGrades, partGradeChoices } from "@/db/queries/grades";
import { displayUnit } from "@/lib/display";
import { Card, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { LibraryList } from "@/components/jobs/library-list";
import { PartForm } from "@/components/jobs/part-form";
import { plural } from "@/lib/format";

export const metadata: Metadata = { title: "Part library" };

export default async function LibraryPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const user = await requirePage("/library");
  const canEdit = allows(["planner"], user.roles);
  const raw = (await searchParams).q;
  const q = typeof raw === "string" ? raw.trim().slice(0, 120) : "";
  const [all, found, grades, unit] = await Promise.all([
    listLibraryParts({ includeRetired: canEdit }),
    q ? listLibraryParts({ q, includeRetired: canEdit }) : null,
    listGrades(),
    displayUnit(user),
  ]);
  const parts = found ?? all;
  const kits = [...new Set(all.map((p) => p.kit).filter((k): k is string => !!k))];
  const gradeOptions = partGradeChoices(grades);
  return (
    <>
      <PageHeader
        title="Part library"
        lead="Parts the shop cuts again and again, grouped by kit. Add them to a job with a quantity."
      />
      <search className="mb-4">
        <form
          method="get"
          action="/library"
          className="rounded-card border border-bead bg-paper-raised p-4 text-sm shadow-card"
        >
          <label htmlFor="library-q" className="block font-medium text-ink-soft">
            Find a part
          </label>
          <div className="mt-1 flex flex-wrap gap-2">
            <input
              id="library-q"
              name="q"
              type="search"
              defaultValue={q}
              maxLength={120}
              placeholder="wing, Kestrel, EPS-II"
              aria-describedby="library-q-hint"
              className="min-h-11 w-72 max-w-full rounded-md border border-bead-strong bg-paper-raised px-3"
            />
            <button type="submit" className={buttonClass("primary")}>
              Search
            </button>
            {q && (
              <Link href="/library" className={buttonClass("quiet")}>
                Show all
              </Link>
            )}
          </div>
          <p id="library-q-hint" className="mt-1 text-xs text-ink-faint">
            Words from the part&apos;s name, its kit or its grade code
          </p>
        </form>
      </search>
      {q && (
        <p className="mb-3 text-sm text-ink-soft" role="status" data-testid="library-search-result">
          {parts.length
            ? `${plural(parts.length, "part")} ${parts.length === 1 ? "matches" : "match"} “${q}”.`
            : `No library part matches “${q}”.`}
        </p>
      )}
      <div className={`grid gap-5 ${canEdit ? "xl:grid-cols-[1fr_26rem]" : ""}`}>
        {q && !parts.length ? (
          <Card>
            <p className="text-ink-soft">
              Nothing found. Try fewer or shorter words, or <Link href="/library">show the whole library</Link>.
            </p>
          </Card>
        ) : (
          <LibraryList parts={JSON.parse(JSON.stringify(parts))} unit={unit} canEdit={canEdit} grades={gradeOptions} />
        )}
        {canEdit && (
          <Card title="Add a library part">
            <PartForm target={{ kind: "library" }} unit={unit} kits={kits} grades={gradeOptions} />
          </Card>
        )}
      </div>
    </>
  );
}
