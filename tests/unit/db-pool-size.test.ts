import { describe, expect, it } from "vitest";
import { poolMax } from "@/db/pool-size";

describe("database pool per process", () => {
  it("gives an app process 10 connections and a nesting worker 2 unless told otherwise", () => {
    expect(poolMax("app", {})).toBe(10);
    expect(poolMax("worker", {})).toBe(2);
    expect(poolMax("app", { DB_POOL_MAX: "" })).toBe(10);
  });

  it("takes DB_POOL_MAX for the app and WORKER_DB_POOL_MAX for a worker, each only for its own", () => {
    expect(poolMax("app", { DB_POOL_MAX: "12", WORKER_DB_POOL_MAX: "3" })).toBe(12);
    expect(poolMax("worker", { DB_POOL_MAX: "12", WORKER_DB_POOL_MAX: "3" })).toBe(3);
    expect(poolMax("worker", { DB_POOL_MAX: "12" })).toBe(2);
  });

  it("refuses a size that is not a whole number from 1 to 100, naming the variable", () => {
    for (const bad of ["0", "-2", "2.5", "ten", "101"])
      expect(() => poolMax("app", { DB_POOL_MAX: bad })).toThrow(
        `DB_POOL_MAX must be a whole number from 1 to 100 (got "${bad}").`,
      );
    expect(() => poolMax("worker", { WORKER_DB_POOL_MAX: "0" })).toThrow(/^WORKER_DB_POOL_MAX must/);
  });
});
