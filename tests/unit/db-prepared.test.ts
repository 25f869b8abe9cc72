import knex from "knex";
import { afterAll, describe, expect, it } from "vitest";
import { prepared } from "@/db/prepared";

// No connection is opened: only the SQL Knex would send, with the statement name it carries.
const k = knex({ client: "pg" });
afterAll(() => k.destroy());

const nameOf = (q: { toSQL(): { options?: unknown } }) => (q.toSQL().options as { name?: string } | undefined)?.name;

describe("prepared statements (db/prepared.ts)", () => {
  it("names a statement by its SQL text: the same text the same name, whatever the values", () => {
    const a = prepared(k("blocks").where({ parent_id: 7 }).select("id", "code"));
    const b = prepared(k("blocks").where({ parent_id: 9 }).select("id", "code"));
    expect(nameOf(a)).toMatch(/^by_[\w-]{24}$/);
    expect(nameOf(b)).toBe(nameOf(a));
  });

  it("gives a different text (another filter, another column) another name", () => {
    const base = nameOf(prepared(k("blocks").where({ parent_id: 7 }).select("id", "code")));
    expect(nameOf(prepared(k("blocks").where({ grade_id: 7 }).select("id", "code")))).not.toBe(base);
    expect(nameOf(prepared(k("blocks").where({ parent_id: 7 }).select("id")))).not.toBe(base);
    expect(nameOf(prepared(k.raw("SELECT 1 WHERE ? = 1", [1])))).not.toBe(base);
  });

  it("keeps the values bound, never in the text", () => {
    const q = prepared(k.raw("SELECT s.id FROM user_sessions s WHERE s.id = ?", ["abc'; DROP TABLE users; --"]));
    const { sql, bindings } = q.toSQL().toNative();
    expect(sql).toBe("SELECT s.id FROM user_sessions s WHERE s.id = $1");
    expect(bindings).toEqual(["abc'; DROP TABLE users; --"]);
  });
});
