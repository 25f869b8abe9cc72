/** Shapes of stock records as the API sends them; shared by query modules and client components. */
import type { BlockStatus, HoldReason, Material, ShownStatus } from "@/lib/stock";
import type { Vec3 } from "@/lib/nesting";

export interface BlockSummary {
  id: number;
  code: string;
  gradeId: number;
  gradeCode: string;
  material: Material;
  neverHotWire: boolean;
  colour: string;
  lot: string;
  size: Vec3;
  volumeM3: number;
  weightKg: number | null;
  densityKgM3: number | null;
  minDensity: number | null;
  /** null in the answers of a role that does not see money (lib/auth/policy.ts, MONEY). */
  cost: number | null;
  location: string;
  mouldedOn: string | null;
  cutNotBefore: string;
  status: BlockStatus;
  shown: ShownStatus;
  isOffcut: boolean;
  parentId: number | null;
  defectCount: number;
  fifo: number | null;
  receivedOn: string | null;
  supplier: string | null;
  /** Why the block is held out of usable stock (status on_hold), by whom and since when; else null. */
  hold: BlockHold | null;
}

export interface BlockHold {
  reason: HoldReason;
  note: string | null;
  since: string;
  by: string | null;
}

/** One page of the stock list with the count and totals of everything the filters match. */
export interface BlockList {
  items: BlockSummary[];
  total: number;
  /** value is null for a role that does not see money (lib/auth/policy.ts, MONEY). */
  totals: { volumeM3: number; value: number | null };
  page: number;
  pageSize: number;
  /** Cursors for the pages after and before this one (null at either end): `?after=` / `?before=`. */
  next: string | null;
  prev: string | null;
}

/** What a row of the stock table shows; the stock page sends only these fields to the browser. */
const STOCK_ROW_FIELDS = [
  "id",
  "code",
  "gradeCode",
  "colour",
  "neverHotWire",
  "size",
  "volumeM3",
  "shown",
  "cutNotBefore",
  "fifo",
  "location",
  "lot",
  "defectCount",
  "isOffcut",
  "hold",
] as const;
export type StockRow = Pick<BlockSummary, (typeof STOCK_ROW_FIELDS)[number]>;

/** A stock list page as the stock table needs it (`GET /api/blocks` answers a superset). */
export interface StockRows extends Omit<BlockList, "items"> {
  items: StockRow[];
}

export function toStockRows(list: BlockList): StockRows {
  const items = list.items.map((b) => Object.fromEntries(STOCK_ROW_FIELDS.map((f) => [f, b[f]])) as StockRow);
  return { ...list, items };
}
