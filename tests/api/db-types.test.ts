import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { tablesSource } from "@/scripts/db-types";

// db/tables.ts is generated from the migrated schema (npm run db:types); it must not drift from
// the migrations. Compared without whitespace, since the formatter may wrap long lines.
describe("db/tables.ts", () => {
  it("matches the migrated schema of the test database", async () => {
    const strip = (s: string) => s.replace(/\s+/g, "");
    const generated = await tablesSource(process.env.DATABASE_URL!);
    expect(strip(fs.readFileSync("db/tables.ts", "utf8"))).toBe(strip(generated));
  });
});
