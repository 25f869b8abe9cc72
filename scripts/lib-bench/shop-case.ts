/**
 * The invented shop case of issue 20 for true-shape nesting: 60 letters of a sign in two faces of
 * Inter (the shipped Bold at 300 mm, Regular Italic at 180 mm; both WOFF from @fontsource/inter in
 * node_modules) plus 8 tapered wing cores (NACA 2412, root ≠ tip chord), into 3 blocks of one grade,
 * one with a defect zone. Also the independent checks of a plan's slabs with polygon-clipping (not
 * the library the planner uses) and the foam a plan uses.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import polygonClipping, { type Polygon, type Ring } from "polygon-clipping";
import type { FacePoint, Plan, Problem } from "@/lib/nesting";
import { leadInFoot } from "@/lib/nesting/slab";
import { partGeometry, type Profile } from "@/lib/profiles/part";
import { partSections } from "@/lib/profiles/slabs";
import { parseFont, textProfiles } from "@/lib/profiles/text";

const FONT_DIR = path.join(process.cwd(), "node_modules", "@fontsource", "inter", "files");

/** The two faces of the sign (Inter Bold is the face Blockyard ships; Regular Italic is the second). */
export const SIGN_FACES = [
  {
    file: "inter-latin-700-normal.woff",
    name: "Inter Bold",
    text: "HOLLOWFIELD FOAMWORKS CUT TO SHAPE",
    heightMm: 300,
    thick: 80,
  },
  {
    file: "inter-latin-400-italic.woff",
    name: "Inter Italic",
    text: "FOAM BLOCKS AND PROFILES MADE HERE IN TOWN",
    heightMm: 180,
    thick: 50,
  },
] as const;

/** Letters of each face in the case. */
export const LETTERS_PER_FACE = 30;
export const GRADE = "EPS20";

export interface ShopCase {
  /** The problem JSON (unparsed), true-shape on. */
  json: Record<string, unknown>;
  letters: number;
  wings: number;
  /** True foam of the parts, m³ (outline area × length; tapered panels by their frustum rule). */
  trueVolumeM3: number;
}

/**
 * Builds the shop case. Identical letters of one face and height are one part with a quantity.
 * @example shopCase().json.parts.length // distinct letters of both faces + 2 wing cores
 */
export function shopCase(): ShopCase {
  const parts: Record<string, unknown>[] = [];
  let letters = 0;
  let trueVolume = 0;
  for (const [f, face] of SIGN_FACES.entries()) {
    const got = parseFont(readFileSync(path.join(FONT_DIR, face.file)));
    if ("error" in got) throw new Error(`${face.file}: ${got.error}`);
    const made = textProfiles(got.font, { text: face.text, heightMm: face.heightMm, fontName: face.name });
    if (!made.ok) throw new Error(`${face.name}: ${made.errors.map((e) => e.message).join("; ")}`);
    const byName = new Map<string, { profile: Profile; quantity: number }>();
    for (const p of made.profiles.slice(0, LETTERS_PER_FACE)) {
      const profile: Profile = { kind: "polygon", points: p.points, holes: p.holes, extrudeMm: face.thick };
      const had = byName.get(p.name);
      if (had) had.quantity++;
      else byName.set(p.name, { profile, quantity: 1 });
      letters++;
    }
    for (const [name, { profile, quantity }] of byName) {
      const g = partGeometry(profile);
      const s = partSections(profile);
      trueVolume += g.trueVolumeMm3 * quantity;
      parts.push({
        id: `f${f + 1}-${name.replace(/^Letter /, "").replace(/[^A-Za-z0-9]+/g, "_")}`,
        size: g.size,
        quantity,
        grade: GRADE,
        rotate: "any",
        outline: { outer: s.root.outer, ...(s.root.holes.length ? { holes: s.root.holes } : {}) },
      });
    }
  }
  const wings: { id: string; profile: Profile; quantity: number }[] = [
    { id: "wing-A", profile: { kind: "naca", code: "2412", chordMm: 300, tipChordMm: 180, spanMm: 700 }, quantity: 4 },
    {
      id: "wing-B",
      profile: { kind: "naca", code: "2412", chordMm: 260, tipChordMm: 160, spanMm: 700, sweepMm: 30 },
      quantity: 4,
    },
  ];
  for (const w of wings) {
    const g = partGeometry(w.profile);
    const s = partSections(w.profile);
    trueVolume += g.trueVolumeMm3 * w.quantity;
    parts.push({
      id: w.id,
      size: g.size,
      quantity: w.quantity,
      grade: GRADE,
      rotate: "any",
      outline: { outer: s.root.outer, tip: { outer: s.tip.outer } },
    });
  }
  const json = {
    version: 1,
    settings: {
      kerf: 1.5,
      trim: 5,
      defectMargin: 10,
      minOffcut: [100, 100, 25],
      layout: "guillotine",
      timeLimitMs: 20_000,
      trueShape: true,
    },
    blocks: [
      {
        id: "SHOP-1",
        size: [1000, 1200, 600],
        grade: GRADE,
        defects: [{ id: "void-1", min: [400, 500, 250], max: [480, 600, 330] }],
      },
      { id: "SHOP-2", size: [1000, 1200, 600], grade: GRADE },
      { id: "SHOP-3", size: [1000, 1200, 600], grade: GRADE },
    ],
    parts,
  };
  return { json, letters, wings: wings.reduce((n, w) => n + w.quantity, 0), trueVolumeM3: trueVolume / 1e9 };
}

/**
 * Foam a plan takes from stock, m³: the blocks it uses less the offcuts it returns.
 * @example foamUsedM3(problem, plan) // → 0.62
 */
export function foamUsedM3(problem: Problem, plan: Plan): number {
  const used = new Set(plan.placements.map((p) => p.block));
  let v = 0;
  for (const b of problem.blocks) if (used.has(b.id)) v += b.size[0] * b.size[1] * b.size[2];
  for (const o of plan.offcuts) v -= o.size[0] * o.size[1] * o.size[2];
  return v / 1e9;
}

const ringArea = (r: FacePoint[]) => {
  let a = 0;
  for (let i = 0, j = r.length - 1; i < r.length; j = i++) a += r[j]![0] * r[i]![1] - r[i]![0] * r[j]![1];
  return Math.abs(a / 2);
};
const polyArea = (mp: [number, number][][][]) =>
  mp.reduce((s, poly) => s + ringArea(poly[0]!) - poly.slice(1).reduce((t, h) => t + ringArea(h), 0), 0);
const closed = (l: readonly FacePoint[]): Ring => [
  ...l.map(([x, y]) => [x, y] as [number, number]),
  [l[0]![0], l[0]![1]],
];

function turn(l: readonly FacePoint[], deg: number, at: FacePoint): FacePoint[] {
  const q = ((Math.round(deg) % 360) + 360) % 360;
  return l.map(([x, y]) => {
    const [u, v] = q === 90 ? [-y, x] : q === 180 ? [-x, -y] : q === 270 ? [y, -x] : [x, y];
    return [u + at[0], v + at[1]] as FacePoint;
  });
}

export interface SlabFigures {
  slabs: number;
  members: number;
  corridors: number;
  errors: string[];
}

/**
 * Checks every slab of a plan again with polygon-clipping: each member's occupied region (its
 * outer loop, for a tapered part united with the tip's) inside the slab's face, no two members
 * overlapping (intersection ≤ 1e-6 of the smaller), and each lead-in slot (a kerf-wide rectangle
 * from the face to its end, or for a chained lead-in the bridge from the earlier member's path)
 * meeting no other member (≤ 1e-6 of the member's area).
 * @example checkSlabsIndependently(problem, plan).errors // → []
 */
export function checkSlabsIndependently(problem: Problem, plan: Plan): SlabFigures {
  const errors: string[] = [];
  const parts = new Map(problem.parts.map((p) => [p.id, p]));
  const r = problem.settings.kerf / 2;
  let slabs = 0;
  let members = 0;
  let corridors = 0;
  for (const [i, pl] of plan.placements.entries()) {
    if (!pl.slab) continue;
    slabs++;
    const [, U, V] = pl.slab.size;
    const polys = pl.slab.members.map((m) => {
      const o = parts.get(m.part)!.outline!;
      const rings: Polygon[] = [[closed(turn(o.outer, m.rotation, m.at))]];
      if (o.tip) rings.push([closed(turn(o.tip.outer, m.rotation, m.at))]);
      const u = polygonClipping.union(rings[0]!, ...rings.slice(1)) as [number, number][][][];
      return { poly: u, area: polyArea(u) };
    });
    for (const [k, p] of polys.entries()) {
      members++;
      const xs = p.poly.flatMap((q) => q[0]!.map((v) => v[0]));
      const ys = p.poly.flatMap((q) => q[0]!.map((v) => v[1]));
      const tol = 1e-6 * Math.max(U, V);
      if (Math.min(...xs) < -tol || Math.min(...ys) < -tol || Math.max(...xs) > U + tol || Math.max(...ys) > V + tol)
        errors.push(`placements[${i}].slab.members[${k}]: outside the slab`);
      for (let j = k + 1; j < polys.length; j++) {
        const q = polys[j]!;
        const inter = polyArea(polygonClipping.intersection(p.poly, q.poly) as [number, number][][][]);
        if (inter > 1e-6 * Math.min(p.area, q.area))
          errors.push(`placements[${i}].slab.members[${k}] and [${j}] overlap (${inter.toExponential(2)} mm²)`);
      }
      const m = pl.slab.members[k]!;
      // A chained lead-in's slot is its bridge from the earlier member's path (that member's own slot is checked with it).
      const via = m.leadIn.via;
      if (via !== undefined && !(Number.isInteger(via) && via >= 0 && via < k))
        errors.push(`placements[${i}].slab.members[${k}]: chained through members[${via}], not one cut before it`);
      const foot = via !== undefined && m.leadIn.from ? m.leadIn.from : leadInFoot(m.leadIn.to, m.leadIn.face, [U, V]);
      const to = m.leadIn.to;
      const len = Math.hypot(foot[0] - to[0], foot[1] - to[1]);
      corridors++;
      if (len < 1e-9) continue;
      const nx = (-(foot[1] - to[1]) / len) * r;
      const ny = ((foot[0] - to[0]) / len) * r;
      const slot: Polygon = [
        closed([
          [to[0] + nx, to[1] + ny],
          [foot[0] + nx, foot[1] + ny],
          [foot[0] - nx, foot[1] - ny],
          [to[0] - nx, to[1] - ny],
        ]),
      ];
      for (const [j, q] of polys.entries()) {
        if (j === k || j === via) continue;
        const inter = polyArea(polygonClipping.intersection(slot, q.poly) as [number, number][][][]);
        if (inter > 1e-6 * q.area)
          errors.push(
            `placements[${i}].slab.members[${k}]: lead-in slot meets members[${j}] (${inter.toExponential(2)} mm²)`,
          );
      }
    }
  }
  return { slabs, members, corridors, errors };
}
