/** Readers for the public benchmark sets in ../shared/benchmarks (formats in each FORMAT.md). */
import { existsSync, readFileSync, readdirSync } from "node:fs";
import path from "node:path";
import type { Problem, Rotate, Vec3 } from "@/lib/nesting";

/** Where the benchmark data lives: --data, BENCH_DATA, or ../shared/benchmarks beside the repo. */
export function benchDataDir(explicit?: string): string | undefined {
  const candidates = [explicit, process.env.BENCH_DATA, path.resolve(process.cwd(), "../shared/benchmarks")];
  for (const c of candidates) if (c && existsSync(path.join(c, "2d-bpp-class"))) return c;
  return undefined;
}

const nums = (text: string): number[] => text.trim().split(/\s+/).map(Number);

export function problemOf(opts: {
  bins: Vec3[];
  parts: { size: Vec3; rotate: Rotate; quantity?: number }[];
  layout: Problem["settings"]["layout"];
  timeLimitMs: number;
  kerf?: number;
}): Problem {
  // Identical parts become one line with a quantity: fewer types, same problem.
  const byKey = new Map<string, { size: Vec3; rotate: Rotate; quantity: number }>();
  for (const p of opts.parts) {
    const key = `${p.size.join("x")}|${p.rotate}`;
    const e = byKey.get(key);
    if (e) e.quantity += p.quantity ?? 1;
    else byKey.set(key, { size: p.size, rotate: p.rotate, quantity: p.quantity ?? 1 });
  }
  return {
    version: 1,
    settings: {
      kerf: opts.kerf ?? 0,
      trim: 0,
      defectMargin: 0,
      minOffcut: [1e12, 1e12, 1e12],
      layout: opts.layout,
      timeLimitMs: opts.timeLimitMs,
    },
    blocks: opts.bins.map((size, i) => ({ id: `B${i + 1}`, size, cost: 1, offcut: false, trim: 0, defects: [] })),
    parts: [...byKey.values()].map((p, i) => ({
      id: `P${i + 1}`,
      size: p.size,
      quantity: p.quantity,
      rotate: p.rotate,
    })),
  };
}

export interface Class2D {
  name: string;
  group: string;
  cls: number;
  W: number;
  H: number;
  items: [number, number][];
}

export function load2DClass(dir: string): Class2D[] {
  const base = path.join(dir, "2d-bpp-class/instances");
  return readdirSync(base)
    .sort()
    .map((name) => {
      const t = nums(readFileSync(path.join(base, name), "utf8"));
      const n = t[0]!;
      const items: [number, number][] = [];
      for (let i = 0; i < n; i++) items.push([t[4 + 3 * i]!, t[5 + 3 * i]!]);
      return { name, group: name.slice(0, 11), cls: Number(name.slice(5, 7)), W: t[1]!, H: t[2]!, items };
    });
}

export function readCsv(file: string): Record<string, string>[] {
  const [head, ...rows] = readFileSync(file, "utf8").trim().split(/\r?\n/);
  const cols = head!.split(",");
  return rows.map((r) => {
    const cells = r.match(/("[^"]*"|[^,]*)(,|$)/g)!.map((c) => c.replace(/,$/, "").replace(/^"|"$/g, ""));
    return Object.fromEntries(cols.map((c, i) => [c, cells[i] ?? ""]));
  });
}

export interface ZeroWaste {
  name: string;
  W: number;
  H: number;
  items: [number, number][];
  exact: boolean;
}

export function loadZeroWaste(dir: string): ZeroWaste[] {
  const rows = readCsv(path.join(dir, "2d-zero-waste-hopper/optimal_values.csv"));
  return rows.map((r) => {
    const t = nums(
      readFileSync(
        path.join(dir, "2d-zero-waste-hopper", r.file!.startsWith("instances") ? r.file! : `instances/${r.file}`),
        "utf8",
      ),
    );
    const n = t[0]!;
    const items: [number, number][] = [];
    for (let i = 0; i < n; i++) items.push([t[3 + 2 * i]!, t[4 + 2 * i]!]);
    return { name: r.literature_name || r.file!, W: t[1]!, H: t[2]!, items, exact: r.area_equals_WxH === "1" };
  });
}

export interface Mpv {
  cls: number;
  n: number;
  no: number;
  bin: Vec3;
  items: Vec3[];
  lb: number;
}

export function loadMpv(dir: string, classes: number[]): Mpv[] {
  const lbs = readCsv(path.join(dir, "3d-bpp-mpv/lower_bounds_computed.csv"));
  return lbs
    .filter((r) => classes.includes(Number(r.class)))
    .map((r) => {
      const t = nums(
        readFileSync(
          path.join(dir, "3d-bpp-mpv", r.file!.startsWith("instances") ? r.file! : `instances/${r.file}`),
          "utf8",
        ),
      );
      const n = t[3]!;
      const items: Vec3[] = [];
      for (let i = 0; i < n; i++) items.push([t[4 + 3 * i]!, t[5 + 3 * i]!, t[6 + 3 * i]!]);
      return {
        cls: Number(r.class),
        n: Number(r.n),
        no: Number(r.instance_no),
        bin: [t[0]!, t[1]!, t[2]!] as Vec3,
        items,
        lb: Number(r.LB_rotation_allowed),
      };
    });
}

export interface BrBox {
  dims: Vec3; // l, w, h
  flags: Vec3; // may be vertical: l, w, h
  count: number;
}

export interface BrInstance {
  set: string;
  no: number;
  container: Vec3; // L, W, H
  boxes: BrBox[];
}

export function loadBr(dir: string, k: number): BrInstance[] {
  const lines = readFileSync(path.join(dir, `3d-clp-br/instances/BR${k}.txt`), "utf8")
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter((l) => l !== "");
  let i = 0;
  const P = Number(lines[i++]);
  const out: BrInstance[] = [];
  for (let p = 0; p < P; p++) {
    const no = nums(lines[i++]!)[0]!;
    const c = nums(lines[i++]!) as Vec3;
    const n = Number(lines[i++]);
    const boxes: BrBox[] = [];
    for (let j = 0; j < n; j++) {
      const t = nums(lines[i++]!);
      boxes.push({ dims: [t[1]!, t[3]!, t[5]!], flags: [t[2]!, t[4]!, t[6]!], count: t[7]! });
    }
    out.push({ set: `BR${k}`, no, container: c, boxes });
  }
  return out;
}

/**
 * A BR box in Blockyard's rotate rules (container L W H = x y z, z up). All flags set → "any";
 * otherwise the box stands on one allowed vertical dimension with rotate "z" — a subset of what
 * the flags allow when two dimensions may be vertical (conservative, never more freedom).
 */
export function brPart(b: BrBox): { size: Vec3; rotate: Rotate } {
  const [l, w, h] = b.dims;
  const [fl, fw, fh] = b.flags;
  if (fl && fw && fh) return { size: [l, w, h], rotate: "any" };
  if (fh) return { size: [l, w, h], rotate: "z" };
  if (fw) return { size: [l, h, w], rotate: "z" };
  return { size: [w, h, l], rotate: "z" };
}
