import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, makeBlock, makeGrade, testDb } from "../support/db";
import { sqlSent } from "../support/statements";
import { makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

// The query modules are read here in this process too (to see the SQL they send); outside Next,
// the "server-only" marker would refuse to load.
vi.mock("server-only", () => ({}));

const { db } = await import("@/db");
const { listBlocks } = await import("@/db/queries/blocks");
const { listRuns } = await import("@/db/queries/runs");
const { blockQuerySchema } = await import("@/lib/validations/stock");

afterAll(async () => {
  await closeTestDb();
  await db().destroy();
});

let buyer: Client;
beforeAll(async () => {
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
});

/** The SQL of every statement `run` sends through the app's Knex instance. */
const statementsOf = (run: () => Promise<unknown>) => sqlSent(db(), run);

const totalsOf = async (query: string) => {
  const res = await buyer.get(`/api/blocks?${query}`);
  expect(res.status).toBe(200);
  return { total: res.body.total as number, volume: res.body.totals.volumeM3 as number, codes: res.body.items };
};

describe("stock list under load: one statement per page, totals kept until stock changes", () => {
  it("reads a page (first, keyset or offset) in one statement once the filter's totals are kept", async () => {
    const f = blockQuerySchema.parse({ status: "all", sort: "code", pageSize: 5 });
    const first = await listBlocks(f);
    expect(first.items).toHaveLength(5);
    // The same filter again, and the keyset and offset pages after it: the totals are kept.
    const again = await statementsOf(() => listBlocks(f));
    expect(again).toHaveLength(1);
    const keyset = await statementsOf(() => listBlocks({ ...f, after: first.next! }));
    expect(keyset).toHaveLength(1);
    const offset = await statementsOf(() => listBlocks({ ...f, page: 2 }));
    expect(offset).toHaveLength(1);
    // Keyset and offset agree on what page 2 is.
    const [byKeyset, byOffset] = await Promise.all([
      listBlocks({ ...f, after: first.next! }),
      listBlocks({ ...f, page: 2 }),
    ]);
    expect(byKeyset.items.map((b) => b.code)).toEqual(byOffset.items.map((b) => b.code));
    expect(byKeyset.total).toBe(first.total);
  });

  it("answers the next request with the new count and totals after any write to stock, from any process", async () => {
    const q = `status=all&location=${encodeURIComponent(`Load bay ${Date.now()}`)}`;
    const location = decodeURIComponent(q.split("location=")[1]!);
    const before = await totalsOf(q);
    expect(before.total).toBe(0);
    await totalsOf(q); // kept now
    // Written by another process (this test's own connection), not through the app.
    const a = await makeBlock({ location, size: [1000, 1000, 1000] });
    const one = await totalsOf(q);
    expect(one.total).toBe(1);
    expect(one.volume).toBeCloseTo(1, 6);
    await makeBlock({ location, size: [2000, 1000, 1000] });
    expect((await totalsOf(q)).volume).toBeCloseTo(3, 6);
    // Through the app: a block written off leaves the stock in the yard.
    const avail = `location=${encodeURIComponent(location)}`;
    expect((await totalsOf(avail)).total).toBe(2);
    expect((await buyer.post(`/api/blocks/${a.id}/scrap`, { reason: "Load test" })).status).toBe(200);
    const after = await totalsOf(avail);
    expect(after.total).toBe(1);
    expect(after.volume).toBeCloseTo(2, 6);
    // A change of a column no filter reads still counts as a write (the version is per commit).
    await testDb()("blocks").where({ id: a.id }).update({ notes: "seen" });
    expect((await totalsOf(avail)).total).toBe(1);
  });

  it("reads the totals again in a process that kept them, once another process wrote a block", async () => {
    const location = `Load yard ${Date.now()}`;
    const f = blockQuerySchema.parse({ status: "all", location });
    expect((await listBlocks(f)).total).toBe(0);
    expect(await statementsOf(() => listBlocks(f))).toHaveLength(1); // kept
    await makeBlock({ location, size: [1000, 1000, 500] });
    const after = await listBlocks(f);
    expect(after.total).toBe(1);
    expect(after.totals.volumeM3).toBeCloseTo(0.5, 6);
    expect(after.items.map((b) => b.location)).toEqual([location]);
  });

  it("offers a new location in the stock page's filter as soon as a block stands there", async () => {
    const location = `Load rack ${Date.now()}`;
    const page = async () => (await buyer.get("/stock")).text;
    expect(await page()).not.toContain(location);
    await makeBlock({ location });
    expect(await page()).toContain(location);
  });

  it("bumps the stock version once per transaction, at its commit", async () => {
    const version = async () => Number((await testDb()("stock_version").where({ id: 1 }).first("v"))!.v);
    const b = await makeBlock();
    const v0 = await version();
    const trx = await testDb().transaction();
    await trx("blocks").where({ id: b.id }).update({ notes: "one" });
    await trx("blocks").where({ id: b.id }).update({ notes: "two" });
    // Not yet committed: others still read the old version (and the totals kept under it hold).
    expect(await version()).toBe(v0);
    await trx.commit();
    expect(await version()).toBe(v0 + 1);
    await testDb()
      .transaction(async (t) => {
        await t("blocks").where({ id: b.id }).update({ notes: "rolled back" });
        await t.rollback();
      })
      .catch(() => undefined);
    expect(await version()).toBe(v0 + 1);
  });
});

describe("the stock list sorted by grade, page by page", () => {
  it("walks every page by keyset in grade code then id order, and follows a grade's new code or a block's new grade", async () => {
    const k = testDb();
    const stamp = `GS${Date.now().toString(36).toUpperCase()}`;
    const location = `Grade sort bay ${stamp}`;
    // Grades of the test's own (blocks of a demo grade would lift it over its reorder point for
    // the buyer's tests); "-M" is renamed below.
    const [b, m, x] = [await makeGrade(`${stamp}-B`), await makeGrade(`${stamp}-M`), await makeGrade(`${stamp}-X`)];
    const blocks: { id: number; code: string }[] = [];
    for (const g of [x, m, b, m, x, b, m]) blocks.push(await makeBlock({ location, gradeCode: g.code }));
    const codesOf = (...i: number[]) => i.map((n) => blocks[n]!.code);
    const f = blockQuerySchema.parse({ status: "all", location, sort: "grade", pageSize: 2 });
    /** Every page of the filter by keyset (forwards), and by offset: the codes in order. */
    const walk = async (dir: "asc" | "desc") => {
      const keyset: string[] = [];
      let page = await listBlocks({ ...f, dir });
      keyset.push(...page.items.map((r) => r.code));
      while (page.next) {
        page = await listBlocks({ ...f, dir, after: page.next });
        keyset.push(...page.items.map((r) => r.code));
      }
      const offset: string[] = [];
      for (let p = 1; p <= 4; p++) offset.push(...(await listBlocks({ ...f, dir, page: p })).items.map((r) => r.code));
      return { keyset, offset };
    };
    /** The order read straight from the grades table (the join the list made before): code, then id. */
    const joined = async (dir: "asc" | "desc") =>
      (
        await k("blocks as b")
          .join("grades as g", "g.id", "b.grade_id")
          .where("b.location", location)
          .orderBy([
            { column: "g.code", order: dir },
            { column: "b.id", order: dir },
          ])
          .select("b.code")
      ).map((r) => r.code as string);
    for (const dir of ["asc", "desc"] as const) {
      const { keyset, offset } = await walk(dir);
      expect(keyset).toEqual(await joined(dir));
      expect(offset).toEqual(keyset);
    }
    expect((await walk("asc")).keyset).toEqual(codesOf(2, 5, 1, 3, 6, 0, 4));
    // "-M" renamed "-Z": its three blocks move from the middle to the end.
    await k("grades")
      .where({ id: m.id })
      .update({ code: `${stamp}-Z` });
    expect((await walk("asc")).keyset).toEqual(codesOf(2, 5, 0, 4, 1, 3, 6));
    // A block moved to another grade sorts with it.
    await k("blocks").where({ id: blocks[0]!.id }).update({ grade_id: m.id });
    const moved = await walk("asc");
    expect(moved.keyset).toEqual(codesOf(2, 5, 4, 0, 1, 3, 6));
    expect(moved.keyset).toEqual(await joined("asc"));
    // The stored copy cannot drift: written directly, it is set back from the grade.
    await k("blocks").where({ id: blocks[2]!.id }).update({ grade_code: "AAA" });
    expect((await k("blocks").where({ id: blocks[2]!.id }).first("grade_code"))!.grade_code).toBe(b.code);
  });
});

describe("the plan page's runs of the same job", () => {
  it("are read without any run's problem or plan", async () => {
    const block = await makeBlock({ size: [2000, 1000, 600] });
    const { jobId } = await makeJobWithParts([{ name: "Load panel", quantity: 2, size: [900, 400, 200] }]);
    for (let i = 0; i < 3; i++) await makeDoneRun(jobId, [block]);
    // Runs stored before figures were kept with the plan get them worked out once, on first read.
    await listRuns({ jobId, limit: 8 });
    let runs: Awaited<ReturnType<typeof listRuns>> = [];
    const sql = await statementsOf(async () => {
      runs = await listRuns({ jobId, limit: 8 });
    });
    expect(runs).toHaveLength(3);
    for (const r of runs) expect(r.stats).not.toBeNull();
    for (const s of sql) {
      expect(s).not.toMatch(/"r"\.\*|"problem"|"plan"(?!\s+IS NOT NULL)|\bselect \*/i);
    }
  });
});
