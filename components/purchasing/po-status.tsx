import { Badge } from "@/components/ui/card";
import { PO_STATUS_LABELS, type PoStatus } from "@/lib/purchasing/orders";

const TONE: Record<PoStatus, "plain" | "kerf" | "wire" | "moss" | "ember"> = {
  draft: "plain",
  sent: "kerf",
  part_received: "wire",
  closed: "moss",
  cancelled: "ember",
};

export function PoStatusBadge({ status }: { status: PoStatus }) {
  return <Badge tone={TONE[status]}>{PO_STATUS_LABELS[status]}</Badge>;
}
