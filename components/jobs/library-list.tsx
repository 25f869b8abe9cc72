"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Badge, Card, Notice } from "@/components/ui/card";
import { formatSize, type LengthUnit } from "@/lib/units";
import type { LibraryPart } from "@/lib/job-terms";
import { RotateLabel, describeProfile } from "./labels";
import { SectionPreview } from "./section-preview";
import { EditLibraryPart } from "./edit-library-part";

export type LibraryRow = LibraryPart;

/** Library parts, one card per kit; the planner can edit a part, retire it or bring it back. */
export function LibraryList({
  parts,
  unit,
  canEdit,
  grades = [],
}: {
  parts: LibraryRow[];
  unit: LengthUnit;
  canEdit: boolean;
  grades?: { id: number; code: string }[];
}) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [editing, setEditing] = useState<number | null>(null);
  const kits = [...new Set(parts.map((p) => p.kit ?? "Parts without a kit"))];
  async function toggle(p: LibraryRow) {
    setError(null);
    try {
      await send(`/api/library/${p.id}`, "PATCH", { active: !p.active });
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "That did not work; nothing was changed.");
    }
  }
  if (!parts.length)
    return (
      <Card>
        <p className="text-ink-soft">The library is empty.</p>
      </Card>
    );
  return (
    <div className="space-y-5">
      {error && <Notice tone="danger">{error}</Notice>}
      {kits.map((kit) => (
        <Card key={kit} title={kit}>
          <ul className="divide-y divide-bead/60" data-testid="library-kit">
            {parts
              .filter((p) => (p.kit ?? "Parts without a kit") === kit)
              .map((p) => (
                <li
                  key={p.id}
                  className={`grid grid-cols-[auto_1fr] items-center gap-x-4 gap-y-2 py-3 sm:grid-cols-[auto_1fr_auto_auto] ${p.active ? "" : "-mx-2 rounded-md bg-paper px-2"}`}
                >
                  <SectionPreview
                    profile={p.profile}
                    size={p.size}
                    width={112}
                    height={56}
                    label={`${p.name} profile`}
                  />
                  <div>
                    <p className="font-medium">
                      {p.name} {!p.active && <Badge>retired</Badge>}
                    </p>
                    <p className="text-xs text-ink-soft">{describeProfile(p.profile)}</p>
                    {p.notes && <p className="text-xs text-ink-faint">{p.notes}</p>}
                  </div>
                  <dl className="col-start-2 grid grid-cols-[auto_auto] justify-start gap-x-3 text-xs sm:col-start-auto sm:w-56">
                    <dt className="text-ink-faint">Box</dt>
                    <dd className="whitespace-nowrap">{formatSize(p.size, unit)}</dd>
                    <dt className="text-ink-faint">Foam</dt>
                    <dd>{((p.trueVolumeMm3 ?? p.size[0] * p.size[1] * p.size[2]) / 1e6).toFixed(2)} dm³</dd>
                    <dt className="text-ink-faint">Grade</dt>
                    <dd className="whitespace-nowrap">
                      {p.gradeCode ?? "any"} · <RotateLabel rotate={p.rotate} />
                    </dd>
                    <dt className="text-ink-faint">Usually</dt>
                    <dd>× {p.defaultQuantity}</dd>
                  </dl>
                  {canEdit ? (
                    <div className="col-start-2 flex gap-1 sm:col-start-auto sm:flex-col">
                      <Button
                        tone="quiet"
                        onClick={() => setEditing(editing === p.id ? null : p.id)}
                        aria-expanded={editing === p.id}
                        aria-label={`Edit ${p.name}`}
                      >
                        Edit
                      </Button>
                      <Button tone="quiet" onClick={() => toggle(p)}>
                        {p.active ? "Retire" : "Bring back"}
                      </Button>
                    </div>
                  ) : (
                    <span className="hidden sm:block" />
                  )}
                  {canEdit && editing === p.id && (
                    <EditLibraryPart part={p} grades={grades} unit={unit} onDone={() => setEditing(null)} />
                  )}
                </li>
              ))}
          </ul>
        </Card>
      ))}
    </div>
  );
}
