import { formatMoney, plural } from "@/lib/format";
import { poFileName, purchaseOrderCsv, type PurchaseOrder } from "@/lib/purchasing/orders";
import { PRICE_UNIT_LABEL } from "@/lib/purchasing/pricing";
import { formatVolume, m3ToBoardFeet } from "@/lib/units";
import type { OutgoingMail } from "./transport";

const money = formatMoney;
const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);

/**
 * The e-mail that sends an order to its supplier: a short letter, the lines in the body, and the
 * order as a CSV attachment (columns as in the README).
 */
export function purchaseOrderMail(po: PurchaseOrder, shopName: string): OutgoingMail {
  if (!po.supplierEmail) throw new Error(`${po.supplier} has no e-mail address`);
  const lines = po.lines.map(
    (l, i) =>
      `${i + 1}. ${l.quantity} × ${l.gradeCode} (${l.gradeLabel}), ${l.size.join(" × ")} mm — ${formatVolume(l.volumeM3)} / ${Math.round(m3ToBoardFeet(l.volumeM3))} BF at ${l.price} ${PRICE_UNIT_LABEL[l.priceUnit]} = ${money(l.value)}`,
  );
  const text = [
    `Purchase order ${po.number} from ${shopName}`,
    "",
    ...lines,
    "",
    `Total: ${formatVolume(po.volumeM3)}, ${money(po.value)}`,
    po.expectedOn ? `Wanted by: ${po.expectedOn}` : "Wanted by: please tell us your date.",
    po.notes ? `Notes: ${po.notes}` : "",
    "",
    "Quantities within ±10 % of each line are accepted on delivery. Please quote the order number on the delivery note and give each block's lot and moulding date.",
    "The order is attached as a CSV file.",
  ]
    .filter((l, i, all) => l !== "" || all[i - 1] !== "")
    .join("\n");
  const html = `<p>Purchase order <strong>${esc(po.number)}</strong> from ${esc(shopName)}</p><ol>${lines.map((l) => `<li>${esc(l.replace(/^\d+\. /, ""))}</li>`).join("")}</ol><p>Total: ${formatVolume(po.volumeM3)}, ${money(po.value)}<br>${po.expectedOn ? `Wanted by: ${esc(po.expectedOn)}` : "Wanted by: please tell us your date."}</p>${po.notes ? `<p>${esc(po.notes)}</p>` : ""}<p>Quantities within ±10 % of each line are accepted on delivery. Please quote the order number on the delivery note and give each block's lot and moulding date.</p>`;
  return {
    to: po.supplierEmail,
    subject: `Purchase order ${po.number} — ${shopName}`,
    text,
    html,
    attachments: [{ filename: poFileName(po), content: purchaseOrderCsv(po), contentType: "text/csv; charset=utf-8" }],
  };
}

export interface LowStockLine {
  gradeCode: string;
  position: number;
  reorderPoint: number;
  suggestedBlocks: number | null;
  suggestedM3: number;
  supplier: string | null;
}

/** The buyers' alert: the grades at or under their reorder point, with what to order. */
export function lowStockMail(to: string, items: LowStockLine[], shopName: string, appUrl: string | null): OutgoingMail {
  const lines = items.map(
    (g) =>
      `- ${g.gradeCode}: ${formatVolume(g.position, { digits: 2 })} on hand and on order, reorder point ${formatVolume(g.reorderPoint, { digits: 2 })}; suggest ${g.suggestedBlocks !== null ? `${plural(g.suggestedBlocks, "block")} (${formatVolume(g.suggestedM3, { digits: 2 })})` : formatVolume(g.suggestedM3, { digits: 2 })}${g.supplier ? ` from ${g.supplier}` : ""}`,
  );
  return {
    to,
    subject: `${items.length} grade${items.length === 1 ? "" : "s"} at or under the reorder point — ${shopName}`,
    text: [
      `These grades are at or under their reorder point:`,
      "",
      ...lines,
      "",
      appUrl ? `Reorder list: ${appUrl}/purchasing` : "Open the reorder list in Blockyard to draft orders.",
    ].join("\n"),
  };
}
