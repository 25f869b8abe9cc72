import type { ReactNode } from "react";

/**
 * One figure: a small caption above a large value, with an optional note; inside a `<dl>`.
 * `boxed` draws it as a card of its own (the plan's figures); `tone` colours the value (a word
 * beside it says the same, never colour alone).
 *
 *   <dl className="grid grid-cols-3 gap-3"><Figure label="Yield" value="91.2 %" /></dl>
 */
export function Figure({
  label,
  value,
  note,
  tone = "",
  boxed = false,
}: {
  label: string;
  value: ReactNode;
  note?: ReactNode;
  tone?: string;
  boxed?: boolean;
}) {
  return (
    <div className={boxed ? "rounded-card border border-bead bg-paper-raised p-4 shadow-card" : ""}>
      <dt className="text-xs uppercase tracking-wide text-ink-faint">{label}</dt>
      <dd className={`${boxed ? "text-xl" : "text-lg"} font-semibold tabular-nums ${tone}`}>{value}</dd>
      {note && <dd className="text-xs text-ink-faint">{note}</dd>}
    </div>
  );
}
