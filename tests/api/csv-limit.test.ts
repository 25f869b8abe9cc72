import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, tableCounts } from "../support/db";
import { makeJob } from "../support/job-fixtures";

afterAll(closeTestDb);

let buyer: Client;
let planner: Client;
beforeAll(async () => {
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
  planner = client();
  await planner.signIn(demoEmail("planner"));
});

/** A 100,000-row file: far over every import's limit. */
function bigCsv(header: string, row: (i: number) => string): string {
  const lines = [header];
  for (let i = 1; i <= 100_000; i++) lines.push(row(i));
  return `${lines.join("\n")}\n`;
}

describe("CSV imports far over the row limit", () => {
  it("refuses 100,000 rows on every import with 422 naming the limit, and writes nothing", async () => {
    const job = await makeJob();
    const cases = [
      {
        c: buyer,
        path: "/api/imports/deliveries?commit=1",
        limit: "20,000",
        body: bigCsv(
          "supplier,received_on,lot,grade,length_mm,width_mm,height_mm,cost,location",
          (i) => `Northgate Moulders,2026-11-25,LOT-BIG,EPS-I,2440,1220,610,95.5,Bay ${i}`,
        ),
      },
      {
        c: buyer,
        path: "/api/imports/stock-counts?commit=1",
        limit: "50,000",
        body: bigCsv("code,location,present", (i) => `BIG-${i},Bay 1,no`),
      },
      {
        c: planner,
        path: `/api/jobs/${job}/parts/import?commit=1`,
        limit: "5,000",
        body: bigCsv("name,quantity,length_mm,width_mm,height_mm", (i) => `Insert ${i},1,100,50,20`),
      },
    ];
    for (const { c, path, limit, body } of cases) {
      const before = await tableCounts();
      const res = await c.call("post", path).set("content-type", "text/csv").send(body);
      expect(res.status, path).toBe(422);
      expect(res.body.committed, path).toBe(false);
      expect(res.body.error, path).toContain(`at most ${limit} rows per file`);
      expect(res.body.problems, path).toEqual([
        {
          row: Number(limit.replace(",", "")) + 2,
          message: `The file has more than ${limit} rows; at most ${limit} rows per file — split it and import each part.`,
        },
      ]);
      expect(await tableCounts(), path).toEqual(before);
    }
  });
});
