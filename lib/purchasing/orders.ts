/**
 * Purchase orders: their states, what moves them, and their CSV. Shared by server and client.
 *
 *   draft ──send──▶ sent ──receive──▶ part_received ──receive / close──▶ closed
 *     └──cancel──▶ cancelled ◀──cancel──┘
 * A line is filled at 90 % of what was ordered; the order closes itself when every line is.
 */
import { toCsv } from "@/lib/csv";
import { m3ToBoardFeet } from "@/lib/units";
import type { PriceUnit } from "./pricing";
import type { Vec3 } from "@/lib/nesting";

export const PO_STATUSES = ["draft", "sent", "part_received", "closed", "cancelled"] as const;
export type PoStatus = (typeof PO_STATUSES)[number];

export const PO_STATUS_LABELS: Record<PoStatus, string> = {
  draft: "Draft",
  sent: "Sent to supplier",
  part_received: "Partly received",
  closed: "Closed",
  cancelled: "Cancelled",
};

export type PoAction = "edit" | "send" | "receive" | "close" | "cancel";

const ALLOWED: Record<PoAction, readonly PoStatus[]> = {
  edit: ["draft"],
  send: ["draft", "sent"], // sending again re-sends the same order
  receive: ["sent", "part_received"],
  close: ["part_received"],
  cancel: ["draft", "sent"],
};

/**
 * Whether an order in `status` may take `action`; the reason when not (the API answers 409).
 *
 *   poActionRefusal("closed", "receive")  // "PO is closed: nothing more can be received against it."
 */
export function poActionRefusal(status: PoStatus, action: PoAction): string | null {
  if (ALLOWED[action].includes(status)) return null;
  const label = PO_STATUS_LABELS[status].toLowerCase();
  switch (action) {
    case "edit":
      return `This order is ${label}: only a draft can be changed.`;
    case "send":
      return `This order is ${label}: it cannot be sent.`;
    case "receive":
      return status === "draft"
        ? "This order is still a draft: send it before receiving against it."
        : `This order is ${label}: nothing more can be received against it.`;
    case "close":
      return `This order is ${label}: only a partly received order can be closed short.`;
    case "cancel":
      return `This order is ${label}: ${status === "part_received" ? "close it short instead." : "it cannot be cancelled."}`;
  }
}

export interface PoLine {
  id: number;
  gradeId: number;
  gradeCode: string;
  gradeLabel: string;
  size: Vec3;
  quantity: number;
  price: number;
  priceUnit: PriceUnit;
  volumeM3: number;
  value: number;
  note: string | null;
  receivedBlocks: number;
  receivedM3: number;
  overTolerance: boolean;
}

export interface PurchaseOrder {
  id: number;
  number: string;
  supplierId: number;
  supplier: string;
  supplierEmail: string | null;
  status: PoStatus;
  expectedOn: string | null;
  notes: string | null;
  createdBy: string | null;
  createdAt: string;
  sentAt: string | null;
  closedAt: string | null;
  cancelReason: string | null;
  lines: PoLine[];
  volumeM3: number;
  value: number;
  receivedM3: number;
}

export const PO_CSV_COLUMNS = [
  "po_number",
  "supplier",
  "status",
  "expected_on",
  "line",
  "grade",
  "grade_name",
  "length_mm",
  "width_mm",
  "height_mm",
  "quantity",
  "volume_m3",
  "board_feet",
  "price",
  "price_unit",
  "line_total",
  "received_blocks",
  "note",
] as const;

/**
 * One row per line, with the order's number and supplier repeated so the file stands alone in a
 * purchasing system. Formula-looking text is escaped by toCsv.
 */
export function purchaseOrderCsv(po: PurchaseOrder): string {
  const rows = po.lines.map((l, i) => ({
    po_number: po.number,
    supplier: po.supplier,
    status: po.status,
    expected_on: po.expectedOn,
    line: i + 1,
    grade: l.gradeCode,
    grade_name: l.gradeLabel,
    length_mm: l.size[0],
    width_mm: l.size[1],
    height_mm: l.size[2],
    quantity: l.quantity,
    volume_m3: Number(l.volumeM3.toFixed(4)),
    board_feet: Math.round(m3ToBoardFeet(l.volumeM3)),
    price: l.price,
    price_unit: l.priceUnit,
    line_total: l.value,
    received_blocks: l.receivedBlocks,
    note: l.note,
  }));
  return toCsv(rows, [...PO_CSV_COLUMNS]);
}

export const poFileName = (po: Pick<PurchaseOrder, "number">) => `${po.number.replace(/[^\w.-]/g, "_")}.csv`;
