import { describe, expect, it } from "vitest";
import { cutRuns, groupPlacements } from "@/lib/planning/sheet";

describe("cut sheet lines", () => {
  it("groups a block's placements by part and orientation, in the order they first appear", () => {
    const at = (part: string, origin: [number, number, number], size: [number, number, number]) => ({
      part,
      origin,
      size,
    });
    const lines = groupPlacements([
      at("a", [0, 0, 0], [10, 20, 5]),
      at("b", [12, 0, 0], [5, 5, 5]),
      at("a", [0, 22, 0], [10, 20, 5]),
      at("a", [20, 0, 0], [20, 10, 5]),
    ]);
    expect(lines).toEqual([
      {
        part: "a",
        size: [10, 20, 5],
        count: 2,
        origins: [
          [0, 0, 0],
          [0, 22, 0],
        ],
      },
      { part: "b", size: [5, 5, 5], count: 1, origins: [[12, 0, 0]] },
      // The same part turned is another line: the cutter looks for another shape.
      { part: "a", size: [20, 10, 5], count: 1, origins: [[20, 0, 0]] },
    ]);
  });

  it("takes evenly spaced cuts across one axis together, keeping every cut's number and order", () => {
    const x = (at: number) => ({ axis: "x" as const, at });
    const z = (at: number) => ({ axis: "z" as const, at });
    const runs = cutRuns([x(60), x(121.5), x(183), x(244.5), z(30), z(61.5), x(400), x(500), z(10), z(20), z(30)]);
    expect(runs).toEqual([
      { from: 1, to: 4, axis: "x", first: 60, last: 244.5, step: 61.5 },
      // Two cuts are not a run (a run is at least three).
      { from: 5, to: 5, axis: "z", first: 30, last: 30, step: 0 },
      { from: 6, to: 6, axis: "z", first: 61.5, last: 61.5, step: 0 },
      { from: 7, to: 7, axis: "x", first: 400, last: 400, step: 0 },
      { from: 8, to: 8, axis: "x", first: 500, last: 500, step: 0 },
      { from: 9, to: 11, axis: "z", first: 10, last: 30, step: 10 },
    ]);
    // Every cut is in exactly one line, in order.
    expect(runs.flatMap((r) => Array.from({ length: r.to - r.from + 1 }, (_, k) => r.from + k))).toEqual(
      Array.from({ length: 11 }, (_, k) => k + 1),
    );
    // The same cut through three pieces in a row is one line too (spacing 0).
    expect(cutRuns([x(25), x(25), x(25), z(40)])).toEqual([
      { from: 1, to: 3, axis: "x", first: 25, last: 25, step: 0 },
      { from: 4, to: 4, axis: "z", first: 40, last: 40, step: 0 },
    ]);
    // An uneven gap ends a run.
    expect(cutRuns([x(10), x(20), x(30), x(40.5), x(51)]).map((r) => [r.from, r.to])).toEqual([
      [1, 3],
      [4, 4],
      [5, 5],
    ]);
  });
});
