import { orientations } from "@/lib/nesting/geometry";
import type { Vec3 } from "@/lib/nesting";

/** A block a plan leaves out of its problem, and why (in the shop's words, naming it by code). */
export interface LeftOut {
  id: number;
  code: string;
  reason: string;
}

interface BlockLike {
  code: string;
  size: Vec3;
  gradeCode: string | null;
  isOffcut: boolean;
}

interface PartLike {
  size: Vec3;
  rotate: "any" | "z" | "none";
  gradeCode: string | null;
  quantity: number;
}

/**
 * Why a block cannot hold any of the parts (null when at least one fits): the face trim (whole
 * blocks only; offcuts are already square) eats it, no part is of its grade, or every part of its
 * grade is larger than what is left after trim in each way it may be turned.
 *
 *   whyUnusable({ code: "HF-1003.4", size: [1200, 600, 18], gradeCode: "EPS-II", isOffcut: true },
 *     [{ size: [300, 200, 40], rotate: "any", gradeCode: "EPS-II", quantity: 4 }], 6)
 *   // → "too small for any part (1200 × 600 × 18 mm)"
 */
export function whyUnusable(block: BlockLike, parts: PartLike[], trim: number): string | null {
  const t = block.isOffcut ? 0 : trim;
  const usable = block.size.map((s) => s - 2 * t) as Vec3;
  const size = `${block.size.join(" × ")} mm`;
  if (usable.some((u) => u <= 0)) return `the ${t} mm face trim leaves no usable material (${size})`;
  const owed = parts.filter((p) => p.quantity > 0);
  if (!owed.length) return null;
  const ofGrade = owed.filter((p) => p.gradeCode === null || p.gradeCode === block.gradeCode);
  if (!ofGrade.length) return `no part still owed is of its grade (${block.gradeCode ?? "none"})`;
  const fits = ofGrade.some((p) =>
    orientations(p.size, p.rotate).some((o) => o.every((v, i) => v <= usable[i]! + 1e-6)),
  );
  if (fits) return null;
  return t > 0 ? `too small for any part after trim (${size})` : `too small for any part (${size})`;
}

/** "HF-1003.4 left out: too small for any part after trim (…)". */
export const leftOutLine = (l: Pick<LeftOut, "code" | "reason">) => `${l.code} left out: ${l.reason}`;
