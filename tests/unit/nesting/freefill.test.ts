/**
 * Free layout (format rule 2 only): the empty room of a block kept as maximal empty boxes.
 * Instance data is generated or made up for the check (common practice, no source). The pinwheel —
 * four oblong pieces turning around a square one, which no through cut separates — is the
 * textbook example of a packing that is not guillotine-cuttable (common knowledge, no source).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { overlaps, volume, type Box } from "@/lib/nesting/geometry";
import { disjointLeftovers, emptySpaces, fillBlockFree, subtractBox } from "@/lib/nesting/solver/freefill";
import { fillBlockGuillotine } from "@/lib/nesting/solver/guillotine3d";
import { buildModel } from "@/lib/nesting/solver/model";
import { rng } from "@/lib/nesting/rng";
import type { Vec3 } from "@/lib/nesting";
import { pinwheel, problem, solveValid } from "./helpers";

const box = (origin: Vec3, size: Vec3): Box => ({ origin, size });
const inside = (p: Vec3, b: Box): boolean =>
  [0, 1, 2].every((a) => p[a]! > b.origin[a]! && p[a]! < b.origin[a]! + b.size[a]!);

/** Unit-cell centres of a W×H×D grid. */
function cells(s: Vec3): Vec3[] {
  const out: Vec3[] = [];
  for (let x = 0; x < s[0]; x++)
    for (let y = 0; y < s[1]; y++) for (let z = 0; z < s[2]; z++) out.push([x + 0.5, y + 0.5, z + 0.5]);
  return out;
}

const taken = fc.array(
  fc
    .tuple(
      fc.integer({ min: 0, max: 5 }),
      fc.integer({ min: 0, max: 5 }),
      fc.integer({ min: 0, max: 5 }),
      fc.integer({ min: 1, max: 4 }),
      fc.integer({ min: 1, max: 4 }),
      fc.integer({ min: 1, max: 4 }),
    )
    .map(([x, y, z, w, h, d]) => box([x, y, z], [w, h, d])),
  { maxLength: 6 },
);

describe("maximal empty boxes", () => {
  it("removing a piece from a box leaves the boxes beyond each of its faces", () => {
    const out = subtractBox([box([0, 0, 0], [10, 10, 10])], box([4, 4, 0], [2, 2, 10]), 0);
    expect(out.map((b) => [b.origin, b.size]).sort()).toEqual(
      [
        [
          [0, 0, 0],
          [4, 10, 10],
        ],
        [
          [6, 0, 0],
          [4, 10, 10],
        ],
        [
          [0, 0, 0],
          [10, 4, 10],
        ],
        [
          [0, 6, 0],
          [10, 4, 10],
        ],
      ].sort(),
    );
  });

  it("drops boxes thinner than the smallest piece and boxes inside other boxes", () => {
    // A piece in the corner: the box beyond its top is 1 thick and goes at minSide 2.
    const out = subtractBox([box([0, 0, 0], [10, 10, 10])], box([0, 0, 0], [10, 10, 9]), 2);
    expect(out).toEqual([]);
    const twice = subtractBox(
      subtractBox([box([0, 0, 0], [10, 10, 10])], box([0, 0, 0], [5, 10, 10]), 0),
      box([0, 0, 0], [5, 5, 10]),
      0,
    );
    expect(twice).toEqual([box([5, 0, 0], [5, 10, 10])]);
  });

  it("are empty, cover all the empty room, and are maximal (random pieces in an 8-cube)", () => {
    fc.assert(
      fc.property(taken, (pieces) => {
        const u = box([0, 0, 0], [8, 8, 8]);
        const spaces = emptySpaces(u, pieces, 0);
        const isEmpty = (c: Vec3): boolean => inside(c, u) && !pieces.some((p) => inside(c, p));
        for (const c of cells([8, 8, 8])) {
          // Every empty cell lies in some box; no box holds a taken cell.
          const covering = spaces.filter((s) => inside(c, s));
          expect(covering.length > 0).toBe(isEmpty(c));
        }
        for (const s of spaces) {
          // Maximal: each face either touches the block's side or has a taken cell right beyond it.
          for (let a = 0; a < 3; a++)
            for (const dir of [-1, 1]) {
              const grown: Box = { origin: [...s.origin] as Vec3, size: [...s.size] as Vec3 };
              grown.size[a] = grown.size[a]! + 1;
              if (dir < 0) grown.origin[a] = grown.origin[a]! - 1;
              const outside = grown.origin[a]! < 0 || grown.origin[a]! + grown.size[a]! > 8;
              const blocked = cells([8, 8, 8]).some((c) => inside(c, grown) && !isEmpty(c));
              expect(outside || blocked).toBe(true);
            }
        }
      }),
      { numRuns: 60, seed: 7 },
    );
  });

  it("disjoint leftovers are empty, do not overlap, and start with the largest box", () => {
    fc.assert(
      fc.property(taken, (pieces) => {
        const u = box([0, 0, 0], [8, 8, 8]);
        const spaces = emptySpaces(u, pieces, 0);
        const left = disjointLeftovers(spaces, 0);
        for (let i = 0; i < left.length; i++) {
          expect(pieces.some((p) => overlaps(p, left[i]!))).toBe(false);
          for (let j = i + 1; j < left.length; j++) expect(overlaps(left[i]!, left[j]!)).toBe(false);
        }
        if (spaces.length > 0) expect(volume(left[0]!.size)).toBe(Math.max(...spaces.map((s) => volume(s.size))));
      }),
      { numRuns: 60, seed: 11 },
    );
  });
});

describe("free fill", () => {
  it("packs the pinwheel, which no through-cut layout holds", () => {
    const m = buildModel(pinwheel("free"));
    // One piece at a time from the block's corners packs it, whatever the part order.
    for (const order of [
      [0, 1, 2],
      [1, 0, 2],
      [2, 0, 1],
    ]) {
      const free = fillBlockFree(
        m.blocks[0]!,
        m.types,
        m.types.map((t) => t.count),
        { order, grid: false, lookahead: 0, corners: true },
      );
      expect(free.items).toHaveLength(5);
    }
    // No through-cut fill manages, with or without judging moves.
    for (const lookahead of [0, 12])
      for (const boxFirst of [false, true]) {
        const cut = fillBlockGuillotine(
          m.blocks[0]!,
          m.types,
          m.types.map((t) => t.count),
          { order: [0, 1, 2], grid: false, split: "biggest", thinSlabs: true, boxFirst, lookahead, rng: rng(1) },
        );
        expect(cut.items.length).toBeLessThan(5);
      }
    // Through the whole solver: free places all five, guillotine must leave one out.
    expect(solveValid(pinwheel("free")).unplaced).toEqual([]);
    expect(solveValid(pinwheel("guillotine")).unplaced.reduce((n, u) => n + u.count, 0)).toBe(1);
  });

  it("keeps pieces apart from each other and from defects, and its leftovers empty (random orders)", () => {
    for (let seed = 1; seed <= 5; seed++) {
      const r = rng(seed);
      const p = problem({
        settings: { kerf: 2, trim: 5, defectMargin: 3, layout: "free", minOffcut: [20, 20, 5] },
        blocks: [{ id: "B", size: [400, 300, 200], defects: [{ min: [150, 100, 50], max: [180, 140, 90] }] }],
        parts: Array.from({ length: 6 }, (_, i) => ({
          id: `P${i}`,
          size: [20 + Math.floor(r() * 120), 20 + Math.floor(r() * 100), 10 + Math.floor(r() * 80)],
          quantity: 3 + Math.floor(r() * 8),
        })),
      });
      const m = buildModel(p);
      const fill = fillBlockFree(
        m.blocks[0]!,
        m.types,
        m.types.map((t) => t.count),
        { order: m.types.map((t) => t.index), grid: true, lookahead: 6, corners: seed % 2 === 0 },
      );
      const boxes = fill.items.map((it) => box(it.origin, it.dims));
      expect(boxes.length).toBeGreaterThan(0);
      for (let i = 0; i < boxes.length; i++) {
        expect(m.blocks[0]!.obstacles.some((o) => overlaps(o, boxes[i]!))).toBe(false);
        for (let j = i + 1; j < boxes.length; j++) expect(overlaps(boxes[i]!, boxes[j]!)).toBe(false);
        for (const l of fill.leftovers) expect(overlaps(l, boxes[i]!)).toBe(false);
      }
      // The solver's plan for the same order is valid (kerf, trim, defect margin, offcuts).
      solveValid(p, 12, seed);
    }
  });
});
