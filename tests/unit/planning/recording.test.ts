import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { overlaps } from "@/lib/nesting/geometry";
import { procedure } from "@/lib/planning/procedure";
import { clipZone, cutState, shareValue } from "@/lib/planning/recording";
import { huge, machine, ok, part, randomPlan } from "../../support/procedure-fixtures";

const vol = (b: { size: readonly number[] }) => b.size[0]! * b.size[1]! * b.size[2]!;

describe("cutState: what a part-cut block has become", () => {
  // A 1000 × 600 × 400 block: a bottom slab P1, then the top slab split across its width into P2
  // and an offcut. The wire spans 700 mm, so the width (600) runs along the wire in step 1 and the
  // top slab has to be placed again (step 2) for its cut across the width.
  const proc = ok(
    procedure({
      blockCode: "T-1",
      size: [1000, 600, 400],
      trim: 0,
      kerf: 2,
      machine: machine({ wireLength: 700 }),
      pieces: [
        part("P1", [0, 0, 0], [1000, 600, 200]),
        part("P2", [0, 0, 202], [1000, 300, 198]),
        { kind: "offcut", index: 0, origin: [0, 302, 202], size: [1000, 298, 198] },
      ],
    }),
  );

  it("takes two steps for this block (worked by hand)", () => {
    expect(proc.steps.map((s) => s.piece)).toEqual(["A", "B"]);
    expect(proc.steps[1]!.size).toEqual([1000, 600, 198]);
  });

  it("after step 1: P1 came off; the top slab B goes back to stock with its true size", () => {
    const s = cutState(proc, new Set([1]));
    expect(s.parts.map((p) => p.part)).toEqual(["P1"]);
    expect(s.offcuts).toEqual([]);
    expect(s.remainders).toEqual([{ piece: "B", step: 2, box: { origin: [0, 0, 202], size: [1000, 600, 198] } }]);
    expect(s.cuts).toEqual([{ axis: "z", at: 200 }]);
  });

  it("with every step: the whole plan, nothing left over", () => {
    const s = cutState(proc, new Set([1, 2]));
    expect(s.parts.map((p) => p.part).sort()).toEqual(["P1", "P2"]);
    expect(s.offcuts.map((o) => o.index)).toEqual([0]);
    expect(s.remainders).toEqual([]);
  });

  it("a step whose piece never came off is not counted: the block stays whole", () => {
    const s = cutState(proc, new Set([2]));
    expect(s.counted).toEqual([]);
    expect(s.skipped).toEqual([2]);
    expect(s.remainders).toEqual([{ piece: "A", step: 1, box: { origin: [0, 0, 0], size: [1000, 600, 400] } }]);
  });

  it("on random plans and any steps done, the pieces never overlap, stay in the block and never outgrow it", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 10_000 }), fc.array(fc.boolean(), { maxLength: 60 }), (seed, flags) => {
        const input = randomPlan(seed);
        const p = procedure({ ...input, machine: huge("horizontal") });
        if (!p.ok) return;
        const done = new Set(p.steps.filter((_, i) => flags[i] ?? true).map((s) => s.n));
        const s = cutState(p, done);
        const boxes = [...s.parts.map((x) => x.box), ...s.offcuts.map((x) => x.box), ...s.remainders.map((x) => x.box)];
        for (const b of boxes)
          for (let a = 0; a < 3; a++) {
            expect(b.origin[a]!).toBeGreaterThanOrEqual(-1e-6);
            expect(b.origin[a]! + b.size[a]!).toBeLessThanOrEqual(input.size[a]! + 1e-6);
          }
        for (let i = 0; i < boxes.length; i++)
          for (let j = i + 1; j < boxes.length; j++) expect(overlaps(boxes[i]!, boxes[j]!)).toBe(false);
        expect(boxes.reduce((t, b) => t + vol(b), 0)).toBeLessThanOrEqual(vol({ size: input.size }) + 1e-3);
        // All steps done: exactly the plan's parts and offcuts come off, nothing remains.
        const all = cutState(p, new Set(p.steps.map((x) => x.n)));
        expect(all.remainders).toEqual([]);
        expect(all.parts.length).toBe(input.pieces.filter((x) => x.kind === "part").length);
        expect(all.offcuts.length).toBe(input.pieces.filter((x) => x.kind === "offcut").length);
      }),
      { numRuns: 120, seed: 5 },
    );
  });
});

describe("clipZone and shareValue", () => {
  it("clips a zone to a piece in the piece's own frame, or null outside it", () => {
    const piece = { origin: [100, 0, 0] as [number, number, number], size: [50, 50, 50] as [number, number, number] };
    expect(clipZone({ min: [90, 0, 0], max: [120, 10, 10] }, piece)).toEqual({ min: [0, 0, 0], max: [20, 10, 10] });
    expect(clipZone({ min: [0, 0, 0], max: [99, 10, 10] }, piece)).toBeNull();
  });

  it("shares a block's value by volume, to the cent (by hand: half a 1 m³ block of 100 is 50)", () => {
    expect(shareValue(100, 1, [[500, 1000, 1000]])).toEqual([50]);
    expect(
      shareValue(118.5, 1.81, [
        [1000, 1000, 100],
        [300, 300, 300],
      ]),
    ).toEqual([6.55, 1.77]); // 118.5 × 0.1 / 1.81 = 6.547; 118.5 × 0.027 / 1.81 = 1.768;
  });
});
