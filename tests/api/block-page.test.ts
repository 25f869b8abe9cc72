import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { client, type Client } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeBlock, makeUser, testDb } from "../support/db";
import { sqlSent } from "../support/statements";
import { makeBlock as makeChild } from "../support/defect-fixtures";

// The query modules are read here in this process too (to see the SQL they send); outside Next,
// the "server-only" marker would refuse to load.
vi.mock("server-only", () => ({}));

const { db } = await import("@/db");
const { getBlock, getBlockPage, listChildren } = await import("@/db/queries/blocks");
const { listDefects } = await import("@/db/queries/defects");
const { listLedgerEntries } = await import("@/db/queries/ledger");

afterAll(async () => {
  await closeTestDb();
  await db().destroy();
});

let cutter: Client;
let planner: Client;
beforeAll(async () => {
  for (const role of ["cutter", "planner"] as const) {
    const u = await makeUser([role]);
    const c = client();
    await c.signIn(u.email, TEST_PASSWORD);
    if (role === "cutter") cutter = c;
    else planner = c;
  }
});

/** The SQL of every statement `run` sends through the app's Knex instance. */
const statementsOf = (run: () => Promise<unknown>) => sqlSent(db(), run);

/**
 * A block with a bit of everything the page lists: two zones (one corrected, with a photo), one
 * removed, two offcuts and `moves` ledger movements besides its receipt.
 */
async function busyBlock(moves = 3) {
  const block = await makeBlock({ size: [2400, 1200, 600] });
  const flag = async (min: number[], max: number[]) => {
    const res = await cutter.post(`/api/blocks/${block.id}/defects`, { kind: "void", min, max, note: "At the saw." });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body.id as number;
  };
  const kept = await flag([100, 100, 100], [200, 200, 200]);
  const gone = await flag([300, 300, 300], [400, 400, 400]);
  expect((await planner.patch(`/api/defects/${kept}`, { kind: "crush", max: [250, 200, 200] })).status).toBe(200);
  expect((await planner.delete(`/api/defects/${gone}`)).status).toBe(200);
  await testDb()("defect_photos").insert({
    defect_id: kept,
    object_key: `defects/${kept}/${crypto.randomUUID()}.jpg`,
    thumb_key: `defects/${kept}/${crypto.randomUUID()}.webp`,
    content_type: "image/jpeg",
    bytes: 1234,
    width: 640,
    height: 480,
  });
  // Two offcuts cut from it, each received through the ledger (the shared fixture).
  for (const [i, size] of [
    [600, 400, 300],
    [500, 300, 200],
  ].entries())
    await makeChild({ size: size as [number, number, number], code: `${block.code}.${i + 1}`, parentId: block.id });
  // Movements that change nothing on hand (a reserve and its release), at distinct times.
  for (let i = 0; i < moves; i++)
    await testDb()("stock_ledger").insert({
      block_id: block.id,
      kind: i % 2 ? "released" : "reserved",
      volume_m3: 1.728,
      delta_m3: 0,
      value: 100,
      delta_value: 0,
      reason: `move ${i + 1}`,
      at: new Date(Date.UTC(2026, 0, 1, 0, i)),
    });
  return { ...block, kept, gone };
}

describe("block page: everything in one statement", () => {
  it("reads the block, its zones with photos, offcuts, movements and zone history in one statement", async () => {
    const b = await busyBlock();
    await getBlockPage(b.code); // FIFO positions kept for this stock version
    const sql = await statementsOf(() => getBlockPage(b.code));
    expect(sql).toHaveLength(1);
  });

  it("gives what the separate reads give, field for field", async () => {
    const b = await busyBlock();
    const page = (await getBlockPage(b.code.toLowerCase()))!;
    expect(page.block).toEqual(await getBlock(b.code));
    expect(page.defects).toEqual(await listDefects(b.id));
    expect(page.defects.map((d) => d.id)).toEqual([b.kept]);
    expect(page.defects[0]!.photos).toMatchObject([{ contentType: "image/jpeg", bytes: 1234, width: 640 }]);
    expect(page.offcuts).toEqual(await listChildren(b.id));
    expect(page.offcuts.map((o) => o.code)).toEqual([`${b.code}.1`, `${b.code}.2`]);
    expect(page.history).toEqual(await listLedgerEntries({ blockId: b.id, pageSize: 20 }));
    expect(page.historyCount).toBe(4);
    // Newest first: removed, changed, flagged twice.
    expect(page.zoneHistory.map((e) => [e.action, e.zone])).toEqual([
      ["removed", b.gone],
      ["changed", b.kept],
      ["flagged", b.gone],
      ["flagged", b.kept],
    ]);
    expect(page.zoneHistory[1]!.what).toEqual(["kind Void → Crush or dent", "x 100–200 → 100–250 mm"]);
    expect(page.zoneHistoryCount).toBe(4);
    expect(await getBlockPage(`${b.code}-NOT-THERE`)).toBeUndefined();
  });
});

describe("block page: long histories", () => {
  /** The movements the page's HTML lists (by their reasons: "move 7"; the receipt says "test fixture"). */
  const movesShown = (html: string) =>
    new Set([...html.replace(/<!-- -->/g, "").matchAll(/ · move (\d+)<\/span>/g)].map((m) => Number(m[1])));

  it("shows the latest 20 movements with their count and a link to them all, which shows them all", async () => {
    const b = await busyBlock(29); // 30 movements with the receipt
    const page = await planner.get(`/stock/${encodeURIComponent(b.code)}`);
    expect(page.status).toBe(200);
    const text = page.text.replace(/<!-- -->/g, "");
    // The receipt (newest: made now) and moves 29 down to 11.
    expect([...movesShown(text)].sort((x, y) => x - y)).toEqual(Array.from({ length: 19 }, (_, i) => i + 11));
    expect(text).toContain("The latest 20 of 30.");
    expect(text).toContain(`href="/stock/${encodeURIComponent(b.code)}?history=all"`);
    const all = await planner.get(`/stock/${encodeURIComponent(b.code)}?history=all`);
    expect(all.status).toBe(200);
    expect(movesShown(all.text).size).toBe(29);
    expect(all.text).not.toContain("The latest");
  });

  it("says nothing more when every movement is shown", async () => {
    const b = await busyBlock(2);
    const text = (await planner.get(`/stock/${encodeURIComponent(b.code)}`)).text.replace(/<!-- -->/g, "");
    expect(movesShown(text).size).toBe(2);
    expect(text).not.toContain("The latest");
    expect(text).not.toContain("?history=all");
  });
});
