import type { Cut } from "@/lib/nesting";
import { cutRegions, travelAcross, type Box } from "./cut-regions";

/**
 * Straight through cuts of one block as a G-code program in the ISO 6983 word-address format
 * (a small subset: G21 millimetres, G90 absolute, G0 rapid, G1 feed, F feed rate, M2 end).
 * Machine frame assumed: the block lies with its length along X and its height along Y, the
 * wire spanning its width. Cuts across the width need the block turned; the program stops (M0)
 * and says so. It covers straight slab cuts only and must be dry-run on the machine.
 *
 *   gcode({ code: "HF-1001", size: [2440, 1220, 610], cuts: [{ axis: "z", at: 300 }], kerf: 1.5, feed: 300 })
 */
export function gcode(input: {
  code: string;
  size: [number, number, number];
  cuts: Cut[];
  kerf: number;
  feed: number;
  clearance?: number;
}): string {
  const c = input.clearance ?? 10;
  const [lx, ly, lz] = input.size;
  const f = (n: number) => (Math.round(n * 1000) / 1000).toFixed(3).replace(/\.?0+$/, "") || "0";
  const out: string[] = [
    `(BLOCKYARD STRAIGHT CUTS FOR ${sanitize(input.code)})`,
    `(BLOCK ${f(lx)} X ${f(ly)} X ${f(lz)} MM, KERF ${f(input.kerf)} MM)`,
    "(CAUTION: STRAIGHT SLAB CUTS ONLY. DRY-RUN WITH THE WIRE COLD BEFORE CUTTING.)",
    "(CAUTION: VENTILATE; NEVER LEAVE A HOT WIRE UNATTENDED; NEVER HOT-WIRE POLYURETHANE.)",
    "G21",
    "G90",
    `G0 X${f(-c)} Y${f(lz + c)}`,
  ];
  let turned = false;
  input.cuts.forEach((cut, i) => {
    // The wire's centre runs half a kerf past `at`, so the kerf starts exactly at `at`.
    const mid = cut.at + input.kerf / 2;
    out.push(`(CUT ${i + 1}: THROUGH ${cut.axis.toUpperCase()} AT ${f(cut.at)})`);
    if (cut.axis === "z") {
      out.push(`G0 X${f(-c)} Y${f(mid)}`, `G1 X${f(lx + c)} F${f(input.feed)}`, `G0 Y${f(lz + c)}`, `G0 X${f(-c)}`);
    } else if (cut.axis === "x") {
      out.push(`G0 X${f(mid)} Y${f(lz + c)}`, `G1 Y${f(-c)} F${f(input.feed)}`, `G0 X${f(-c)}`, `G0 Y${f(lz + c)}`);
    } else {
      if (!turned) {
        out.push("(TURN THE BLOCK A QUARTER TURN: ITS WIDTH NOW RUNS ALONG X)", "M0");
        turned = true;
      }
      out.push(`G0 X${f(mid)} Y${f(lz + c)}`, `G1 Y${f(-c)} F${f(input.feed)}`, `G0 X${f(-c)}`, `G0 Y${f(lz + c)}`);
    }
  });
  out.push("M2");
  return `${out.join("\n")}\n`;
}

function sanitize(s: string): string {
  return s.toUpperCase().replace(/[^A-Z0-9 .-]/g, "");
}

/**
 * Wire travel for a block's through cuts (mm) and the time at `feed` mm/min: each cut crosses the
 * piece of foam it splits (see cutRegions), plus entry and exit clearance. Without the pieces the
 * whole block is assumed for every cut, which errs high.
 */
export function cutEstimate(
  size: [number, number, number],
  cuts: Cut[],
  feed: number,
  clearance = 10,
  opts: { trim?: number; kerf?: number; pieces?: Box[] } = {},
): { lengthMm: number; minutes: number } {
  const regions = cutRegions(size, cuts, opts.trim ?? 0, opts.kerf ?? 0, opts.pieces ?? []);
  const lengthMm = regions.reduce(
    (s, c) => s + (opts.pieces ? travelAcross(c) : c.axis === "z" ? size[0] : size[2]) + 2 * clearance,
    0,
  );
  return { lengthMm, minutes: feed > 0 ? lengthMm / feed : 0 };
}
