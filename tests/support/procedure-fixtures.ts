import type { Vec3 } from "@/lib/nesting";
import type { Box } from "@/lib/nesting/geometry";
import { rng } from "@/lib/nesting/rng";
import type { Machine } from "@/lib/planning/machine";
import type { OkProcedure, Procedure, ProcedureInput, ProcedurePiece } from "@/lib/planning/procedure";

// Invented machines for the tests (no real model's figures).
export const machine = (over: Partial<Machine> = {}): Machine => ({
  name: "Test cutter",
  kind: "block",
  wire: "horizontal",
  wireLength: 1300,
  travel: [2600, 1000],
  maxPiece: [2500, 1300, 1000],
  turntable: false,
  rapid: 3000,
  heatUpS: 20,
  handlingS: 120,
  dialect: { unitWords: "G20/G21", inch: false, heatOn: "M3", heatOff: "M5", axes: ["X", "Y"], lineNumbers: false },
  ...over,
});
/**
 * An invented profile cutter: 1,000 mm of wire, 1,200 × 600 mm of travel, 2 axes (X Y) unless
 * `over` says `fourAxis` and `dialect` names tower axes.
 *
 *   profileCutter({ fourAxis: true }, { towerAxes: ["U", "V"] })
 */
export const profileCutter = (over: Partial<Machine> = {}, dialect: Partial<Machine["dialect"]> = {}): Machine => ({
  name: "Test profile cutter",
  kind: "profile",
  wire: "horizontal",
  wireLength: 1000,
  travel: [1200, 600],
  maxPiece: [1000, 1000, 600],
  turntable: false,
  rapid: 1500,
  heatUpS: 10,
  handlingS: 60,
  dialect: {
    unitWords: "G20/G21",
    inch: false,
    heatOn: "M3",
    heatOff: "M5",
    axes: ["X", "Y"],
    lineNumbers: false,
    ...dialect,
  },
  ...over,
});
export const huge = (wire: Machine["wire"]) =>
  machine({ wire, wireLength: 1e5, travel: [1e5, 1e5], maxPiece: [1e5, 1e5, 1e5] });

export const part = (id: string, origin: Vec3, size: Vec3): ProcedurePiece => ({
  kind: "part",
  part: id,
  origin,
  size,
});
export const ok = (p: Procedure): OkProcedure => {
  if (!p.ok) throw new Error(JSON.stringify(p.problems));
  return p;
};

/**
 * A random guillotine plan: recursive cuts with kerf, leaves made parts, offcuts or scrap, some
 * shrunk in their cell. `maxSize` and `maxLeaves` bound the block and the pieces; `offcuts: false`
 * makes every kept leaf a part.
 */
export function randomPlan(
  seed: number,
  opts: { maxSize?: Vec3; maxLeaves?: number; offcuts?: boolean } = {},
): Omit<ProcedureInput, "machine"> {
  const r = rng(seed);
  const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
  const max = opts.maxSize ?? [3000, 1500, 1200];
  const size: Vec3 = [int(60, max[0]), int(60, max[1]), int(40, max[2])];
  const trim = int(0, 10);
  const kerf = [0.5, 1, 1.5, 2, 3][int(0, 4)]!;
  const target = int(2, opts.maxLeaves ?? 40);
  const cells: Box[] = [{ origin: [trim, trim, trim], size: size.map((v) => v - 2 * trim) as Vec3 }];
  for (let tries = 0; cells.length < target && tries < 400; tries++) {
    const k = int(0, cells.length - 1);
    const c = cells[k]!;
    const a = int(0, 2);
    if (c.size[a]! < 10 + kerf) continue;
    const at = int(5, Math.floor(c.size[a]! - kerf - 5));
    const lo: Box = { origin: [...c.origin], size: [...c.size] };
    lo.size[a] = at;
    const hi: Box = { origin: [...c.origin], size: [...c.size] };
    hi.origin[a] = c.origin[a]! + at + kerf;
    hi.size[a] = c.size[a]! - at - kerf;
    cells.splice(k, 1, lo, hi);
  }
  const pieces: ProcedurePiece[] = [];
  let offcuts = 0;
  cells.forEach((c, i) => {
    const kind = r();
    if (kind > 0.85) return; // scrap
    const box: Box = { origin: [...c.origin], size: [...c.size] };
    if (r() < 0.4)
      for (let a = 0; a < 3; a++) {
        const room = Math.floor(box.size[a]! / 4);
        const lo = int(0, Math.min(20, room));
        const hi = int(0, Math.min(20, room));
        box.origin[a]! += lo;
        box.size[a]! -= lo + hi;
      }
    pieces.push(
      kind < 0.65 || opts.offcuts === false
        ? part(`P${i}`, box.origin, box.size)
        : { kind: "offcut", index: offcuts++, origin: box.origin, size: box.size },
    );
  });
  return { blockCode: `B-${seed}`, size, trim, kerf, pieces };
}

export function randomMachine(seed: number): Machine {
  const r = rng(seed ^ 0x5bd1e995);
  const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
  return machine({
    wire: r() < 0.5 ? "horizontal" : "vertical",
    wireLength: int(100, 3500),
    travel: [int(100, 3500), int(100, 2500)],
    maxPiece: [int(200, 4000), int(200, 4000), int(200, 4000)],
    turntable: r() < 0.5,
  });
}
