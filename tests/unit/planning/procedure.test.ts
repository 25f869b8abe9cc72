import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Vec3 } from "@/lib/nesting";
import { overlaps, type Box } from "@/lib/nesting/geometry";
import { placementProblem } from "@/lib/planning/machine";
import { huge, machine, ok, part, randomMachine, randomPlan } from "../../support/procedure-fixtures";
import {
  pieceLabel,
  procedure,
  replay,
  type OkProcedure,
  type ProcedureInput,
  type ProcedurePiece,
} from "@/lib/planning/procedure";

const sameBox = (a: Box, b: Box, eps = 1e-6) =>
  [0, 1, 2].every((i) => Math.abs(a.origin[i]! - b.origin[i]!) <= eps && Math.abs(a.size[i]! - b.size[i]!) <= eps);
const AX = { x: 0, y: 1, z: 2 } as const;

/** Checks every promise of an ok procedure against its input; throws on the first broken one. */
function check(p: OkProcedure, input: ProcedureInput) {
  const m = input.machine;
  const nexts = p.steps.flatMap((s) => s.next.map((x) => ({ ...x, from: s.n })));
  // Every part and offcut comes off exactly once, with the plan's box.
  input.pieces.forEach((piece) => {
    const hits = nexts.filter((x) =>
      piece.kind === "part"
        ? x.what.kind === "part" && x.what.part === piece.part
        : x.what.kind === "offcut" && x.what.index === piece.index,
    );
    const asIs = p.asIs && p.asIs.kind === piece.kind ? 1 : 0;
    expect(hits.length + asIs, JSON.stringify(piece)).toBe(1);
    if (hits[0]) expect(sameBox(hits[0].box, piece)).toBe(true);
  });
  // Every later step is sent on from exactly one earlier step, with its box.
  p.steps.forEach((s, i) => {
    expect(s.n).toBe(i + 1);
    const from = nexts.filter((x) => x.what.kind === "step" && x.what.step === s.n);
    expect(from.length).toBe(i === 0 ? 0 : 1);
    if (i > 0) {
      expect(from[0]!.from).toBeLessThan(s.n);
      expect(from[0]!.what).toEqual({ kind: "step", step: s.n, piece: s.piece });
      expect(sameBox(from[0]!.box, s)).toBe(true);
    }
    if (s.kind === "turn") {
      expect(m.turntable).toBe(true);
      expect(from[0]!.from).toBe(s.n - 1);
    }
  });
  expect(p.steps[0]?.piece ?? "A").toBe("A");
  let n = 0;
  for (const s of p.steps) {
    // The piece fits the machine as placed.
    const placed = [s.size[AX[s.orient.x]], s.size[AX[s.orient.w]], s.size[AX[s.orient.y]]] as Vec3;
    expect(s.placed).toEqual(placed);
    expect(new Set([s.orient.x, s.orient.w, s.orient.y]).size).toBe(3);
    expect(placementProblem(m, s.placed)).toBeNull();
    expect(s.cuts.length).toBeGreaterThan(0);
    for (const c of s.cuts) {
      expect(c.n).toBe(++n);
      // Every cut is across one of the placement's in-plane axes.
      expect(c.axis).toBe(c.machineAxis === "X" ? s.orient.x : s.orient.y);
      expect(c.pos).toBeCloseTo(c.at - s.origin[AX[c.axis]], 9);
      // A horizontal wire never runs below the table.
      if (m.wire === "horizontal" && c.machineAxis === "Y") expect(c.pos + p.kerf / 2).toBeGreaterThanOrEqual(-1e-9);
      // The region lies inside the step's piece.
      for (let a = 0; a < 3; a++) {
        expect(c.region.origin[a]!).toBeGreaterThanOrEqual(s.origin[a]! - 1e-9);
        expect(c.region.origin[a]! + c.region.size[a]!).toBeLessThanOrEqual(s.origin[a]! + s.size[a]! + 1e-9);
      }
    }
  }
  expect(p.cutCount).toBe(n);
  expect(p.placements + p.turns).toBe(p.steps.length);
  // Replaying the cuts gives exactly the boxes sent to the bins, the rack and the scrap.
  const boxes = replay(p);
  const finals = nexts.filter((x) => x.what.kind !== "step").map((x) => x.box);
  if (p.asIs) finals.push({ origin: [0, 0, 0], size: [...p.size] });
  expect(boxes.length).toBe(finals.length);
  const left = [...finals];
  for (const b of boxes) {
    const k = left.findIndex((f) => sameBox(f, b));
    expect(k, JSON.stringify(b)).toBeGreaterThanOrEqual(0);
    left.splice(k, 1);
  }
  // Scrap never takes foam of a part or offcut.
  for (const x of nexts.filter((y) => y.what.kind === "scrap"))
    for (const piece of input.pieces) expect(overlaps(x.box, piece)).toBe(false);
}

describe("cutting procedure: 12 slabs from a 2440 × 1220 × 610 block on a horizontal wire", () => {
  // Kerf 0.5 mm; slab i (0..11) at z = 2 + 50.5·i, 50 mm thick, length trimmed 5 mm each end, full width.
  // The top slab ends at 2 + 11·50.5 + 50 = 607.5, so 2.5 mm comes off the top (kerf 607.5..608, scrap 608..610),
  // and 2 mm off the bottom (kerf 1.5..2: scrap 0..1.5, wire centre 1.75 mm above the table).
  const pieces = Array.from({ length: 12 }, (_, i) => part(`S${i + 1}`, [5, 0, 2 + 50.5 * i], [2430, 1220, 50]));
  const input: ProcedureInput = {
    blockCode: "HF-1001",
    size: [2440, 1220, 610],
    trim: 0,
    kerf: 0.5,
    pieces,
    machine: machine(),
  };

  it("is one placement, width along the 1300 mm wire, with 13 horizontal and 2 vertical cuts", () => {
    const p = ok(procedure(input));
    check(p, input);
    expect(p.steps).toHaveLength(1);
    expect([p.placements, p.turns, p.cutCount]).toEqual([1, 0, 15]);
    const s = p.steps[0]!;
    expect(s.piece).toBe("A");
    expect(s.orient).toEqual({ x: "x", w: "y", y: "z" });
    expect(s.placed).toEqual([2440, 1220, 610]);
    expect(s.howToPlace).toMatch(/^Lay A on its 2440 × 1220 mm face, 610 mm high/);
    // Top trim, bottom trim, zero-end trim, far-end trim, then the 11 splits bottom up.
    expect(s.cuts.map((c) => [c.kind, c.machineAxis, c.pos])).toEqual([
      ["trim", "Y", 607.5],
      ["trim", "Y", 1.5],
      ["trim", "X", 4.5],
      ["trim", "X", 2435],
      ...Array.from({ length: 11 }, (_, j) => ["split", "Y", 52 + 50.5 * j]),
    ]);
    expect(s.cuts.filter((c) => c.machineAxis === "Y")).toHaveLength(13);
    expect(s.cuts[0]!.frees).toEqual([
      { box: { origin: [0, 0, 608], size: [2440, 1220, 2] }, what: { kind: "scrap" } },
    ]);
    expect(s.cuts[1]!.frees[0]!.box).toEqual({ origin: [0, 0, 0], size: [2440, 1220, 1.5] });
    expect(s.cuts[4]!.frees.map((f) => f.what)).toEqual([{ kind: "part", part: "S1" }]);
    // The last split frees the last two slabs.
    expect(s.cuts[14]!.frees.map((f) => f.what)).toEqual([
      { kind: "part", part: "S11" },
      { kind: "part", part: "S12" },
    ]);
    expect(s.next.filter((x) => x.what.kind === "part")).toHaveLength(12);
  });

  it("reports the block when the wire is too short for any side, naming the limit", () => {
    const p = procedure({ ...input, machine: machine({ wireLength: 600 }) });
    expect(p.ok).toBe(false);
    if (p.ok) return;
    expect(p.problems).toEqual([
      {
        piece: "A",
        size: [2440, 1220, 610],
        limit: "the wire spans 600 mm; this piece is 2440 × 1220 × 610 mm and none of its sides fits along it",
      },
    ]);
  });

  it("reports the travel when only the height fits along the wire and the rest is too tall", () => {
    // Wire 1000: only the 610 mm height fits along it, and then 1220 mm stands up in 1000 mm of travel.
    const p = procedure({ ...input, machine: machine({ wireLength: 1000 }) });
    expect(p.ok).toBe(false);
    if (!p.ok) expect(p.problems[0]!.limit).toMatch(/^the wire travels 2600 × 1000 mm .*2440 × 1220 × 610 mm/);
  });

  it("reports the table size", () => {
    const p = procedure({ ...input, machine: machine({ maxPiece: [2000, 1300, 1000] }) });
    expect(p.ok).toBe(false);
    if (!p.ok)
      expect(p.problems[0]!.limit).toBe(
        "the table takes pieces up to 2000 × 1300 × 1000 mm; this piece is 2440 × 1220 × 610 mm",
      );
  });
});

describe("cutting procedure: a 1000 × 600 × 50 slab cut into blanks across its width", () => {
  // Kerf 1: one cut across the length at x = 499 (halves 0..499 and 500..1000), then two across the
  // width at y = 199 and 399 (rows 0..199, 200..399, 400..600) in each half.
  const pieces: ProcedurePiece[] = [];
  for (const [x0, lx] of [
    [0, 499],
    [500, 500],
  ] as const)
    for (const [y0, ly] of [
      [0, 199],
      [200, 199],
      [400, 200],
    ] as const)
      pieces.push(part(`P${pieces.length + 1}`, [x0, y0, 0], [lx, ly, 50]));
  // Travel 400 mm up: the slab cannot stand on its edge (600 + 10 > 400), so it lies flat and the
  // wire (1300 mm) runs across its width, then along its length once the halves are turned.
  const flat = { travel: [1200, 400] as [number, number], maxPiece: [1200, 1300, 400] as Vec3 };
  const input: ProcedureInput = {
    blockCode: "OC-7",
    size: [1000, 600, 50],
    trim: 0,
    kerf: 1,
    pieces,
    machine: machine(),
  };

  it("halves it, turns the first half on the turntable and re-places the second", () => {
    const inp = { ...input, machine: machine({ ...flat, turntable: true }) };
    const p = ok(procedure(inp));
    check(p, inp);
    // Halving first needs 3 steps; cutting the rows first would leave 3 rows, 4 steps.
    expect(p.steps.map((s) => [s.n, s.kind, s.piece])).toEqual([
      [1, "place", "A"],
      [2, "turn", "B"],
      [3, "place", "C"],
    ]);
    expect([p.placements, p.turns, p.cutCount]).toEqual([2, 1, 5]);
    const [a, b, c] = p.steps as [(typeof p.steps)[0], (typeof p.steps)[0], (typeof p.steps)[0]];
    expect(a.orient).toEqual({ x: "x", w: "y", y: "z" });
    expect(a.cuts.map((x) => [x.n, x.axis, x.at, x.machineAxis, x.pos])).toEqual([[1, "x", 499, "X", 499]]);
    expect(a.next).toEqual([
      { box: { origin: [0, 0, 0], size: [499, 600, 50] }, what: { kind: "step", step: 2, piece: "B" } },
      { box: { origin: [500, 0, 0], size: [500, 600, 50] }, what: { kind: "step", step: 3, piece: "C" } },
    ]);
    expect(b.orient).toEqual({ x: "y", w: "x", y: "z" });
    expect(b.howToPlace).toMatch(/^Turn B a quarter turn on the turntable/);
    expect(b.cuts.map((x) => [x.n, x.axis, x.at, x.machineAxis, x.pos])).toEqual([
      [2, "y", 199, "X", 199],
      [3, "y", 399, "X", 399],
    ]);
    expect(b.next.map((x) => x.what)).toEqual([
      { kind: "part", part: "P1" },
      { kind: "part", part: "P2" },
      { kind: "part", part: "P3" },
    ]);
    expect(c.origin).toEqual([500, 0, 0]);
    expect(c.cuts.map((x) => [x.n, x.at, x.pos])).toEqual([
      [4, 199, 199],
      [5, 399, 399],
    ]);
  });

  it("without a turntable every step is a placement", () => {
    const inp = { ...input, machine: machine({ ...flat, turntable: false }) };
    const p = ok(procedure(inp));
    check(p, inp);
    expect(p.steps.map((s) => s.kind)).toEqual(["place", "place", "place"]);
    expect([p.placements, p.turns]).toEqual([3, 0]);
  });

  it("with room to stand the slab on its edge, one placement makes every cut", () => {
    const inp = { ...input, machine: machine({ travel: [1200, 700], maxPiece: [1200, 1300, 700] }) };
    const p = ok(procedure(inp));
    check(p, inp);
    expect(p.steps).toHaveLength(1);
    expect(p.steps[0]!.orient).toEqual({ x: "x", w: "z", y: "y" });
  });
});

describe("cutting procedure: 40 slices under a kept offcut", () => {
  // A 2000 × 1000 × 512 block, trim 6, kerf 1.5: 40 slices 1980 × 980 × 10 stacked from z = 6 every
  // 11.5 mm (the last ends at 6 + 39 · 11.5 + 10 = 464.5), a 1988 × 988 × 40 offcut kept above them
  // (466 … 506). Only the 1000 mm width fits along the 1350 mm wire for the cuts between slices, and
  // the slices' 980 mm width needs a cut along it: each slice came off for its own later step
  // (42 placements, about 19 hours at the machine). Together: 4.
  const pieces: ProcedurePiece[] = [
    ...Array.from({ length: 40 }, (_, i) => part(`S${i + 1}`, [6, 6, 6 + 11.5 * i], [1980, 980, 10])),
    { kind: "offcut", index: 0, origin: [6, 6, 466], size: [1988, 988, 40] },
  ];
  const input: ProcedureInput = {
    blockCode: "HF-2040",
    size: [2000, 1000, 512],
    trim: 6,
    kerf: 1.5,
    pieces,
    machine: machine({ wireLength: 1350, travel: [5200, 1300], maxPiece: [5000, 1300, 1250], turntable: true }),
  };

  it("keeps the slices together for one cut along the wire, then parts them: 4 steps, not one per slice", () => {
    const p = ok(procedure(input));
    check(p, input);
    expect(p.steps.length).toBeLessThanOrEqual(4);
    // Every cut between two slices is made once, in one step.
    const between = p.steps.filter((s) => s.next.filter((x) => x.what.kind === "part").length === 40);
    expect(between).toHaveLength(1);
  });
});

describe("cutting procedure: edge cases", () => {
  it("labels pieces A…Z, AA, AB…", () => {
    expect([0, 1, 25, 26, 27, 51, 52, 701, 702].map(pieceLabel)).toEqual([
      "A",
      "B",
      "Z",
      "AA",
      "AB",
      "AZ",
      "BA",
      "ZZ",
      "AAA",
    ]);
  });

  it("a block that is the part itself needs no cut; an empty one is all scrap", () => {
    const base = { blockCode: "B", size: [100, 100, 100] as Vec3, trim: 0, kerf: 1, machine: machine() };
    const p = ok(procedure({ ...base, pieces: [part("P", [0, 0, 0], [100, 100, 100])] }));
    expect(p.steps).toEqual([]);
    expect(p.asIs).toEqual({ kind: "part", part: "P" });
    expect(ok(procedure({ ...base, pieces: [] })).asIs).toEqual({ kind: "scrap" });
  });

  it("a single part is trimmed on all six sides, the width on a second placement", () => {
    const inp: ProcedureInput = {
      blockCode: "B",
      size: [1000, 500, 300],
      trim: 5,
      kerf: 1,
      machine: machine({ wireLength: 600, travel: [1100, 700] }),
      pieces: [part("P", [5, 5, 5], [990, 490, 290])],
    };
    const p = ok(procedure(inp));
    check(p, inp);
    expect(p.cutCount).toBe(6);
    expect(p.steps.length).toBe(2);
  });

  it("refuses pieces that no through cut separates, naming them", () => {
    const p = procedure({
      blockCode: "B",
      size: [30, 30, 10],
      trim: 0,
      kerf: 0,
      machine: huge("horizontal"),
      pieces: [
        part("H1", [0, 0, 0], [20, 10, 10]),
        part("V1", [20, 0, 0], [10, 20, 10]),
        part("H2", [10, 20, 0], [20, 10, 10]),
        part("V2", [0, 10, 0], [10, 20, 10]),
        part("C", [10, 10, 0], [10, 10, 10]),
      ],
    });
    expect(p.ok).toBe(false);
    if (!p.ok) expect(p.problems[0]!.limit).toMatch(/cannot separate .*H1/);
  });

  it("is deterministic", () => {
    const inp = { ...randomPlan(7), machine: randomMachine(7) };
    expect(JSON.stringify(procedure(inp))).toBe(JSON.stringify(procedure(inp)));
  });
});

describe("cutting procedure properties on random guillotine plans and machines", () => {
  it("keeps every promise when ok, names a piece and a limit when not", () => {
    let oks = 0;
    let fails = 0;
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 30 }), (seed) => {
        const plan = randomPlan(seed);
        const inp = { ...plan, machine: randomMachine(seed) };
        const p = procedure(inp);
        if (p.ok) {
          oks++;
          check(p, inp);
        } else {
          fails++;
          expect(p.problems.length).toBeGreaterThan(0);
          for (const q of p.problems) {
            expect(q.piece).toMatch(/^[A-Z]+$/);
            expect(q.limit).toMatch(/\d+( × \d+(\.\d+)?)* mm/);
          }
        }
        // A machine large enough in every respect always makes the plan.
        for (const wire of ["horizontal", "vertical"] as const) {
          const big = { ...plan, machine: huge(wire) };
          check(ok(procedure(big)), big);
        }
      }),
      { seed: 20261204, numRuns: 150 },
    );
    // Both outcomes occur, so both branches were exercised.
    expect(oks).toBeGreaterThan(10);
    expect(fails).toBeGreaterThan(10);
  });
});
