import "server-only";
import path from "node:path";
import { recordMail } from "@/db/queries/outbox";
import { HttpError } from "@/lib/errors";
import { mailConfig } from "./config";
import { deliver, type Delivered, type OutgoingMail } from "./transport";

export type MailKind = "purchase_order" | "low_stock" | "other";

/**
 * Sends one message through the configured transport and writes a row to mail_outbox, sent or
 * failed, so the admin's outbox page shows every attempt. A failure is answered with 502 naming
 * the mail server's reason; nothing else is rolled back by it.
 */
export async function sendMail(
  mail: OutgoingMail,
  meta: { kind: MailKind; ref?: string | null; sentBy?: string | null },
): Promise<Delivered> {
  const config = mailConfig();
  const row = {
    kind: meta.kind,
    to_address: mail.to,
    subject: mail.subject,
    transport: config.kind,
    attachments: JSON.stringify((mail.attachments ?? []).map((a) => a.filename)),
    ref: meta.ref ?? null,
    sent_by: meta.sentBy ?? null,
  };
  try {
    const sent = await deliver(config, mail);
    await recordMail({
      ...row,
      status: "sent",
      message_id: sent.messageId,
      file: sent.file ? path.relative(process.cwd(), sent.file) : null,
    });
    return sent;
  } catch (e) {
    const reason = e instanceof Error ? e.message : String(e);
    await recordMail({ ...row, status: "failed", error: reason.slice(0, 500) });
    throw new HttpError(502, `The mail could not be sent: ${reason.slice(0, 200)}`);
  }
}
