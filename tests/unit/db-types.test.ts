import { describe, expect, it } from "vitest";
import { checkedValues } from "@/scripts/db-types";

// The row types name the values a CHECK constraint allows a text column. The constraint texts
// below are what PostgreSQL's pg_get_constraintdef prints for the migrations' checks.
describe("checkedValues", () => {
  it("reads a plain list of values", () => {
    expect(
      checkedValues("status", "CHECK ((status = ANY (ARRAY['open'::text, 'planned'::text, 'cutting'::text])))"),
    ).toEqual(["open", "planned", "cutting"]);
  });

  it("reads a list that also allows NULL", () => {
    expect(
      checkedValues(
        "hold_reason",
        "CHECK (((hold_reason IS NULL) OR (hold_reason = ANY (ARRAY['wet'::text, 'damaged'::text]))))",
      ),
    ).toEqual(["wet", "damaged"]);
  });

  it("keeps values with characters other than letters", () => {
    expect(checkedValues("unit_words", "CHECK ((unit_words = ANY (ARRAY['G20/G21'::text, 'G70/G71'::text])))")).toEqual(
      ["G20/G21", "G70/G71"],
    );
  });

  it("leaves any other check alone (the column stays a string)", () => {
    expect(checkedValues("kerf_mm", "CHECK ((kerf_mm > (0)::numeric))")).toBeUndefined();
    expect(checkedValues("code", "CHECK ((code ~ '^[A-Z]'::text))")).toBeUndefined();
    // A list on another column, or a list combined with another condition, is not this column's list.
    expect(checkedValues("status", "CHECK ((kind = ANY (ARRAY['a'::text, 'b'::text])))")).toBeUndefined();
    expect(
      checkedValues("status", "CHECK (((status = ANY (ARRAY['a'::text])) AND (length(note) > 0)))"),
    ).toBeUndefined();
    // A value with a quote in it is printed doubled; not read, so the column stays a plain string.
    expect(checkedValues("note", "CHECK ((note = ANY (ARRAY['it''s'::text])))")).toBeUndefined();
  });
});
