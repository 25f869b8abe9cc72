import type { Problem } from "@/lib/nesting";
import type { RunSettings } from "@/lib/validations/runs";

export interface StockForPlan {
  id: number;
  code: string;
  size: [number, number, number];
  gradeCode: string;
  cost: number;
  isOffcut: boolean;
  defects: { id: number; min: [number, number, number]; max: [number, number, number] }[];
}

export interface PartForPlan {
  id: number;
  name: string;
  size: [number, number, number];
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
    settings: { ...settings, minOffcut: [...settings.minOffcut] as [number, number, number] },
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
