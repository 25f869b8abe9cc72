/** Shapes of stock records as the API sends them; shared by query modules and client components. */
import type { BlockStatus, Material, ShownStatus } from "@/lib/stock";

export type Size = [number, number, number];

export interface BlockSummary {
  id: number;
  code: string;
  gradeId: number;
  gradeCode: string;
  material: Material;
  neverHotWire: boolean;
  colour: string;
  lot: string;
  size: Size;
  volumeM3: number;
  weightKg: number | null;
  densityKgM3: number | null;
  minDensity: number | null;
  cost: number;
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
}

/** One page of the stock list with the count and totals of everything the filters match. */
export interface BlockList {
  items: BlockSummary[];
  total: number;
  totals: { volumeM3: number; value: number };
  page: number;
  pageSize: number;
}
