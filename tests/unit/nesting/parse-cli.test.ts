import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseProblem } from "@/lib/nesting";

const ok = {
  blocks: [{ id: "B1", size: [1000, 500, 400] }],
  parts: [{ id: "p1", size: [100, 100, 100], quantity: 2 }],
};
const withPath = (mutate: (j: any) => void): unknown => {
  const j = JSON.parse(JSON.stringify(ok));
  mutate(j);
  return j;
};

describe("parseProblem", () => {
  it("fills the defaults of the format page", () => {
    const r = parseProblem(ok);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.problem.settings).toEqual({
      kerf: 1.5,
      trim: 0,
      defectMargin: 0,
      minOffcut: [100, 100, 25],
      layout: "guillotine",
      timeLimitMs: 3000,
    });
    expect(r.problem.blocks[0]).toMatchObject({ cost: 0.2, offcut: false, trim: 0, defects: [] });
    expect(r.problem.parts[0]).toMatchObject({ rotate: "any", quantity: 2 });
  });

  it.each([
    ["a zero size", (j: any) => (j.parts[0].size[1] = 0), "parts[0].size[1]: must be > 0"],
    ["a negative size", (j: any) => (j.blocks[0].size[2] = -4), "blocks[0].size[2]: must be > 0 (block B1)"],
    ["a missing part id", (j: any) => delete j.parts[0].id, "parts[0].id: is required"],
    ["missing blocks", (j: any) => delete j.blocks, "blocks: is required"],
    ["a size that is not a number", (j: any) => (j.parts[0].size[0] = "10"), "parts[0].size[0]: must be a number"],
    ["a short size", (j: any) => (j.parts[0].size = [1, 2]), "parts[0].size: must be an array of 3 numbers"],
    [
      "a duplicate part id",
      (j: any) => j.parts.push({ id: "p1", size: [1, 1, 1] }),
      'parts[1].id: duplicate id "p1" (also parts[0])',
    ],
    [
      "a defect outside its block",
      (j: any) => (j.blocks[0].defects = [{ min: [0, 0, 0], max: [10, 600, 10] }]),
      "blocks[0].defects[0].max[1]: lies outside its block (size 500) (block B1)",
    ],
    [
      "a bad layout",
      (j: any) => (j.settings = { layout: "spiral" }),
      'settings.layout: must be one of "guillotine", "layers", "free"',
    ],
    ["a bad rotate rule", (j: any) => (j.parts[0].rotate = "x"), 'parts[0].rotate: must be one of "any", "z", "none"'],
    [
      "a fractional quantity",
      (j: any) => (j.parts[0].quantity = 1.5),
      "parts[0].quantity: must be a whole number >= 1",
    ],
    ["a negative kerf", (j: any) => (j.settings = { kerf: -1 }), "settings.kerf: must be >= 0"],
    [
      "a trim that eats the block",
      (j: any) => (j.blocks[0].trim = 250),
      "blocks[0].trim: leaves no usable material in block B1 (size[1] = 500)",
    ],
  ])("refuses %s and names its path", (_what, mutate, message) => {
    const r = parseProblem(withPath(mutate));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors).toContain(message);
  });

  it("names a block by its code in every message about it, not only by its place in the list", () => {
    // Seventy blocks and one sliver: "blocks[69].trim" alone is a number nobody can find.
    const blocks = Array.from({ length: 70 }, (_, i) => ({ id: `HF-${1000 + i}`, size: [1000, 500, 400] }));
    blocks[69] = { id: "HF-1003.4", size: [1000, 500, 10] };
    const r = parseProblem({ blocks, parts: ok.parts, settings: { trim: 6 } });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toEqual(["settings.trim: leaves no usable material in block HF-1003.4 (size[2] = 10)"]);
    const bad = parseProblem(withPath((j) => (j.blocks[0].size = [0, 500, "x"])));
    expect(bad.ok).toBe(false);
    if (!bad.ok) for (const e of bad.errors) expect(e).toContain("(block B1)");
  });
});

const root = process.cwd();
function runCli(stdin: string, args: string[] = []): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(
    process.execPath,
    [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "scripts/nest.ts"), ...args],
    { input: stdin, encoding: "utf8", cwd: root, timeout: 30_000 },
  );
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("nest command line", () => {
  it("turns a problem on stdin into a plan on stdout", () => {
    const r = runCli(JSON.stringify({ ...ok, settings: { timeLimitMs: 200 } }));
    expect(r.code).toBe(0);
    const plan = JSON.parse(r.stdout);
    expect(plan.placements).toHaveLength(2);
    expect(plan.stats.blocksUsed).toBe(1);
  });

  // One spawn per kind keeps this file quick; the parser cases above cover each message.
  it.each([
    ["malformed JSON", '{"blocks": [\n', /^\(root\): malformed JSON[^\n]*\n$/],
    ["missing fields", JSON.stringify({ parts: [] }), /^blocks: is required$/m],
    [
      "negative and zero sizes",
      JSON.stringify(withPath((j) => ((j.parts[0].size = [10, 0, -1]), (j.blocks[0].size[0] = 0)))),
      /^blocks\[0\]\.size\[0\]: must be > 0 \(block B1\)\nparts\[0\]\.size\[1\]: must be > 0\nparts\[0\]\.size\[2\]: must be > 0\n$/,
    ],
    [
      "a defect outside its block",
      JSON.stringify(withPath((j) => (j.blocks[0].defects = [{ min: [-5, 0, 0], max: [10, 10, 10] }]))),
      /^blocks\[0\]\.defects\[0\]\.min\[0\]: must be >= 0 \(block B1\)$/m,
    ],
    [
      "duplicate ids",
      JSON.stringify(withPath((j) => j.blocks.push({ id: "B1", size: [1, 1, 1] }))),
      /^blocks\[1\]\.id: duplicate id "B1"/m,
    ],
    [
      "non-numbers",
      JSON.stringify(withPath((j) => (j.parts[0].quantity = "two"))),
      /^parts\[0\]\.quantity: must be a number$/m,
    ],
  ])("refuses %s with exit code 2, the path on stderr and nothing on stdout", (_what, input, pattern) => {
    const r = runCli(input);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(pattern);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
