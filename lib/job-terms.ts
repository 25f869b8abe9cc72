import type { Profile } from "@/lib/profiles";
import type { Vec3 } from "@/lib/nesting";
/** Job and part vocabulary shared by server and client: statuses, rotation rules and their names. */
export const JOB_STATUSES = ["open", "planned", "cutting", "done", "cancelled"] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

export const JOB_STATUS_LABELS: Record<JobStatus, string> = {
  open: "Taking parts",
  planned: "Planned",
  cutting: "On the machine",
  done: "Cut and done",
  cancelled: "Called off",
};

export const JOB_STATUS_TONES: Record<JobStatus, "plain" | "kerf" | "wire" | "moss" | "ember"> = {
  open: "kerf",
  planned: "wire",
  cutting: "wire",
  done: "moss",
  cancelled: "plain",
};

export const ROTATE_RULES = ["any", "z", "none"] as const;
export type RotateRule = (typeof ROTATE_RULES)[number];

export const ROTATE_LABELS: Record<RotateRule, string> = {
  any: "Any way round",
  z: "Keep height up",
  none: "As drawn",
};

/** Columns of a part-list CSV, in the order the template lists them. */
export const PART_CSV_COLUMNS = {
  required: ["name", "quantity"],
  optional: [
    "length_mm",
    "width_mm",
    "height_mm",
    "grade",
    "rotate",
    "naca",
    "chord_mm",
    "tip_chord_mm",
    "span_mm",
    "sweep_mm",
    "polygon",
    "extrude_mm",
  ],
  maxRows: 5_000,
};

/** A reusable part definition as the library pages and the API show it. */
export interface LibraryPart {
  id: number;
  kit: string | null;
  name: string;
  size: Vec3;
  gradeId: number | null;
  gradeCode: string | null;
  rotate: RotateRule;
  profile: Profile | null;
  trueVolumeMm3: number | null;
  defaultQuantity: number;
  notes: string | null;
  active: boolean;
}
