import fs from "node:fs";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, ledgerGap, tableCounts, testDb } from "../support/db";
import { seed as seedPurchasing } from "@/db/seeds/04_purchasing";
import { makeOrder } from "../support/purchasing-fixtures";
import { attachment, parseMime } from "../support/mime";
import { PO_CSV_COLUMNS } from "@/lib/purchasing/orders";
import { createBoss } from "@/lib/jobs/boss";
import { QUEUES } from "@/lib/jobs/queues";

let buyer: Client;
let manager: Client;
let cutter: Client;

beforeAll(async () => {
  // Other files (the role matrix, hostile input) send and receive orders and set overrides:
  // start from the demo shop's purchasing state so the figures below are the seeded ones.
  await seedPurchasing(testDb());
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
  manager = client();
  await manager.signIn(demoEmail("manager"));
  cutter = client();
  await cutter.signIn(demoEmail("cutter"));
});
afterAll(closeTestDb);

const gradeId = async (code: string) => (await testDb()("grades").where({ code }).first("id"))!.id as number;
const supplierId = async (name: string) => (await testDb()("suppliers").where({ name }).first("id"))!.id as number;
const block = (lineId: number, size: [number, number, number] = [2000, 1000, 500]) => ({
  lineId,
  size,
  location: "Test bay",
  weightKg: 24,
});

describe("writing purchase orders", () => {
  it("saves a draft by hand with the grade's price unit and a number", async () => {
    const res = await buyer.post("/api/purchase-orders", {
      supplierId: await supplierId("Northgate Moulders"),
      expectedOn: "2026-12-22",
      notes: "Test order",
      lines: [
        { gradeId: await gradeId("EPS-II"), size: [4877, 1219, 1219], quantity: 3, price: 0.44 },
        { gradeId: await gradeId("XPS-IV"), size: [2440, 1220, 100], quantity: 10, price: 180 },
      ],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const po = res.body.order;
    expect(po.status).toBe("draft");
    expect(po.number).toMatch(/^PO-\d{4}-\d{4}$/);
    expect(po.lines.map((l: { priceUnit: string }) => l.priceUnit)).toEqual(["bf", "m3"]);
    // 3 blocks of 4877 × 1219 × 1219 mm at $0.44 per board foot.
    const m3 = (3 * 4877 * 1219 * 1219) / 1e9;
    expect(po.lines[0].value).toBeCloseTo(Math.round(m3 * 423.776 * 0.44 * 100) / 100, 1);
    expect(po.lines[1].value).toBeCloseTo(10 * 2.44 * 1.22 * 0.1 * 180, 1);
  });

  it("refuses bad input naming each field, and saves nothing", async () => {
    const before = await tableCounts();
    const res = await buyer.post("/api/purchase-orders", {
      supplierId: await supplierId("Northgate Moulders"),
      expectedOn: "next week",
      lines: [{ gradeId: await gradeId("EPS-II"), size: [4877, -1, 1219], quantity: 0, price: -2 }],
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fields)).toEqual(
      expect.arrayContaining(["expectedOn", "lines.0.size.1", "lines.0.quantity", "lines.0.price"]),
    );
    const unknown = await buyer.post("/api/purchase-orders", {
      supplierId: 999999,
      lines: [{ gradeId: 999999, size: [1, 1, 1], quantity: 1, price: 1 }],
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.fields).toMatchObject({
      supplierId: "That supplier does not exist.",
      "lines.0.gradeId": "That grade does not exist.",
    });
    const empty = await buyer.post("/api/purchase-orders", { supplierId: 1, lines: [] });
    expect(empty.body.fields.lines).toMatch(/at least one line/);
    expect(await tableCounts()).toEqual(before);
  });

  it("lets the manager read orders but not write them, and keeps the cutter out", async () => {
    const po = await makeOrder();
    expect((await manager.get(`/api/purchase-orders/${po.id}`)).status).toBe(200);
    expect((await manager.post(`/api/purchase-orders/${po.id}/send`, { email: false })).status).toBe(403);
    expect((await cutter.get("/api/purchase-orders")).status).toBe(403);
    expect((await cutter.get(`/api/purchase-orders/${po.id}/export`)).status).toBe(403);
  });
});

describe("sending an order", () => {
  it("e-mails the supplier with the CSV attached, records it in the outbox and marks the order sent", async () => {
    const po = await makeOrder({ supplierName: "Ashcombe Bead & Block", quantity: 4 });
    const res = await buyer.post(`/api/purchase-orders/${po.id}/send`, { email: true });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.order.status).toBe("sent");
    expect(res.body.mail.to).toBe("orders@ashcombe-bead.test");
    const row = await testDb()("mail_outbox")
      .where({ ref: `po:${po.id}` })
      .first();
    expect(row).toMatchObject({
      kind: "purchase_order",
      status: "sent",
      transport: "outbox",
      to_address: "orders@ashcombe-bead.test",
    });
    expect(row!.attachments).toEqual([`${po.number}.csv`]);
    const eml = parseMime(fs.readFileSync(row!.file!, "utf8"));
    const csv = Papa.parse<Record<string, string>>(
      attachment(eml, `${po.number}.csv`)!
        .body.toString("utf8")
        .replace(/^\uFEFF/, ""),
      { header: true, skipEmptyLines: true },
    );
    expect(csv.meta.fields).toEqual([...PO_CSV_COLUMNS]);
    expect(csv.data[0]).toMatchObject({ po_number: po.number, grade: "EPS-II", quantity: "4" });
    // The admin's outbox lists it.
    const admin = client();
    await admin.signIn(demoEmail("admin"));
    const outbox = await admin.get("/api/outbox");
    expect(outbox.body.items.some((m: { ref: string }) => m.ref === `po:${po.id}`)).toBe(true);
    expect((await buyer.get("/api/outbox")).status).toBe(403);
  });

  it("says plainly when the supplier has no e-mail address, and leaves the order a draft", async () => {
    const [s] = await testDb()("suppliers")
      .insert({ name: `No Mail Foams ${Date.now()}` })
      .returning("id");
    const po = await makeOrder();
    await testDb()("purchase_orders").where({ id: po.id }).update({ supplier_id: s!.id });
    const res = await buyer.post(`/api/purchase-orders/${po.id}/send`, { email: true });
    expect(res.status).toBe(400);
    expect(res.body.error).toMatch(/no e-mail address/);
    expect((await testDb()("purchase_orders").where({ id: po.id }).first())!.status).toBe("draft");
  });

  it("exports the order as CSV with formula-looking text escaped", async () => {
    const po = await makeOrder();
    await testDb()("purchase_order_lines").where({ id: po.lineId }).update({ note: '=HYPERLINK("x")' });
    const res = await buyer
      .get(`/api/purchase-orders/${po.id}/export`)
      .buffer(true)
      .parse((r, cb) => {
        let s = "";
        r.on("data", (c: Buffer) => (s += c.toString("utf8")));
        r.on("end", () => cb(null, s));
      });
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/text\/csv/);
    const rows = Papa.parse<Record<string, string>>((res.body as string).replace(/^\uFEFF/, ""), {
      header: true,
      skipEmptyLines: true,
    });
    expect(rows.data[0]!.note).toBe('\'=HYPERLINK("x")');
  });
});

describe("order states", () => {
  it("moves draft → sent → part received → closed, and cancels only drafts and sent orders", async () => {
    const po = await makeOrder({ quantity: 10 });
    expect((await buyer.post(`/api/purchase-orders/${po.id}/send`, { email: false })).body.order.status).toBe("sent");
    const part = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-STATE-1",
      blocks: Array.from({ length: 5 }, () => block(po.lineId)),
    });
    expect(part.status, JSON.stringify(part.body)).toBe(201);
    expect(part.body.status).toBe("part_received");
    expect((await buyer.post(`/api/purchase-orders/${po.id}/cancel`, { reason: "too late" })).status).toBe(409);
    const close = await buyer.post(`/api/purchase-orders/${po.id}/close`, {
      reason: "Supplier short of beads; the rest is not coming.",
    });
    expect(close.status).toBe(200);
    expect(close.body.order.status).toBe("closed");

    const cancel = await makeOrder({ status: "sent" });
    expect(
      (await buyer.post(`/api/purchase-orders/${cancel.id}/cancel`, { reason: "Bought elsewhere" })).body.order.status,
    ).toBe("cancelled");
  });

  it("refuses illegal moves with 409 and changes nothing", async () => {
    const closed = await makeOrder({ status: "closed" });
    const cancelled = await makeOrder({ status: "cancelled" });
    const draft = await makeOrder({ status: "draft" });
    const sent = await makeOrder({ status: "sent" });
    const before = await tableCounts();
    const tries: [string, object, RegExp][] = [
      [`/api/purchase-orders/${closed.id}/cancel`, { reason: "x" }, /closed/],
      [
        `/api/purchase-orders/${closed.id}/receive`,
        { receivedOn: "2026-11-30", lot: "L", blocks: [block(closed.lineId)] },
        /nothing more can be received/,
      ],
      [`/api/purchase-orders/${cancelled.id}/send`, { email: false }, /cannot be sent/],
      [
        `/api/purchase-orders/${draft.id}/receive`,
        { receivedOn: "2026-11-30", lot: "L", blocks: [block(draft.lineId)] },
        /still a draft/,
      ],
      [`/api/purchase-orders/${draft.id}/close`, { reason: "x" }, /only a partly received order/],
      [`/api/purchase-orders/${sent.id}/close`, { reason: "x" }, /only a partly received order/],
    ];
    for (const [url, body, message] of tries) {
      const res = await buyer.post(url, body);
      expect(res.status, url).toBe(409);
      expect(res.body.error).toMatch(message);
    }
    const edit = await buyer.put(`/api/purchase-orders/${sent.id}`, {
      supplierId: 1,
      lines: [{ gradeId: closed.gradeId, size: [1, 1, 1], quantity: 1, price: 1 }],
    });
    expect(edit.status).toBe(409);
    expect(edit.body.error).toMatch(/only a draft can be changed/);
    expect(await tableCounts()).toEqual(before);
  });

  it("answers 404 for an order that does not exist", async () => {
    expect((await buyer.get("/api/purchase-orders/999999")).status).toBe(404);
    expect((await buyer.get("/api/purchase-orders/abc")).status).toBe(404);
  });
});

describe("receiving against an order, ±10 % (domain brief §6, common trade terms)", () => {
  // Ten blocks of 2000 × 1000 × 500 mm = 10 m³ ordered.
  it("accepts 90 % as filled and closes the order, with stock, ledger and delivery linked", async () => {
    const po = await makeOrder({ status: "sent", quantity: 10 });
    const before = await testDb()("stock_ledger").count<{ n: number }[]>({ n: "*" }).first();
    const res = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-TOL-90",
      blocks: Array.from({ length: 9 }, () => block(po.lineId)),
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.status).toBe("closed");
    expect(res.body.lines[0]).toMatchObject({ percent: 90, filled: true, over: false });
    expect(res.body.codes).toHaveLength(9);
    const delivery = await testDb()("deliveries").where({ id: res.body.deliveryId }).first();
    expect(delivery).toMatchObject({ purchase_order_id: po.id, po_ref: po.number, lot: "L-TOL-90" });
    const after = await testDb()("stock_ledger").count<{ n: number }[]>({ n: "*" }).first();
    expect(Number(after!.n) - Number(before!.n)).toBe(9);
    // Cost from the line's price: 1 m³ at $0.40 per board foot.
    const b = await testDb()("blocks").where({ code: res.body.codes[0] }).first();
    expect(Number(b!.cost)).toBeCloseTo(423.776 * 0.4, 1);
    expect((await ledgerGap()).m3).toBeCloseTo(0, 6);
  });

  it("keeps an order under 90 % open, then accepts up to 110 % in a second delivery", async () => {
    const po = await makeOrder({ status: "sent", quantity: 10 });
    const first = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-TOL-A",
      blocks: Array.from({ length: 5 }, () => block(po.lineId)),
    });
    expect(first.body.status).toBe("part_received");
    expect(first.body.lines[0]).toMatchObject({ percent: 50, filled: false });
    const second = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-12-01",
      lot: "L-TOL-B",
      blocks: Array.from({ length: 6 }, () => block(po.lineId)),
    });
    expect(second.status, JSON.stringify(second.body)).toBe(201);
    expect(second.body.lines[0]).toMatchObject({ percent: 110, filled: true, over: false });
    expect(second.body.status).toBe("closed");
  });

  it("refuses more than 110 % with 409 naming the line, and receives nothing", async () => {
    const po = await makeOrder({ status: "sent", quantity: 4 });
    const before = await tableCounts();
    const res = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-OVER",
      blocks: Array.from({ length: 5 }, () => block(po.lineId)),
    });
    expect(res.status).toBe(409);
    expect(res.body.fields[`lines.${po.lineId}`]).toMatch(/125 % of the 4\.00 m³ ordered/);
    expect(await tableCounts()).toEqual(before);
    const noReason = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-OVER",
      acceptOver: true,
      blocks: Array.from({ length: 5 }, () => block(po.lineId)),
    });
    expect(noReason.status).toBe(400);
    expect(noReason.body.fields.overReason).toBeDefined();
    expect(await tableCounts()).toEqual(before);
  });

  it("takes the extra when the buyer accepts it with a reason, and flags the line", async () => {
    const po = await makeOrder({ status: "sent", quantity: 4 });
    const res = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-OVER-OK",
      acceptOver: true,
      overReason: "Supplier sent a fifth block at no charge",
      blocks: Array.from({ length: 5 }, () => block(po.lineId)),
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.lines[0]).toMatchObject({ over: true, percent: 125 });
    expect(res.body.order.lines[0].overTolerance).toBe(true);
    const receipt = await testDb()("purchase_order_receipts").where({ purchase_order_id: po.id }).first();
    expect(receipt).toMatchObject({ over_tolerance: true, over_reason: "Supplier sent a fifth block at no charge" });
  });

  it("names a bad block row and a line from another order, and receives nothing", async () => {
    const po = await makeOrder({ status: "sent", quantity: 4 });
    const other = await makeOrder({ status: "sent" });
    const before = await tableCounts();
    const bad = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-BAD",
      blocks: [block(po.lineId), { ...block(po.lineId), size: [2000, 0, 500], location: "" }],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.fields).toHaveProperty(["blocks.1.size.1"]);
    expect(bad.body.fields).toHaveProperty(["blocks.1.location"]);
    const foreign = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-BAD",
      blocks: [block(other.lineId)],
    });
    expect(foreign.status).toBe(400);
    expect(foreign.body.fields["blocks.0.lineId"]).toMatch(/not on this order/);
    const existing = await testDb()("blocks").whereNull("parent_id").orderBy("id").first("code");
    const dup = await buyer.post(`/api/purchase-orders/${po.id}/receive`, {
      receivedOn: "2026-11-30",
      lot: "L-BAD",
      blocks: [{ ...block(po.lineId), code: existing!.code }],
    });
    expect(dup.status).toBe(400);
    expect(dup.body.fields["blocks.0.code"]).toMatch(/already in stock/);
    expect(await tableCounts()).toEqual(before);
  });
});

describe("the reorder list", () => {
  it("shows every input with its source and a reorder point that follows from them", async () => {
    const res = await buyer.get("/api/reorder");
    expect(res.status).toBe(200);
    const eps = res.body.items.find((r: { gradeCode: string }) => r.gradeCode === "EPS-I");
    expect(eps.dailyDemand.source).toBe("ledger");
    expect(eps.leadTimeDays.source).toBe("supplier");
    expect(eps.committed.source).toBe("jobs");
    expect(["supplier", "deliveries"]).toContain(eps.leadTimeSd.source);
    const { z, safetyStock, reorderPoint } = eps.result;
    // SS = z·√(L·σd² + d²·σL²); ROP = max(d·L, work due within the lead time) + SS, in working days.
    const [d, sd, L, sL] = [eps.dailyDemand.value, eps.demandSd.value, eps.leadTimeDays.value, eps.leadTimeSd.value];
    expect(safetyStock).toBeCloseTo(z * Math.sqrt(L * sd ** 2 + d ** 2 * sL ** 2), 9);
    expect(reorderPoint).toBeCloseTo(Math.max(d * L, eps.committed.value) + safetyStock, 9);
    const onHand = await testDb()("blocks")
      .where({ grade_id: eps.gradeId })
      .whereIn("status", ["in_stock", "earmarked"])
      .sum({ m3: "volume_m3" })
      .first();
    expect(eps.onHand).toBeCloseTo(Number(onHand!.m3), 6);
    expect((await cutter.get("/api/reorder")).status).toBe(403);
  });

  it("takes overrides, names a bad one, and drafts an order from a due grade", async () => {
    const ix = await gradeId("EPS-IX");
    const bad = await buyer.put(`/api/reorder/${ix}`, { serviceLevel: 1.5, leadTimeDays: -1 });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fields).sort()).toEqual(["leadTimeDays", "serviceLevel"]);
    const ok = await buyer.put(`/api/reorder/${ix}`, {
      reorderPointM3: 500,
      orderQtyM3: 20,
      leadTimeDays: 9,
      note: "test",
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.item.result.due).toBe(true);
    expect(ok.body.item.leadTimeDays).toEqual({ value: 9, source: "override" });
    const draft = await buyer.post("/api/reorder/draft", { gradeIds: [ix] });
    expect(draft.status, JSON.stringify(draft.body)).toBe(201);
    const line = draft.body.orders[0].lines[0];
    expect(line.gradeCode).toBe("EPS-IX");
    expect(line.quantity).toBe(ok.body.item.result.suggestedBlocks);
    await buyer.put(`/api/reorder/${ix}`, {});
  });

  it("e-mails buyers the due grades when asked, as the scheduled job does", async () => {
    const viii = await gradeId("EPS-VIII");
    await buyer.put(`/api/reorder/${viii}`, { reorderPointM3: 10_000 });
    const res = await buyer.post("/api/reorder/alert");
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.grades).toContain("EPS-VIII");
    expect(res.body.sentTo).toContain("buyer@demo.blockyard.test");
    const row = await testDb()("mail_outbox")
      .where({ kind: "low_stock", to_address: "buyer@demo.blockyard.test" })
      .orderBy("id", "desc")
      .first();
    expect(row!.subject).toMatch(/reorder point/);
    await buyer.put(`/api/reorder/${viii}`, {});
  });

  it("runs the low-stock alert as a background job through pg-boss (the worker `npm test` starts)", async () => {
    const viii = await gradeId("EPS-VIII");
    await buyer.put(`/api/reorder/${viii}`, { reorderPointM3: 10_000 });
    const last = (await testDb()("mail_outbox").max({ id: "id" }).first())?.id ?? 0;
    const boss = createBoss("sender");
    await boss.start();
    try {
      await boss.createQueue(QUEUES.lowStockAlert);
      expect(await boss.send(QUEUES.lowStockAlert, {})).toBeTruthy();
      let row: { subject: string } | undefined;
      for (let i = 0; i < 60 && !row; i++) {
        row = await testDb()("mail_outbox").where("id", ">", last).where({ kind: "low_stock" }).first();
        if (!row) await new Promise((r) => setTimeout(r, 500));
      }
      expect(row?.subject).toMatch(/EPS-VIII|reorder point/);
    } finally {
      await boss.stop({ graceful: false, wait: false }).catch(() => {});
      await buyer.put(`/api/reorder/${viii}`, {});
    }
  });
});
