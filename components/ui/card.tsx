import type { ReactNode } from "react";

export function Card({
  title,
  action,
  children,
  className = "",
}: {
  title?: ReactNode;
  action?: ReactNode;
  children: ReactNode;
  className?: string;
}) {
  return (
    <section className={`rounded-card border border-bead bg-paper-raised p-5 shadow-card ${className}`}>
      {(title || action) && (
        <header className="mb-3 flex items-center justify-between gap-3">
          {title && <h2>{title}</h2>}
          {action}
        </header>
      )}
      {children}
    </section>
  );
}

export function PageHeader({ title, lead, actions }: { title: string; lead?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1>{title}</h1>
        {lead && <p className="mt-1 max-w-2xl text-ink-soft">{lead}</p>}
      </div>
      {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
    </div>
  );
}

type NoticeTone = "info" | "caution" | "danger" | "success";
const NOTICE: Record<NoticeTone, string> = {
  info: "border-kerf bg-kerf-light text-ink",
  caution: "border-wire bg-wire-light text-ink",
  danger: "border-ember bg-ember-light text-ink",
  success: "border-moss bg-moss-light text-ink",
};

/**
 * A boxed message. It is not a live region: a result of an action goes through ResultNotice or
 * LiveNotice, which say it in the page's one live region (components/ui/announcer.tsx).
 */
export function Notice({ tone = "info", title, children }: { tone?: NoticeTone; title?: string; children: ReactNode }) {
  return (
    <div className={`rounded-md border-l-4 px-4 py-3 text-sm ${NOTICE[tone]}`}>
      {title && <p className="font-semibold">{title}</p>}
      <div>{children}</div>
    </div>
  );
}

export function Badge({
  children,
  tone = "plain",
}: {
  children: ReactNode;
  tone?: "plain" | "kerf" | "wire" | "moss" | "ember";
}) {
  const tones = {
    plain: "bg-paper-sunk text-ink-soft",
    kerf: "bg-kerf-light text-kerf-dark",
    wire: "bg-wire-light text-wire",
    moss: "bg-moss-light text-moss",
    ember: "bg-ember-light text-ember",
  };
  return (
    <span
      className={`inline-flex items-center whitespace-nowrap rounded px-2 py-0.5 text-xs font-medium ${tones[tone]}`}
    >
      {children}
    </span>
  );
}
