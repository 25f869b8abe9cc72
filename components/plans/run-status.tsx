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

export function RunStatusBadge({ status }: { status: keyof typeof LABELS }) {
  const [label, tone] = LABELS[status];
  return <Badge tone={tone}>{label}</Badge>;
}
