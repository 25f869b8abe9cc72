import "server-only";
import { plural } from "@/lib/format";
import { listDueGrades } from "@/db/queries/reorder";
import { listBuyerAddresses } from "@/db/queries/outbox";
import { getShopSettings } from "@/db/queries/settings";
import { lowStockMail } from "@/lib/mail/messages";
import { sendMail } from "@/lib/mail/send";
import { QUEUES } from "../queues";
import type { JobDefinition } from "../registry";

export interface LowStockAlertResult {
  grades: string[];
  sentTo: string[];
}

/**
 * E-mails every active buyer the grades at or under their reorder point. Nothing is sent when no
 * grade is due. The scheduled job and the reorder page's button both call this.
 */
export async function sendLowStockAlerts(actorId: string | null = null): Promise<LowStockAlertResult> {
  const due = await listDueGrades();
  if (!due.length) return { grades: [], sentTo: [] };
  const [buyers, shop] = await Promise.all([listBuyerAddresses(), getShopSettings()]);
  const items = due.map((r) => ({
    gradeCode: r.gradeCode,
    position: r.result.position,
    reorderPoint: r.result.reorderPoint,
    suggestedBlocks: r.result.suggestedBlocks,
    suggestedM3: r.result.suggestedM3,
    supplier: r.supplier?.name ?? null,
  }));
  for (const to of buyers) {
    await sendMail(lowStockMail(to, items, shop.shopName, process.env.APP_URL ?? null), {
      kind: "low_stock",
      ref: `grades:${due.map((d) => d.gradeId).join(",")}`,
      sentBy: actorId,
    });
  }
  return { grades: due.map((d) => d.gradeCode), sentTo: buyers };
}

/** Weekdays at 06:00 (server time): buyers start the day with the list. */
export const lowStockAlertJob: JobDefinition<{ actorId?: string }> = {
  queue: QUEUES.lowStockAlert,
  options: { retryLimit: 2, retryDelay: 300 },
  schedule: { cron: "0 6 * * 1-5" },
  async handle(data) {
    const r = await sendLowStockAlerts(data?.actorId ?? null);
    console.error(
      `[low-stock-alert] ${plural(r.grades.length, "grade")} due; mailed ${plural(r.sentTo.length, "buyer")}`,
    );
  },
};
