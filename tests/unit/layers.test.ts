import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

/**
 * Layers (issue "A codebase people want to carry on", item 4): only db/ holds the database handle.
 * lib/ decides (sessions, throttling, mail, planning…) and reads or writes rows through
 * db/queries, so every table is written from one folder.
 */
function files(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? files(p) : /\.tsx?$/.test(e.name) ? [p] : [];
  });
}

describe("layers", () => {
  it("no module under lib/ imports the database handle (@/db) or Knex itself", () => {
    const offenders = files("lib").filter((f) => {
      const src = fs.readFileSync(f, "utf8");
      return /from\s+"@\/db"/.test(src) || /from\s+"knex"/.test(src) || /\bdb\(\)\(/.test(src);
    });
    expect(offenders).toEqual([]);
  });

  it("no import cycle among the modules under lib/ (type-only imports aside): each can be read on its own", () => {
    const all = files("lib");
    const resolve = (from: string, spec: string): string | undefined => {
      const base = spec.startsWith("@/")
        ? spec.slice(2)
        : spec.startsWith(".")
          ? path.join(path.dirname(from), spec)
          : undefined;
      if (!base) return undefined;
      return [`${base}.ts`, `${base}.tsx`, path.join(base, "index.ts")].find((c) => all.includes(path.normalize(c)));
    };
    const edges = new Map<string, string[]>();
    for (const f of all) {
      const src = fs.readFileSync(f, "utf8");
      const targets: string[] = [];
      for (const m of src.matchAll(/^(?:import|export)\s+(type\s+)?[^;]*?from\s+"([^"]+)"/gms)) {
        if (m[1]) continue; // `import type` is erased: it cannot make a cycle at run time
        const t = resolve(f, m[2]!);
        if (t) targets.push(path.normalize(t));
      }
      edges.set(path.normalize(f), targets);
    }
    const cycles: string[] = [];
    const state = new Map<string, "open" | "done">();
    const walk = (f: string, trail: string[]) => {
      state.set(f, "open");
      for (const t of edges.get(f) ?? []) {
        if (state.get(t) === "open") cycles.push([...trail.slice(trail.indexOf(t)), t].join(" → "));
        else if (!state.has(t)) walk(t, [...trail, t]);
      }
      state.set(f, "done");
    };
    for (const f of edges.keys()) if (!state.has(f)) walk(f, [f]);
    expect(cycles).toEqual([]);
  });
});
