import type { Problem } from "@/lib/nesting";
import type { RunSettings } from "@/lib/validations/runs";
import type { Vec3 } from "@/lib/nesting";

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
}

/** Ids inside a plan: parts as "jp-<job part id>", blocks by their printed code. */
export const partKey = (id: number) => `jp-${id}`;
export const partIdFromKey = (key: string) => Number(key.replace(/^jp-/, ""));

/**
 * The nesting problem (format v1) for a run: the chosen stock with its defect zones, the parts
 * still owed, and the run's settings.
 *
 *   buildProblem(parts, stock, settings).blocks[0].id  // "HF-1003"
 */
export function buildProblem(parts: PartForPlan[], stock: StockForPlan[], settings: RunSettings): Problem {
  return {
    version: 1,
    settings: { ...settings, minOffcut: [...settings.minOffcut] as Vec3 },
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
      })),
  };
}
