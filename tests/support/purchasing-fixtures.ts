import { testDb } from "./db";

let seq = 0;

/**
 * A purchase order straight into the database, in any state: one line (EPS-II by default) of
 * `quantity` blocks of `size`, optionally with `receivedM3` already received against it.
 */
export async function makeOrder(
  opts: {
    status?: "draft" | "sent" | "part_received" | "closed" | "cancelled";
    gradeCode?: string;
    size?: [number, number, number];
    quantity?: number;
    price?: number;
    supplierName?: string;
    receivedM3?: number;
  } = {},
) {
  const k = testDb();
  const grade = await k("grades")
    .where({ code: opts.gradeCode ?? "EPS-II" })
    .first("id", "price_unit");
  const supplier = opts.supplierName
    ? await k("suppliers").where({ name: opts.supplierName }).first("id")
    : await k("suppliers").whereNotNull("email").orderBy("id").first("id");
  const size = opts.size ?? [2000, 1000, 500];
  const [po] = await k("purchase_orders")
    .insert({
      number: `PO-T-${process.pid}-${Date.now().toString(36)}-${++seq}`,
      supplier_id: supplier!.id,
      status: opts.status ?? "draft",
      expected_on: "2026-12-20",
      created_by: "u-buyer",
    })
    .returning(["id", "number"]);
  const [line] = await k("purchase_order_lines")
    .insert({
      purchase_order_id: po!.id,
      grade_id: grade!.id,
      size_x: size[0],
      size_y: size[1],
      size_z: size[2],
      quantity: opts.quantity ?? 10,
      price: opts.price ?? 0.4,
      price_unit: grade!.price_unit,
    })
    .returning(["id", "volume_m3"]);
  if (opts.receivedM3) {
    const [d] = await k("deliveries")
      .insert({
        supplier_id: supplier!.id,
        received_on: "2026-11-30",
        lot: `PO-FIX-${seq}`,
        po_ref: po!.number,
        purchase_order_id: po!.id,
      })
      .returning("id");
    await k("purchase_order_receipts").insert({
      purchase_order_id: po!.id,
      line_id: line!.id,
      delivery_id: d!.id,
      blocks: 1,
      volume_m3: opts.receivedM3,
    });
  }
  return {
    id: po!.id as number,
    number: po!.number as string,
    lineId: line!.id as number,
    lineM3: Number(line!.volume_m3),
    gradeId: grade!.id as number,
  };
}
