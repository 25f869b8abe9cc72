/** Stock vocabulary shared by server and client: statuses, defect kinds, materials. */
export const BLOCK_STATUSES = ["in_stock", "earmarked", "cut", "written_off"] as const;
export type BlockStatus = (typeof BLOCK_STATUSES)[number];

/** What a person sees: "in stock" splits into settling (cut-not-before still ahead) and ready. */
export const SHOWN_STATUSES = ["settling", "ready", "earmarked", "cut", "written_off"] as const;
export type ShownStatus = (typeof SHOWN_STATUSES)[number];

export const STATUS_LABELS: Record<ShownStatus, string> = {
  settling: "Settling",
  ready: "Ready to cut",
  earmarked: "Earmarked",
  cut: "Cut up",
  written_off: "Written off",
};

export function shownStatus(status: BlockStatus, cutNotBefore: string, today: string): ShownStatus {
  if (status !== "in_stock") return status;
  return cutNotBefore > today ? "settling" : "ready";
}

export const DEFECT_KINDS = ["void", "poor_fusion", "crush", "wet_core", "inclusion", "off_density", "other"] as const;
export type DefectKind = (typeof DEFECT_KINDS)[number];
export const DEFECT_LABELS: Record<DefectKind, string> = {
  void: "Void",
  poor_fusion: "Poor bead fusion",
  crush: "Crush or dent",
  wet_core: "Wet core",
  inclusion: "Inclusion",
  off_density: "Off density",
  other: "Other",
};

export const MATERIALS = ["EPS", "XPS", "EPP", "PU"] as const;
export type Material = (typeof MATERIALS)[number];

export const LEDGER_KINDS = [
  "received",
  "reserved",
  "released",
  "consumed",
  "offcut_created",
  "scrapped",
  "adjusted",
  "reversed",
] as const;
export type LedgerKind = (typeof LEDGER_KINDS)[number];
export const LEDGER_LABELS: Record<LedgerKind, string> = {
  received: "Received",
  reserved: "Earmarked for a plan",
  released: "Released",
  consumed: "Cut up",
  offcut_created: "Offcut kept",
  scrapped: "Written off",
  adjusted: "Adjusted",
  reversed: "Recording undone",
};

/** Local calendar date as YYYY-MM-DD (the shop's day, not UTC's); a DATE column's text passes through. */
export function isoDate(d: Date | string = new Date()): string {
  if (typeof d === "string") return d.slice(0, 10);
  const y = d.getFullYear();
  const m = String(d.getMonth() + 1).padStart(2, "0");
  const day = String(d.getDate()).padStart(2, "0");
  return `${y}-${m}-${day}`;
}

export function addDays(date: string, days: number): string {
  const d = new Date(`${date}T12:00:00`);
  d.setDate(d.getDate() + days);
  return isoDate(d);
}
