import crypto from "node:crypto";
import fs from "node:fs/promises";
import path from "node:path";
import nodemailer from "nodemailer";
import type SMTPTransport from "nodemailer/lib/smtp-transport";
import type { MailConfig } from "./config";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: string | Buffer; contentType?: string }[];
}

export interface Delivered {
  transport: MailConfig["kind"];
  messageId: string;
  /** The .eml file, for the outbox transport. */
  file: string | null;
}

/**
 * Sends one message through the configured transport. The outbox transport renders the message
 * with nodemailer's streamTransport and keeps it as an .eml file a mail client can open.
 */
export async function deliver(config: MailConfig, mail: OutgoingMail): Promise<Delivered> {
  const message = {
    from: config.from,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html,
    attachments: mail.attachments,
  };
  if (config.kind === "outbox") {
    const t = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: "unix" });
    const info = await t.sendMail(message);
    await fs.mkdir(config.dir, { recursive: true });
    const stamp = new Date().toISOString().replace(/[:.]/g, "-");
    const file = path.join(config.dir, `${stamp}-${crypto.randomBytes(4).toString("hex")}.eml`);
    await fs.writeFile(file, info.message as Buffer);
    return { transport: "outbox", messageId: info.messageId, file };
  }
  const options: SMTPTransport.Options = config.url
    ? { url: config.url }
    : {
        host: config.host,
        port: config.port,
        secure: config.secure,
        auth: config.user ? { user: config.user, pass: config.pass ?? "" } : undefined,
      };
  const t = nodemailer.createTransport({
    ...options,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
  try {
    const info = await t.sendMail(message);
    return { transport: "smtp", messageId: info.messageId, file: null };
  } finally {
    t.close();
  }
}
