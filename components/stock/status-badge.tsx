import { HOLD_LABELS, STATUS_LABELS, type HoldReason, type ShownStatus } from "@/lib/stock";
import { Badge } from "@/components/ui/card";

const TONE: Record<ShownStatus, "plain" | "kerf" | "wire" | "moss" | "ember"> = {
  settling: "wire",
  ready: "moss",
  earmarked: "kerf",
  on_hold: "ember",
  cut: "plain",
  written_off: "ember",
};

/** A block's status in words; a held block says why ("On hold: wet"), not by colour alone. */
export function StatusBadge({ status, hold }: { status: ShownStatus; hold?: HoldReason | null }) {
  return (
    <Badge tone={TONE[status]}>
      {status === "on_hold" && hold ? `On hold: ${HOLD_LABELS[hold]}` : STATUS_LABELS[status]}
    </Badge>
  );
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
