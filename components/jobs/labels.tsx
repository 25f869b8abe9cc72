import { Badge } from "@/components/ui/card";
import { JOB_STATUS_LABELS, JOB_STATUS_TONES, ROTATE_LABELS, type JobStatus, type RotateRule } from "@/lib/job-terms";
import { outlineArea, type Profile } from "@/lib/profiles";

export function JobStatusBadge({ status }: { status: JobStatus }) {
  return <Badge tone={JOB_STATUS_TONES[status]}>{JOB_STATUS_LABELS[status]}</Badge>;
}

export function RotateLabel({ rotate }: { rotate: RotateRule }) {
  return <span title={`rotate: ${rotate}`}>{ROTATE_LABELS[rotate]}</span>;
}

/** One line describing what shape a part is. */
export function describeProfile(p: Profile | null): string {
  if (!p) return "Box";
  if (p.kind === "polygon") {
    const holes = p.holes?.length ?? 0;
    const holeText = holes ? `, ${holes} ${holes === 1 ? "hole" : "holes"}` : "";
    const area = Math.round(outlineArea(p.points, p.holes ?? [])).toLocaleString("en");
    return `Polygon, ${p.points.length} points${holeText} × ${trim(p.extrudeMm)} mm, ${area} mm²${p.source ? ` · ${p.source}` : ""}`;
  }
  const tip = p.tipChordMm ?? p.chordMm;
  const taper = tip !== p.chordMm;
  return `NACA ${p.code}, chord ${trim(p.chordMm)}${taper ? `→${trim(tip)}` : ""} mm, span ${trim(p.spanMm)} mm${taper ? " (4-axis)" : ""}`;
}

const trim = (v: number) => String(Math.round(v * 100) / 100);
