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
});
