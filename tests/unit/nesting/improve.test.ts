import { describe, expect, it } from "vitest";
import { eliminateBlocks } from "@/lib/nesting/solver/improve";
import { buildModel, type BlockFill } from "@/lib/nesting/solver/model";
import type { Vec3 } from "@/lib/nesting/types";
import { problem } from "./helpers";

const box = (origin: Vec3, size: Vec3) => ({ origin, size });

describe("emptying the least-filled block into the others' leftovers", () => {
  const p = problem({
    settings: { kerf: 0, trim: 0, layout: "guillotine" },
    blocks: [
      { id: "A", size: [100, 100, 100] },
      { id: "B", size: [100, 100, 100] },
    ],
    parts: [
      { id: "big", size: [100, 100, 60], rotate: "none" },
      { id: "small", size: [50, 50, 20], quantity: 4, rotate: "none" },
    ],
  });
  const m = buildModel(p);
  const item = (type: number, origin: Vec3, dims: Vec3) => ({ type, origin, dims });
  // A holds the big part and leaves a 100 × 100 × 40 slab; B holds the four small ones.
  const a: BlockFill = {
    block: 0,
    items: [item(0, [0, 0, 0], [100, 100, 60])],
    leftovers: [box([0, 0, 60], [100, 100, 40])],
    packedVolume: 600_000,
  };
  const smalls = [0, 50].flatMap((x) => [0, 50].map((y) => item(1, [x, y, 0], [50, 50, 20])));
  const b: BlockFill = { block: 1, items: smalls, leftovers: [box([0, 0, 20], [100, 100, 80])], packedVolume: 200_000 };

  it("moves the four small parts into A's slab and frees block B", () => {
    const out = eliminateBlocks(m, [a, b]);
    expect(out).toHaveLength(1);
    expect(out[0]!.block).toBe(0);
    expect(out[0]!.items).toHaveLength(5);
    expect(out[0]!.packedVolume).toBe(800_000);
  });

  it("leaves both blocks when the others' leftovers hold less room than the weak block's parts", () => {
    // A keeps 10 mm of room (B's parts need 20 mm); B keeps 50 mm (A's part needs 60).
    const tightA: BlockFill = { ...a, leftovers: [box([0, 0, 60], [100, 100, 10])] };
    const tightB: BlockFill = { ...b, leftovers: [box([0, 0, 20], [100, 100, 50])] };
    const out = eliminateBlocks(m, [tightA, tightB]);
    expect(out.map((f) => f.block)).toEqual([0, 1]);
    expect(out.map((f) => f.items.length)).toEqual([1, 4]);
  });
});
