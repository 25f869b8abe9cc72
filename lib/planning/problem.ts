import type { Problem } from "@/lib/nesting";
import type { RunSettings } from "@/lib/validations/runs";
import type { Vec3 } from "@/lib/nesting";
import type { Profile } from "@/lib/profiles/part";
import { profileOutline } from "@/lib/profiles/slabs";

const outlineOf = (profile: Profile, size: Vec3) => {
  const outline = profileOutline(profile, size);
  return outline ? { outline } : {};
};

export interface StockForPlan {
  id: number;
  code: string;
  size: Vec3;
  gradeCode: string;
  cost: number;
  isOffcut: boolean;
  defects: { id: number; min: Vec3; max: Vec3 }[];
}

export interface PartForPlan {
  id: number;
  name: string;
  size: Vec3;
  quantity: number;
  gradeCode: string | null;
  rotate: "any" | "z" | "none";
  /** The part's profile, if it has one: with `settings.trueShape` it is nested by its outline. */
  profile?: Profile | null;
}

/** Ids inside a plan: parts as "jp-<job part id>", blocks by their printed code. */
export const partKey = (id: number) => `jp-${id}`;
/**
 * The job part id of a part key. A slab's key ("slab-2", plan version 2) names no part: expand it
 * with `lib/planning/slabs.ts` first; this throws rather than give NaN.
 *
 *   partIdFromKey("jp-12")  // → 12
 */
export const partIdFromKey = (key: string): number => {
  const m = /^jp-(\d+)$/.exec(key);
  if (!m) throw new Error(`${key} is not a part key${key.startsWith("slab-") ? " (a slab: count its members)" : ""}`);
  return Number(m[1]);
};

/**
 * The nesting problem (format v1) for a run: the chosen stock with its defect zones, the parts
 * still owed, and the run's settings. With `settings.trueShape`, each part with a profile carries
 * its `outline` (parts without one, or whose profile does not fit its box, stay boxes), and
 * `options.slabMax` (the profile cutter's largest slab, `slabMaxFor`) bounds every slab.
 *
 *   buildProblem(parts, stock, settings).blocks[0].id  // "HF-1003"
 */
export function buildProblem(
  parts: PartForPlan[],
  stock: StockForPlan[],
  settings: RunSettings,
  options: { slabMax?: Vec3 | null } = {},
): Problem {
  // `trueShape` (and the profile cutter's `slabMax`) only when on: a box run's problem stays exactly what it was.
  const { trueShape, ...rest } = settings;
  const slabMax = trueShape && options.slabMax ? { slabMax: [...options.slabMax] as Vec3 } : {};
  return {
    version: 1,
    settings: {
      ...rest,
      minOffcut: [...settings.minOffcut] as Vec3,
      ...(trueShape ? { trueShape: true } : {}),
      ...slabMax,
    },
    blocks: stock.map((b) => ({
      id: b.code,
      size: b.size,
      grade: b.gradeCode,
      cost: b.cost > 0 ? b.cost : (b.size[0] * b.size[1] * b.size[2]) / 1e9,
      offcut: b.isOffcut,
      trim: b.isOffcut ? 0 : settings.trim,
      defects: b.defects.map((d) => ({ id: `D-${d.id}`, min: d.min, max: d.max })),
    })),
    parts: parts
      .filter((p) => p.quantity > 0)
      .map((p) => ({
        id: partKey(p.id),
        size: p.size,
        quantity: p.quantity,
        rotate: p.rotate,
        ...(p.gradeCode ? { grade: p.gradeCode } : {}),
        ...(trueShape && p.profile ? outlineOf(p.profile, p.size) : {}),
      })),
  };
}
