/** Stock vocabulary shared by server and client: statuses, defect kinds, materials. */
export const BLOCK_STATUSES = ["in_stock", "earmarked", "on_hold", "cut", "written_off"] as const;
export type BlockStatus = (typeof BLOCK_STATUSES)[number];

/**
 * Blocks that are physically in the yard and owned (the ledger's on-hand): usable stock
 * (`in_stock`, `earmarked`) and stock held back (`on_hold`). Only `in_stock` is free to plan, and
 * only `in_stock` and `earmarked` count as on hand for reorder sums.
 */
export const PHYSICAL_STATUSES = ["in_stock", "earmarked", "on_hold"] as const;

/** What a person sees: "in stock" splits into settling (cut-not-before still ahead) and ready. */
export const SHOWN_STATUSES = ["settling", "ready", "earmarked", "on_hold", "cut", "written_off"] as const;
export type ShownStatus = (typeof SHOWN_STATUSES)[number];

export const STATUS_LABELS: Record<ShownStatus, string> = {
  settling: "Settling",
  ready: "Ready to cut",
  earmarked: "Earmarked",
  on_hold: "On hold",
  cut: "Cut up",
  written_off: "Written off",
};

/**
 * Why a block is held out of usable stock until someone releases it. A held block is not on hand
 * for reorder sums and is never offered to planning.
 */
export const HOLD_REASONS = ["under_density", "over_density", "wet", "damaged", "reweigh"] as const;
export type HoldReason = (typeof HOLD_REASONS)[number];
export const HOLD_LABELS: Record<HoldReason, string> = {
  under_density: "under density",
  over_density: "over density",
  wet: "wet",
  damaged: "damaged",
  reweigh: "awaiting re-weigh",
};

/**
 * A received block heavier than this many times its grade's minimum density is suspect: a wet
 * core, or a denser grade delivered under the wrong label. (EPS grades' minimums run 10–15 %
 * under their nominal density; 1.5 × the minimum is well past any block of the grade itself.)
 */
export const OVER_DENSITY_FACTOR = 1.5;

/** Whether a measured density puts a block on hold, and why (null: within its grade, or not known). */
export function densityHold(density: number | null, minDensity: number | null): HoldReason | null {
  if (density === null || minDensity === null || !(minDensity > 0)) return null;
  if (density < minDensity) return "under_density";
  if (density > OVER_DENSITY_FACTOR * minDensity) return "over_density";
  return null;
}

/** A claim to the supplier about blocks it delivered, and what became of it. */
export const CLAIM_REASONS = ["under_density", "over_density", "wet", "damaged", "wrong_size", "other"] as const;
export type ClaimReason = (typeof CLAIM_REASONS)[number];
export const CLAIM_REASON_LABELS: Record<ClaimReason, string> = {
  under_density: "Under density",
  over_density: "Over density / wrong grade",
  wet: "Wet",
  damaged: "Damaged",
  wrong_size: "Wrong size",
  other: "Other",
};
export const CLAIM_STATUSES = ["open", "accepted", "rejected", "credited"] as const;
export type ClaimStatus = (typeof CLAIM_STATUSES)[number];
export const CLAIM_STATUS_LABELS: Record<ClaimStatus, string> = {
  open: "Open",
  accepted: "Accepted",
  rejected: "Rejected",
  credited: "Credited",
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
  "held",
  "hold_released",
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
  held: "Put on hold",
  hold_released: "Released from hold",
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
