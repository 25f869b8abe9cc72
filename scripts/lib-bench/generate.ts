/** Generated instances for the benchmark: perfect 3D packings and a large mixed-stock shop case. */
import type { Problem, Vec3 } from "@/lib/nesting";

export function rng(seed: number): () => number {
  let a = seed >>> 0 || 1;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Cuts a block recursively with random guillotine cuts (each cut removes `kerf`) into `pieces`
 * parts: all of them fit back into one block, so the optimum is one block.
 */
export function perfectPacking(seed: number, block: Vec3, pieces: number, kerf: number): Problem {
  const r = rng(seed);
  const boxes: Vec3[] = [block];
  const minSide = 20;
  let guard = 0;
  while (boxes.length < pieces && guard++ < 10_000) {
    // Cut the largest piece that can still be cut, across a random axis.
    boxes.sort((a, b) => b[0] * b[1] * b[2] - a[0] * a[1] * a[2]);
    const i = Math.floor(r() * Math.min(boxes.length, 3));
    const b = boxes[i]!;
    const axes = [0, 1, 2].filter((a) => b[a]! >= 2 * minSide + kerf);
    if (axes.length === 0) continue;
    const a = axes[Math.floor(r() * axes.length)]!;
    const at = Math.round(minSide + r() * (b[a]! - 2 * minSide - kerf));
    const left = [...b] as Vec3;
    const right = [...b] as Vec3;
    left[a] = at;
    right[a] = b[a]! - at - kerf;
    boxes.splice(i, 1, left, right);
  }
  return {
    version: 1,
    settings: { kerf, trim: 0, defectMargin: 0, minOffcut: [100, 100, 25], layout: "guillotine", timeLimitMs: 1000 },
    blocks: [0, 1].map((i) => ({ id: `B${i + 1}`, size: block, cost: 1, offcut: false, trim: 0, defects: [] })),
    // Shuffle orientation so the solver must find the rotations.
    parts: boxes.map((s, i) => {
      const p = [...s].sort(() => r() - 0.5) as Vec3;
      return { id: `P${i + 1}`, size: p, quantity: 1, rotate: "any" as const };
    }),
  };
}

/** A shop-sized case: 1,000 parts (40 lines) into 100 mixed blocks, some offcuts, some with defects. */
export function shopCase(seed: number, timeLimitMs: number): Problem {
  const r = rng(seed);
  const grades = ["EPS-15", "EPS-22"];
  const blocks: Problem["blocks"] = [];
  for (let i = 0; i < 100; i++) {
    const offcut = i % 5 === 0;
    const size: Vec3 = offcut
      ? [600 + Math.round(r() * 1200), 400 + Math.round(r() * 700), 200 + Math.round(r() * 400)]
      : r() < 0.5
        ? [2440, 1220, 610]
        : [4880, 1220, 1220];
    const defects =
      !offcut && r() < 0.3
        ? [
            {
              id: `D${i}`,
              min: [
                Math.round(r() * (size[0] - 100)),
                Math.round(r() * (size[1] - 100)),
                Math.round(r() * (size[2] - 100)),
              ] as Vec3,
            },
          ].map((d) => ({
            id: d.id,
            min: d.min,
            max: d.min.map((v, a) => Math.min(size[a]!, v + 20 + Math.round(r() * 60))) as Vec3,
          }))
        : [];
    const vol = (size[0] * size[1] * size[2]) / 1e9;
    blocks.push({
      id: `B${i + 1}`,
      size,
      grade: grades[i % 2]!,
      cost: offcut ? vol * 40 : vol * 65,
      offcut,
      trim: offcut ? 0 : 6,
      defects,
    });
  }
  const parts: Problem["parts"] = [];
  for (let i = 0; i < 40; i++) {
    const size: Vec3 = [50 + Math.round(r() * 900), 50 + Math.round(r() * 600), 25 + Math.round(r() * 300)];
    parts.push({ id: `part-${i + 1}`, size, quantity: 25, grade: grades[i % 2]!, rotate: i % 3 === 0 ? "z" : "any" });
  }
  return {
    version: 1,
    settings: { kerf: 1.5, trim: 6, defectMargin: 10, minOffcut: [150, 150, 25], layout: "guillotine", timeLimitMs },
    blocks,
    parts,
  };
}

/** What the wide check varies in `perfectMultiBlock` (defaults: the benchmark's set). */
export interface MultiBlockVariant {
  /** Block size in mm (default 2400 × 1200 × 600). */
  block?: Vec3;
  /** Kerf in mm (default 1.5; 0 allowed). */
  kerf?: number;
  /** Layout rule (default "guillotine"; the cut trees are guillotine either way). */
  layout?: "guillotine" | "layers" | "free";
}

/**
 * Multi-block perfect packings: `k` blocks of 2400 × 1200 × 600 mm, each cut by random guillotine
 * through cuts (kerf 1.5 mm, sizes to 0.1 mm) into 8–40 pieces; the pieces of all blocks mixed,
 * turned at random, and k + 2 blocks offered. The optimum is k blocks (the pieces grown by the kerf
 * fill k usable boxes exactly), and a plan the cutter can follow exists (guillotine layout).
 * The same generator as the budget test's (tests/unit/nesting/budget.test.ts). `variant` changes the
 * block size, kerf and layout rule (the wide check, `scripts/check-multiblock.ts`).
 * @example perfectMultiBlock(87, 5, 2000, { kerf: 3, block: [2000, 1000, 500], layout: "layers" })
 */
export function perfectMultiBlock(
  seed: number,
  k: number,
  timeLimitMs: number,
  variant: MultiBlockVariant = {},
): Problem {
  const r = rng(seed);
  const block: Vec3 = variant.block ?? [2400, 1200, 600];
  const kerf = variant.kerf ?? 1.5;
  const pieces: Vec3[] = [];
  for (let b = 0; b < k; b++) {
    const want = 8 + Math.floor(r() * 33);
    const boxes: Vec3[] = [block];
    let guard = 0;
    while (boxes.length < want && guard++ < 10_000) {
      boxes.sort((x, y) => y[0] * y[1] * y[2] - x[0] * x[1] * x[2]);
      const i = Math.floor(r() * Math.min(boxes.length, 3));
      const box = boxes[i]!;
      const axes = [0, 1, 2].filter((a) => box[a]! >= 2 * 40 + kerf);
      if (axes.length === 0) continue;
      const a = axes[Math.floor(r() * axes.length)]!;
      const at = Math.round((40 + r() * (box[a]! - 2 * 40 - kerf)) * 10) / 10;
      const left = [...box] as Vec3;
      const right = [...box] as Vec3;
      left[a] = at;
      right[a] = Math.round((box[a]! - at - kerf) * 10) / 10;
      boxes.splice(i, 1, left, right);
    }
    pieces.push(...boxes);
  }
  // Mix the pieces of all blocks.
  for (let i = pieces.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [pieces[i], pieces[j]] = [pieces[j]!, pieces[i]!];
  }
  return {
    version: 1,
    settings: {
      kerf,
      trim: 0,
      defectMargin: 0,
      minOffcut: [100, 100, 25],
      layout: variant.layout ?? "guillotine",
      timeLimitMs,
    },
    blocks: Array.from({ length: k + 2 }, (_, i) => ({
      id: `S${i + 1}`,
      size: block,
      grade: "EPS-22",
      cost: 100,
      offcut: false,
      trim: 0,
      defects: [],
    })),
    parts: pieces.map((s, i) => ({
      id: `p${i + 1}`,
      size: [...s].sort(() => r() - 0.5) as Vec3,
      quantity: 1,
      grade: "EPS-22",
      rotate: "any" as const,
    })),
  };
}

/** The multi-block perfect set of the benchmark: seed s cuts k = 2 + (s mod 4) blocks (2–5). */
export const multiBlockCount = (seed: number): number => 2 + (seed % 4);
