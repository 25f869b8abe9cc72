import { formatDateTime } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { listOutbox } from "@/db/queries/outbox";
import { Badge, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass, rowLinkClass } from "@/components/ui/button";
import { mailConfig } from "@/lib/mail/config";

export const metadata: Metadata = { title: "Outbox" };

const SCROLLS = "overflow-x-auto rounded-card border border-bead bg-paper-raised shadow-card";

export default async function OutboxPage({ searchParams }: { searchParams: Promise<{ page?: string }> }) {
  await requirePage("/admin/outbox");
  const page = Math.max(1, Math.min(10_000, Number((await searchParams).page) || 1));
  const { items, total } = await listOutbox({ page, pageSize: 50 });
  let where: string;
  try {
    const c = mailConfig();
    where =
      c.kind === "smtp"
        ? "Mail goes to the SMTP server set in the environment (SMTP_URL or SMTP_HOST)."
        : `No SMTP server is set: mail is written to ${c.dir} as .eml files and not delivered.`;
  } catch (e) {
    where = e instanceof Error ? e.message : "The mail settings are not valid.";
  }
  return (
    <>
      <PageHeader title="Outbox" lead={`Every e-mail Blockyard has sent or tried to send: ${total} in all.`} />
      <div className="mb-4">
        <Notice>{where}</Notice>
      </div>
      {/* biome-ignore lint/a11y/noNoninteractiveTabindex: a keyboard scrolls the wide table sideways (WCAG 2.1.1) */}
      <section tabIndex={0} aria-label="Mail sent, newest first" className={SCROLLS}>
        <table>
          <thead className="border-b border-bead bg-paper-sunk">
            <tr>
              <th className="px-3 py-2">When</th>
              <th className="px-3 py-2">What</th>
              <th className="px-3 py-2">To</th>
              <th className="px-3 py-2">Subject</th>
              <th className="px-3 py-2">Attached</th>
              <th className="px-3 py-2">How</th>
              <th className="px-3 py-2">By</th>
            </tr>
          </thead>
          <tbody>
            {items.map((m) => (
              <tr key={m.id} className="border-b border-bead/60 align-top last:border-0" data-testid={`mail-${m.id}`}>
                <td className="whitespace-nowrap px-3 py-2">{formatDateTime(m.at)}</td>
                <td className="px-3 py-2">
                  {m.kind === "purchase_order"
                    ? "Purchase order"
                    : m.kind === "low_stock"
                      ? "Low-stock alert"
                      : "Other"}
                  {m.ref?.startsWith("po:") && (
                    <Link className={rowLinkClass} href={`/purchasing/orders/${m.ref.slice(3)}`}>
                      Open the order
                    </Link>
                  )}
                </td>
                <td className="px-3 py-2">{m.to}</td>
                <td className="px-3 py-2">
                  {m.subject}
                  {m.error && <p className="text-xs text-ember">{m.error}</p>}
                </td>
                <td className="px-3 py-2">{m.attachments.join(", ") || "–"}</td>
                <td className="px-3 py-2">
                  {m.status === "sent" ? (
                    <Badge tone="moss">{m.transport === "smtp" ? "sent by SMTP" : "kept in outbox"}</Badge>
                  ) : (
                    <Badge tone="ember">failed</Badge>
                  )}
                  {m.file && <p className="text-xs text-ink-faint">{m.file}</p>}
                </td>
                <td className="px-3 py-2">{m.sentBy ?? "scheduled"}</td>
              </tr>
            ))}
            {!items.length && (
              <tr>
                <td colSpan={7} className="px-3 py-6 text-center text-ink-faint">
                  Nothing has been sent yet.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </section>
      <div className="mt-4 flex justify-between text-sm">
        {page > 1 ? (
          <Link className={buttonClass("secondary")} href={`/admin/outbox?page=${page - 1}`}>
            Newer
          </Link>
        ) : (
          <span />
        )}
        {page * 50 < total && (
          <Link className={buttonClass("secondary")} href={`/admin/outbox?page=${page + 1}`}>
            Older
          </Link>
        )}
      </div>
    </>
  );
}
