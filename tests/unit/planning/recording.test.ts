import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { overlaps } from "@/lib/nesting/geometry";
import { procedure } from "@/lib/planning/procedure";
import {
  clipZone,
  countParts,
  cutState,
  partLine,
  rejectedSizes,
  shareValue,
  tallyRejects,
  volumeBasis,
} from "@/lib/planning/recording";
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

describe("rejects and part lines of a recording", () => {
  // A block whose plan places three of job part 7 and one of part 9; two of part 7 came off in the
  // steps done, part 9 not yet.
  const placed = countParts(["jp-7", "jp-7", "jp-7", "jp-9"]);
  const came = countParts(["jp-7", "jp-7"]);

  it("counts pieces per job part from the plan's part keys", () => {
    expect([...placed]).toEqual([
      [7, 3],
      [9, 1],
    ]);
  });

  it("adds rejects up per part with their reasons, in the order given", () => {
    const { rejects, fields } = tallyRejects(
      [
        { reject: { jobPartId: 7, count: 1, reason: "void in the face" }, field: "steps.1.rejects.0" },
        { reject: { jobPartId: 7, count: 1, reason: "wire wander" }, field: "rejects.0" },
      ],
      came,
      placed,
    );
    expect(fields).toEqual({});
    expect(rejects.get(7)).toEqual({ count: 2, reasons: ["void in the face", "wire wander"] });
  });

  it("names each field that asks too much, and which kind of missing part it is", () => {
    const { rejects, fields } = tallyRejects(
      [
        { reject: { jobPartId: 7, count: 2, reason: "a" }, field: "rejects.0" },
        { reject: { jobPartId: 7, count: 1, reason: "b" }, field: "rejects.1" }, // 3 > the 2 that came off
        { reject: { jobPartId: 9, count: 1, reason: "c" }, field: "rejects.2" }, // placed, not come off yet
        { reject: { jobPartId: 11, count: 1, reason: "d" }, field: "rejects.3" }, // not in this block
      ],
      came,
      placed,
    );
    expect(fields).toEqual({
      "rejects.1.count": "Only 2 of that part came off this block.",
      "rejects.2.jobPartId": "That part has not come off this block in the steps done.",
      "rejects.3.jobPartId": "That part is not cut from this block.",
    });
    expect(rejects.get(7)).toEqual({ count: 2, reasons: ["a"] });
  });

  it("takes the first pieces of a rejected part, in the order they came off", () => {
    const box = (x: number) => ({
      origin: [x, 0, 0] as [number, number, number],
      size: [x + 1, 2, 3] as [number, number, number],
    });
    const parts = [
      { part: "jp-7", box: box(10) },
      { part: "jp-9", box: box(20) },
      { part: "jp-7", box: box(30) },
      { part: "jp-7", box: box(40) },
    ];
    expect(rejectedSizes(parts, new Map([[7, { count: 2 }]]))).toEqual([
      [11, 2, 3],
      [31, 2, 3],
    ]);
    expect(rejectedSizes(parts, new Map())).toEqual([]);
  });

  it("works a part's line out by hand: good, not cut, and its volume on the box or the profile", () => {
    // Box 600 × 400 × 100 mm = 0.024 m³ each; 3 placed, 2 came off, 1 rejected → 1 good, 1 owed again.
    expect(partLine({ size: [600, 400, 100], trueVolumeMm3: null }, { placed: 3, came: 2, rejected: 1 })).toEqual({
      good: 1,
      rejected: 1,
      notCut: 1,
      basis: "box",
      eachM3: 0.024,
      volumeM3: 0.024,
    });
    // A profiled part counts its true volume: 15,000,000 mm³ = 0.015 m³ each, 2 good.
    const profiled = partLine(
      { size: [600, 400, 100], trueVolumeMm3: 15_000_000 },
      { placed: 2, came: 2, rejected: 0 },
    );
    expect(profiled).toMatchObject({ good: 2, notCut: 0, basis: "profile" });
    expect(profiled.volumeM3).toBeCloseTo(0.03, 12);
  });

  it("says mixed when the parts' bases differ", () => {
    expect(volumeBasis([])).toBe("box");
    expect(volumeBasis(["profile", "profile"])).toBe("profile");
    expect(volumeBasis(["box", "profile"])).toBe("mixed");
  });
});
