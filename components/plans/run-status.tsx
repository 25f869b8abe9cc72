import { Badge } from "@/components/ui/card";

const LABELS = {
  queued: ["Waiting", "plain"],
  running: ["Searching", "kerf"],
  done: ["Ready to approve", "wire"],
  failed: ["Failed", "ember"],
  cancelled: ["Stopped", "plain"],
  approved: ["Approved · stock earmarked", "moss"],
  closed: ["Cut and closed", "plain"],
} as const;

/** A run's state; a finished plan with blocks no cutter can follow (`stuck`) is "Not cuttable", never "Ready to approve". */
export function RunStatusBadge({ status, stuck = false }: { status: keyof typeof LABELS; stuck?: boolean }) {
  if (status === "done" && stuck) return <Badge tone="ember">Not cuttable</Badge>;
  const [label, tone] = LABELS[status];
  return <Badge tone={tone}>{label}</Badge>;
}
