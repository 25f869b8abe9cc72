import "server-only";
import { db } from "@/db";

export interface OutboxEntry {
  id: number;
  kind: string;
  to: string;
  subject: string;
  transport: string;
  status: "sent" | "failed";
  messageId: string | null;
  file: string | null;
  attachments: string[];
  error: string | null;
  ref: string | null;
  sentBy: string | null;
  at: string;
}

/** One attempt to send a mail, sent or failed (lib/mail/send.ts), for the admin's outbox page. */
export async function recordMail(row: {
  kind: string;
  to_address: string;
  subject: string;
  transport: string;
  attachments: string;
  ref: string | null;
  sent_by: string | null;
  status: "sent" | "failed";
  message_id?: string | null;
  file?: string | null;
  error?: string;
}): Promise<void> {
  await db()("mail_outbox").insert(row);
}

export async function listOutbox(
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ items: OutboxEntry[]; total: number }> {
  const pageSize = opts.pageSize ?? 50;
  const k = db();
  const [rows, count] = await Promise.all([
    k("mail_outbox as m")
      .leftJoin("users as u", "u.id", "m.sent_by")
      .select("m.*", "u.name as sent_by_name")
      .orderBy([
        { column: "m.at", order: "desc" },
        { column: "m.id", order: "desc" },
      ])
      .limit(pageSize)
      .offset(((opts.page ?? 1) - 1) * pageSize),
    k("mail_outbox").count<{ n: number }[]>({ n: "*" }).first(),
  ]);
  return {
    items: rows.map((r: Record<string, unknown>) => ({
      id: Number(r.id),
      kind: r.kind as string,
      to: r.to_address as string,
      subject: r.subject as string,
      transport: r.transport as string,
      status: r.status as "sent" | "failed",
      messageId: r.message_id as string | null,
      file: r.file as string | null,
      attachments: (r.attachments as string[] | null) ?? [],
      error: r.error as string | null,
      ref: r.ref as string | null,
      sentBy: r.sent_by_name as string | null,
      at: (r.at as Date).toISOString(),
    })),
    total: Number(count?.n ?? 0),
  };
}

/** Active people holding the buyer role (the low-stock alert goes to them). */
export async function listBuyerAddresses(): Promise<string[]> {
  return (
    await db()("users as u")
      .join("user_roles as r", "r.user_id", "u.id")
      .where({ "r.role": "buyer", "u.active": true })
      .distinct("u.email")
      .orderBy("u.email")
  ).map((r: { email: string }) => r.email);
}
