import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, makeBlock, testDb } from "../support/db";

let manager: Client;
const today = new Date().toISOString().slice(0, 10);

beforeAll(async () => {
  manager = client();
  await manager.signIn(demoEmail("manager"));
});
afterAll(closeTestDb);

const csvOf = async (c: Client, url: string) => {
  const res = await c
    .get(url)
    .buffer(true)
    .parse((r, cb) => {
      let s = "";
      r.on("data", (x: Buffer) => (s += x.toString("utf8")));
      r.on("end", () => cb(null, s));
    });
  return {
    res,
    csv: Papa.parse<Record<string, string>>((res.body as string).replace(/^\uFEFF/, ""), {
      header: true,
      skipEmptyLines: true,
    }),
  };
};

describe("stock value reconciles with the ledger", () => {
  it("totals by grade and location equal the ledger's on-hand and the blocks in stock", async () => {
    await makeBlock({ location: "Reconcile bay", cost: 321.5 });
    const res = await manager.get(`/api/reports/stock-value?to=${today}`);
    expect(res.status).toBe(200);
    const ledger = await testDb()("stock_ledger").sum({ m3: "delta_m3", v: "delta_value" }).first();
    expect(res.body.total.m3).toBeCloseTo(Number(ledger!.m3), 3);
    expect(res.body.total.value).toBeCloseTo(Number(ledger!.v), 1);
    expect((await ledgerGap()).m3).toBeCloseTo(0, 6);
    // Each grade × location against the blocks there (held ones too: a hold moves nothing).
    const blocks = (await testDb()("blocks as b")
      .join("grades as g", "g.id", "b.grade_id")
      .whereIn("b.status", ["in_stock", "earmarked", "on_hold"])
      .groupBy("g.code", "b.location")
      .select("g.code", "b.location", testDb().raw("sum(b.volume_m3) AS m3"), testDb().raw("sum(b.cost) AS v"))) as {
      code: string;
      location: string;
      m3: string;
      v: string;
    }[];
    for (const b of blocks) {
      const row = res.body.rows.find(
        (r: { grade: string; location: string }) => r.grade === b.code && r.location === b.location,
      );
      expect(row, `${b.code} at ${b.location}`).toBeDefined();
      expect(row.m3).toBeCloseTo(Number(b.m3), 3);
      expect(row.value).toBeCloseTo(Number(b.v), 1);
    }
    const byGrade = res.body.byGrade.reduce((s: number, r: { m3: number }) => s + r.m3, 0);
    const byLocation = res.body.byLocation.reduce((s: number, r: { m3: number }) => s + r.m3, 0);
    expect(byGrade).toBeCloseTo(res.body.total.m3, 3);
    expect(byLocation).toBeCloseTo(res.body.total.m3, 3);
    expect(res.body.rows.find((r: { location: string }) => r.location === "Reconcile bay")).toBeDefined();
  });

  it("exports the same figures as CSV, the total row last", async () => {
    const { res, csv } = await csvOf(manager, `/api/reports/stock-value?to=${today}&format=csv`);
    expect(res.status).toBe(200);
    expect(csv.meta.fields).toEqual(["grade", "location", "blocks", "m3", "board_feet", "value"]);
    const json = await manager.get(`/api/reports/stock-value?to=${today}`);
    const last = csv.data.at(-1)!;
    expect(last.grade).toBe("All grades");
    expect(Number(last.m3)).toBeCloseTo(json.body.total.m3, 4);
  });
});

describe("yield and losses", () => {
  it("gives 65.1 % for 2,000 BF of parts from one 3,072 BF block, on the bounding box, and says so", async () => {
    // A 4×4×16 ft block (3,072 BF) cut on a day no other record uses (brief §2, check value 10).
    const b = await makeBlock({ size: [4876.8, 1219.2, 1219.2] });
    const k = testDb();
    const [run] = await k("nesting_runs")
      .insert({ status: "closed", job_ids: [], block_ids: [b.id], settings: "{}", problem: "{}" })
      .returning("id");
    const bf = 1e6 / (144 * 2.54 ** 3); // board feet per m³
    await k("plan_blocks").insert({
      run_id: run!.id,
      block_id: b.id,
      status: "cut",
      cut_at: "2019-03-06T10:00:00Z",
      block_volume_m3: 3072 / bf,
      part_volume_m3: 2000 / bf,
      offcut_volume_m3: 0,
      loss_trim_m3: 0.2,
      loss_kerf_m3: 0.05,
      loss_defect_m3: 0,
      loss_unusable_m3: 2.1,
      loss_reject_m3: 0.12,
      volume_basis: "box",
    });
    const res = await manager.get("/api/reports/yield?from=2019-03-04&to=2019-03-10");
    expect(res.status).toBe(200);
    expect(res.body.total.yieldPct).toBe(65.1);
    expect(res.body.total.basis).toBe("box");
    expect(res.body.weekly).toHaveLength(1);
    expect(res.body.weekly[0].key).toBe("2019-03-04");
    const losses = await manager.get("/api/reports/losses?from=2019-03-04&to=2019-03-10");
    expect(losses.body.total.losses).toEqual({ trim: 0.2, kerf: 0.05, defect: 0, unusable: 2.1, reject: 0.12 });
    expect(losses.body.total.totalM3).toBeCloseTo(2.47, 6);
  });

  it("adds up the seeded cut history the same way the database does, by grade and by job", async () => {
    const from = "2000-01-01";
    const res = await manager.get(`/api/reports/yield?from=${from}&to=${today}`);
    const k = testDb();
    const sql = await k("plan_blocks")
      .where({ status: "cut" })
      .where("cut_at", ">=", from)
      .select<{ p: number; n: number }[]>(
        k.raw("sum(part_volume_m3) AS p"),
        k.raw("sum(block_volume_m3 - offcut_volume_m3) AS n"),
      )
      .first();
    expect(res.body.total.yieldPct).toBeCloseTo((Number(sql!.p) / Number(sql!.n)) * 100, 1);
    const grades = res.body.byGrade.reduce((s: number, r: { partM3: number }) => s + r.partM3, 0);
    expect(grades).toBeCloseTo(res.body.total.partM3, 3);
    expect(res.body.byJob.length).toBeGreaterThan(0);
    expect(res.body.byJob.every((j: { basis: string }) => ["profile", "box", "mixed"].includes(j.basis))).toBe(true);
    const { csv } = await csvOf(manager, `/api/reports/yield?from=${from}&to=${today}&format=csv`);
    expect(csv.meta.fields).toEqual([
      "breakdown",
      "key",
      "label",
      "part_m3",
      "issued_m3",
      "offcut_m3",
      "net_m3",
      "yield_pct",
      "volume_basis",
    ]);
    expect(new Set(csv.data.map((r) => r.breakdown))).toEqual(new Set(["week", "grade", "job", "total"]));
  });
});

describe("offcuts and supplier quality", () => {
  it("counts offcuts in stock by age and used ones as cut", async () => {
    const res = await manager.get(`/api/reports/offcuts?from=2000-01-01&to=${today}`);
    expect(res.status).toBe(200);
    const inStock = await testDb()("blocks")
      .whereNotNull("parent_id")
      .whereIn("status", ["in_stock", "earmarked"])
      .count<{ n: number }[]>({ n: "*" })
      .first();
    expect(res.body.byAge.reduce((s: number, a: { count: number }) => s + a.count, 0)).toBe(Number(inStock!.n));
    const used = await testDb()("blocks")
      .whereNotNull("parent_id")
      .where({ status: "cut" })
      .count<{ n: number }[]>({ n: "*" })
      .first();
    expect(res.body.fate.find((f: { key: string }) => f.key === "used").count).toBe(Number(used!.n));
  });

  it("gives defects per m³ by supplier and lot, and blocks under the grade's minimum density", async () => {
    const res = await manager.get(`/api/reports/suppliers?from=2000-01-01&to=${today}`);
    expect(res.status).toBe(200);
    for (const s of res.body.bySupplier) if (s.m3 > 0) expect(s.defectsPerM3).toBeCloseTo(s.defects / s.m3, 2);
    const lots = res.body.byLot.reduce((n: number, l: { blocks: number }) => n + l.blocks, 0);
    expect(lots).toBe(res.body.bySupplier.reduce((n: number, l: { blocks: number }) => n + l.blocks, 0));
    for (const b of res.body.lowDensity) expect(b.density).toBeLessThan(b.minDensity);
  });
});

describe("bad requests", () => {
  it("names a bad date, a reversed period and an unknown format; 404 for an unknown report", async () => {
    const bad = await manager.get("/api/reports/yield?from=2026-13-01");
    expect(bad.status).toBe(400);
    expect(bad.body.fields.from).toBeDefined();
    const reversed = await manager.get("/api/reports/losses?from=2026-12-01&to=2026-11-01");
    expect(reversed.status).toBe(400);
    expect(reversed.body.fields.to).toMatch(/before from/);
    expect((await manager.get("/api/reports/yield?format=xls")).body.fields.format).toBeDefined();
    expect((await manager.get("/api/reports/payroll")).status).toBe(404);
  });

  it("lets the planner read reports and keeps the buyer and cutter out", async () => {
    const planner = client();
    await planner.signIn(demoEmail("planner"));
    expect((await planner.get("/api/reports/losses")).status).toBe(200);
    for (const role of ["buyer", "cutter"]) {
      const c = client();
      await c.signIn(demoEmail(role));
      expect((await c.get("/api/reports/yield")).status).toBe(403);
    }
  });
});
