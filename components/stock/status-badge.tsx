import { STATUS_LABELS, type ShownStatus } from "@/lib/stock";
import { Badge } from "@/components/ui/card";

const TONE: Record<ShownStatus, "plain" | "kerf" | "wire" | "moss" | "ember"> = {
  settling: "wire",
  ready: "moss",
  earmarked: "kerf",
  cut: "plain",
  written_off: "ember",
};

export function StatusBadge({ status }: { status: ShownStatus }) {
  return <Badge tone={TONE[status]}>{STATUS_LABELS[status]}</Badge>;
}

export function GradeChip({ code, colour, noWire }: { code: string; colour: string; noWire?: boolean }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap">
      <span
        className="inline-block size-3 rounded-sm border border-ink/20"
        style={{ background: colour }}
        aria-hidden="true"
      />
      <span>{code}</span>
      {noWire && <Badge tone="ember">no hot wire</Badge>}
    </span>
  );
}
