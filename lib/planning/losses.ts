import type { Vec3 } from "@/lib/nesting";
/**
 * Where a block's volume went when it was cut: good part blanks, rejected blanks, offcuts kept,
 * face trim, kerf, defect cut-outs and unusable leftovers. The parts add up to the block exactly.
 *
 *   lossBreakdown({ size: [1000, 1000, 1000], trim: 0, kerf: 0, cuts: [], blanks: [[1000, 1000, 500]],
 *                   rejected: [], offcuts: [], defects: [] }).unusable  // 0.5 (m³)
 */
type V3 = Vec3;

export interface LossInput {
  size: V3;
  trim: number; // per face, 0 for offcuts
  kerf: number;
  cuts: { axis: "x" | "y" | "z"; at: number }[];
  blanks: V3[]; // sizes of every placed part on the block (good and rejected)
  rejected: V3[]; // sizes of the rejected ones (a subset of blanks)
  offcuts: { origin: V3; size: V3 }[];
  defects: { min: V3; max: V3 }[]; // already grown by the margin
}

export interface LossBreakdown {
  block: number;
  goodBlanks: number;
  rejects: number;
  offcuts: number;
  trim: number;
  kerf: number;
  defect: number;
  unusable: number;
}

const vol = (s: readonly number[]) => (s[0]! * s[1]! * s[2]!) / 1e9;

function overlap(aMin: V3, aMax: V3, bMin: readonly number[], bMax: readonly number[]): number {
  let v = 1;
  for (let i = 0; i < 3; i++) {
    const d = Math.min(aMax[i]!, bMax[i]!) - Math.max(aMin[i]!, bMin[i]!);
    if (d <= 0) return 0;
    v *= d;
  }
  return v / 1e9;
}

export function lossBreakdown(input: LossInput): LossBreakdown {
  const block = vol(input.size);
  const inner = input.size.map((s) => Math.max(0, s - 2 * input.trim)) as V3;
  const trim = block - vol(inner);
  const blanks = input.blanks.reduce((s, b) => s + vol(b), 0);
  const rejects = input.rejected.reduce((s, b) => s + vol(b), 0);
  const offcuts = input.offcuts.reduce((s, o) => s + vol(o.size), 0);
  // Kerf: each through cut removes a kerf-thick sheet; across the whole block is an upper bound.
  const areaAcross = { x: inner[1] * inner[2], y: inner[0] * inner[2], z: inner[0] * inner[1] };
  let kerf = input.cuts.reduce((s, c) => s + (input.kerf * areaAcross[c.axis]) / 1e9, 0);
  // Defect cut-outs: the grown zones inside the usable box, except what left inside an offcut.
  const lo: V3 = [input.trim, input.trim, input.trim];
  const hi: V3 = [input.size[0] - input.trim, input.size[1] - input.trim, input.size[2] - input.trim];
  let defect = 0;
  for (const d of input.defects) {
    const dMin = d.min.map((v, i) => Math.max(v, lo[i]!)) as V3;
    const dMax = d.max.map((v, i) => Math.min(v, hi[i]!)) as V3;
    const inside = overlap(dMin, dMax, lo, hi);
    if (!inside) continue;
    const inOffcuts = input.offcuts.reduce(
      (s, o) =>
        s +
        overlap(
          dMin,
          dMax,
          o.origin,
          o.origin.map((v, i) => v + o.size[i]!),
        ),
      0,
    );
    defect += Math.max(0, inside - inOffcuts);
  }
  // The estimates of kerf and defect may not exceed what is left once blanks, offcuts and trim are counted.
  const room = Math.max(0, block - trim - blanks - offcuts);
  if (kerf + defect > room) {
    const k = room / (kerf + defect);
    kerf *= k;
    defect *= k;
  }
  const unusable = Math.max(0, block - trim - blanks - offcuts - kerf - defect);
  return { block, goodBlanks: blanks - rejects, rejects, offcuts, trim, kerf, defect, unusable };
}
