import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { API_POLICY, MONEY, MONEY_FIELDS, type RouteKey } from "@/lib/auth/policy";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, makeBlock } from "../support/db";
import { makePlannedBlock } from "../support/planning-fixtures";

/**
 * Who sees money, decided once (lib/auth/policy.ts, MONEY) and applied to every answer that
 * carries it and to the pages: the buyer, the planner and the manager see a block's cost, the
 * stock's value and a plan's cost; a cutter sees none of it — as the exports were already refused.
 */
afterAll(closeTestDb);

const signed: Record<string, Client> = {};
beforeAll(async () => {
  for (const role of ["cutter", "buyer", "planner"]) {
    signed[role] = client();
    await signed[role].signIn(demoEmail(role));
  }
});

/** Every value, at any depth, of the fields named `keys`. */
function valuesOf(data: unknown, keys: readonly string[]): unknown[] {
  const out: unknown[] = [];
  const walk = (v: unknown) => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (v && typeof v === "object")
      for (const [k, x] of Object.entries(v)) {
        if (keys.includes(k)) out.push(x);
        else walk(x);
      }
  };
  walk(data);
  return out;
}

describe("money figures follow one rule", () => {
  it("the roles that see money are those the exports admit", () => {
    for (const key of Object.keys(API_POLICY) as RouteKey[]) {
      if (key.endsWith("/export") && key.includes("/api/blocks")) expect(API_POLICY[key]).toEqual(MONEY);
    }
  });

  it("a cutter gets every money field of every route that carries money blank; a buyer and a planner get figures", async () => {
    const block = await makeBlock({ cost: 412.5 });
    const { runId } = await makePlannedBlock();
    const urls: Record<string, string> = {
      "GET /api/blocks": `/api/blocks?q=${encodeURIComponent(block.code)}&status=all`,
      "GET /api/blocks/[blockId]": `/api/blocks/${block.id}`,
      "GET /api/runs": "/api/runs?limit=5",
      "GET /api/runs/[runId]": `/api/runs/${runId}`,
      "GET /api/runs/[runId]/plan": `/api/runs/${runId}/plan`,
    };
    expect(Object.keys(urls).sort()).toEqual(Object.keys(MONEY_FIELDS).sort());
    for (const [key, url] of Object.entries(urls)) {
      const keys = MONEY_FIELDS[key as RouteKey]!;
      const cutter = await signed.cutter!.get(url);
      expect(cutter.status, url).toBe(200);
      const hidden = valuesOf(cutter.body, keys);
      expect(hidden.length, `${url} carries ${keys.join("/")}`).toBeGreaterThan(0);
      expect(
        hidden.every((v) => v === null),
        `${url} for a cutter`,
      ).toBe(true);
      for (const role of ["buyer", "planner"]) {
        const res = await signed[role]!.get(url);
        if (res.status === 403) continue; // a route this role cannot read at all
        expect(
          valuesOf(res.body, keys).some((v) => typeof v === "number"),
          `${url} for the ${role}`,
        ).toBe(true);
      }
    }
    const own = await signed.buyer!.get(`/api/blocks/${block.id}`);
    expect(own.body.block.cost).toBe(412.5);
  });

  it("the pages a cutter opens show no money; the buyer's stock page shows the value", async () => {
    const block = await makeBlock({ cost: 777 });
    const cutterStock = await signed.cutter!.get(`/stock?q=${encodeURIComponent(block.code)}&status=all`);
    expect(cutterStock.status).toBe(200);
    expect(cutterStock.text).not.toMatch(/\$[\d,]+\.\d\d/);
    const cutterBlock = await signed.cutter!.get(`/stock/${encodeURIComponent(block.code)}`);
    expect(cutterBlock.text).not.toContain("$777.00");
    const buyerBlock = await signed.buyer!.get(`/stock/${encodeURIComponent(block.code)}`);
    expect(buyerBlock.text).toContain("$777.00");
    const { runId } = await makePlannedBlock();
    const cutterPlan = await signed.cutter!.get(`/plans/${runId}`);
    expect(cutterPlan.status).toBe(200);
    expect(cutterPlan.text).not.toContain("Stock cost");
    const plannerPlan = await signed.planner!.get(`/plans/${runId}`);
    expect(plannerPlan.text).toContain("Stock cost");
  });
});
