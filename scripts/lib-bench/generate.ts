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
