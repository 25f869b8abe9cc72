import type { Knex } from "knex";
import type { PurchaseOrdersRow } from "../tables";
import path from "node:path";
import { deliver } from "../../lib/mail/transport";
import { lowStockMail, purchaseOrderMail } from "../../lib/mail/messages";
import { priceFor } from "../../lib/purchasing/pricing";
import type { PoLine, PurchaseOrder } from "../../lib/purchasing/orders";
import type { Vec3 } from "../../lib/nesting";

/**
 * Demo purchasing for Hollowfield Foamworks (invented): reorder settings with two grade
 * overrides, five purchase orders in every state against the invented suppliers (two of them
 * the orders behind recent seeded deliveries), and two mails in the outbox. Runs after 02_stock.
 */
const day = (offset: number) => {
  const d = new Date();
  d.setHours(12, 0, 0, 0);
  d.setDate(d.getDate() + offset);
  return d;
};
const iso = (d: Date) =>
  `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;

type LineSeed = { grade: string; size: Vec3; quantity: number; price: number; note?: string };

export async function seed(knex: Knex): Promise<void> {
  // DELETE, not TRUNCATE … CASCADE: deliveries refer to orders, and a cascade would empty the stock.
  await knex("deliveries").whereNotNull("purchase_order_id").update({ purchase_order_id: null });
  for (const t of [
    "mail_outbox",
    "purchase_order_receipts",
    "purchase_order_lines",
    "purchase_orders",
    "grade_reorder",
    "reorder_settings",
  ])
    await knex(t).delete();
  await knex.raw("ALTER SEQUENCE purchase_order_seq RESTART WITH 1");
  await knex("reorder_settings").insert({
    id: 1,
    service_level: 0.95,
    history_days: 90,
    order_cost: 75,
    holding_cost_m3_year: 18,
    updated_by: "u-buyer",
  });

  const grades = new Map<string, { id: number; unit: "m3" | "bf"; label: string }>(
    (await knex("grades").select("id", "code", "price_unit", "grade_system", "grade")).map((g) => [
      g.code,
      { id: g.id, unit: g.price_unit, label: `${g.grade_system} ${g.grade}` },
    ]),
  );
  const suppliers = new Map<string, { id: number; email: string | null }>(
    (await knex("suppliers").select("id", "name", "email")).map((s) => [s.name, { id: s.id, email: s.email }]),
  );
  const ash = suppliers.get("Ashcombe Bead & Block")!;
  const north = suppliers.get("Northgate Moulders")!;
  const tallow = suppliers.get("Tallow Creek Foams")!;

  await knex("grade_reorder").insert([
    {
      grade_id: grades.get("EPS-II")!.id,
      daily_demand_m3: 2,
      note: "Sign season forecast: about 2 m³ a day until February.",
      updated_by: "u-buyer",
    },
    {
      grade_id: grades.get("EPS-IX")!.id,
      service_level: 0.98,
      note: "Dense stage-floor foam: a stock-out stops the panto work.",
      updated_by: "u-buyer",
    },
    {
      grade_id: grades.get("XPS-IV")!.id,
      supplier_id: tallow.id,
      lead_time_days: 10,
      note: "Tallow Creek holds XPS boards for us.",
      updated_by: "u-buyer",
    },
  ]);

  let seq = 0;
  const order = async (o: {
    supplierId: number;
    status: PurchaseOrdersRow["status"];
    created: number;
    expected: number | null;
    sent?: number;
    closed?: number;
    notes?: string;
    cancel?: string;
    number?: string;
    lines: LineSeed[];
  }) => {
    const number = o.number ?? `PO-${iso(day(0)).slice(0, 4)}-${String(++seq).padStart(4, "0")}`;
    const [po] = await knex("purchase_orders")
      .insert({
        number,
        supplier_id: o.supplierId,
        status: o.status,
        expected_on: o.expected === null ? null : iso(day(o.expected)),
        notes: o.notes ?? null,
        created_by: "u-buyer",
        created_at: day(o.created),
        sent_at: o.sent === undefined ? null : day(o.sent),
        closed_at: o.closed === undefined ? null : day(o.closed),
        cancel_reason: o.cancel ?? null,
      })
      .returning(["id", "number"]);
    if (!po) throw new Error(`Order ${number} was not saved.`);
    const lines = await knex("purchase_order_lines")
      .insert(
        o.lines.map((l) => ({
          purchase_order_id: po.id,
          grade_id: grades.get(l.grade)!.id,
          size_x: l.size[0],
          size_y: l.size[1],
          size_z: l.size[2],
          quantity: l.quantity,
          price: l.price,
          price_unit: grades.get(l.grade)!.unit,
          note: l.note ?? null,
        })),
      )
      .returning(["id", "grade_id", "size_x", "size_y", "size_z", "quantity", "volume_m3"]);
    await knex("audit_log").insert({
      actor_id: "u-buyer",
      action: "po.create",
      subject: `po:${po.id}`,
      detail: { number, seeded: true },
      at: day(o.created),
    });
    return { id: po.id, number: po.number, lines };
  };

  // The orders behind the two newest EPS deliveries of the stock seed: one filled and closed,
  // one partly received (two blocks of its first line still to come).
  const recent = (await knex("deliveries as d")
    .join("blocks as b", "b.delivery_id", "d.id")
    .join("grades as g", "g.id", "b.grade_id")
    .where("g.material", "EPS")
    .groupBy("d.id")
    .orderBy("d.received_on", "desc")
    .limit(2)
    .select("d.id", "d.supplier_id", "d.po_ref", "d.received_on", "d.created_at")) as {
    id: number;
    supplier_id: number;
    po_ref: string | null;
    received_on: string; // DATE as its text (db/types.ts)
    created_at: Date;
  }[];
  for (const [i, d] of recent.reverse().entries()) {
    const blocks = (await knex("blocks as b")
      .join("grades as g", "g.id", "b.grade_id")
      .where("b.delivery_id", d.id)
      .whereNull("b.parent_id")
      .select("g.code", "b.nominal_x", "b.nominal_y", "b.nominal_z", "b.volume_m3", "b.cost")) as {
      code: string;
      nominal_x: number;
      nominal_y: number;
      nominal_z: number;
      volume_m3: number;
      cost: number;
    }[];
    const groups = new Map<string, { grade: string; size: Vec3; n: number; m3: number; cost: number }>();
    for (const b of blocks) {
      const key = `${b.code}|${b.nominal_x}|${b.nominal_y}|${b.nominal_z}`;
      const g = groups.get(key) ?? {
        grade: b.code,
        size: [Number(b.nominal_x), Number(b.nominal_y), Number(b.nominal_z)] as Vec3,
        n: 0,
        m3: 0,
        cost: 0,
      };
      g.n += 1;
      g.m3 += Number(b.volume_m3);
      g.cost += Number(b.cost);
      groups.set(key, g);
    }
    const open = i === 1; // the newest stays partly received
    const received = d.received_on;
    const created = Math.round((new Date(`${received}T12:00:00`).getTime() - Date.now()) / 86400_000) - 16;
    const po = await order({
      supplierId: d.supplier_id,
      number: d.po_ref ?? undefined,
      status: open ? "part_received" : "closed",
      created,
      sent: created + 1,
      expected: created + 15,
      closed: open ? undefined : created + 16,
      lines: [...groups.values()].map((g, j) => {
        const unit = grades.get(g.grade)!.unit;
        const perM3 = g.cost / g.m3;
        return {
          grade: g.grade,
          size: g.size,
          quantity: g.n + (open && j === 0 ? 2 : 0),
          price: Math.round((unit === "bf" ? perM3 / 423.776 : perM3) * 10000) / 10000,
        };
      }),
    });
    await knex("deliveries").where({ id: d.id }).update({ purchase_order_id: po.id });
    await knex("purchase_order_receipts").insert(
      po.lines.map((l, j) => {
        const g = [...groups.values()][j]!;
        return {
          purchase_order_id: po.id,
          line_id: l.id,
          delivery_id: d.id,
          blocks: g.n,
          volume_m3: g.m3,
          over_tolerance: false,
          received_by: "u-buyer",
          at: d.created_at,
        };
      }),
    );
  }

  const big: Vec3 = [4877, 1219, 1219];
  const sent = await order({
    supplierId: north.id,
    status: "sent",
    created: -4,
    sent: -4,
    expected: 12,
    notes: "Deliver to Bay A, mornings only.",
    lines: [
      { grade: "EPS-VIII", size: big, quantity: 3, price: 0.36 },
      { grade: "EPS-IX", size: [3658, 1219, 610], quantity: 4, price: 0.61 },
    ],
  });
  await order({
    supplierId: ash.id,
    status: "draft",
    created: -1,
    expected: 14,
    notes: "Drafted from the reorder list.",
    lines: [{ grade: "EPS-I", size: big, quantity: 5, price: 0.31, note: "Kestrel kits need the lighter grade." }],
  });
  await order({
    supplierId: tallow.id,
    status: "cancelled",
    created: -30,
    sent: -29,
    expected: -10,
    closed: -25,
    cancel: "Supplier could not mould before the panto deadline; bought elsewhere.",
    lines: [{ grade: "EPS-VIII", size: [4000, 1200, 1000], quantity: 3, price: 0.38 }],
  });
  await knex.raw("SELECT setval('purchase_order_seq', ?)", [Math.max(seq, 1)]);

  // Two mails in the outbox, written as .eml files the same way the app writes them.
  const outbox = {
    kind: "outbox" as const,
    from: "Hollowfield Foamworks <purchasing@hollowfield.test>",
    dir: path.resolve(process.env.MAIL_OUTBOX_DIR ?? path.join(".data", "outbox")),
  };
  const lines = await knex("purchase_order_lines as l")
    .join("grades as g", "g.id", "l.grade_id")
    .where("l.purchase_order_id", sent.id)
    .orderBy("l.id")
    .select("l.*", "g.code");
  const poLines: PoLine[] = lines.map(
    (l: {
      id: number;
      grade_id: number;
      code: string;
      size_x: number;
      size_y: number;
      size_z: number;
      quantity: number;
      price: number;
      price_unit: "m3" | "bf";
      volume_m3: number;
    }) => ({
      id: l.id,
      gradeId: l.grade_id,
      gradeCode: l.code,
      gradeLabel: [...grades.entries()].find(([, g]) => g.id === l.grade_id)![1].label,
      size: [Number(l.size_x), Number(l.size_y), Number(l.size_z)],
      quantity: l.quantity,
      price: Number(l.price),
      priceUnit: l.price_unit,
      volumeM3: Number(l.volume_m3),
      value: priceFor(Number(l.volume_m3), Number(l.price), l.price_unit),
      note: null,
      receivedBlocks: 0,
      receivedM3: 0,
      overTolerance: false,
    }),
  );
  const po: PurchaseOrder = {
    id: sent.id,
    number: sent.number,
    supplierId: north.id,
    supplier: "Northgate Moulders",
    supplierEmail: north.email,
    status: "sent",
    expectedOn: iso(day(12)),
    notes: "Deliver to Bay A, mornings only.",
    createdBy: "Tobias Wren",
    createdAt: day(-4).toISOString(),
    sentAt: day(-4).toISOString(),
    closedAt: null,
    cancelReason: null,
    lines: poLines,
    volumeM3: poLines.reduce((s, l) => s + l.volumeM3, 0),
    value: poLines.reduce((s, l) => s + l.value, 0),
    receivedM3: 0,
  };
  const mails = [
    { mail: purchaseOrderMail(po, "Hollowfield Foamworks"), kind: "purchase_order", ref: `po:${sent.id}`, at: day(-4) },
    {
      mail: lowStockMail(
        "buyer@demo.blockyard.test",
        [
          {
            gradeCode: "EPS-II",
            position: 11.2,
            reorderPoint: 14.9,
            suggestedBlocks: 4,
            suggestedM3: 29,
            supplier: "Northgate Moulders",
          },
        ],
        "Hollowfield Foamworks",
        null,
      ),
      kind: "low_stock",
      ref: "grades:EPS-II",
      at: day(-5),
    },
  ];
  for (const m of mails) {
    const d = await deliver(outbox, m.mail);
    await knex("mail_outbox").insert({
      kind: m.kind,
      to_address: m.mail.to,
      subject: m.mail.subject,
      transport: "outbox",
      status: "sent",
      message_id: d.messageId,
      file: path.relative(process.cwd(), d.file!),
      attachments: JSON.stringify((m.mail.attachments ?? []).map((a) => a.filename)),
      ref: m.ref,
      sent_by: m.kind === "purchase_order" ? "u-buyer" : null,
      at: m.at,
    });
  }
}
